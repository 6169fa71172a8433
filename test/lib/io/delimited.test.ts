import { describe, expect, it } from "vitest";
import { readDelimitedVectorField, writeCsvVectorField, DelimitedFieldParser, parseDecimalBytes, LENGTH_UNITS } from "../../../lib/src/io/delimited.js";
import { parseQuantity } from "../../../lib/src/quantity/units.js";
import { runPython } from "../../helpers/python.js";
import { InputError } from "../../../lib/src/errors.js";
import { skyrmionTexture } from "../../../lib/src/topology/textures.js";
import { skyrmionNumber } from "../../../lib/src/topology/skyrmionNumber.js";

// Source for the table form: RFC 4180 (comma-separated values) and common practice for TSV; the header and
// units-row conventions are ours (documented in lib/src/io/delimited.ts).
describe("CSV/TSV reader", () => {
  it("reads columns in any order with a units row, into SI, x fastest", () => {
    const csv = ["# invented demo table", "mz,my,x,mx,y", ",,nm,,nm", "1,0,0,0,0", "0,1,2,0,0", "0,0,0,1,2", "0,0,2,-2,2"].join("\n");
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

// The byte path (DelimitedFieldParser.bytes: rows parsed from bytes, large files) against the text
// path and against Number() and numpy.loadtxt. Correct rounding: W. D. Clinger, "How to read floating
// point numbers accurately", PLDI 1990 (the exact case: <= 15 digits, |exponent| <= 22).
describe("CSV reader, byte path", () => {
  const enc = new TextEncoder();
  const viaText = (t: string, file: string) => readDelimitedVectorField(t, { file });
  const viaBytes = (t: string, file: string, piece = 0) => {
    const b = enc.encode(t);
    if (!piece) return readDelimitedVectorField(b, { file });
    const p = new DelimitedFieldParser({ file }, b.length);
    for (let k = 0; k < b.length; k += piece) p.bytes(b.subarray(k, Math.min(b.length, k + piece)), false);
    p.bytes(new Uint8Array(0), true);
    return p.finish();
  };

  it("parses plain decimals exactly as Number() does, and leaves every other token to Number()", () => {
    let s = 12345;
    const rnd = () => (s = (Math.imul(s, 1103515245) + 12345) >>> 0) / 2 ** 32;
    const tokens: string[] = [
      "0",
      "-0",
      "+0.0",
      "5.",
      ".5",
      "+.5",
      "-.25e-3",
      "1e22",
      "1e23",
      "1e-22",
      "1e-23",
      "123456789012345",
      "1234567890123456",
      "0.000000000000000000001234",
      "9007199254740993",
      "1.7976931348623157e308",
      "1e400",
      "4.9e-324",
      " 7 ",
      "\t-3.5\t",
      "nan",
      "NaN",
      "-nan",
      "1e",
      "e5",
      ".",
      "1.2.3",
      "0x10",
      "Infinity",
      "1_0",
      "١",
    ];
    for (let k = 0; k < 20000; k++) {
      const v = (rnd() - 0.5) * 10 ** Math.floor(rnd() * 40 - 20);
      const f = k % 4;
      tokens.push(f === 0 ? v.toPrecision(1 + (k % 17)) : f === 1 ? v.toExponential(k % 16) : f === 2 ? String(v) : v.toFixed(k % 12));
    }
    let fast = 0;
    for (const t of tokens) {
      const b = enc.encode(t);
      const v = parseDecimalBytes(b, 0, b.length, true);
      const trimmed = t.trim();
      if (v === null) continue;
      fast++;
      if (/^[+-]?nan$/i.test(trimmed)) expect(v).toBeNaN();
      else {
        expect(/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(trimmed), t).toBe(true);
        expect(Object.is(v, Number(trimmed)), `${t}: ${v} vs ${Number(trimmed)}`).toBe(true);
      }
    }
    expect(fast).toBeGreaterThan(10000); // most tokens of up to 15 digits take the fast path
    const b = enc.encode("nan");
    expect(parseDecimalBytes(b, 0, 3, false)).toBeNull(); // nan only where vacuum is allowed (m columns)
  });

  it("gives the text path's field and notes for every table of the suite, whole or in pieces of 1 to 7 bytes", () => {
    const tables = [
      "# invented demo table\nmz,my,x,mx,y\n,,nm,,nm\n1,0,0,0,0\n0,1,2,0,0\n0,0,0,1,2\n0,0,2,-2,2",
      "x [um]\ty [um]\tz [um]\tmx\tmy\tmz\n0\t0\t0\t0\t0\t1\n0.001\t0\t0\tnan\tnan\tnan\n0\t0.001\t0\t1\t0\t0\n",
      'x y mx my mz note\r\n 0 0 0 0 1 a\r\n1   0 0 1 0 b \r\n# comment\r\n\r\n0 1 "1" 0 0 c\r\n1 1 0.6 0.8 0 d',
      "x;y;mx;my;mz\n0;0;1e-3;0;1\n1;0;12345678901234567;0;1\n",
    ];
    for (const [k, t] of tables.entries()) {
      const a = viaText(t, `t${k}.csv`);
      for (const piece of [0, 1, 2, 3, 7]) {
        const b = viaBytes(t, `t${k}.csv`, piece);
        expect(Array.from(b.field.m)).toEqual(Array.from(a.field.m));
        expect([b.field.nx, b.field.ny, b.field.nz, b.field.dx, b.field.dy, b.field.dz]).toEqual([a.field.nx, a.field.ny, a.field.nz, a.field.dx, a.field.dy, a.field.dz]);
        expect(b.info).toEqual(a.info);
      }
    }
  });

  it("the coordinate units read without the unit engine have the values parseQuantity gives", () => {
    for (const [u, v] of Object.entries(LENGTH_UNITS)) expect(v, u).toBe(parseQuantity("unit", `1 ${u}`, "m"));
  });

  it("reports the same errors as the text path (row and column named)", () => {
    const bad = [
      "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,0\n",
      "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,zero,1\n",
      "x,y,mx,my,mz\nnan,0,0,0,1\n",
      "x,y,mx,my,mz\n0,0,,0,1\n",
      "x,y,mx,my,mz\n0,0,1e400,0,1\n",
      "x,y,mx,my,mz\n0,0,0,0,1\n0,0,1,0,0\n",
      "x,y,mx,my,mz\n0,0,0,0,1\n1,0,0,0,1\n2.5,0,0,0,1\n",
    ];
    for (const t of bad) {
      let textError = "";
      try {
        viaText(t, "e.csv");
      } catch (e) {
        textError = (e as Error).message;
      }
      expect(textError).not.toBe("");
      expect(() => viaBytes(t, "e.csv", 3)).toThrow(textError);
    }
  });

  it("reads a skyrmion table as numpy.loadtxt does (components to the last bit, unit vectors within 1 ulp)", () => {
    // Source of the comparison: numpy.loadtxt (Debian's numpy), an independent decimal parser.
    const n = 60;
    const lines = ["x (nm),y (nm),mx,my,mz"];
    for (let j = 0; j < n; j++)
      for (let i = 0; i < n; i++) {
        const x = i - (n - 1) / 2,
          y = j - (n - 1) / 2,
          r = Math.hypot(x, y),
          th = 2 * Math.atan(Math.exp((12 - r) / 4)),
          ph = Math.atan2(y, x);
        lines.push(
          [
            (i * 1.5).toFixed(1),
            (j * 1.5).toFixed(1),
            (Math.sin(th) * Math.cos(ph)).toPrecision(12),
            (Math.sin(th) * Math.sin(ph)).toPrecision(9),
            Math.cos(th).toExponential(10),
          ].join(","),
        );
      }
    const text = lines.join("\n") + "\n";
    const ours = viaBytes(text, "sk.csv");
    const ref = runPython<number[]>(
      `
import sys, json, io, numpy as np
a = np.loadtxt(io.StringIO(json.load(sys.stdin)), delimiter=",", skiprows=1)
m = a[:, 2:5]; m = m / np.linalg.norm(m, axis=1)[:, None]
print(json.dumps(m.ravel().tolist()))`,
      text,
    );
    // The same rows shuffled (the reader places them by coordinates): the same field.
    const shuffled = [
      lines[0],
      ...lines
        .slice(1)
        .map((l, k) => ({ l, key: (k * 7919) % (lines.length - 1) }))
        .sort((a, b) => a.key - b.key)
        .map((r) => r.l),
    ].join("\n");
    expect(Array.from(viaBytes(shuffled, "sk2.csv").field.m)).toEqual(Array.from(ours.field.m));
    expect(ours.field.nx).toBe(n);
    expect(ours.field.dx).toBeCloseTo(1.5e-9, 22);
    let worst = 0;
    for (let k = 0; k < ref.length; k++) worst = Math.max(worst, Math.abs(ours.field.m[k]! - ref[k]!));
    expect(worst).toBeLessThanOrEqual(2 ** -52);
  });
});
