import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parseNpyHeader, readNpyVectorField, writeNpyVectorField } from "../../../lib/src/io/npy.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";

const dir = mkdtempSync(join(tmpdir(), "helicoid-npy-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// value of component c at cell (k, j, i), written by numpy and expected by us (not normalized: |v| != 1)
const value = (k: number, j: number, i: number, c: number) => (c === 2 ? 2 + 0.5 * k : 0.25 * (i + 1) * (c === 0 ? 1 : -1) + 0.125 * j);

describe(".npy reader against files written by Debian's numpy", () => {
  // Source: numpy.lib.format (the .npy format specification and its reference writer), numpy 1.24.
  const files = runPython<Array<{ path: string; dtype: string; order: string; shape: number[]; version: number[]; first?: boolean }>>(
    `
import json, sys, itertools, numpy as np
from numpy.lib import format as fmt
d = json.load(sys.stdin)
out = []
for shape in [(4, 5, 3), (2, 4, 5, 3)]:
    nz, ny, nx = (1,) + shape[:2] if len(shape) == 3 else shape[:3]
    k, j, i, c = np.meshgrid(np.arange(nz), np.arange(ny), np.arange(nx), np.arange(3), indexing="ij")
    v = np.where(c == 2, 2 + 0.5 * k, 0.25 * (i + 1) * np.where(c == 0, 1, -1) + 0.125 * j).reshape(shape)
    for dt, order, version in itertools.product(["<f8", ">f8", "<f4", ">f4"], ["C", "F"], [(1, 0), (2, 0), (3, 0)]):
        a = np.array(v, dtype=dt, order=order)
        path = "%s/a_%d_%s_%s_%d.npy" % (d["dir"], len(shape), dt.replace("<", "le").replace(">", "be"), order, version[0])
        with open(path, "wb") as f:
            fmt.write_array(f, a, version=version)
        out.append({"path": path, "dtype": dt, "order": order, "shape": list(shape), "version": list(version)})
    # component-first: the same values with the component axis moved to the front, (3, ny, nx) / (3, nz, ny, nx)
    for dt, order in itertools.product(["<f8", ">f4"], ["C", "F"]):
        a = np.array(np.moveaxis(v, -1, 0), dtype=dt, order=order)
        path = "%s/first_%d_%s_%s.npy" % (d["dir"], len(shape), dt.replace("<", "le").replace(">", "be"), order)
        np.save(path, a)
        out.append({"path": path, "dtype": dt, "order": order, "shape": list(a.shape), "version": [1, 0], "first": True})
print(json.dumps(out))
`,
    { dir },
  );

  it("wrote all 48 combinations and 8 component-first files", () => {
    expect(files.length).toBe(56);
  });

  for (const f of files) {
    it(`${f.dtype} ${f.order}-order shape (${f.shape.join(", ")}) v${f.version[0]}${f.first ? " component-first" : ""}`, () => {
      const bytes = readFileSync(f.path);
      const before = Buffer.from(bytes);
      const h = parseNpyHeader(bytes, f.path);
      expect(h.version[0]).toBe(f.version[0]);
      expect(h.fortranOrder).toBe(f.order === "F");
      expect(h.shape).toEqual(f.shape);
      const { field, info } = readNpyVectorField(bytes, { file: f.path, dx: 2e-9 });
      expect(Buffer.compare(bytes, before)).toBe(0); // the input is never changed
      const dims = f.first ? f.shape.slice(1) : f.shape.slice(0, -1);
      const [nz, ny, nx] = dims.length === 2 ? [1, dims[0]!, dims[1]!] : dims;
      // the layout read is said
      expect(info.notes.join(" ")).toContain(f.first ? "layout read: component-first" : "layout read: component-last");
      expect([field.nx, field.ny, field.nz]).toEqual([nx, ny, nz]);
      expect(field.dx).toBe(2e-9);
      expect(info.vacuumCells).toBe(0);
      const tol = f.dtype.endsWith("4") ? 1e-6 : 1e-15;
      for (let k = 0; k < nz!; k++)
        for (let j = 0; j < ny!; j++)
          for (let i = 0; i < nx!; i++) {
            const v = [0, 1, 2].map((c) => value(k, j, i, c));
            const norm = Math.hypot(...v);
            const cell = (k * ny! + j) * nx! + i;
            for (let c = 0; c < 3; c++) expect(Math.abs(field.m[3 * cell + c]! - v[c]! / norm)).toBeLessThan(tol);
          }
    });
  }

  it("our writer produces files numpy reads back identically", () => {
    // Source: numpy.load as the reference reader.
    const m = Float64Array.from({ length: 2 * 3 * 4 * 3 }, (_, k) => Math.sin(k));
    const path = join(dir, "ours.npy");
    writeFileSync(path, writeNpyVectorField({ nx: 4, ny: 3, nz: 2, m }));
    const back = runPython<{ shape: number[]; flat: number[] }>(
      `
import json, sys, numpy as np
a = np.load(json.load(sys.stdin))
print(json.dumps({"shape": list(a.shape), "flat": a.ravel().tolist()}))`,
      path,
    );
    expect(back.shape).toEqual([2, 3, 4, 3]);
    expect(back.flat).toEqual(Array.from(m));
  });
});

describe(".npy reader: bad input names what was found and what was expected", () => {
  const make = (descr: string, shape: string, dataBytes: number, version = 1) => {
    let header = `{'descr': '${descr}', 'fortran_order': False, 'shape': ${shape}, }`;
    const pre = version === 1 ? 10 : 12;
    header += " ".repeat((64 - ((pre + header.length + 1) % 64)) % 64) + "\n";
    const b = new Uint8Array(pre + header.length + dataBytes);
    b.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, version, 0], 0);
    b[8] = header.length & 255;
    b[9] = header.length >> 8;
    for (let k = 0; k < header.length; k++) b[pre + k] = header.charCodeAt(k);
    return b;
  };
  // Common practice, no source: each error is an InputError with the found value and the expectation.
  it("wrong shapes", () => {
    expect(() => readNpyVectorField(make("<f8", "(4, 5)", 160), { file: "flat.npy" })).toThrow(
      /flat\.npy: shape = "\(4, 5\)".*expected \(ny, nx, 3\) or \(nz, ny, nx, 3\), or component-first \(3, ny, nx\)/,
    );
    expect(() => readNpyVectorField(make("<f8", "(4, 5, 2)", 320), { file: "two.npy" })).toThrow(/\(4, 5, 2\)/);
    expect(() => readNpyVectorField(make("<f8", "(1, 2, 4, 5, 3)", 8 * 120), { file: "five.npy" })).toThrow(InputError);
  });
  it("wrong dtype, truncated data, bad magic, unknown version", () => {
    expect(() => readNpyVectorField(make("<i8", "(2, 2, 3)", 96), { file: "int.npy" })).toThrow(/int\.npy: dtype = "<i8".*float32 or float64/);
    expect(() => readNpyVectorField(make("<f8", "(2, 2, 3)", 50), { file: "cut.npy" })).toThrow(/cut\.npy: data = "50 bytes".*96 bytes/);
    expect(() => readNpyVectorField(new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]), { file: "x.npy" })).toThrow(/\\x93NUMPY/);
    expect(() => readNpyVectorField(make("<f8", "(2, 2, 3)", 96, 4), { file: "v4.npy" })).toThrow(/format version = "4\.0"/);
  });
  it("all-vacuum arrays are read (vacuum counted) and NaN vectors become vacuum", () => {
    const b = make("<f8", "(2, 2, 3)", 96);
    const view = new Float64Array(b.buffer, b.length - 96, 12);
    view.set([NaN, 0, 1, 0, 0, 0, 0, 0, 2, 1, 1, 0]);
    const r = readNpyVectorField(b, { file: "nan.npy" });
    expect(r.info.vacuumCells).toBe(2);
    expect(Array.from(r.field.vacuum!)).toEqual([1, 1, 0, 0]);
    expect(view[0]).toBeNaN(); // input untouched
    const z = readNpyVectorField(make("<f8", "(2, 2, 3)", 96), { file: "zero.npy" });
    expect(z.info.vacuumCells).toBe(4);
  });
});
