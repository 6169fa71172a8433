// Reads our copies of the NIST StRD nonlinear regression files (test/data/nist/*.dat, layout in
// their headers) into plain arrays.
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

export interface NistSet {
  name: string;
  names: string[];
  start1: number[];
  start2: number[];
  certified: number[];
  certifiedSd: number[];
  rss: number;
  dof: number;
  x: Float64Array;
  y: Float64Array;
}

export function readNist(name: string): NistSet {
  const text = readFileSync(fileURLToPath(new URL(`../../data/nist/${name}.dat`, import.meta.url)), "utf8");
  const s: NistSet = { name, names: [], start1: [], start2: [], certified: [], certifiedSd: [], rss: NaN, dof: NaN, x: new Float64Array(), y: new Float64Array() };
  const xs: number[] = [];
  const ys: number[] = [];
  let inData = false;
  for (const line of text.split("\n")) {
    if (line.startsWith("#") || line.trim() === "") continue;
    const t = line.trim().split(/\s+/);
    if (t[0] === "param") {
      s.names.push(t[1]);
      s.start1.push(Number(t[2]));
      s.start2.push(Number(t[3]));
      s.certified.push(Number(t[4]));
      s.certifiedSd.push(Number(t[5]));
    } else if (t[0] === "rss:") s.rss = Number(t[1]);
    else if (t[0] === "dof:") s.dof = Number(t[1]);
    else if (t[0] === "data:") inData = true;
    else if (t[0] === "model:") continue;
    else if (inData) {
      ys.push(Number(t[0]));
      xs.push(Number(t[1]));
    }
  }
  s.x = Float64Array.from(xs);
  s.y = Float64Array.from(ys);
  return s;
}

/** log relative error (number of correct significant digits), capped at 15. */
export function lre(value: number, certified: number): number {
  const rel = Math.abs(value - certified) / Math.abs(certified);
  return rel === 0 ? 15 : Math.min(15, -Math.log10(rel));
}
