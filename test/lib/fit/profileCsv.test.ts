// CSV line profiles: units from the header, NaN rows reported / dropped on request, sorting with a
// note, the input text unchanged. Common practice, no source.
import { describe, it, expect } from "vitest";
import { readProfileCsv } from "../../../lib/src/fit/profileCsv.js";

describe("readProfileCsv", () => {
  it("reads units from the header and converts to SI", () => {
    const r = readProfileCsv("# invented scan\nx (nm),Bz (mT),sigma (mT)\n-1,0.5,0.1\n2,1.5,0.1\n");
    expect(r.x).toEqual([-1e-9, 2e-9]);
    expect(r.y[1]).toBeCloseTo(1.5e-3, 15);
    expect(r.sigma![0]).toBeCloseTo(1e-4, 15);
    expect(r.yUnit).toBe("T");
  });
  it("reads an optional units row under the header (as instruments and spreadsheets write it), and says so", () => {
    const r = readProfileCsv("x,Bz,sigma\nnm,mT,mT\n-1,0.5,0.1\n2,1.5,0.1\n");
    expect(r.x).toEqual([-1e-9, 2e-9]);
    expect(r.y[1]).toBeCloseTo(1.5e-3, 15);
    expect(r.sigma![1]).toBeCloseTo(1e-4, 15);
    expect(r.yUnit).toBe("T");
    expect(r.notes[0]).toBe("units row under the header (line 2) read: x [nm], Bz [mT], sigma [mT]");
    // brackets and empty cells (a signal without a unit), tab-separated
    const t = readProfileCsv("x\tmz\n(um)\t\n1\t0.5\n2\t-0.5\n");
    expect(t.x).toEqual([1e-6, 2e-6]);
    expect(t.yUnit).toBe("");
    // a units row that contradicts the header is refused, naming both
    expect(() => readProfileCsv("x (nm),mz\num,\n1,0.5\n2,0.4\n")).toThrow(/the header says "nm", the units row "um"/);
  });
  it("keeps a non-field signal unit and uses the x unit option", () => {
    const r = readProfileCsv("pos\tcounts\n1\t10\n2\t12\n", { xUnit: "um" });
    expect(r.x).toEqual([1e-6, 2e-6]);
    expect(r.y).toEqual([10, 12]);
    expect(r.sigma).toBeNull();
  });
  it("reports NaN rows and drops them only when asked", () => {
    const text = "x (nm),s\n1,1\n2,NaN\n3,\n4,4\n";
    expect(() => readProfileCsv(text)).toThrow(/line 3, line 4.*dropNaN/);
    const r = readProfileCsv(text, { dropNaN: true });
    expect(r.x.length).toBe(2);
    expect(r.droppedRows).toEqual([3, 4]);
    expect(r.notes[0]).toMatch(/dropped 2 row/);
  });
  it("sorts unsorted positions with a note and keeps rows together", () => {
    const r = readProfileCsv("x,y,s\n3,30,3\n1,10,1\n2,20,2\n");
    expect(r.x).toEqual([1, 2, 3]);
    expect(r.y).toEqual([10, 20, 30]);
    expect(r.sigma).toEqual([1, 2, 3]);
    expect(r.notes.join()).toMatch(/not sorted/);
  });
  it("names a bad cell by line and column", () => {
    expect(() => readProfileCsv("x,y\n1,2\n2,abc\n", { source: "f.csv" })).toThrow(/f.csv line 3, column y/);
  });
  it("whitespace-separated with units", () => {
    const r = readProfileCsv("x (nm) y\n1 2\n3 4\n");
    expect(r.columns).toEqual(["x (nm)", "y"]);
    expect(r.x[0]).toBeCloseTo(1e-9, 20);
    expect(r.x[1]).toBeCloseTo(3e-9, 20);
  });

  it("a non-positive or infinite sigma is refused with its line in the file", () => {
    // Common practice, no source: error reporting names the place in the user's file.
    const text = "# invented scan\nx (nm),signal,sigma\n-1,0.5,0.1\n2,1.5,0\n3,1.1,0.1\n";
    expect(() => readProfileCsv(text, { source: "cut.csv" })).toThrow(/cut\.csv line 4, column sigma = "0" is not valid: expected a positive, finite standard deviation/);
    expect(() => readProfileCsv(text.replace(",0\n", ",-0.2\n"), { source: "cut.csv" })).toThrow(/line 4, column sigma = "-0\.2"/);
    expect(() => readProfileCsv(text.replace(",0\n", ",Infinity\n"), { source: "cut.csv" })).toThrow(/line 4, column sigma/);
  });
});
