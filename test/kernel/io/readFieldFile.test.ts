import { afterAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { readVectorFieldFile } from "../../../kernel-ext/src/io/readFieldFile.js";
import { readNpyVectorField } from "../../../lib/src/io/npy.js";
import { runPython } from "../../helpers/python.js";

const dir = mkdtempSync(join(tmpdir(), "helicoid-readfile-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("readVectorFieldFile (Node)", () => {
  it("the direct .npy path and the in-memory reader agree on numpy-written files, shared or not", () => {
    // Source: files written by numpy.save (numpy 1.24), NaN cells included.
    const paths = runPython<string[]>(
      `
import json, sys, numpy as np
d = json.load(sys.stdin)
rng = np.random.default_rng(3)
a = rng.normal(size=(2, 7, 9, 3)); a[0, 1, 2] = np.nan; a[1, 3, 4] = 0
out = []
for name, arr in [("c.npy", a), ("f.npy", np.asfortranarray(a)), ("be.npy", a.astype(">f8")), ("f4.npy", a.astype("<f4"))]:
    p = d + "/" + name; np.save(p, arr); out.append(p)
print(json.dumps(out))`,
      dir,
    );
    for (const p of paths) {
      const before = readFileSync(p);
      const a = readVectorFieldFile(p, { dx: 2e-9 });
      const b = readNpyVectorField(new Uint8Array(before), { file: p, dx: 2e-9 });
      const s = readVectorFieldFile(p, { shared: true, dx: 2e-9 });
      expect(s.field.m.buffer instanceof SharedArrayBuffer).toBe(true);
      expect([a.field.nx, a.field.ny, a.field.nz]).toEqual([9, 7, 2]);
      expect(a.info.vacuumCells).toBe(2);
      expect(Array.from(a.field.m)).toEqual(Array.from(b.field.m));
      expect(Array.from(s.field.m)).toEqual(Array.from(b.field.m));
      expect(Buffer.compare(readFileSync(p), before)).toBe(0);
    }
  });
  it("a missing file is an InputError naming it", () => {
    // Common practice, no source.
    expect(() => readVectorFieldFile(join(dir, "nope.csv"))).toThrow(/nope\.csv.*existing, readable file/);
  });
  it("reads CSV through the same path", () => {
    const p = join(dir, "t.csv");
    writeFileSync(p, "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,1,0\n");
    expect(readVectorFieldFile(p).field.nx).toBe(2);
  });
});
