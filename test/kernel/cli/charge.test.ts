import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { spawnSync } from "node:child_process";
import { helicoidBin } from "../../helpers/paths.js";
import { chargeCommand } from "../../../kernel-ext/src/cli/charge.js";
import { writeNpyVectorField } from "../../../lib/src/io/npy.js";
import { writeCsvVectorField } from "../../../lib/src/io/delimited.js";
import { vectorFieldToJson } from "../../../lib/src/io/jsonField.js";
import { antiskyrmionTexture, skyrmionLatticeTexture, skyrmioniumTexture } from "../../../lib/src/topology/textures.js";
import { blochPointTexture } from "../../../lib/src/topology/textures3d.js";

const dir = mkdtempSync(join(tmpdir(), "helicoid-charge-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(args: string[]) {
  let out = "",
    err = "";
  const code = await chargeCommand(args, {
    stdout: (s) => {
      out += s;
    },
    stderr: (s) => {
      err += s;
    },
  });
  return { code, out, err };
}

const nm = 1e-9;

describe("helicoid charge FILE [--json]", () => {
  it("a periodic skyrmion lattice in .npy: Q = -4 and four skyrmions at the generator's centres", async () => {
    // Source: Q = -1 per core-down v = 1 skyrmion in +z (convention of lib/src/README.md); lattice total = sum.
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

  it("bad input and usage: exit code 2 with messages naming what was found", async () => {
    // Common practice, no source: exit 2 for bad input or usage, 1 only for a computation that failed.
    const bad = join(dir, "ragged.csv");
    writeFileSync(bad, "x,y,mx,my,mz\n0,0,0,0,1\n1,0,1\n");
    const r = await run([bad]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/ragged\.csv: row 3 = "3 fields"/);
    const empty = join(dir, "vac.csv");
    writeFileSync(empty, "x,y,mx,my,mz\n0,0,0,0,0\n1,0,0,0,0\n0,1,0,0,0\n1,1,0,0,0\n");
    expect((await run([empty])).err).toMatch(/all vacuum/);
    const small = join(dir, "small.csv");
    writeFileSync(small, "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,0,1\n");
    expect((await run([small])).err).toMatch(/at least 2x2x1 cells/);
    expect((await run([join(dir, "missing.npy")])).code).toBe(2);
    expect((await run([small, "--boundary", "round"])).err).toMatch(/--boundary = "round"/);
    expect((await run([])).code).toBe(2);
    expect((await run([bad, "--frobnicate"])).code).toBe(2);
  });

  describe("the built command: bad input exits 2 with one line, never a stack trace", () => {
    // Common practice, no source: exit 0 done, 2 bad input or usage, 1 a computation that failed.
    const charge = (...args: string[]) => {
      const r = spawnSync(process.execPath, [helicoidBin, "charge", ...args], { encoding: "utf8", timeout: 60_000 });
      return { status: r.status, stdout: r.stdout, stderr: r.stderr };
    };
    const noTrace = (s: string) => expect(s).not.toMatch(/\n\s+at |Error: E[A-Z]+:/);
    const ok = join(dir, "ok.npy");
    writeFileSync(ok, writeNpyVectorField(skyrmionLatticeTexture({ nx: 8, ny: 8, dx: nm }, { a: 8 * nm, R: 2 * nm, w: 1 * nm })));

    it("malformed, empty, missing and directory inputs", () => {
      // A .npy of shape (4, 4, 2): the last axis must hold the 3 components.
      const header = "{'descr': '<f8', 'fortran_order': False, 'shape': (4, 4, 2), }";
      const pad = 64 - ((10 + header.length + 1) % 64);
      const h = Buffer.from(header + " ".repeat(pad % 64) + "\n", "latin1");
      const pre = Buffer.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, h.length & 255, h.length >> 8]);
      const badShape = join(dir, "badshape.npy");
      writeFileSync(badShape, Buffer.concat([pre, h, Buffer.alloc(8 * 32)]));
      let r = charge(badShape);
      expect(r.status, r.stderr).toBe(2);
      expect(r.stderr).toMatch(/shape = "\(4, 4, 2\)" is not valid: expected \(ny, nx, 3\)/);
      const empty = join(dir, "empty.csv");
      writeFileSync(empty, "");
      r = charge(empty);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/empty\.csv = "an empty table" is not valid/);
      r = charge(join(dir, "nosuch.npy"));
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/nosuch\.npy" is not valid: expected an existing, readable vector field file\. no such file or directory/);
      r = charge(dir);
      expect(r.status).toBe(2);
      expect(r.stderr.trim().split("\n")).toHaveLength(1);
      expect(r.stderr).toContain(`file = "${dir}" is not valid`);
      expect(r.stderr).toMatch(/it is a directory, not a file/);
      noTrace(r.stderr);
    });

    it("bad option values: --boundary, --layer out of range, --cell of the wrong dimension, --cell without a value", () => {
      let r = charge(ok, "--boundary", "weird");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--boundary = "weird" is not valid: expected periodic, open/);
      r = charge(ok, "--layer", "2");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--layer = "2" is not valid: expected 0: the field has one layer/);
      r = charge(ok, "--cell", "2mT");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--cell = "2mT" is not valid: expected a quantity of the dimension of m/);
      r = charge(ok, "--cell");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--cell needs a value \(a length such as 2nm\)/);
      expect(r.stderr).not.toMatch(/unknown/);
      noTrace(r.stderr);
    });

    it("the usage shown on a bad option lists every option; a partial --dx/--dy/--dz is refused", () => {
      let r = charge(ok, "--frobnicate");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/unknown option --frobnicate; the options are --json, --boundary, --layer, --mode, --cell, --dx, --dy, --dz/);
      for (const o of ["--json", "--boundary", "--layer", "--mode", "--cell", "--dx", "--dy", "--dz"]) expect(r.stderr).toMatch(new RegExp(`usage:[^]*${o}\\b`));
      r = charge(ok, "--dx", "2nm", "--dy", "1nm");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--dx and --dy without --dz: give --dz too, or --cell LEN/);
      expect(r.stdout).toBe("");
      // --cell with an override: 2 x 1 x 2 nm, as asked; the text says nm, the JSON m.
      r = charge(ok, "--cell", "2nm", "--dy", "1nm");
      expect(r.status, r.stderr).toBe(0);
      expect(r.stdout).toMatch(/cells of 2\.00 x 1\.00 x 2\.00 nm/);
      expect(r.stdout).toMatch(/^units: lengths in nm, angles in degrees/m);
      expect(r.stdout).not.toMatch(/lengths in m, angles in rad/);
      // Without a cell size the note names the command's options.
      r = charge(ok);
      expect(r.stdout).toMatch(/note: a \.npy file carries no cell size: 1 nm assumed \(give --cell LEN, or --dx --dy --dz, to change it\)/);
    });

    it("--json: bad input gives a JSON error object on stdout (the shape of calc's), the message on stderr, exit 2", () => {
      let r = charge(ok, "--json", "--boundary", "weird");
      expect(r.status).toBe(2);
      expect(JSON.parse(r.stdout)).toEqual({
        id: "charge",
        file: ok,
        status: "error",
        error: {
          type: "InputError",
          message: expect.stringMatching(/--boundary = "weird"/),
          parameter: "--boundary",
          value: "weird",
          expected: "periodic, open, periodic-x, periodic-y",
        },
      });
      expect(r.stderr).toMatch(/helicoid charge: --boundary = "weird" is not valid/);
      r = charge(ok, "--json", "--bogus");
      expect(r.status).toBe(2);
      expect(JSON.parse(r.stdout)).toMatchObject({ id: "charge", status: "error", error: { type: "UsageError", message: expect.stringMatching(/unknown option --bogus/) } });
      r = charge(ok, "--json");
      expect(r.status).toBe(0);
      expect(JSON.parse(r.stdout).assumptions).toContain("lengths in m, angles in rad");
    });
  });
});
