/**
 * Berry curvature and Chern numbers on a discretized 2D zone by link variables, per band or per
 * group of bands (determinant of the overlap matrices for a group).
 * Source: T. Fukui, Y. Hatsugai, H. Suzuki, J. Phys. Soc. Jpn. 74, 1674 (2005).
 *
 * Convention: the flux of a plaquette is the Berry phase of its boundary run counterclockwise in
 * (k1, k2), F = -arg(U1(k) U2(k + e1) U1(k + e2)^* U2(k)^*) in (-pi, pi], with U_mu the normalized
 * link variables (the gamma = -Im ln prod <u|u'> convention of spinBerryPhase.ts). Then
 * F -> Omega dk1 dk2 with the Berry curvature Omega = i(<d1 u|d2 u> - <d2 u|d1 u>) =
 * -2 Im <d1 u|d2 u>, and C = sum F / 2 pi = (1/2 pi) int Omega, an exact integer on any grid.
 * For a right-handed lattice basis (a1 x a2 along +z) this is the Chern number of the plane with
 * z out of plane (the convention of D. Xiao, M.-C. Chang, Q. Niu, Rev. Mod. Phys. 82, 1959 (2010)).
 *
 * The integer is the Chern number of the bands only if the grid resolves them: the flux of every
 * plaquette must stay well below pi (else its sign is ambiguous: a Dirac point with a gap smaller
 * than the grid spacing puts a flux near +-pi in one plaquette) and the gap must not close between
 * grid points. We check three things and report "unresolved" (or throw an InputError) otherwise:
 *  (1) the smallest gap to the neighbouring bands on the grid is above gapTolerance;
 *  (2) every plaquette flux is below fluxLimit (default 1 rad);
 *  (3) along every link, the gap at both ends exceeds the change of the two band energies across
 *      the link (else the gap may close between the grid points).
 */
import { compile, type EvalFunction } from "mathjs";
import { InputError } from "../errors.js";
import { HermitianEigenSolver, assertHermitian } from "../numeric/eigenHermitian.js";
import { complexDeterminant, toPlanarMatrix } from "../numeric/complexMatrix.js";
import type { BlochModel } from "./blochModel.js";

export interface ChernOptions {
  /** Grid points along k1 (default 60) and k2 (default n1). */
  n1?: number;
  n2?: number;
  /** Groups of consecutive bands (ascending energy); default: every band on its own. */
  groups?: number[][];
  /** "throw" (default): InputError when the grid does not resolve the bands; "report": status. */
  onUnresolved?: "throw" | "report";
  /** Largest allowed plaquette flux (rad), default 1. */
  fluxLimit?: number;
  /** Smallest allowed gap on the grid, relative to the largest |H_ij| (default 1e-9). */
  gapTolerance?: number;
  /** Keep the flux of every plaquette (Float64Array per group, [j * n1 + i]). */
  map?: boolean;
  /** Keep the band energies at the grid points ([(j * n1 + i) * bands + b]). */
  energies?: boolean;
  /** Use the model's orbital positions in the links (default true). */
  usePositions?: boolean;
}

export interface ChernResult {
  chern: number[];
  resolved: boolean[];
  status: "ok" | "unresolved";
  notes: string[];
  groups: number[][];
  n1: number;
  n2: number;
  /** Raw sum of plaquette fluxes / 2 pi (an integer to rounding). */
  chernSum: number[];
  maxFlux: number[];
  minGap: number[];
  flux?: Float64Array[];
  energies?: Float64Array;
  method: string;
  sources: string[];
}

/** A Bloch model from a function (k1, k2) -> matrix or a mathjs formula in k1, k2. */
export function blochModelFromFunction(
  h: ((k1: number, k2: number) => unknown) | string,
  parameters: Record<string, number> = {},
): BlochModel {
  let f: (k1: number, k2: number) => unknown;
  if (typeof h === "string") {
    f = compileFormula(h, parameters);
  } else f = h;
  const m0 = toPlanarMatrix(f(0.1234, 0.3456), "H");
  const n = m0.n;
  return {
    bands: n,
    fill(k1, k2, re, im) {
      const m = toPlanarMatrix(f(k1, k2), "H");
      if (m.n !== n) throw new InputError("H", `${m.n} x ${m.n} at k = (${k1}, ${k2})`, `${n} x ${n} everywhere`);
      re.set(m.re);
      im.set(m.im);
    },
  };
}

