/**
 * The catalogue's contract, checked for every calculator (a calculator added to the catalogue is
 * checked without anyone writing a line here, except its entry in `outsideChecks`):
 *
 * - every declared output is produced on the defaults, or is marked `optional`;
 * - plots point at array outputs of the same spec, of the same length;
 * - defaults sit inside their slider ranges and their physical limits;
 * - sweeps go through one `sweepValues`: bad points (1, 0, 2.5, too many) are InputErrors naming
 *   `sweep.points`, and no calculator builds its own sweep points or default sweep;
 * - the result survives a JSON round trip (what `helicoid calc --json` and the widgets carry);
 * - every example of every command's `--help` runs (a real process of the built command);
 * - each calculator has a test comparing a headline output with a value from outside the project
 *   (`outsideChecks`): the test exists, names its source and names the headline outputs;
 * - every output of every calculator is named in some test (outputsNamed.test.ts, with the list
 *   from test/helpers/unnamedOutputs.ts; the outputs*.test.ts files check them against outside values).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { catalogue, defaultSweep, InputError, runCalculator, sweepValues, type CalculatorResult } from "@helicoid/lib";
import { helicoidBin, repoRoot } from "../../helpers/paths.js";
import { commandNames } from "../../../kernel-ext/src/cli/main.js";

/**
 * For each calculator id: the test holding its outside check (file relative to the repository,
 * the test's title as written) and the headline outputs that test compares with an outside value.
 * A calculator without an entry fails this suite.
 */
export const outsideChecks: Record<string, { file: string; test: string; outputs: string[] }> = {
  wall: { file: "test/lib/calculators/walls.test.ts", test: "wall: outputs match the closed forms on the defaults", outputs: ["width", "energy", "criticalDmi"] },
  wall360: {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "wall360: the core half-width and its slope against scipy quad of the first integral",
    outputs: ["radius", "wallWidth"],
  },
  "wall-type": {
    file: "test/lib/calculators/walls.test.ts",
    test: "wall360 and wall-type say so when |D| > D_c (no bound pair with negative energy and status ok)",
    outputs: ["saturationField"],
  },
  skyrmion: {
    file: "test/lib/calculators/skyrmions.test.ts",
    test: "skyrmion: finds the audit bubble at 9 mT and its expansion field does not depend on the sweep direction",
    outputs: ["radius", "wallWidth"],
  },
  "skyrmion-profile": {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "skyrmion-profile: the exact profile solves the Euler-Lagrange equation (scipy solve_bvp)",
    outputs: ["radiusExact"],
  },
  "skyrmion-stability": {
    file: "test/lib/calculators/skyrmions.test.ts",
    test: "skyrmion-stability: stable with the translation zero mode; strip-out search above D_c ends at B_sat",
    outputs: ["stability", "translationEigenvalue"],
  },
  texture: { file: "test/lib/calculators/topology.test.ts", test: "is in the catalogue and computes on its defaults: one Neel skyrmion, Q = -1", outputs: ["Q"] },
  "berry-loop": {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "berry-loop: the top-state phase is -S times the cone's solid angle",
    outputs: ["solidAngle", "gammaTop"],
  },
  chern: {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "chern: Haldane's phase diagram (C = +-1 inside |M| < 3 sqrt3 t2 |sin phi|)",
    outputs: ["chernLower", "criticalMass"],
  },
  "magnon-hall": {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "magnon-hall: band edges of the honeycomb ferromagnet against numpy",
    outputs: ["bandBottom", "bandTop"],
  },
  "spin-tunnel": { file: "test/lib/calculators/outsideChecks.test.ts", test: "spin-tunnel: Garg's period of the quenched splittings", outputs: ["gargPeriod"] },
  "easy-plane": { file: "test/lib/calculators/outsideChecks.test.ts", test: "easy-plane: the ground state's S_z against numpy diagonalization", outputs: ["groundM", "szExact"] },
  "wall-fit": {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "wall-fit: the fit recovers the profile it was generated from, within its errors",
    outputs: ["Rfit", "wfit"],
  },
  "wall-motion": {
    file: "test/lib/calculators/dynamics.test.ts",
    test: "wall-motion: the Walker field and velocity of the default film against the closed forms evaluated in Python",
    outputs: ["walkerField", "velocity"],
  },
  "wall-current": { file: "test/lib/calculators/outsideChecks.test.ts", test: "wall-current: below the Walker current v = (beta / alpha) u", outputs: ["velocity"] },
  "wall-trace": {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "wall-trace: the mean velocity above Walker breakdown against the closed form",
    outputs: ["traceVelocity"],
  },
  "skyrmion-drift": {
    file: "test/lib/calculators/dynamics.test.ts",
    test: "skyrmion-drift: Hall angle of a force is atan(4 / alpha I) for Q = -1, and beta = alpha gives v = u",
    outputs: ["forceHallAngle"],
  },
  "precessing-skyrmion": {
    file: "test/lib/calculators/dynamics.test.ts",
    test: "precessing-skyrmion: the stable frequency approaches the thin-wall value and the threshold current is below the default current",
    outputs: ["frequency"],
  },
  "chain-spectrum": {
    file: "test/lib/calculators/chains.test.ts",
    test: "chain-spectrum reaches the Bethe-ansatz e0 and the transverse-Ising closed form",
    outputs: ["groundEnergyPerSite"],
  },
  "chain-dynamics": {
    file: "test/lib/calculators/outsideChecks.test.ts",
    test: "chain-dynamics: <S^x> of a small ring against numpy diagonalization",
    outputs: ["magnetizationX", "chiralWeight"],
  },
  "wall-band": {
    file: "test/lib/calculators/chains.test.ts",
    test: "chain-dynamics obeys its sum rules; wall-band's first-order chiral weight matches it",
    outputs: ["villainEdge", "chiralWeight"],
  },
  "ion-levels": {
    file: "test/lib/calculators/ions.test.ts",
    test: "B20 alone: levels 3 B20 (M^2 - 1/4), g = (g_J (J + 1/2), g_J (J + 1/2), g_J), field in meV units",
    outputs: ["levels", "gPrincipal1"],
  },
  "dipolar-lattice": {
    file: "test/lib/calculators/lattices.test.ts",
    test: "square lattice: the zz band at Gamma is sum' 1/r^3 = 4 zeta(3/2) beta(3/2); honeycomb LT at K",
    outputs: ["band3", "qMinFractional"],
  },
  "field-tuned-order": {
    file: "test/lib/calculators/lattices.test.ts",
    test: "spin 1: the ordered window of the solver matches the closed-form critical fields; lobe tip (sqrt2 - 1)^2",
    outputs: ["Bc1", "Bc2"],
  },
};

