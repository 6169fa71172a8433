import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chargeCommand } from "../../../kernel-ext/src/cli/charge.js";
import { writeNpyVectorField } from "../../../lib/src/io/npy.js";
import { writeCsvVectorField } from "../../../lib/src/io/delimited.js";
import { vectorFieldToJson } from "../../../lib/src/io/jsonField.js";
import { antiskyrmionTexture, skyrmionLatticeTexture, skyrmioniumTexture } from "../../../lib/src/topology/textures.js";
import { blochPointTexture } from "../../../lib/src/topology/textures3d.js";

const dir = mkdtempSync(join(tmpdir(), "helicoid-charge-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(args: string[]) {
  let out = "", err = "";
  const code = await chargeCommand(args, { stdout: (s) => { out += s; }, stderr: (s) => { err += s; } });
  return { code, out, err };
}

const nm = 1e-9;

describe("helicoid charge FILE [--json]", () => {
  it("a periodic skyrmion lattice in .npy: Q = -4 and four skyrmions at the generator's centres", async () => {
    // Source: Q = -1 per core-down v = 1 skyrmion in +z (PHYSICS.md convention); lattice total = sum.
    const f = skyrmionLatticeTexture({ nx: 64, ny: 64, dx: nm }, { a: 32 * nm, R: 7 * nm, w: 2 * nm });
    const path = join(dir, "lattice.npy");
    writeFileSync(path, writeNpyVectorField(f));
    const before = readFileSync(path);
    const mtime = statSync(path).mtimeMs;
    const r = await run([path, "--json", "--boundary", "periodic", "--cell", "1 nm"]);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(Math.abs(j.skyrmionNumber + 4)).toBeLessThan(1e-9);
    expect(j.closed).toBe(true);
    expect(j.vacuumCells).toBe(0);
    expect(j.objects.length).toBe(4);
    for (const o of j.objects) {
      expect(Math.abs(o.charge + 1)).toBeLessThan(1e-3);
      expect(o.vorticity).toBe(1);
      expect(Math.abs(o.helicity)).toBeLessThan(1e-6);
      expect(Math.abs(o.radius - 7 * nm)).toBeLessThan(0.5 * nm);
      expect(f.centres.some(([x, y]) => Math.hypot(x - o.center[0], y - o.center[1]) < 0.05 * nm)).toBe(true);
    }
    expect(j.grid).toMatchObject({ nx: 64, ny: 64, nz: 1, lattice: "square" });
    expect(j.assumptions.length).toBeGreaterThan(0);
    expect(Buffer.compare(readFileSync(path), before)).toBe(0); // never modify the input
    expect(statSync(path).mtimeMs).toBe(mtime);
  });

  it("a CSV antiskyrmion and a JSON skyrmionium, readable summary", async () => {
    // Source: closed form Q = (v/2)[cos T(0) - cos T(inf)]: antiskyrmion core down +1, skyrmionium 0 (objects.ts).
    const a = antiskyrmionTexture({ nx: 40, ny: 40 }, { R: 8 * nm, w: 2 * nm });
    const p1 = join(dir, "anti.csv");
    writeFileSync(p1, writeCsvVectorField(a));
    const r1 = await run([p1]);
    expect(r1.code).toBe(0);
    const Q = Number(/skyrmion number Q = (\S+)/.exec(r1.out)![1]);
    expect(Math.abs(Q - 1)).toBeLessThan(1e-4); // open boundary: the tail beyond the box is missing
    expect(r1.out).toMatch(/antiskyrmion/);
    const s = skyrmioniumTexture({ nx: 80, ny: 80 }, { R: 25 * nm, Rinner: 10 * nm, w: 2.5 * nm });
    const p2 = join(dir, "ring.json");
    writeFileSync(p2, vectorFieldToJson(s, { boundary: "periodic" }));
    const r2 = await run([p2, "--json"]);
    const j = JSON.parse(r2.out);
    expect(j.boundary).toBe("periodic");
    expect(Math.abs(j.skyrmionNumber)).toBeLessThan(1e-9);
    expect(j.objects.length).toBe(1);
    expect(j.objects[0].kind).toBe("skyrmionium");
    expect(Math.abs(j.objects[0].radius - 25 * nm)).toBeLessThan(0.5 * nm);
  });

  it("a 3D Bloch point: degree -1, Q per layer 0 below and -1 above", async () => {
    // Source: degree = sign det of the Jacobian at the zero (J. Milnor 1965); see textures3d.ts.
    const f = blochPointTexture({ nx: 40, ny: 40, nz: 10 }, { lambda: 3 * nm });
    const p = join(dir, "bp.json");
    writeFileSync(p, vectorFieldToJson(f));
    const j = JSON.parse((await run([p, "--json"])).out);
    expect(j.blochPoints.length).toBe(1);
    expect(j.blochPoints[0].degree).toBe(-1);
    const q = j.layers.map((l: { skyrmionNumber: number }) => l.skyrmionNumber);
    expect(Math.abs(q[0])).toBeLessThan(0.02);
    expect(Math.abs(q[9] + 1)).toBeLessThan(0.02);
  });

  it("bad input and usage: exit codes 1 and 2 with messages naming what was found", async () => {
    // Common practice, no source.
    const bad = join(dir, "ragged.csv");
    writeFileSync(bad, "x,y,mx,my,mz\n0,0,0,0,1\n1,0,1\n");
    const r = await run([bad]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/ragged\.csv: row 3 = "3 fields"/);
    const empty = join(dir, "vac.csv");
    writeFileSync(empty, "x,y,mx,my,mz\n0,0,0,0,0\n1,0,0,0,0\n0,1,0,0,0\n1,1,0,0,0\n");
    expect((await run([empty])).err).toMatch(/all vacuum/);
    const small = join(dir, "small.csv");
    writeFileSync(small, "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,0,1\n");
    expect((await run([small])).err).toMatch(/at least 2x2x1 cells/);
    expect((await run([join(dir, "missing.npy")])).code).toBe(1);
    expect((await run([small, "--boundary", "round"])).err).toMatch(/--boundary = "round"/);
    expect((await run([])).code).toBe(2);
    expect((await run([bad, "--frobnicate"])).code).toBe(2);
  });
});
