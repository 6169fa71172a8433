/**
 * The typed catalogue and the result contract (lib/src/calculators/spec.ts): types checked by the
 * TypeScript compiler on two small files (one must compile, one must not), and at run time an
 * absent output read from a result is an InputError listing the outputs it has, and a film is
 * accepted as inputs. Common practice, no source.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import {
  choiceInput,
  defineCalculator,
  demoFilmHX1,
  InputError,
  isDocumentedResult,
  makeFilm,
  report,
  runCalculator,
  solveLeastSquares,
  type CalculatorSpec,
} from "@helicoid/lib/internal";

const here = join(__dirname, "typed");
const tscBin = require.resolve("typescript/bin/tsc");

function tsc(file: string): { status: number | null; out: string } {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-types-"));
  const config = join(dir, "tsconfig.json");
  writeFileSync(
    config,
    JSON.stringify({
      compilerOptions: {
        strict: true,
        noEmit: true,
        target: "ES2022",
        module: "CommonJS",
        moduleResolution: "Node10",
        types: ["node"],
        typeRoots: [join(__dirname, "../../../node_modules/@types")],
        skipLibCheck: true,
        noErrorTruncation: true,
      },
      files: [join(here, file)],
    }),
  );
  const r = spawnSync(process.execPath, [tscBin, "-p", config], { encoding: "utf8", timeout: 240_000 });
  return { status: r.status, out: r.stdout + r.stderr };
}

describe("typed catalogue (compile time)", () => {
  it("compiles typed reads, a film as inputs and ids in variables; each misspelling marked in the file is an error", () => {
    const r = tsc("compiles.ts");
    expect(r.out).toBe("");
    expect(r.status).toBe(0);
  }, 300_000);

  it("refuses a misspelt output, naming every output of the calculator", () => {
    const r = tsc("misspelt.ts");
    expect(r.status).not.toBe(0);
    expect(r.out).toMatch(/misspelt\.ts\(4,\d+\): error TS\d+: Property 'widht' does not exist on type '\{ width: OutputEntry<number>;/);
    for (const name of ["width", "energy", "criticalDmi", "wallType", "regime", "x", "mz", "mInPlane"]) expect(r.out).toContain(` ${name}: OutputEntry<`);
    expect(r.out).toContain("Did you mean 'width'?");
  }, 300_000);
});

// A small spec of our own: y = 2 x always, z only for x > 1 (declared optional), w only for x > 5.
const demo = defineCalculator({
  id: "contract-demo",
  title: "Demo",
  summary: "A test calculator.",
  inputs: [{ name: "x", symbol: "x", unit: "m", default: 1, min: 0, max: 10, scale: "linear", meaning: "a length" }],
  outputs: [
    { name: "y", symbol: "y", unit: "m", meaning: "twice x" },
    { name: "z", symbol: "z", unit: "m", meaning: "x when x > 1", optional: true },
    { name: "w", symbol: "w", unit: "m", meaning: "x when x > 5" },
  ],
  plots: [],
  assumptions: ["none"],
  sources: [],
  method: "doubling",
  compute: (v) => ({ values: { y: 2 * v.x!, ...(v.x! > 1 ? { z: v.x! } : {}), ...(v.x! > 5 ? { w: v.x! } : {}) } }),
});

describe("outputs of a result (run time)", () => {
  it("reads present outputs as before; an absent optional output is undefined", () => {
    const r = runCalculator(demo, { x: "3 m" });
    expect(r.outputs.y).toEqual({ value: 6, unit: "m" });
    expect(r.outputs.z?.value).toBe(3);
    const small = runCalculator(demo, { x: 0.5 });
    expect(small.outputs.z).toBeUndefined();
    expect("z" in small.outputs).toBe(false);
    expect(Object.keys(small.outputs)).toEqual(["y"]);
  });

  it("answers an absent declared output and a misspelt one with an InputError listing the outputs the result has", () => {
    const r = runCalculator(demo, { x: 3 });
    const absent = (() => {
      try {
        return r.outputs.w.value;
      } catch (e) {
        return e;
      }
    })();
    expect(absent).toBeInstanceOf(InputError);
    expect((absent as InputError).parameter).toBe("output");
    expect((absent as InputError).message).toBe(
      `output = "w" is not valid: expected one of the outputs of this 'contract-demo' result: y, z. 'w' is an output of 'contract-demo' that was not computed for these inputs (see the result's status and notes)`,
    );
    const loose = r.outputs as unknown as Record<string, { value: number }>;
    expect(() => loose.yy!.value).toThrow(
      /output = "yy" is not valid: expected one of the outputs of this 'contract-demo' result: y, z\. Outputs of 'contract-demo' not computed for these inputs: w/,
    );
  });

  it("keeps the outputs a plain record: JSON, structured clone, spread, equality, inspection", () => {
    const r = runCalculator(demo, { x: 3 });
    expect(JSON.parse(JSON.stringify(r)).outputs).toEqual({ y: { value: 6, unit: "m" }, z: { value: 3, unit: "m" } });
    expect(structuredClone(r).outputs).toEqual({ y: { value: 6, unit: "m" }, z: { value: 3, unit: "m" } });
    expect({ ...r.outputs }).toEqual({ y: { value: 6, unit: "m" }, z: { value: 3, unit: "m" } });
    expect(r.outputs).toEqual({ y: { value: 6, unit: "m" }, z: { value: 3, unit: "m" } });
    expect(String(r.outputs)).toBe("[object Object]");
    expect(isDocumentedResult(r)).toBe(true);
  });

  it("a catalogue calculator by id: the skyrmion's absent sweep outputs are named when read", () => {
    const r = runCalculator("skyrmion", {}, { noSweep: true });
    expect(r.outputs.radius.value).toBeGreaterThan(0);
    expect(() => r.outputs.radiusSweep.value).toThrow(InputError);
    expect(() => r.outputs.radiusSweep.value).toThrow(/'radiusSweep' is an output of 'skyrmion' that was not computed/);
  }, 120_000);
});

describe("a film as inputs", () => {
  const film = makeFilm({ Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.4 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm", alpha: 0.2 });

  it("uses the film's fields that are inputs, and says which film fields it did not use", () => {
    const fromFilm = runCalculator("wall", film);
    const byHand = runCalculator("wall", { Ms: film.Ms, A: film.A, Ku: film.Ku, D: film.D, t: film.t });
    expect(fromFilm.outputs).toEqual(byHand.outputs);
    expect(fromFilm.inputs).toEqual(byHand.inputs);
    expect(fromFilm.notes).toContain("Film fields that are not inputs of 'wall' were not used: alpha = 0.2");
    // K_eff = Ku - mu0 Ms^2 / 2, Delta = sqrt(A / K_eff)
    const keff = 1.4e6 - (4e-7 * Math.PI * 1.1e6 ** 2) / 2;
    expect(fromFilm.outputs.width.value).toBeCloseTo(Math.sqrt(15e-12 / keff), 15);
    // a calculator that takes alpha uses it
    expect(runCalculator("wall-motion", film, { noSweep: true }).inputs.alpha.value).toBe(0.2);
  });

  it("accepts any object with a film's fields (a demo film spread with a field)", () => {
    const r = runCalculator("wall", { ...demoFilmHX1.film, D: "1 mJ/m^2" });
    expect(r.inputs.D.value).toBeCloseTo(1e-3, 15);
    expect(r.inputs.Ms.value).toBe(demoFilmHX1.film.Ms);
  });

  it("refuses bulk DMI for a calculator that models interfacial DMI, and still refuses a misspelt name", () => {
    expect(() => runCalculator("wall", { ...film, dmi: "bulk" })).toThrow(/dmi = "bulk" is not valid: expected "interfacial": 'wall' models interfacial DMI only/);
    expect(() => runCalculator("wall", { ...film, Kuu: 1 } as object)).toThrow(/Kuu = 1 is not valid: expected one of the inputs of 'wall'/);
    // without a film's dmi the object is not read as a film: alpha is an unknown input of 'wall'
    expect(() => runCalculator("wall", { alpha: 0.1 } as object)).toThrow(/alpha = 0.1 is not valid: expected one of the inputs of 'wall'/);
  });
});

describe("one documented-result contract", () => {
  it("a fit result carries status, message, notes, method, sources and assumptions; report() takes it and a calculator result", () => {
    // y = a x fitted to exact data: a = 2
    const x = [0, 1, 2, 3, 4];
    const fit = solveLeastSquares({
      parameters: [{ name: "a", value: 1, unit: "" }],
      m: x.length,
      model: (p, out) => x.forEach((v, i) => (out[i] = p[0]! * v)),
      y: Float64Array.from(x, (v) => 2 * v + 0.01 * Math.sin(7 * v)),
      sigma: null,
    });
    expect(isDocumentedResult(fit)).toBe(true);
    expect(fit.assumptions.length).toBeGreaterThan(0);
    expect(fit.parameters.a!.value).toBeCloseTo(2, 2);
    expect(report(fit)).toContain("**Method:**");
    const calc = runCalculator("wall", {});
    const text = report(calc);
    expect(text).toContain("| width |");
    expect(text).toContain(`**Method:** ${(calc as { method: string }).method}`);
    const spec: CalculatorSpec = demo;
    expect(isDocumentedResult(runCalculator(spec, {}))).toBe(true);
  });
});

describe("choiceInput", () => {
  // Common practice, no source: a choice is given by its label or its value, and both mean the same.
  it("builds a choice input: values by place or as given, range and default from them", () => {
    const b = choiceInput("boundary", "\\text{bc}", ["periodic", "open"], "boundary of the grid");
    expect(b).toEqual({
      name: "boundary",
      symbol: "\\text{bc}",
      unit: "",
      default: 0,
      min: 0,
      max: 1,
      scale: "linear",
      kind: "choice",
      choices: [
        { value: 0, label: "periodic" },
        { value: 1, label: "open" },
      ],
      meaning: "boundary of the grid",
    });
    const p = choiceInput(
      "polarity",
      "p",
      [
        [1, "up-down"],
        [-1, "down-up"],
      ],
      "wall polarity",
    );
    expect([p.default, p.min, p.max]).toEqual([1, -1, 1]);
    expect(
      choiceInput(
        "S",
        "S",
        [
          [0.5, "1/2"],
          [1, "1"],
        ],
        "spin",
        { default: 1 },
      ).default,
    ).toBe(1);
    expect(() => choiceInput("x", "", [], "none")).toThrow(InputError);
    expect(() => choiceInput("x", "", ["a", "b"], "bad default", { default: 3 })).toThrow(/default/);
    expect(() =>
      choiceInput(
        "x",
        "",
        [
          [0, "a"],
          [0, "b"],
        ],
        "twice",
      ),
    ).toThrow(/distinct/);
  });

  it("reads a label that looks like a number ('-z') as the label, and the value alike", () => {
    const tex = (background: string | number) => runCalculator("texture", { kind: "skyrmion", n: 32, background }).inputs.background.value;
    expect(tex("-z")).toBe(1);
    expect(tex("+z")).toBe(0);
    expect(tex(1)).toBe(1);
    expect(() => tex("z")).toThrow(InputError);
  });
});