/** The body of the test titled `title` in `source` (up to the next test or the end), or undefined. */
function testBody(source: string, title: string): string | undefined {
  for (const q of ['"', "'", "`"]) {
    const start = source.indexOf(`it(${q}${title}${q}`);
    if (start < 0) continue;
    const rest = source.slice(start + title.length + 5);
    const next = rest.search(/\n\s*(it|test|describe)\(/);
    return next < 0 ? rest : rest.slice(0, next);
  }
  return undefined;
}

/** What JSON can carry of a value: -0 is written as 0 and NaN (a declared gap) as null; all else unchanged. */
function asJson(v: unknown): unknown {
  if (typeof v === "number") return Number.isNaN(v) ? null : v === 0 ? 0 : v;
  if (Array.isArray(v)) return v.map(asJson);
  if (v && typeof v === "object") return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, asJson(x)]));
  return v;
}

/** The text of the innermost describe(...) header line before the test titled `title` (where a shared spec is set up). */
function describeScope(source: string, title: string): string {
  const at = source.indexOf(title);
  const before = source.slice(0, at);
  const start = before.lastIndexOf("describe(");
  return start < 0 ? "" : before.slice(start);
}

const results = new Map<string, CalculatorResult>();

describe("the catalogue's contract", () => {
  beforeAll(() => {
    // every calculator on its defaults (with its default sweep), once for all the checks below
    for (const spec of catalogue) results.set(spec.id, runCalculator(spec, {}));
  }, 300_000);

  it("ids are unique and every calculator has an outside check registered, and every registered id exists", () => {
    const ids = catalogue.map((s) => s.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(
      ids.filter((id) => !(id in outsideChecks)),
      "calculators without an outside check in outsideChecks",
    ).toEqual([]);
    expect(
      Object.keys(outsideChecks).filter((id) => !ids.includes(id)),
      "outsideChecks entries for no calculator",
    ).toEqual([]);
  });

  for (const spec of catalogue) {
    describe(spec.id, () => {
      it("produces every declared output on its defaults (or the output is marked optional), and nothing undeclared", () => {
        const r = results.get(spec.id)!;
        const missing = spec.outputs.filter((o) => !o.optional && !(o.name in r.outputs)).map((o) => o.name);
        expect(missing, `outputs of '${spec.id}' not produced on the defaults`).toEqual([]);
        const declared = new Set(spec.outputs.map((o) => o.name));
        expect(Object.keys(r.outputs).filter((k) => !declared.has(k))).toEqual([]);
        expect(new Set(spec.outputs.map((o) => o.name)).size, "output names are unique").toBe(spec.outputs.length);
        for (const o of spec.outputs) {
          const v = r.outputs[o.name]?.value;
          if (v === undefined) continue;
          const kind = o.kind ?? "scalar";
          if (kind === "scalar") expect(typeof v, `${o.name} is a scalar`).toBe("number");
          if (kind === "text") expect(typeof v, `${o.name} is a text`).toBe("string");
          if (kind === "array") expect(Array.isArray(v), `${o.name} is an array`).toBe(true);
          expect(r.outputs[o.name]!.unit).toBe(o.unit);
        }
        expect(["ok", "warning"]).toContain(r.status);
      });

      it("plots point at array outputs of the same length", () => {
        const r = results.get(spec.id)!;
        const byName = new Map(spec.outputs.map((o) => [o.name, o]));
        for (const p of spec.plots) {
          for (const name of [p.x, ...p.y]) {
            expect(byName.get(name)?.kind, `plot '${p.id}' of '${spec.id}': ${name} is an array output`).toBe("array");
          }
          const x = r.outputs[p.x]?.value as number[] | undefined;
          if (x === undefined) continue; // an optional array, absent on the defaults
          for (const y of p.y) {
            const yv = r.outputs[y]?.value as number[] | undefined;
            if (yv !== undefined) expect(yv.length, `plot '${p.id}': ${y} against ${p.x}`).toBe(x.length);
          }
        }
        expect(new Set(spec.plots.map((p) => p.id)).size, "plot ids are unique").toBe(spec.plots.length);
      });

      it("defaults sit inside their slider ranges and physical limits; choices and integers are consistent", () => {
        for (const input of spec.inputs) {
          expect(input.min <= input.max, `${input.name}: min <= max`).toBe(true);
          expect(input.default >= input.min && input.default <= input.max, `${input.name} = ${input.default} within ${input.min} .. ${input.max}`).toBe(true);
          if (input.scale === "log") expect(input.min > 0, `${input.name}: a log slider starts above 0`).toBe(true);
          if (input.kind === "integer") expect(Number.isInteger(input.default), `${input.name}: a whole default`).toBe(true);
          if (input.kind === "choice")
            expect(
              input.choices?.some((c) => c.value === input.default),
              `${input.name}: the default is a choice`,
            ).toBe(true);
          const lim = spec.limits?.[input.name];
          if (!lim) continue;
          const v = input.default;
          if (lim.min !== undefined) expect(v >= lim.min, `${input.name} >= ${lim.min}`).toBe(true);
          if (lim.max !== undefined) expect(v <= lim.max, `${input.name} <= ${lim.max}`).toBe(true);
          if (lim.above !== undefined) expect(v > lim.above, `${input.name} > ${lim.above}`).toBe(true);
          if (lim.below !== undefined) expect(v < lim.below, `${input.name} < ${lim.below}`).toBe(true);
        }
        for (const name of Object.keys(spec.limits ?? {}))
          expect(
            spec.inputs.some((i) => i.name === name),
            `limit on an input: ${name}`,
          ).toBe(true);
      });

      it("survives a JSON round trip unchanged (a signed zero comes back as 0, a gap as null)", () => {
        const r = results.get(spec.id)!;
        expect(JSON.parse(JSON.stringify(r))).toEqual(asJson(r));
      });

      if (spec.sweep) {
        it("sweeps through sweepValues: sweepable inputs exist, the default sweep is the result's, bad points are refused by name", () => {
          const sweep = spec.sweep!;
          expect(sweep.over.length).toBeGreaterThan(0);
          for (const name of sweep.over)
            expect(
              spec.inputs.some((i) => i.name === name),
              `sweepable ${name} is an input`,
            ).toBe(true);
          const def = defaultSweep(spec)!;
          expect(results.get(spec.id)!.sweep).toEqual(def);
          const values = sweepValues(spec, def);
          expect(values.length).toBe(sweep.points);
          expect(values[0]).toBe(def.from);
          expect(values[values.length - 1]).toBe(def.to);
          for (const points of [1, 0, 2.5, -3, Number.NaN, (sweep.maxPoints ?? 100000) + 1]) {
            let err: unknown;
            try {
              runCalculator(spec, {}, { sweep: { ...def, points } });
            } catch (e) {
              err = e;
            }
            expect(err, `points = ${points}`).toBeInstanceOf(InputError);
            expect((err as InputError).parameter).toBe("sweep.points");
            expect((err as InputError).message).toMatch(/points/);
          }
          let err: unknown;
          try {
            runCalculator(spec, {}, { sweep: { ...def, over: "no-such-input" } });
          } catch (e) {
            err = e;
          }
          expect((err as InputError).parameter).toBe("sweep");
        });
      }
    });
  }

  it("no calculator builds its own sweep points or default sweep (one sweepValues, one defaultSweep)", () => {
    // the grid formula `from + (to - from) * i / (n - 1)` and `{ over, from: input.min, to: input.max }` live in spec.ts only
    const dir = join(repoRoot, "lib", "src", "calculators");
    for (const f of readdirSync(dir).filter((n) => n.endsWith(".ts") && n !== "spec.ts")) {
      const text = readFileSync(join(dir, f), "utf8");
      expect(text, `${f}: a sweep grid built by hand`).not.toMatch(/sweep\.from\s*\+|sweep\.to\s*-\s*sweep\.from/);
      expect(text, `${f}: a default sweep built by hand`).not.toMatch(/from:\s*\w+(\.inputs[^,]*)?\.min,\s*to:/);
      if (/options\.sweep|o\.sweep|\bsweep\b\s*=\s*options/.test(text) && /\.points\b/.test(text)) {
        expect(text, `${f} reads a sweep: its points come from sweepValues`).toMatch(/sweepValues\(/);
      }
    }
  });

  it("the skyrmion calculator's sweep: points 1, 0 and 2.5 are InputErrors naming points, not the field", () => {
    const spec = catalogue.find((s) => s.id === "skyrmion")!;
    for (const points of [1, 0, 2.5]) {
      let err: unknown;
      try {
        runCalculator(spec, { B: "50 mT" }, { sweep: { over: "B", from: 0.01, to: 0.1, points } });
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InputError);
      expect((err as InputError).parameter).toBe("sweep.points");
      expect((err as InputError).message).not.toMatch(/^B =/);
      // the compute function itself (as a worker calls it) refuses the same way
      expect(() => spec.compute(Object.fromEntries(spec.inputs.map((i) => [i.name, i.default])), { sweep: { over: "B", from: 0.01, to: 0.1, points } })).toThrow(/sweep\.points/);
    }
    expect(() => runCalculator(spec, {}, { sweep: { over: "B", from: 0.01, to: 0.1, points: 2001 } })).toThrow(/at most|2000/);
  });

  it("each registered outside check exists, names its source and the headline outputs it checks", () => {
    const problems: string[] = [];
    for (const [id, check] of Object.entries(outsideChecks)) {
      const path = join(repoRoot, check.file);
      if (!existsSync(path)) {
        problems.push(`${id}: ${check.file} does not exist`);
        continue;
      }
      const source = readFileSync(path, "utf8");
      const body = testBody(source, check.test);
      if (body === undefined) {
        problems.push(`${id}: no test "${check.test}" in ${check.file}`);
        continue;
      }
      if (!/\/\/\s*(Source:|From memory)|runPython/.test(body)) problems.push(`${id}: the test names no source (// Source: ..., // From memory: ..., or a runPython oracle)`);
      // the calculator is named in the test, or in its describe block (`const spec = getCalculator(id)`)
      const scope = describeScope(source, check.test) + body;
      if (!new RegExp(`["'\`]${id}["'\`]|${id.replace(/-(\w)/g, (_, c: string) => c.toUpperCase())}(Spec|Calculator)\\b`).test(scope))
        problems.push(`${id}: the test does not run the calculator by its id`);
      const spec = catalogue.find((s) => s.id === id);
      if (check.outputs.length === 0) problems.push(`${id}: no headline output`);
      for (const o of check.outputs) {
        if (!spec?.outputs.some((x) => x.name === o)) problems.push(`${id}: ${o} is not an output`);
        if (!new RegExp(`\\b${o}\\b`).test(body)) problems.push(`${id}: the test does not check ${o}`);
      }
    }
    expect(problems).toEqual([]);
  });
});

describe("every --help example runs", () => {
  it("each command of the command table answers --help; each example line in it runs and exits 0", () => {
    // Common practice, no source: documented examples are run as tests (doctest style).
    const names = commandNames();
    expect(names).toContain("calc");
    let examples = 0;
    for (const cmd of names) {
      const help = spawnSync(process.execPath, [helicoidBin, cmd, "--help"], { encoding: "utf8", timeout: 30_000 });
      expect(help.status, `${cmd} --help: ${help.stderr}`).toBe(0);
      const block = help.stdout.split(/\nExamples:\n/)[1];
      if (!block) continue;
      for (const line of block.split("\n")) {
        const m = /^\s+helicoid (.+)$/.exec(line);
        if (!m) break;
        const args = m[1]!.trim().split(/\s+/);
        const r = spawnSync(process.execPath, [helicoidBin, ...args], { encoding: "utf8", timeout: 120_000 });
        expect(r.status, `helicoid ${m[1]}: ${r.stderr}`).toBe(0);
        expect(r.stdout.length, `helicoid ${m[1]} prints its answer`).toBeGreaterThan(0);
        if (args.includes("--json")) expect(() => JSON.parse(r.stdout)).not.toThrow();
        examples++;
      }
    }
    expect(examples, "the help texts carry examples").toBeGreaterThanOrEqual(4);
  });
});
