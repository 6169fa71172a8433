// mathjs is loaded lazily (lib/src/quantity/mathjs.ts): importing @helicoid/lib and running a
// calculator with SI numbers must not load it; the first string with a unit loads a units-only
// instance built from mathjs's factories, the first formula a lazily built full one. A structural
// check on the built library in a fresh Node process (a module-load hook and require.cache), not a
// timing. Common practice, no source.
import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import * as mathjs from "mathjs";
import { loadMathUnits, UNIT_FACTORIES } from "../../../lib/src/quantity/mathjsLoad.js";
import * as browserLoad from "../../../lib/src/quantity/mathjsLoad.browser.js";

const dist = fileURLToPath(new URL("../../../lib/dist/internal.js", import.meta.url));

function child(body: string): { loads: string[]; cached: boolean; out: unknown } {
  const script = `
const Module = require("node:module");
const loads = [];
const orig = Module._load;
Module._load = function (request, parent, isMain) {
  if (/^mathjs(\\/|$)/.test(request)) loads.push(request);
  return orig.apply(this, arguments);
};
const lib = require(${JSON.stringify(dist)});
const out = (() => { ${body} })();
const cached = Object.keys(require.cache).some((k) => /[\\\\/]node_modules[\\\\/]mathjs[\\\\/]/.test(k));
console.log(JSON.stringify({ loads, cached, out }));
`;
  const r = spawnSync(process.execPath, ["-e", script], { encoding: "utf8" });
  expect(r.stderr).toBe("");
  expect(r.status).toBe(0);
  return JSON.parse(r.stdout);
}

