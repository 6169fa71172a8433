// mathjs is loaded lazily (lib/src/quantity/mathjs.ts): importing @helicoid/lib and running a
// calculator with SI numbers must not load it; the first string with a unit must. A structural
// check on the built library in a fresh Node process (a module-load hook and require.cache), not a
// timing. Common practice, no source.
import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

const dist = fileURLToPath(new URL("../../../lib/dist/index.js", import.meta.url));

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

  it("a string with a unit loads mathjs once, with the CGS units defined", () => {
    const r = child(`
      return [lib.parseQuantity("A", "15 pJ/m", "J/m"), lib.parseQuantity("H", "1 kOe", "A/m")];
    `);
    expect(r.cached).toBe(true);
    expect(r.loads.filter((x) => x === "mathjs")).toEqual(["mathjs"]);
    const [A, H] = r.out as number[];
    expect(A).toBeCloseTo(15e-12, 24);
    // Source: NIST SP 811 (2008), appendix B.9: 1 Oe = (1000 / 4 pi) A/m
    expect(H).toBeCloseTo(1e6 / (4 * Math.PI), 6);
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
});
