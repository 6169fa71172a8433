import { describe, expect, it } from "vitest";
import { readDelimitedVectorField, writeCsvVectorField } from "../../../lib/src/io/delimited.js";
import { InputError } from "../../../lib/src/errors.js";
import { skyrmionTexture } from "../../../lib/src/topology/textures.js";
import { skyrmionNumber } from "../../../lib/src/topology/skyrmionNumber.js";

// Source for the table form: RFC 4180 (comma-separated values) and common practice for TSV; the header and
// units-row conventions are ours (documented in lib/src/io/delimited.ts).
describe("CSV/TSV reader", () => {
  it("reads columns in any order with a units row, into SI, x fastest", () => {
    const csv = [
      "# invented demo table",
      "mz,my,x,mx,y",
      ",,nm,,nm",
      "1,0,0,0,0",
      "0,1,2,0,0",
      "0,0,0,1,2",
      "0,0,2,-2,2",
    ].join("\n");
    const { field, info } = readDelimitedVectorField(csv, { file: "demo.csv" });
    expect([field.nx, field.ny, field.nz]).toEqual([2, 2, 1]);
    expect(field.dx).toBeCloseTo(2e-9, 20);
    expect(field.dy).toBeCloseTo(2e-9, 20);
    expect(Array.from(field.m)).toEqual([0, 0, 1, 0, 1, 0, 1, 0, 0, -1, 0, 0]);
    expect(info.format).toBe("csv");
    expect(info.vacuumCells).toBe(0);
  });

  it("reads TSV and whitespace tables with units in the header, z column, nan and missing cells as vacuum", () => {
    const tsv = "x [um]\ty [um]\tz [um]\tmx\tmy\tmz\n0\t0\t0\t0\t0\t1\n0.001\t0\t0\tnan\tnan\tnan\n0\t0.001\t0\t1\t0\t0\n";
    const { field, info } = readDelimitedVectorField(new TextEncoder().encode(tsv), { file: "t.tsv" });
    expect(info.format).toBe("tsv");
    expect([field.nx, field.ny, field.nz]).toEqual([2, 2, 1]);
    expect(field.dx).toBeCloseTo(1e-9, 20);
    expect(info.missingCells).toBe(1);
    expect(info.vacuumCells).toBe(2);
    expect(Array.from(field.vacuum!)).toEqual([0, 1, 0, 1]);
    const ws = "x y mx my mz extra\n0 0 0 0 1 a\n1 0 0 0 1 b\n";
    const r = readDelimitedVectorField(ws, { file: "w.txt" });
    expect(r.info.format).toBe("text");
    expect(r.info.notes.join(" ")).toMatch(/ignored columns: extra/);
    expect(r.info.notes.join(" ")).toMatch(/metres/);
  });

  it("round trip through our CSV writer keeps Q of a skyrmion", () => {
    // Source: Q = -1 for a core-down v = 1 skyrmion in +z (convention of lib/src/README.md).
    const f = skyrmionTexture({ nx: 24, ny: 20 }, { R: 5e-9, w: 1.5e-9 });
    const back = readDelimitedVectorField(writeCsvVectorField(f), { file: "sk.csv" }).field;
    expect([back.nx, back.ny]).toEqual([24, 20]);
    expect(back.dx).toBeCloseTo(1e-9, 18);
    for (let k = 0; k < f.m.length; k++) expect(Math.abs(back.m[k]! - f.m[k]!)).toBeLessThan(1e-14);
    expect(skyrmionNumber(back).Q).toBeCloseTo(-1, 9);
  });

  // Common practice, no source: each bad input is an InputError naming file, row and column.
  it("ragged rows name the row and the field counts", () => {
    const csv = "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,0\n";
    expect(() => readDelimitedVectorField(csv, { file: "r.csv" })).toThrow(/r\.csv: row 3 = "4 fields".*expected 5 fields \(comma-separated\)/);
  });
  it("non-numeric cells name the row and the column", () => {
    const csv = "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,zero,1\n";
    expect(() => readDelimitedVectorField(csv, { file: "n.csv" })).toThrow(/n\.csv: row 3, column 4 \(my\) = "zero".*a number/);
    expect(() => readDelimitedVectorField("x,y,mx,my,mz\nnan,0,0,0,1\n", { file: "c.csv" })).toThrow(/row 2, column 1 \(x\)/);
    expect(() => readDelimitedVectorField("x,y,mx,my,mz\n0,0,,0,1\n", { file: "e.csv" })).toThrow(/row 2, column 3 \(mx\) = ""/);
  });
  it("missing or repeated columns, empty tables, bad units, non-uniform grids, duplicate cells", () => {
    expect(() => readDelimitedVectorField("x,y,mx,my\n0,0,0,1\n", { file: "h.csv" })).toThrow(/missing: mz/);
    expect(() => readDelimitedVectorField("x,x,y,mx,my,mz\n", { file: "h2.csv" })).toThrow(/x appears twice/);
    expect(() => readDelimitedVectorField("\n# only a comment\n", { file: "empty.csv" })).toThrow(/empty\.csv = "an empty table"/);
    expect(() => readDelimitedVectorField("x,y,mx,my,mz\n", { file: "nodata.csv" })).toThrow(/no data rows/);
    expect(() => readDelimitedVectorField("x (kg),y,mx,my,mz\n0,0,0,0,1\n", { file: "u.csv" })).toThrow(InputError);
    expect(() => readDelimitedVectorField("x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,0,1\n2.5,0,0,0,1\n", { file: "g.csv" })).toThrow(/g\.csv: column x.*uniform grid/);
    expect(() => readDelimitedVectorField("x,y,mx,my,mz\n0,0,0,0,1\n0,0,1,0,0\n", { file: "d.csv" })).toThrow(/d\.csv: row 3.*row 2 has the same cell/);
  });
  it("never changes the caller's bytes", () => {
    const bytes = new TextEncoder().encode("x,y,mx,my,mz\n0,0,0,0,3\n1,0,4,0,0\n");
    const copy = bytes.slice();
    readDelimitedVectorField(bytes, { file: "k.csv" });
    expect(Array.from(bytes)).toEqual(Array.from(copy));
  });
});