const formulaCache = new Map<string, EvalFunction>();
function compileFormula(h: string, parameters: Record<string, number>): (k1: number, k2: number) => unknown {
  let code = formulaCache.get(h);
  if (!code) {
    try {
      code = compile(h) as EvalFunction;
    } catch (err) {
      throw new InputError("H", h, "a mathjs matrix expression in k1, k2", (err as Error).message);
    }
    formulaCache.set(h, code);
  }
  const c = code;
  return (k1, k2) => c.evaluate({ ...parameters, k1, k2 });
}

export function chernNumbers(model: BlochModel, options: ChernOptions = {}): ChernResult {
  const n = model.bands;
  const n1 = options.n1 ?? 60;
  const n2 = options.n2 ?? n1;
  for (const [name, v] of [["n1", n1], ["n2", n2]] as const) {
    if (!Number.isInteger(v) || v < 3 || v > 4096) throw new InputError(name, v, "a whole number of grid points from 3 to 4096");
  }
  const groups = options.groups ?? Array.from({ length: n }, (_, b) => [b]);
  groups.forEach((g, gi) => {
    if (g.length === 0 || g.some((b, i) => !Number.isInteger(b) || b < 0 || b >= n || (i > 0 && b !== g[i - 1]! + 1))) {
      throw new InputError(`groups[${gi}]`, g, `consecutive band indices in 0..${n - 1}`);
    }
  });
  const fluxLimit = options.fluxLimit ?? 1;
  const usePos = options.usePositions ?? true;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  // Hermiticity and periodicity checks at sample points.
  let scale = 0;
  const sample = (k1: number, k2: number) => {
    model.fill(k1, k2, re, im);
    assertHermitian(n, re, im, 1e-10, `H(${k1}, ${k2})`);
    for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(re[i]!), Math.abs(im[i]!));
    return { re: Float64Array.from(re), im: Float64Array.from(im) };
  };
  for (const [a, b] of [[0.137, 0.291], [0.733, 0.518]] as const) {
    const h0 = sample(a, b);
    for (const [c, d] of [[a + 1, b], [a, b + 1]] as const) {
      const h1 = sample(c, d);
      let diff = 0;
      for (let i = 0; i < n * n; i++) diff = Math.max(diff, Math.abs(h0.re[i]! - h1.re[i]!), Math.abs(h0.im[i]! - h1.im[i]!));
      if (diff > 1e-9 * Math.max(scale, 1e-300)) {
        throw new InputError("H", `H(${c}, ${d}) - H(${a}, ${b}) of size ${diff.toExponential(3)}`, "a Bloch Hamiltonian periodic in the fractional wave vector: H(k1 + 1, k2) = H(k1, k2 + 1) = H(k1, k2) (use the lattice-vector gauge)");
      }
    }
  }
  const gapTol = (options.gapTolerance ?? 1e-9) * Math.max(scale, 1e-300);
  // Embedding phases per orbital for steps 1/n1 and 1/n2: exp(-2 pi i r / n).
  const p1r = new Float64Array(n).fill(1), p1i = new Float64Array(n);
  const p2r = new Float64Array(n).fill(1), p2i = new Float64Array(n);
  if (usePos && model.positions) {
    for (let a = 0; a < n; a++) {
      const r = model.positions[a] ?? [0, 0];
      p1r[a] = Math.cos((-2 * Math.PI * r[0]) / n1);
      p1i[a] = Math.sin((-2 * Math.PI * r[0]) / n1);
      p2r[a] = Math.cos((-2 * Math.PI * r[1]) / n2);
      p2i[a] = Math.sin((-2 * Math.PI * r[1]) / n2);
    }
  }
  const solver = new HermitianEigenSolver(n);
  const nn = n * n;
  const G = groups.length;
  const rowE = () => new Float64Array(n1 * n);
  const rowV = () => ({ re: new Float64Array(n1 * nn), im: new Float64Array(n1 * nn) });
  const energiesOut = options.energies ? new Float64Array(n1 * n2 * n) : undefined;
  const computeRow = (j: number, E: Float64Array, V: { re: Float64Array; im: Float64Array }) => {
    const k2 = j / n2;
    for (let i = 0; i < n1; i++) {
      model.fill(i / n1, k2, re, im);
      solver.solve(re, im, true);
      E.set(solver.values, i * n);
      V.re.set(solver.vectorsRe, i * nn);
      V.im.set(solver.vectorsIm, i * nn);
      if (energiesOut && j < n2) energiesOut.set(solver.values, (j * n1 + i) * n);
    }
  };
  const kmax = Math.max(...groups.map((g) => g.length));
  const mr = new Float64Array(kmax * kmax), mi = new Float64Array(kmax * kmax);
  const sr0 = new Float64Array(kmax * kmax), si0 = new Float64Array(kmax * kmax);
  let minLinkOverlap = Infinity;
  // Scratch for links: phased copy of the second point's group vectors (n x k), link output.
  const yr = new Float64Array(n * kmax), yi = new Float64Array(n * kmax);
  let linkRe = 1, linkIm = 0;
  /** Normalized link of group g between point A (row VA, index ia) and B, with phase factors; sets linkRe/linkIm. */
  const link = (g: number[], VA: { re: Float64Array; im: Float64Array }, ia: number, VB: { re: Float64Array; im: Float64Array }, ib: number, pr: Float64Array, pi: Float64Array): void => {
    const k = g.length;
    const lo = g[0]!;
    const oa = ia * nn, ob = ib * nn;
    for (let s = 0; s < n; s++) {
      const fr = pr[s]!, fi = pi[s]!;
      for (let b = 0; b < k; b++) {
        const vr = VB.re[ob + s * n + lo + b]!, vi = VB.im[ob + s * n + lo + b]!;
        yr[s * k + b] = vr * fr - vi * fi;
        yi[s * k + b] = vr * fi + vi * fr;
      }
    }
    for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) {
      let sr = 0, si = 0;
      const ca = lo + a;
      for (let s = 0; s < n; s++) {
        const xr = VA.re[oa + s * n + ca]!, xi = VA.im[oa + s * n + ca]!;
        const zr = yr[s * k + b]!, zi = yi[s * k + b]!;
        sr += xr * zr + xi * zi;
        si += xr * zi - xi * zr;
      }
      mr[a * k + b] = sr;
      mi[a * k + b] = si;
    }
    let dr: number, di: number;
    if (k === 1) {
      dr = mr[0]!;
      di = mi[0]!;
    } else {
      const d = complexDeterminant(k, mr, mi, sr0, si0);
      dr = d[0];
      di = d[1];
    }
    const m = Math.sqrt(dr * dr + di * di);
    if (m < minLinkOverlap) minLinkOverlap = m;
    if (m > 0) {
      linkRe = dr / m;
      linkIm = di / m;
    } else {
      linkRe = 1;
      linkIm = 0;
    }
  };
  const sums = new Float64Array(G);
  const comps = new Float64Array(G);
  const maxFlux = new Float64Array(G);
  const minGap = new Float64Array(G).fill(Infinity);
  const hiddenClosing = new Array<boolean>(G).fill(false);
  const fluxMaps = options.map ? groups.map(() => new Float64Array(n1 * n2)) : undefined;
  const gapAt = (g: number[], E: Float64Array, i: number) => {
    const lo = g[0]!, hi = g[g.length - 1]!;
    let gap = Infinity;
    if (lo > 0) gap = Math.min(gap, E[i * n + lo]! - E[i * n + lo - 1]!);
    if (hi < n - 1) gap = Math.min(gap, E[i * n + hi + 1]! - E[i * n + hi]!);
    return gap;
  };
  const checkLink = (gi: number, EA: Float64Array, ia: number, EB: Float64Array, ib: number) => {
    const g = groups[gi]!;
    const lo = g[0]!, hi = g[g.length - 1]!;
    if (lo > 0) {
      const dE = Math.abs(EA[ia * n + lo]! - EB[ib * n + lo]!) + Math.abs(EA[ia * n + lo - 1]! - EB[ib * n + lo - 1]!);
      const gl = Math.min(EA[ia * n + lo]! - EA[ia * n + lo - 1]!, EB[ib * n + lo]! - EB[ib * n + lo - 1]!);
      if (gl < dE) hiddenClosing[gi] = true;
    }
    if (hi < n - 1) {
      const dE = Math.abs(EA[ia * n + hi]! - EB[ib * n + hi]!) + Math.abs(EA[ia * n + hi + 1]! - EB[ib * n + hi + 1]!);
      const gh = Math.min(EA[ia * n + hi + 1]! - EA[ia * n + hi]!, EB[ib * n + hi + 1]! - EB[ib * n + hi]!);
      if (gh < dE) hiddenClosing[gi] = true;
    }
  };
  const E0 = rowE(), V0 = rowV();
  computeRow(0, E0, V0);
  let Ep = E0, Vp = V0;
  let Ec = rowE(), Vc = rowV();
  // U1 along the current lower row, per group: [gi][i] -> (re, im)
  const u1Lower = groups.map(() => ({ re: new Float64Array(n1), im: new Float64Array(n1) }));
  const u1Upper = groups.map(() => ({ re: new Float64Array(n1), im: new Float64Array(n1) }));
  const u2 = groups.map(() => ({ re: new Float64Array(n1), im: new Float64Array(n1) }));
  const rowLinks = (E: Float64Array, V: { re: Float64Array; im: Float64Array }, out: typeof u1Lower) => {
    for (let gi = 0; gi < G; gi++) {
      const g = groups[gi]!;
      for (let i = 0; i < n1; i++) {
        const ip = (i + 1) % n1;
        link(g, V, i, V, ip, p1r, p1i);
        out[gi]!.re[i] = linkRe;
        out[gi]!.im[i] = linkIm;
        checkLink(gi, E, i, E, ip);
        minGap[gi] = Math.min(minGap[gi]!, gapAt(g, E, i));
      }
    }
  };
  rowLinks(Ep, Vp, u1Lower);
  for (let j = 0; j < n2; j++) {
    let EcUse: Float64Array, VcUse: { re: Float64Array; im: Float64Array };
    if (j + 1 < n2) {
      computeRow(j + 1, Ec, Vc);
      EcUse = Ec;
      VcUse = Vc;
      rowLinks(Ec, Vc, u1Upper);
    } else {
      EcUse = E0;
      VcUse = V0;
      // u1 of row 0: recompute links (cheap) into u1Upper
      for (let gi = 0; gi < G; gi++) {
        const g = groups[gi]!;
        for (let i = 0; i < n1; i++) {
          link(g, V0, i, V0, (i + 1) % n1, p1r, p1i);
          u1Upper[gi]!.re[i] = linkRe;
          u1Upper[gi]!.im[i] = linkIm;
        }
      }
    }
    for (let gi = 0; gi < G; gi++) {
      const g = groups[gi]!;
      const U2 = u2[gi]!;
      for (let i = 0; i < n1; i++) {
        link(g, Vp, i, VcUse, i, p2r, p2i);
        U2.re[i] = linkRe;
        U2.im[i] = linkIm;
        checkLink(gi, Ep, i, EcUse, i);
      }
      const L = u1Lower[gi]!, Up = u1Upper[gi]!;
      for (let i = 0; i < n1; i++) {
        const ip = (i + 1) % n1;
        // z = U1(i,j) U2(i+1,j) conj(U1(i,j+1)) conj(U2(i,j))
        let zr = L.re[i]! * U2.re[ip]! - L.im[i]! * U2.im[ip]!;
        let zi = L.re[i]! * U2.im[ip]! + L.im[i]! * U2.re[ip]!;
        const tr = zr * Up.re[i]! + zi * Up.im[i]!;
        const ti = zi * Up.re[i]! - zr * Up.im[i]!;
        zr = tr * U2.re[i]! + ti * U2.im[i]!;
        zi = ti * U2.re[i]! - tr * U2.im[i]!;
        const F = -Math.atan2(zi, zr);
        const y = F - comps[gi]!;
        const s = sums[gi]! + y;
        comps[gi] = s - sums[gi]! - y;
        sums[gi] = s;
        const aF = Math.abs(F);
        if (aF > maxFlux[gi]!) maxFlux[gi] = aF;
        if (fluxMaps) fluxMaps[gi]![j * n1 + i] = F;
      }
      // the upper row becomes the lower row
      L.re.set(Up.re);
      L.im.set(Up.im);
    }
    if (j + 1 < n2) {
      // rotate buffers (keep row 0 untouched)
      if (Ep === E0) {
        Ep = Ec;
        Vp = Vc;
        Ec = rowE();
        Vc = rowV();
      } else {
        const te = Ep, tv = Vp;
        Ep = Ec;
        Vp = Vc;
        Ec = te;
        Vc = tv;
      }
    }
  }
  const chern: number[] = [];
  const chernSum: number[] = [];
  const resolved: boolean[] = [];
  const notes: string[] = [];
  for (let gi = 0; gi < G; gi++) {
    const c = sums[gi]! / (2 * Math.PI);
    chernSum.push(c);
    chern.push(Math.round(c) + 0); // + 0 turns -0 into 0
    const label = groups[gi]!.length === 1 ? `band ${groups[gi]![0]}` : `bands ${groups[gi]!.join(", ")}`;
    const why: string[] = [];
    if (minGap[gi]! < gapTol) why.push(`the gap to a neighbouring band vanishes on the grid (minimum ${minGap[gi]!.toExponential(2)})`);
    if (maxFlux[gi]! > fluxLimit) why.push(`a plaquette carries a Berry flux of ${maxFlux[gi]!.toFixed(3)} rad (> ${fluxLimit}): the curvature is concentrated below the grid spacing`);
    if (hiddenClosing[gi]) why.push("the gap is smaller than the change of the band energies across a grid step, so it may close between grid points");
    resolved.push(why.length === 0);
    if (why.length) notes.push(`${label}: not resolved on the ${n1} x ${n2} grid: ${why.join("; ")}. Refine the grid (or group the touching bands); a gapless model has no Chern number.`);
  }
  if (minLinkOverlap < 1e-8) notes.push(`a link overlap nearly vanishes (${minLinkOverlap.toExponential(2)}): states change completely between neighbouring points`);
  const status: ChernResult["status"] = resolved.every(Boolean) ? "ok" : "unresolved";
  if (status === "unresolved" && (options.onUnresolved ?? "throw") === "throw") {
    throw new InputError("n1", n1, "a grid fine enough to resolve the band gaps (or onUnresolved: \"report\")", notes.join(" "));
  }
  const result: ChernResult = {
    chern,
    resolved,
    status,
    notes,
    groups: groups.map((g) => g.slice()),
    n1,
    n2,
    chernSum,
    maxFlux: Array.from(maxFlux),
    minGap: Array.from(minGap),
    method: `link variables on a ${n1} x ${n2} grid (Fukui-Hatsugai-Suzuki)`,
    sources: ["T. Fukui, Y. Hatsugai, H. Suzuki, J. Phys. Soc. Jpn. 74, 1674 (2005)"],
  };
  if (fluxMaps) result.flux = fluxMaps;
  if (energiesOut) result.energies = energiesOut;
  return result;
}
