import { describe, expect, it } from "vitest";
import { readJsonVectorField, vectorFieldToJson } from "../../../lib/src/io/jsonField.js";
import { readVectorField } from "../../../lib/src/io/readVectorField.js";
import { writeNpyVectorField } from "../../../lib/src/io/npy.js";
import { writeCsvVectorField } from "../../../lib/src/io/delimited.js";
import { antiskyrmionTexture } from "../../../lib/src/topology/textures.js";
import { skyrmionNumber } from "../../../lib/src/topology/skyrmionNumber.js";

// Our own JSON form (documented in lib/src/io/jsonField.ts). Common practice, no source.
describe("JSON vector-field form", () => {
  it("reads interleaved, triple and planar forms with units and null vacuum", () => {
    const base = { kind: "helicoid-vector-field", version: 1, nx: 2, ny: 1, cell: ["2 nm", "3 nm"], boundary: "open", note: "invented demo" };
    const a = readJsonVectorField(JSON.stringify({ ...base, m: [0, 0, 2, 1, 0, 0] }), { file: "a.json" });
    const b = readJsonVectorField(
      {
        ...base,
        m: [
          [0, 0, 2],
          [1, 0, 0],
        ],
      },
      { file: "b.json" },
    );
    const c = readJsonVectorField({ ...base, mx: [0, 1], my: [0, 0], mz: [2, 0] }, { file: "c.json" });
    for (const r of [a, b, c]) {
      expect(Array.from(r.field.m)).toEqual([0, 0, 1, 1, 0, 0]);
      expect(r.field.dx).toBeCloseTo(2e-9, 20);
      expect(r.field.dy).toBeCloseTo(3e-9, 20);
      expect(r.info.boundary).toBe("open");
      expect(r.info.notes).toContain("invented demo");
    }
    const v = readJsonVectorField({ ...base, m: [[0, 0, 1], null] }, { file: "v.json" });
    expect(v.info.vacuumCells).toBe(1);
  });

  it("round trip keeps the field and its charge", () => {
    // Source: Q = +1 for a core-down antiskyrmion (v = -1) in +z (convention of lib/src/README.md, closed form in objects.ts).
    const f = antiskyrmionTexture({ nx: 20, ny: 20 }, { R: 5e-9, w: 1.5e-9 });
    const back = readJsonVectorField(vectorFieldToJson(f, { boundary: "periodic" }), { file: "rt.json" }).field;
    for (let k = 0; k < f.m.length; k++) expect(Math.abs(back.m[k]! - f.m[k]!)).toBeLessThan(1e-15);
    expect(skyrmionNumber(back).Q).toBeCloseTo(1, 9);
  });

  it("bad documents name what was found and what was expected", () => {
    expect(() => readJsonVectorField("{not json", { file: "x.json" })).toThrow(/x\.json.*a JSON document/);
    expect(() => readJsonVectorField({ kind: "other", version: 1 }, { file: "k.json" })).toThrow(/k\.json: kind = "other"/);
    expect(() => readJsonVectorField({ kind: "helicoid-vector-field", version: 2 }, { file: "v.json" })).toThrow(/version = 2/);
    expect(() => readJsonVectorField({ kind: "helicoid-vector-field", version: 1, nx: 2, ny: 2, m: [1, 2, 3] }, { file: "s.json" })).toThrow(
      /s\.json: m.*12 numbers.*found 3 entries/,
    );
    expect(() => readJsonVectorField({ kind: "helicoid-vector-field", version: 1, nx: 1, ny: 1, m: [1, "a", 0] }, { file: "t.json" })).toThrow(/t\.json: m\[1\] = "a"/);
    expect(() => readJsonVectorField({ kind: "helicoid-vector-field", version: 1, nx: 1, ny: 1, m: [1, 0, 0], cell: ["2 kg"] }, { file: "u.json" })).toThrow(/cell\[0\]/);
    expect(() => readJsonVectorField({ kind: "helicoid-vector-field", version: 1, nx: 1.5, ny: 1, m: [] }, { file: "n.json" })).toThrow(/nx = 1.5/);
  });
});

describe("readVectorField chooses the reader by extension or content", () => {
  it("npy, json and csv", () => {
    // Common practice, no source.
    const f = antiskyrmionTexture({ nx: 8, ny: 8 }, { R: 2e-9, w: 1e-9 });
    expect(readVectorField(writeNpyVectorField(f), { file: "a.bin" }).info.format).toBe("npy");
    expect(readVectorField(vectorFieldToJson(f), { file: "noext" }).info.format).toBe("json");
    expect(readVectorField(writeCsvVectorField(f), { file: "t.dat" }).info.format).toBe("csv");
    expect(() => readVectorField("x,y\n", { file: "f.npy" })).toThrow(/a Uint8Array/);
  });
});