describe("mathjs is loaded only when a unit must be parsed", () => {
  it("needs the built library (npm run build)", () => {
    expect(existsSync(dist)).toBe(true);
  });

  it("importing @helicoid/lib and running calculators with SI numbers (and numeric strings) loads no mathjs", () => {
    const r = child(`
      const wall = lib.runCalculator(lib.getCalculator("wall"), { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 });
      const q = lib.parseQuantity("A", " 1.5e-11 ", "J/m");
      return { status: wall.status, width: wall.outputs.width.value, q, text: lib.formatQuantity(3e-9, "m") };
    `);
    expect(r.loads).toEqual([]);
    expect(r.cached).toBe(false);
    const out = r.out as { status: string; width: number; q: number; text: string };
    expect(out.status).toBe("ok");
    // delta = sqrt(A / K_eff), K_eff = Ku - mu0 Ms^2 / 2 (Common practice, no source)
    const mu0 = 1.25663706212e-6;
    expect(Math.abs(out.width / Math.sqrt(15e-12 / (1.2e6 - (mu0 * 1.1e6 ** 2) / 2)) - 1)).toBeLessThan(1e-9);
    expect(out.q).toBe(1.5e-11);
    expect(out.text).toBe("3 nm");
  });

  it("a string with a unit loads a units-only mathjs (its factory files, never the whole library), with the CGS units defined", () => {
    const r = child(`
      const out = [lib.parseQuantity("A", "15 pJ/m", "J/m"), lib.parseQuantity("H", "1 kOe", "A/m")];
      const files = Object.keys(require.cache).filter((k) => /[\\/]node_modules[\\/]mathjs[\\/]/.test(k)).map((k) => k.replace(/.*[\\/]lib[\\/]cjs[\\/]/, "").replace(/\\\\/g, "/"));
      return { out, files };
    `);
    expect(r.cached).toBe(true);
    // no `require("mathjs")`: its entry builds every function (about 1 s of CPU)
    expect(r.loads).toEqual([]);
    const { out, files } = r.out as { out: number[]; files: string[] };
    expect(files).toContain("type/unit/Unit.js");
    expect(files).not.toContain("index.js");
    expect(files).not.toContain("factoriesAny.js");
    expect(files.some((f) => f.startsWith("expression/"))).toBe(false);
    const [A, H] = out;
    expect(A).toBeCloseTo(15e-12, 24);
    // Source: NIST SP 811 (2008), appendix B.9: 1 Oe = (1000 / 4 pi) A/m
    expect(H).toBeCloseTo(1e6 / (4 * Math.PI), 6);
  });

  it("a formula loads the full (lazily built) mathjs, with the CGS units defined there too", () => {
    const r = child(`
      const m = lib.formulaModel("a * x");
      const y = new Float64Array(1);
      m.bind(new Float64Array([3])).model([2], y);
      const family = lib.compileMatrixFamily("[[lambda * 1 Oe / (1 A/m), 0], [0, -lambda]]");
      const files = Object.keys(require.cache).filter((k) => /[\\/]node_modules[\\/]mathjs[\\/]/.test(k)).map((k) => k.replace(/.*[\\/]lib[\\/]cjs[\\/]/, "").replace(/\\\\/g, "/"));
      return { y: y[0], h: family(1), files };
    `);
    expect(r.loads).toEqual([]);
    const { y, h, files } = r.out as { y: number; h: { re: number[] }; files: string[] };
    expect(files).toContain("factoriesAny.js");
    expect(files).not.toContain("index.js");
    expect(y).toBe(6);
    // Source: NIST SP 811 (2008), appendix B.9: 1 Oe = (1000 / 4 pi) A/m
    expect(h.re[0]).toBeCloseTo(1000 / (4 * Math.PI), 9);
  });

  it("the units-only factory list is the closure mathjs itself declares for unit and createUnit", () => {
    // Source: mathjs's generated dependency lists (unitDependencies, createUnitDependencies)
    const factories = new Set<string>();
    const walk = (o: Record<string, unknown>): void => {
      for (const [k, v] of Object.entries(o)) {
        if (typeof v === "function") factories.add(k);
        else if (v && typeof v === "object") walk(v as Record<string, unknown>);
      }
    };
    walk({ a: mathjs.unitDependencies, b: mathjs.createUnitDependencies });
    expect(new Set(UNIT_FACTORIES.map(([name]) => name))).toEqual(factories);
  });

  it("the units-only instance reads units exactly as mathjs's default instance does", () => {
    // Reference: mathjs's default instance (the whole library), same version
    const own = loadMathUnits();
    const texts = [
      "15 pJ/m",
      "1.1 MA/m",
      "0.8 MJ/m^3",
      "1.5 mJ/m^2",
      "1 nm",
      "50 mT",
      "3 meV",
      "10 GHz",
      "8 cm^-1",
      "2 m^2/s^2",
      "1 erg",
      "4 uT",
      "1e7 erg/cm^3",
      "300 K",
      "5 kg m^2 / s^2",
      "1 eV",
    ];
    for (const t of texts) {
      const a = own.unit(t);
      const b = mathjs.unit(t);
      expect(a.equalBase(b as never), t).toBe(true);
      expect(a.toSI().toNumeric() as number, t).toBe(b.toSI().toNumeric() as number);
      expect(a.toSI().formatUnits(), t).toBe(b.toSI().formatUnits());
    }
    for (const bad of ["5 furlongs per fortnight", "2 (m/s)^2", "1 G"]) {
      expect(() => own.unit(bad), bad).toThrow();
      expect(() => mathjs.unit(bad), bad).toThrow();
    }
  });

  it("the browser loader's lazily built instances read units, formulas and eigenvalues as mathjs's default instance does", () => {
    // Reference: mathjs's default instance (the whole library), same version
    const u = browserLoad.loadMathUnits();
    for (const t of ["15 pJ/m", "1.5 mJ/m^2", "3 meV", "8 cm^-1", "50 mT"]) {
      expect(u.unit(t).toSI().toNumeric() as number, t).toBe(mathjs.unit(t).toSI().toNumeric() as number);
      expect(u.unit(t).toSI().formatUnits(), t).toBe(mathjs.unit(t).toSI().formatUnits());
    }
    const formula = "a * sin(x)^2 + exp(-x / w) + sqrt(-4)";
    const scope = { a: 2, x: 0.3, w: 1.5 };
    expect(
      String(
        browserLoad
          .loadMathExpressions()
          .compile(formula)
          .evaluate({ ...scope }),
      ),
    ).toBe(String(mathjs.compile(formula).evaluate({ ...scope })));
    const { complex, eigs } = browserLoad.loadMathComplex();
    const m = [
      [complex(2, 0), complex(0, 1)],
      [complex(0, -1), complex(2, 0)],
    ];
    const ours = (eigs(m as never, { eigenvectors: false } as never) as unknown as { values: { toArray(): unknown[] } }).values;
    const ref = (mathjs.eigs(m as never, { eigenvectors: false } as never) as unknown as { values: { toArray(): unknown[] } }).values;
    expect(JSON.stringify(ours)).toBe(JSON.stringify(ref));
  });

  it("no module of the library imports mathjs at run time except the loaders (quantity/mathjsLoad*.ts)", () => {
    const src = fileURLToPath(new URL("../../../lib/src", import.meta.url));
    const offenders: string[] = [];
    const walk = (dir: string): void => {
      for (const e of readdirSync(dir, { withFileTypes: true })) {
        const p = join(dir, e.name);
        if (e.isDirectory()) walk(p);
        else if (p.endsWith(".ts") && !/mathjsLoad(\.browser)?\.ts$/.test(p)) {
          const text = readFileSync(p, "utf8");
          // value imports and requires of mathjs; `import type` is erased at compile time
          if (/^\s*import\s+(?!type\b)[^;]*from\s+["']mathjs["']/m.test(text) || /require\(\s*["']mathjs["']\s*\)/.test(text)) offenders.push(p);
        }
      }
    };
    walk(src);
    expect(offenders).toEqual([]);
  });

  it("a thread handed another's unit conversions (computeInWorker's worker) reads those inputs without loading mathjs, to the same numbers", () => {
    const inputs = { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m²", t: "1 nm" };
    // the caller's thread: reads the inputs (mathjs loaded there) and gives its conversions
    const caller = child(`
      const r = lib.runCalculator("wall", ${JSON.stringify(inputs)});
      return { conversions: lib.knownQuantityConversions(), width: r.outputs.width.value, notes: r.notes };
    `);
    expect(caller.cached).toBe(true);
    const given = caller.out as { conversions: Array<[string, number]>; width: number; notes: string[] };
    expect(given.conversions.length).toBe(5);
    // a fresh thread with them: the same result, no mathjs
    const worker = child(`
      lib.learnQuantities(${JSON.stringify(given.conversions)});
      const r = lib.runCalculator("wall", ${JSON.stringify(inputs)});
      return { width: r.outputs.width.value, notes: r.notes };
    `);
    expect(worker.loads).toEqual([]);
    expect(worker.cached).toBe(false);
    expect(worker.out).toEqual({ width: given.width, notes: given.notes });
    // Common practice, no source: 15 pJ/m is 1.5e-11 J/m
    expect(given.conversions.find(([k]) => k.startsWith("J/m\u0000"))?.[1]).toBeCloseTo(1.5e-11, 25);
    // a text the thread was not handed still loads mathjs and is read as before
    const other = child(`
      lib.learnQuantities(${JSON.stringify(given.conversions)});
      return lib.parseQuantity("A", "16 pJ/m", "J/m");
    `);
    expect(other.cached).toBe(true);
    expect(other.out).toBeCloseTo(1.6e-11, 25);
  });
});
