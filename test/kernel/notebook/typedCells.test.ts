/**
 * The typed catalogue in a real notebook run (`helicoid run`, tslab type-checks every cell): a
 * calculator's outputs are typed (a number is a number, no cast), a film is accepted as inputs,
 * and a misspelt output, input or calculator id is a compile error whose message lists what
 * exists. Common practice, no source.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";
import { getCalculator } from "../../../lib/src/index";

const cell = (source: string) => ({ cell_type: "code", metadata: {}, source, outputs: [], execution_count: null });
const notebook = (cells: unknown[]) => ({ nbformat: 4, nbformat_minor: 5, metadata: {}, cells });

interface Output {
  output_type: string;
  name?: string;
  text?: string[];
  ename?: string;
  evalue?: string;
  traceback?: string[];
}

const dir = mkdtempSync(join(tmpdir(), "helicoid-typed-"));

function runCells(name: string, sources: string[]): { status: number | null; stderr: string; cells: Array<{ outputs: Output[] }> } {
  const input = join(dir, `${name}.ipynb`);
  const out = join(dir, `${name}.out.ipynb`);
  writeFileSync(input, JSON.stringify(notebook(sources.map(cell))));
  const r = spawnSync(process.execPath, [helicoidBin, "run", input, "-o", out], { encoding: "utf8", timeout: 180_000 });
  return { status: r.status, stderr: r.stderr, cells: JSON.parse(readFileSync(out, "utf8")).cells };
}

const errorText = (outputs: Output[]) =>
  outputs
    .filter((o) => o.output_type === "error")
    .map((o) => `${o.ename}: ${o.evalue}\n${(o.traceback ?? []).join("\n")}`)
    .join("\n");
const stdout = (outputs: Output[]) =>
  outputs
    .filter((o) => o.name === "stdout")
    .map((o) => (o.text ?? []).join(""))
    .join("");

const imports = 'import { runCalculator, makeFilm, InputError } from "@helicoid/lib";';
const film = 'const film = makeFilm({ Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.4 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" });';

describe("typed calculators in notebook cells", () => {
  it("compiles typed reads without casts, takes a film, and answers a missing output at run time with an InputError", () => {
    const r = runCells("ok", [
      `${imports}\n${film}`,
      [
        'const wall = runCalculator("wall", film);',
        "const width: number = wall.outputs.width.value;",
        "const x: number[] = wall.outputs.x.value;",
        "const kind: string = wall.outputs.regime.value;",
        "console.log(`width ${(width * 1e9).toFixed(3)} nm, ${x.length} points, ${kind.length > 0}`);",
        "const untyped: any = wall.outputs; // as plain JavaScript would read it\ntry { untyped.widht.value; } catch (e) { console.log(`${(e as Error).name}|${e instanceof InputError}|${(e as Error).message}`); }",
      ].join("\n"),
    ]);
    expect(r.status, r.stderr + errorText(r.cells.flatMap((c) => c.outputs))).toBe(0);
    const text = stdout(r.cells[1]!.outputs);
    // sqrt(A / K_eff), K_eff = Ku - mu0 Ms^2 / 2: the wall calculator's own width for this film
    const keff = 1.4e6 - (4e-7 * Math.PI * 1.1e6 ** 2) / 2;
    expect(text).toContain(`width ${(Math.sqrt(15e-12 / keff) * 1e9).toFixed(3)} nm`);
    expect(text).toContain("true");
    expect(text).toMatch(/InputError\|true\|output = "widht" is not valid: expected one of the outputs of this 'wall' result: width, .*energy/);
  }, 200_000);

  it("refuses to compile a misspelt output, and the message lists the outputs", () => {
    const r = runCells("bad-output", [`${imports}\n${film}`, 'runCalculator("wall", film).outputs.widht.value']);
    expect(r.status).not.toBe(0);
    const err = errorText(r.cells[1]!.outputs);
    expect(err).toMatch(/Property 'widht' does not exist/);
    // every output of the wall calculator is named in the message (no "... more ...")
    for (const name of ["width", "energy", "criticalDmi", "wallType", "regime", "x", "mz", "mInPlane"]) expect(err).toContain(`${name}: `);
    expect(err).not.toMatch(/\.\.\. \d+ more/);
  }, 200_000);

  it("refuses to compile a misspelt input and a misspelt calculator id", () => {
    const input = runCells("bad-input", [`${imports}\n${film}`, 'runCalculator("wall", { Ms: "1 MA/m", Kuu: 1e6 })']);
    expect(input.status).not.toBe(0);
    expect(errorText(input.cells[1]!.outputs)).toMatch(/'Kuu' does not exist in type/);
    const id = runCells("bad-id", [imports, 'runCalculator("skyrmon", {})']);
    expect(id.status).not.toBe(0);
    const err = errorText(id.cells[1]!.outputs);
    expect(err).toMatch(/"skyrmon"/);
    expect(err).toContain('"skyrmion"');
  }, 400_000);

  it("cells see Node's global types (the kernel includes only @types/node without an import) and a wrong one still fails to compile", () => {
    // Common practice, no source: Buffer, process and NodeJS.Timeout are @types/node globals
    const r = runCells("node-globals", [
      'const b: Buffer = Buffer.from("ab");\nconst t: NodeJS.Timeout = setTimeout(() => {}, 0);\nclearTimeout(t);\nconsole.log(`${b.length}|${typeof process.version}`);',
      "const wrong: number = Buffer.from('ab');",
    ]);
    expect(r.status).not.toBe(0);
    expect(errorText(r.cells[0]!.outputs)).toBe("");
    expect(stdout(r.cells[0]!.outputs)).toBe("2|string\n");
    expect(errorText(r.cells[1]!.outputs)).toMatch(/Buffer.*not assignable to type 'number'/);
  }, 400_000);

  it("types the choice inputs made with choiceInput: labels and values compile, a misspelt choice input does not", () => {
    const ok = runCells("choices", [
      imports,
      [
        'const tex = runCalculator("texture", { kind: "skyrmion", n: 128, boundary: "open", background: "-z", pairPolarity: 0 });',
        'const trace = runCalculator("wall-trace", { breathing: "breathing", polarity: -1, duration: "0.2 ns" });',
        "const q: number = tex.outputs.Q.value;",
        "console.log(`${Math.round(q)}|${tex.inputs.boundary.value}|${tex.inputs.background.value}|${trace.inputs.breathing.value}|${trace.inputs.polarity.value}`);",
      ].join("\n"),
    ]);
    expect(ok.status, ok.stderr + errorText(ok.cells[1]!.outputs)).toBe(0);
    // each label is read as the value the spec gives it (choiceInput: a label's place, or its given value)
    const value = (id: string, input: string, label: string) =>
      getCalculator(id)
        .inputs.find((i) => i.name === input)!
        .choices!.find((c) => c.label === label)!.value;
    const [q, ...values] = stdout(ok.cells[1]!.outputs).trim().split("|");
    expect(values.map(Number)).toEqual([value("texture", "boundary", "open"), value("texture", "background", "-z"), value("wall-trace", "breathing", "breathing"), -1]);
    expect(Math.abs(Number(q))).toBe(1); // one skyrmion: |Q| = 1 (N. Nagaosa, Y. Tokura, Nat. Nanotechnol. 8, 899 (2013))
    const bad = runCells("bad-choice", [imports, 'runCalculator("texture", { boundry: "open" })']);
    expect(bad.status).not.toBe(0);
    expect(errorText(bad.cells[1]!.outputs)).toMatch(/'boundry' does not exist in type/);
  }, 400_000);
});
