/**
 * The catalogue of line-profile models: magnetization profile (180-degree wall, 360-degree wall or
 * skyrmion cut, wallProfiles.ts) times a signal model (contrast of m_z; contrast along a tilted
 * sensor; stray field B_z or B_x at height h, strayField.ts), optionally blurred by a Gaussian
 * point-spread. Ids are ours; `helicoid fit --list` prints them.
 *
 * Every model is SI inside: positions and lengths in m, fields in T, helicity and tilt in rad,
 * contrast and offset in the unit of the measured signal.
 */
import type { FitParameter } from "./leastSquares.js";
import { InputError } from "../errors.js";
import { wall360Point, wall360Mz as wall360MzValues, wall360MzDerivatives } from "./wallProfiles.js";
import { erfc as erfcLocal } from "../numeric/distributions.js";
import { gridFor, interpolateGrid, blurOnGrid, spectrumToPoints, type UniformGrid } from "./strayField.js";
import { fft } from "../numeric/fft.js";
import { mu0 } from "../quantity/constants.js";
import { at, float64Arrays } from "../numeric/indexing.js";

export interface BoundModel {
  model(p: Float64Array, out: Float64Array): void;
  jacobian?(p: Float64Array, out: Float64Array): void;
}

export interface ProfileModel {
  id: string;
  title: string;
  summary: string;
  /** Default start values and bounds (SI). */
  parameters: FitParameter[];
  /** Unit of the signal ("" for a contrast in arbitrary units, "T" for a field). */
  signalUnit: string;
  assumptions: string[];
  sources: string[];
  /** Prepare the model for these positions (grids for FFT models are fixed here from the start values). */
  bind(x: Float64Array, start: Float64Array): BoundModel;
}

const WALL_SOURCES = ["L. Landau, E. Lifshitz (1935); A. Hubert, R. Schaefer, Magnetic Domains (Springer 1998): 180-degree wall profile"];
const W360_SOURCES = [
  "H.-B. Braun, PRB 50, 16501 (1994): 360-degree wall",
  "F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018): skyrmion profile ansatz tan(theta/2) = sinh(R/w)/sinh(rho/w)",
];
const STRAY_SOURCES = [
  "R. Beardsley, IEEE Trans. Magn. 25, 671 (1989): stray field of thin-film magnetization in Fourier space",
  "J.-P. Tetienne et al., Nat. Commun. 6, 6733 (2015): Bloch versus Neel walls from the stray field",
];
const BASE_ASSUMPTIONS = ["continuum micromagnetics, T = 0", "magnetization uniform through the film thickness"];
const STRAIGHT_WALL = "straight wall (1D profile: m depends only on the position x across it)";
const CENTRAL_CUT = "a cut through the centre of an axisymmetric skyrmion, or across a straight 360-degree wall (m depends only on the distance from the centre or the wall line)";
const STRAY_360_CUT =
  "the cut is treated as a straight 360-degree wall (invariant along y): for a skyrmion whose radius is not large against h this neglects the curvature of its wall";

const nm = 1e-9;
const P = {
  x0: (): FitParameter => ({ name: "x0", value: 0, unit: "m", typical: 10 * nm, meaning: "wall or core center" }),
  Delta: (): FitParameter => ({
    name: "Delta",
    value: 10 * nm,
    unit: "m",
    min: 0.01 * nm,
    typical: 10 * nm,
    physical: [0, Infinity],
    meaning: "wall width parameter (m_z = -tanh(x/Delta))",
  }),
  R: (): FitParameter => ({ name: "R", value: 30 * nm, unit: "m", min: 0, typical: 10 * nm, physical: [0, Infinity], meaning: "radius (m_z = 0 at |x - x0| = R)" }),
  w: (): FitParameter => ({ name: "w", value: 10 * nm, unit: "m", min: 0.01 * nm, typical: 10 * nm, physical: [0, Infinity], meaning: "wall width of the ansatz" }),
  offset: (unit: string): FitParameter => ({ name: "offset", value: 0, unit, typical: 1, meaning: "signal offset" }),
  contrast: (): FitParameter => ({ name: "contrast", value: 1, unit: "", typical: 1, meaning: "signal per unit m_z (sensor along +z)" }),
  tilt: (): FitParameter => ({
    name: "tilt",
    value: 0.1,
    unit: "rad",
    min: -Math.PI / 2,
    max: Math.PI / 2,
    typical: 0.1,
    meaning: "sensor axis tilt from +z toward +x (the cut direction)",
  }),
  helicity: (fixed: boolean): FitParameter => ({
    name: "helicity",
    value: 0,
    unit: "rad",
    min: -2 * Math.PI,
    max: 2 * Math.PI,
    typical: 0.1,
    fixed,
    meaning: "in-plane angle of the wall moment (0, pi: Neel; +-pi/2: Bloch)",
  }),
  h: (): FitParameter => ({ name: "h", value: 50 * nm, unit: "m", min: 0, typical: 10 * nm, physical: [0, Infinity], meaning: "sensor height above the film top surface" }),
  t: (): FitParameter => ({ name: "t", value: 1 * nm, unit: "m", min: 0, typical: 1 * nm, fixed: true, physical: [0, Infinity], meaning: "film thickness" }),
  Ms: (): FitParameter => ({ name: "Ms", value: 1e6, unit: "A/m", min: 0, typical: 1e5, physical: [0, Infinity], meaning: "saturation magnetization" }),
  neel: (): FitParameter => ({
    name: "neel",
    value: 0.1,
    unit: "",
    min: -1,
    max: 1,
    typical: 0.1,
    physical: [-1, 1],
    meaning: "cos(helicity): +1 Neel toward the up domain, -1 Neel toward the down domain, 0 Bloch (the stray field depends on the helicity only through it)",
  }),
  blur: (fixed: boolean): FitParameter => ({
    name: "blur",
    value: fixed ? 0 : 10 * nm,
    unit: "m",
    min: 0,
    typical: 10 * nm,
    fixed,
    physical: [0, Infinity],
    meaning: "standard deviation of the Gaussian instrument blur",
  }),
};

function idx(params: FitParameter[]) {
  const m = new Map<string, number>();
  params.forEach((p, i) => m.set(p.name, i));
  return (name: string) => {
    const i = m.get(name);
    if (i === undefined) throw new RangeError(`no parameter ${name} (parameters: ${params.map((p) => p.name).join(", ")})`);
    return i;
  };
}

/** offset + contrast * m_z of a 180-degree wall (analytic Jacobian). */
const wall180Mz: ProfileModel = {
  id: "wall180-mz",
  title: "180-degree wall, signal = offset + contrast * m_z",
  summary: "Polar (m_z) contrast across a 180-degree wall: spin-polarized tunnelling with a perpendicular tip, polar Kerr, XMCD at normal incidence.",
  parameters: [P.x0(), P.Delta(), P.offset(""), P.contrast()],
  signalUnit: "",
  assumptions: [...BASE_ASSUMPTIONS, STRAIGHT_WALL, "signal = offset + contrast * m_z (linear in m_z)"],
  sources: WALL_SOURCES,
  bind(x) {
    const m = x.length;
    return {
      model(p, out) {
        for (let i = 0; i < m; i++) out[i] = p[2]! + p[3]! * -Math.tanh((x[i]! - p[0]!) / p[1]!);
      },
      jacobian(p, out) {
        for (let i = 0; i < m; i++) {
          const u = (x[i]! - p[0]!) / p[1]!;
          const th = Math.tanh(u);
          const s2 = 1 - th * th;
          out[i] = (p[3]! * s2) / p[1]!;
          out[m + i] = (p[3]! * s2 * u) / p[1]!;
          out[2 * m + i] = 1;
          out[3 * m + i] = -th;
        }
      },
    };
  },
};

/** offset + contrast * (cos(tilt) m_z + sin(tilt) m_x) of a 180-degree wall. */
const wall180Tilted: ProfileModel = {
  id: "wall180-tilted",
  title: "180-degree wall seen by a tilted sensor",
  summary:
    "Signal = offset + contrast * (m . n), sensor axis n tilted from +z toward +x by `tilt`: the in-plane moment of the wall adds an odd part. The helicity is held fixed by default (with one tilted sensor only contrast*sin(tilt)*cos(helicity) is measurable).",
  parameters: [P.x0(), P.Delta(), P.helicity(true), P.tilt(), P.offset(""), P.contrast()],
  signalUnit: "",
  assumptions: [...BASE_ASSUMPTIONS, STRAIGHT_WALL, "signal linear in m . n, sensor axis n in the x-z plane"],
  sources: WALL_SOURCES,
  bind(x) {
    const m = x.length;
    return {
      model(p, out) {
        const ct = Math.cos(p[3]!);
        const st = Math.sin(p[3]!);
        const cg = Math.cos(p[2]!);
        for (let i = 0; i < m; i++) {
          const u = (x[i]! - p[0]!) / p[1]!;
          out[i] = p[4]! + p[5]! * (ct * -Math.tanh(u) + st * (-cg / Math.cosh(u)));
        }
      },
    };
  },
};

function w360Signal(x: Float64Array, p: Float64Array, out: Float64Array) {
  wall360MzValues(x, p[0]!, p[1]!, p[2]!, out);
  for (let i = 0; i < x.length; i++) out[i] = p[3]! + p[4]! * out[i]!;
}

/** offset + contrast * m_z of a 360-degree wall / skyrmion cut (analytic Jacobian). */
const wall360Mz: ProfileModel = {
  id: "wall360-mz",
  title: "360-degree wall or skyrmion line cut, signal = offset + contrast * m_z",
  summary: "Polar contrast along a cut through a skyrmion or a 360-degree wall, ansatz tan(theta/2) = sinh(R/w) / sinh(|x - x0|/w).",
  parameters: [P.x0(), P.R(), P.w(), P.offset(""), P.contrast()],
  signalUnit: "",
  assumptions: [...BASE_ASSUMPTIONS, CENTRAL_CUT, "profile ansatz of Braun / Buettner-Lemesh-Beach", "signal = offset + contrast * m_z (linear in m_z)"],
  sources: W360_SOURCES,
  bind(x) {
    const m = x.length;
    // exp(|x - x0| / w) of the last evaluation: Levenberg-Marquardt asks for the Jacobian at the
    // point it evaluated last, so the Jacobian reuses them (one exp per point per iteration)
    const E = new Float64Array(m);
    let keyX0 = NaN;
    let keyW = NaN;
    const expsFor = (x0: number, w: number) => {
      if (x0 === keyX0 && w === keyW) return;
      const iw = 1 / w;
      for (let i = 0; i < m; i++) E[i] = Math.exp(Math.abs(x[i]! - x0) * iw);
      keyX0 = x0;
      keyW = w;
    };
    return {
      model(p, out) {
        if (p[1]! / p[2]! > 300) {
          w360Signal(x, p, out);
          return;
        }
        expsFor(p[0]!, p[2]!);
        const sb = Math.sinh(p[1]! / p[2]!);
        const sb2 = sb * sb;
        const off = p[3]!;
        const c = p[4]!;
        for (let i = 0; i < m; i++) {
          const e = E[i]!;
          if (e > 1e130) {
            out[i] = off + c;
            continue;
          }
          const sa = 0.5 * (e - 1 / e);
          const sa2 = sa * sa;
          out[i] = off + (c * (sa2 - sb2)) / (sa2 + sb2);
        }
      },
      jacobian(p, out) {
        const x0 = p[0]!;
        const R = p[1]!;
        const w = p[2]!;
        const c = p[4]!;
        if (R / w > 300) {
          const mz = out.subarray(4 * m, 5 * m);
          wall360MzDerivatives(x, x0, R, w, mz, out.subarray(0, 3 * m));
          for (let i = 0; i < 3 * m; i++) out[i]! *= c;
          out.fill(1, 3 * m, 4 * m);
          return;
        }
        // same formulas as wallProfiles.wall360MzDerivatives, from the cached exponentials
        expsFor(x0, w);
        const b = R / w;
        const sb = Math.sinh(b);
        const sb2 = sb * sb;
        const cb = 1 / Math.tanh(b);
        const iw = 1 / w;
        const ciw = c * iw;
        for (let i = 0; i < m; i++) {
          const e = E[i]!;
          if (e > 1e130) {
            out[i] = 0;
            out[m + i] = 0;
            out[2 * m + i] = 0;
            out[4 * m + i] = 1;
            continue;
          }
          const ie = 1 / e;
          const sa = 0.5 * (e - ie);
          const sa2 = sa * sa;
          const v = (sa2 - sb2) / (sa2 + sb2);
          out[4 * m + i] = v;
          const s2 = 1 - v * v;
          const u = x[i]! - x0;
          if (u !== 0) {
            const ca = (e + ie) / (e - ie);
            const a = Math.abs(u) * iw;
            out[i] = (u > 0 ? -s2 : s2) * ca * ciw;
            out[2 * m + i] = -s2 * (a * ca - b * cb) * ciw;
          } else {
            out[i] = 0;
            out[2 * m + i] = -s2 * (1 - b * cb) * ciw;
          }
          out[m + i] = -s2 * cb * ciw;
        }
        out.fill(1, 3 * m, 4 * m);
      },
    };
  },
};

const wall360Tilted: ProfileModel = {
  id: "wall360-tilted",
  title: "360-degree wall or skyrmion line cut seen by a tilted sensor",
  summary: "Signal = offset + contrast * (cos(tilt) m_z + sin(tilt) m_x) along the cut; helicity fixed by default.",
  parameters: [P.x0(), P.R(), P.w(), P.helicity(true), P.tilt(), P.offset(""), P.contrast()],
  signalUnit: "",
  assumptions: [...BASE_ASSUMPTIONS, CENTRAL_CUT, "profile ansatz of Braun / Buettner-Lemesh-Beach", "signal linear in m . n, sensor axis n in the x-z plane"],
  sources: W360_SOURCES,
  bind(x) {
    return {
      model(p, out) {
        const ct = Math.cos(p[4]!);
        const st = Math.sin(p[4]!);
        const cg = Math.cos(p[3]!);
        for (let i = 0; i < x.length; i++) {
          const q = wall360Point(x[i]!, p[0]!, p[1]!, p[2]!);
          out[i] = p[5]! + p[6]! * (ct * q.mz + st * cg * q.signedSin);
        }
      },
    };
  },
};

/** Grid for FFT models, fixed at bind time from the data range and the start length scales. */
function bindGrid(x: Float64Array, lengths: number[], padLengths: number[]): UniformGrid {
  let xmin = Infinity;
  let xmax = -Infinity;
  for (const v of x) {
    if (v < xmin) xmin = v;
    if (v > xmax) xmax = v;
  }
  // the grid resolves the physical length scales (the model is smooth between them and is
  // interpolated to the data), not the data spacing
  const scale = Math.min(...lengths.filter((v) => v > 0));
  const dxMax = Math.min(scale / 3, (xmax - xmin) / 64);
  const pad = Math.max(...padLengths, 0.25 * (xmax - xmin));
  return gridFor(xmin, xmax, dxMax, pad);
}

type Kind = "180" | "360";

/**
 * Weights c_i of the reference steps -(2/pi) atan(u / i), i = 1, 2, 3 (u = (x - x0) / Delta), removed from
 * the 180-degree wall before the FFT: sum c_i = 1 (the unit step), sum c_i i = sum c_i i^3 = 0, so the
 * remainder -tanh(u) + (2/pi) sum c_i atan(u / i) has no u^-1 and no u^-3 tail (it falls as u^-5). A
 * single atan reference leaves a -2 / (pi u) tail, which the periodic FFT box cuts off with a jump at its
 * edge: that jump's field was the 1e-4 error of the model against a real-space quadrature.
 */
const REF_C = [2.5, -2, 0.5];

/** Band-limited upsampling of the FFT fields before the cubic interpolation to the data points. */
const UPSAMPLE = 4;

function strayModel(kind: Kind, component: "bz" | "bx"): ProfileModel {
  const shape = kind === "180" ? [P.x0(), P.Delta()] : [P.x0(), P.R(), P.w()];
  const params = [...shape, P.neel(), P.h(), P.t(), P.Ms(), P.blur(true), P.offset("T")];
  const ix = idx(params);
  const label = component === "bz" ? "B_z" : "B_x";
  return {
    id: `wall${kind}-${component}`,
    title: `${kind === "180" ? "180-degree wall" : "360-degree wall / skyrmion cut"}: stray field ${label} at height h`,
    summary: `${label} above the film from its surface and volume charges (Fourier space), with neel = cos(helicity) free (m_y has no charge, so the field sees the helicity only through its cosine): |neel| near 1 is a Neel wall, its sign the chirality, near 0 a Bloch wall; Gaussian blur optional (fixed at 0 by default).`,
    parameters: params,
    signalUnit: "T",
    assumptions: [
      ...BASE_ASSUMPTIONS,
      kind === "180" ? STRAIGHT_WALL : STRAY_360_CUT,
      `signal = ${label} of the surface and volume charges of m (not a function of m_z alone)`,
      "point sensor at height h above the top surface (finite size only through the blur)",
      "the FFT grid is set from the start values: lengths far below the start width are resolved less well",
    ],
    sources: [...(kind === "180" ? WALL_SOURCES : W360_SOURCES), ...STRAY_SOURCES],
    bind(x, start) {
      const sv = (name: string) => at(start, ix(name), "start");
      const widths = kind === "180" ? [sv("Delta")] : [sv("w"), sv("R")];
      const blur0 = sv("blur");
      const h0 = sv("h");
      const width0 = at(widths, 0, "widths");
      // The kernel e^{-|k| h} cut at the grid's Nyquist wavenumber pi/dx leaves a relative error of
      // about e^{-pi h/dx}: dx <= h/6 (the length h/2 below, resolved by thirds) puts it near 7e-9.
      // With dx = h/3 a sensor closer than the wall width erred by 3e-6 of the peak. The periodic box is
      // padded by 160 wall widths: a wall much wider than h (12 nm at h = 2 nm) erred by 3e-6 with 80.
      const grid = bindGrid(
        x,
        [...widths, h0 > 0 ? h0 / 2 : width0, blur0 > 0 ? blur0 : Infinity],
        [200 * (h0 + sv("t")), 160 * Math.max(...widths), 6 * blur0, kind === "360" ? 60 * sv("R") : 0],
      );
      // zero-mode reference: centred at the start position, 2 start widths wide (its spectrum e^{-|k| a}
      // must vanish well before the grid's Nyquist wavenumber 3 pi / width)
      return strayBound(kind, component, grid, x, ix, sv("x0"), 2 * Math.min(...widths.filter((v) => v > 0)));
    },
  };
}

/**
 * The bound stray-field model with its analytic Jacobian. The field is linear in the transformed
 * magnetization: with L(k) = FFT(m_z,local) - i sgn(k) FFT(m_x), the kernel
 * K(k) = (mu0 Ms / 2) e^{-|k| h} (1 - e^{-|k| t}) G(k), G = exp(-k^2 s^2 / 2), and the component
 * factor C(k) = 1 (B_z) or -i sgn(k) (B_x), the output spectrum is C K L (+ G S_c, the transform of
 * the closed-form step field of a 180-degree wall when blurred). So d/dp of the spectrum is
 * C K dL/dp (transform of d m / dp) for the shape parameters and neel, C (dK/dp) L for h and t
 * (dK/dh = -|k| K, dK/dt = (mu0 Ms / 2) e^{-|k| (h + t)} |k| G), -k^2 s (spectrum) for the blur,
 * (spectrum) / Ms for Ms; the step field's derivatives are in closed form. Two real derivative
 * fields share one complex FFT (forward and inverse). Checked against central differences in
 * test/lib/fit/strayFieldJacobian.test.ts.
 */
function strayBound(kind: Kind, component: "bz" | "bx", grid: UniformGrid, x: Float64Array, ix: (name: string) => number, refCenter: number, refWidth: number): BoundModel {
  const n = grid.n;
  const m = x.length;
  // Zero-mode reference ell = 2 P_a - P_2a (P_a the Lorentzian (a/pi)/(u^2 + a^2)), normalized to unit
  // grid sum; its u^-2 tails cancel (u^-4 left). The net charges Qz = sum m_z,local dx and
  // Qx = sum m_x dx are carried by Q ell and their fields added in closed form at the data points
  // (Poisson semigroup: P_a seen from height H is a line seen from H + a). Reason: the kernel's |k| at
  // k = 0 is not smooth, so a periodic box with a net charge errs by ~Q h / L^2 (1e-4 of the peak for
  // the Neel wall's m_x and the 360-degree wall's m_z); without net charge the box error vanishes.
  const ell = new Float64Array(n);
  {
    const a = refWidth;
    let sum = 0;
    for (let g = 0; g < n; g++) {
      const u = grid.x0 + g * grid.dx - refCenter;
      ell[g] = (2 * a) / (Math.PI * (u * u + a * a)) - (2 * a) / (Math.PI * (u * u + 4 * a * a));
      sum += ell[g]! * grid.dx;
    }
    for (let g = 0; g < n; g++) ell[g] = ell[g]! / sum;
  }
  /**
   * Field component per unit net charge of m_z (kind "z") or m_x ("x") spread as ell, at points xs, and
   * its derivatives in h and t; scaled by mu0 Ms / (2 pi).
   */
  function zeroModeField(xs: ArrayLike<number>, p: Float64Array, which: "z" | "x", val: Float64Array, dh: Float64Array | null, dt: Float64Array | null) {
    const h = p[iH]!,
      t = p[iT]!,
      c = (mu0 * p[iMs]!) / (2 * Math.PI);
    // P(u, H) = H / (u^2 + H^2), Qk(u, H) = u / (u^2 + H^2) and their H-derivatives
    const P = (u: number, H: number) => H / (u * u + H * H);
    const Qk = (u: number, H: number) => u / (u * u + H * H);
    const dP = (u: number, H: number) => (u * u - H * H) / (u * u + H * H) ** 2;
    const dQ = (u: number, H: number) => (-2 * u * H) / (u * u + H * H) ** 2;
    // kz1 = P(H1) - P(H2), kz2 = Qk(H1) - Qk(H2), H1 = h + b, H2 = h + t + b, for b = a (weight 2) and 2a (weight -1)
    // bz: from m_z +kz1, from m_x +kz2; bx: from m_z +kz2, from m_x -kz1
    const useP = (component === "bz") === (which === "z");
    const sgn = component === "bx" && which === "x" ? -1 : 1;
    const F = useP ? P : Qk,
      dF = useP ? dP : dQ;
    for (let i = 0; i < xs.length; i++) {
      const u = xs[i]! - refCenter;
      let v = 0,
        vh = 0,
        vt = 0;
      for (const [w, b] of [
        [2, refWidth],
        [-1, 2 * refWidth],
      ] as const) {
        const H1 = h + b,
          H2 = h + t + b;
        v += w * (F(u, H1) - F(u, H2));
        vh += w * (dF(u, H1) - dF(u, H2));
        vt += w * -dF(u, H2);
      }
      val[i] = sgn * c * v;
      if (dh) dh[i] = sgn * c * vh;
      if (dt) dt[i] = sgn * c * vt;
    }
  }
  const is180 = kind === "180";
  const nShape = is180 ? 2 : 3; // x0 + (Delta | R, w)
  const iNeel = ix("neel");
  const iH = ix("h");
  const iT = ix("t");
  const iMs = ix("Ms");
  const iBlur = ix("blur");
  const iOff = ix("offset");
  const nPar = iOff + 1;
  const ak = new Float64Array(n);
  const kk = new Float64Array(n);
  const sg = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const f = j < n / 2 ? j : j - n;
    const k = (2 * Math.PI * f) / (n * grid.dx);
    kk[j] = k;
    ak[j] = Math.abs(k);
    sg[j] = 2 * j === n ? 0 : Math.sign(k);
  }
  const gx = new Float64Array(n);
  for (let g = 0; g < n; g++) gx[g] = grid.x0 + g * grid.dx;
  // work arrays
  const mzL = new Float64Array(n);
  const mx1 = new Float64Array(n); // m_x / neel
  const dmz = float64Arrays(3, n); // first nShape used
  const dmx1 = float64Arrays(3, n);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const K = new Float64Array(n);
  const G = new Float64Array(n);
  const Kt = new Float64Array(n);
  const gridOut = new Float64Array(m);
  // spectra kept per evaluation: local base (A: mz, B: mx1) and step (Sc) as separate re/im
  const Ar = new Float64Array(n),
    Ai = new Float64Array(n),
    Br = new Float64Array(n),
    Bi = new Float64Array(n);
  const Sr = new Float64Array(n),
    Si = new Float64Array(n);
  const stepAt = new Float64Array(m);
  const scratch = new Float64Array(m);
  // scratch grid (W) and data-point (Wm) arrays, allocated once per bind
  const W = float64Arrays(14, n);
  const WD = new Float64Array(n),
    SDr = new Float64Array(n),
    SDi = new Float64Array(n);
  const fineRe = new Float64Array(UPSAMPLE * n),
    fineIm = new Float64Array(UPSAMPLE * n);
  const Wm = float64Arrays(4, m);
  const [Zz, Zzh, Zzt, Zx, Zxh, Zxt] = float64Arrays(6, m);
  const [ZG, ZGh, ZGt, Fr, Fi, Fhr, Fhi, Ftr, Fti] = float64Arrays(9, n);

  /** Fill the grid fields (and their shape derivatives when d is true). */
  function gridFields(p: Float64Array, d: boolean) {
    const x0 = p[0]!;
    if (is180) {
      const Delta = p[1]!;
      for (let g = 0; g < n; g++) {
        const u = (gx[g]! - x0) / Delta;
        const th = Math.tanh(u);
        const sech = 1 / Math.cosh(u);
        // remove the reference sum_i c_i (-(2/pi) atan(u / i)) (see REF_C): the remainder decays as u^-5
        let ref = 0,
          dref = 0;
        for (let r = 0; r < REF_C.length; r++) {
          const a = r + 1;
          ref += REF_C[r]! * Math.atan(u / a);
          dref += (REF_C[r]! * a) / (a * a + u * u);
        }
        mzL[g] = -th + (2 / Math.PI) * ref;
        mx1[g] = -sech;
        if (d) {
          // d/du of mzL and mx1, then du/dx0 = -1/Delta, du/dDelta = -u/Delta
          const dzu = -sech * sech + (2 / Math.PI) * dref;
          const dxu = sech * th;
          dmz[0][g] = -dzu / Delta;
          dmx1[0][g] = -dxu / Delta;
          dmz[1][g] = (-u * dzu) / Delta;
          dmx1[1][g] = (-u * dxu) / Delta;
        }
      }
    } else {
      for (let g = 0; g < n; g++) {
        const q = wall360Point(gx[g]!, x0, p[1]!, p[2]!);
        mzL[g] = q.mz - 1;
        mx1[g] = q.signedSin;
        if (d) {
          // s = sign(u) sech L with dm_z = -sech^2 L dL: ds = sign(u) tanh(L) dm_z / sech(L), tanh L = -m_z
          const sech = Math.abs(q.signedSin);
          const f = sech > 1e-150 ? (Math.sign(gx[g]! - x0) * -q.mz) / sech : 0;
          dmz[0][g] = q.dx0;
          dmz[1][g] = q.dR;
          dmz[2][g] = q.dw;
          dmx1[0][g] = f * q.dx0;
          dmx1[1][g] = f * q.dR;
          dmx1[2][g] = f * q.dw;
        }
      }
    }
  }

  /** Net charges of the grid fields (and of their shape derivatives), moved onto ell (blur 0 only). */
  const dQz = new Float64Array(3),
    dQx = new Float64Array(3);
  let Qz = 0,
    Qx = 0;
  function removeZeroModes(d: boolean) {
    const sumOf = (f: Float64Array) => {
      let v = 0;
      for (let g = 0; g < n; g++) v += f[g]!;
      return v * grid.dx;
    };
    const take = (f: Float64Array, q: number) => {
      for (let g = 0; g < n; g++) f[g] = f[g]! - q * ell[g]!;
    };
    // Only the charge whose kernel has the |k| kink needs it: m_z for B_z (kernel K), m_x for B_x
    // (kernel -K); the cross terms carry -i sgn(k) K ~ -i k t, smooth at k = 0.
    const bz = component === "bz";
    Qz = bz ? sumOf(mzL) : 0;
    Qx = bz ? 0 : sumOf(mx1);
    if (bz) take(mzL, Qz);
    else take(mx1, Qx);
    if (d) {
      for (let s2 = 0; s2 < nShape; s2++) {
        dQz[s2] = bz ? sumOf(dmz[s2]!) : 0;
        dQx[s2] = bz ? 0 : sumOf(dmx1[s2]!);
        if (bz) take(dmz[s2]!, dQz[s2]!);
        else take(dmx1[s2]!, dQx[s2]!);
      }
    }
  }

  /** Kernels K, G and dK/dt / K-free factor for the current p. */
  function kernels(p: Float64Array) {
    const pref = (mu0 * p[iMs]!) / 2;
    const h = p[iH]!;
    const t = p[iT]!;
    const s = p[iBlur]!;
    for (let j = 0; j < n; j++) {
      const a = ak[j]!;
      const g = s > 0 ? Math.exp(-0.5 * kk[j]! * kk[j]! * s * s) : 1;
      const eh = Math.exp(-a * h);
      G[j] = g;
      K[j] = pref * eh * -Math.expm1(-a * t) * g;
      Kt[j] = pref * eh * Math.exp(-a * t) * a * g;
    }
  }

  /** FFT of two real fields u + i v, unpacked into the spectra of u (ur, ui) and v (vr, vi). */
  function fftPair(u: Float64Array, v: Float64Array | null, ur: Float64Array, ui: Float64Array, vr: Float64Array | null, vi: Float64Array | null) {
    re.set(u);
    if (v) im.set(v);
    else im.fill(0);
    fft(re, im);
    for (let j = 0; j < n; j++) {
      const jm = j === 0 ? 0 : n - j;
      const a = re[j]!,
        b = im[j]!,
        c = re[jm]!,
        e = im[jm]!;
      ur[j] = 0.5 * (a + c);
      ui[j] = 0.5 * (b - e);
      if (vr && vi) {
        vr[j] = 0.5 * (b + e);
        vi[j] = -0.5 * (a - c);
      }
    }
  }

  /**
   * Closed-form field of the reference magnetization sum_i c_i (-(2/pi) atan((x - x0) / (i Delta))) and
   * its derivatives (u, h, t, Delta) on the grid or at points: each term is the ideal step seen from
   * h + i Delta (Poisson semigroup, strayField.ts).
   */
  function stepValues(
    xs: ArrayLike<number>,
    p: Float64Array,
    val: Float64Array,
    du: Float64Array | null,
    dH: Float64Array | null,
    dt: Float64Array | null,
    dD: Float64Array | null = null,
  ) {
    const x0 = p[0]!;
    const t = p[iT]!;
    const Ms = p[iMs]!;
    for (let i = 0; i < xs.length; i++) {
      const u = xs[i]! - x0;
      let v = 0,
        vu = 0,
        vH = 0,
        vt = 0,
        vD = 0;
      for (let r = 0; r < REF_C.length; r++) {
        const cr = REF_C[r]!;
        const H = p[iH]! + (r + 1) * p[1]!;
        const Ht = H + t;
        const a2 = Ht * Ht + u * u;
        const b2 = H * H + u * u;
        let fv: number, fu: number, fH: number, ft: number;
        if (component === "bz") {
          fv = Math.atan(u / Ht) - Math.atan(u / H);
          fu = Ht / a2 - H / b2;
          fH = -u / a2 + u / b2;
          ft = -u / a2;
        } else {
          fv = Math.log(a2 / b2);
          fu = (2 * u) / a2 - (2 * u) / b2;
          fH = (2 * Ht) / a2 - (2 * H) / b2;
          ft = (2 * Ht) / a2;
        }
        v += cr * fv;
        vu += cr * fu;
        vH += cr * fH;
        vt += cr * ft;
        vD += cr * (r + 1) * fH;
      }
      const c = component === "bz" ? (mu0 * Ms) / Math.PI : (mu0 * Ms) / (2 * Math.PI);
      val[i] = c * v;
      if (du) du[i] = c * vu;
      if (dH) dH[i] = c * vH;
      if (dt) dt[i] = c * vt;
      if (dD) dD[i] = c * vD;
    }
  }

  /** Component factor C(k): 1 (B_z) or -i sgn(k) (B_x). */
  const comp = component === "bx";

  // spectra of the output columns to invert: list of [re, im] arrays
  const colR = Array.from({ length: nPar }, () => new Float64Array(n));
  const colI = Array.from({ length: nPar }, () => new Float64Array(n));

  function evaluate(p: Float64Array, out: Float64Array, jac: Float64Array | null) {
    const blur = p[iBlur]!;
    const cg = p[iNeel]!;
    const stepInFft = is180 && blur > 0;
    gridFields(p, jac !== null);
    const zeroModes = true;
    const blurred = blur > 0;
    const zWhich = component === "bz" ? "z" : "x";
    if (zeroModes) removeZeroModes(jac !== null);
    kernels(p);
    fftPair(mzL, mx1, Ar, Ai, Br, Bi);
    if (stepInFft) {
      stepValues(gx, p, W[0], jac ? W[1] : null, jac ? W[2] : null, jac ? W[3] : null, jac ? WD : null);
      fftPair(W[0], null, Sr, Si, null, null);
    }
    // base output spectrum O = C (K L + G S), L = A - i sg cg B
    const Or = colR[iOff]!,
      Oi = colI[iOff]!; // reuse the offset slot for the base
    for (let j = 0; j < n; j++) {
      const lr = Ar[j]! + sg[j]! * cg * Bi[j]!;
      const li = Ai[j]! - sg[j]! * cg * Br[j]!;
      let r = K[j]! * lr;
      let i = K[j]! * li;
      if (comp) {
        const t = r;
        r = sg[j]! * i;
        i = -sg[j]! * t;
      }
      if (stepInFft) {
        r += G[j]! * Sr[j]!;
        i += G[j]! * Si[j]!;
      }
      Or[j] = r;
      Oi[j] = i;
    }
    // Blurred: the closed-form field Q F of the net charge is added at the points unblurred, and its
    // blur as the spectrum Q (G - 1) F: G - 1 ~ -k^2 s^2 / 2 removes the |k| kink of F at k = 0, so the
    // periodic box errs only at third order there.
    const Qeff = component === "bz" ? Qz : cg * Qx;
    if (blurred) {
      zeroModeField(gx, p, zWhich, ZG, jac ? ZGh : null, jac ? ZGt : null);
      fftPair(ZG, jac ? ZGh : null, Fr, Fi, jac ? Fhr : null, jac ? Fhi : null);
      if (jac) fftPair(ZGt, null, Ftr, Fti, null, null);
      for (let j = 0; j < n; j++) {
        const g1 = G[j]! - 1;
        Or[j]! += Qeff * g1 * Fr[j]!;
        Oi[j]! += Qeff * g1 * Fi[j]!;
      }
    }
    // base values
    spectrumToPoints(grid, Or, Oi, x, gridOut, null, UPSAMPLE, fineRe, fineIm);
    const off = p[iOff]!;
    if (is180 && !stepInFft) stepValues(x, p, stepAt, null, null, null);
    for (let i = 0; i < m; i++) out[i] = gridOut[i]! + off + (is180 && !stepInFft ? stepAt[i]! : 0);
    if (zeroModes) {
      zeroModeField(x, p, "z", Zz, jac ? Zzh : null, jac ? Zzt : null);
      zeroModeField(x, p, "x", Zx, jac ? Zxh : null, jac ? Zxt : null);
      for (let i = 0; i < m; i++) out[i]! += Qz * Zz[i]! + cg * Qx * Zx[i]!;
    }
    if (!jac) return;

    // ---- Jacobian columns (spectra) ----
    const cols: number[] = [];
    const setLocal = (c: number, dr: Float64Array, di: Float64Array, er: Float64Array, ei: Float64Array, scale: number) => {
      // column spectrum C K (dA - i sg cg dB) * scale, dA = (dr, di), dB = (er, ei)
      const R = colR[c]!,
        I = colI[c]!;
      for (let j = 0; j < n; j++) {
        const lr = dr[j]! + sg[j]! * cg * ei[j]!;
        const li = di[j]! - sg[j]! * cg * er[j]!;
        let r = K[j]! * lr * scale;
        let i = K[j]! * li * scale;
        if (comp) {
          const t = r;
          r = sg[j]! * i;
          i = -sg[j]! * t;
        }
        R[j] = r;
        I[j] = i;
      }
      cols.push(c);
    };
    const [tr, ti, ur, ui] = [W[4], W[5], W[6], W[7]];
    for (let s = 0; s < nShape; s++) {
      fftPair(dmz[s]!, dmx1[s]!, tr, ti, ur, ui);
      setLocal(s, tr, ti, ur, ui, 1);
    }
    // step derivatives (blurred 180 wall): d/dx0 = -d/du, d/dDelta and d/dh through H, d/dt
    let SdR: Float64Array | null = null,
      SdI: Float64Array | null = null,
      SHr: Float64Array | null = null,
      SHi: Float64Array | null = null,
      Str: Float64Array | null = null,
      Sti: Float64Array | null = null;
    if (stepInFft) {
      [SdR, SdI, SHr, SHi, Str, Sti] = [W[8], W[9], W[10], W[11], W[12], W[13]];
      fftPair(W[1], W[2], SdR, SdI, SHr, SHi);
      fftPair(W[3], WD, Str, Sti, SDr, SDi);
      for (let j = 0; j < n; j++) {
        colR[0]![j]! -= G[j]! * SdR[j]!;
        colI[0]![j]! -= G[j]! * SdI[j]!;
        colR[1]![j]! += G[j]! * SDr[j]!;
        colI[1]![j]! += G[j]! * SDi[j]!;
      }
    }
    // neel: C K (-i sg B)
    {
      const R = colR[iNeel]!,
        I = colI[iNeel]!;
      for (let j = 0; j < n; j++) {
        let r = K[j]! * sg[j]! * Bi[j]!;
        let i = -K[j]! * sg[j]! * Br[j]!;
        if (comp) {
          const t = r;
          r = sg[j]! * i;
          i = -sg[j]! * t;
        }
        R[j] = r;
        I[j] = i;
      }
      cols.push(iNeel);
    }
    // h, t: dK/dh = -|k| K, dK/dt = Kt; the step through H (h) and t
    {
      const Rh = colR[iH]!,
        Ih = colI[iH]!,
        Rt = colR[iT]!,
        It = colI[iT]!;
      for (let j = 0; j < n; j++) {
        const lr = Ar[j]! + sg[j]! * cg * Bi[j]!;
        const li = Ai[j]! - sg[j]! * cg * Br[j]!;
        let rh = -ak[j]! * K[j]! * lr;
        let ih = -ak[j]! * K[j]! * li;
        let rt = Kt[j]! * lr;
        let it = Kt[j]! * li;
        if (comp) {
          let t = rh;
          rh = sg[j]! * ih;
          ih = -sg[j]! * t;
          t = rt;
          rt = sg[j]! * it;
          it = -sg[j]! * t;
        }
        if (stepInFft) {
          rh += G[j]! * SHr![j]!;
          ih += G[j]! * SHi![j]!;
          rt += G[j]! * Str![j]!;
          it += G[j]! * Sti![j]!;
        }
        Rh[j] = rh;
        Ih[j] = ih;
        Rt[j] = rt;
        It[j] = it;
      }
      cols.push(iH, iT);
    }
    // Ms: O / Ms; blur: -k^2 s O
    {
      const Ms = p[iMs]!;
      const Rm = colR[iMs]!,
        Im = colI[iMs]!,
        Rb = colR[iBlur]!,
        Ib = colI[iBlur]!;
      for (let j = 0; j < n; j++) {
        Rm[j] = Or[j]! / Ms;
        Im[j] = Oi[j]! / Ms;
        const f = -kk[j]! * kk[j]! * blur;
        // d/ds of Q (G - 1) F is f Q G F; f Or holds f Q (G - 1) F of it, so add f Q F
        Rb[j] = f * Or[j]! + (blurred ? f * Qeff * Fr[j]! : 0);
        Ib[j] = f * Oi[j]! + (blurred ? f * Qeff * Fi[j]! : 0);
      }
      cols.push(iMs, iBlur);
    }
    if (blurred) {
      // the blurred net-charge field's derivatives: shape (dQ), neel (m_x charge), h and t
      for (let j = 0; j < n; j++) {
        const g1 = G[j]! - 1;
        for (let s2 = 0; s2 < nShape; s2++) {
          const dq = component === "bz" ? dQz[s2]! : cg * dQx[s2]!;
          colR[s2]![j]! += dq * g1 * Fr[j]!;
          colI[s2]![j]! += dq * g1 * Fi[j]!;
        }
        if (component === "bx") {
          colR[iNeel]![j]! += Qx * g1 * Fr[j]!;
          colI[iNeel]![j]! += Qx * g1 * Fi[j]!;
        }
        colR[iH]![j]! += Qeff * g1 * Fhr[j]!;
        colI[iH]![j]! += Qeff * g1 * Fhi[j]!;
        colR[iT]![j]! += Qeff * g1 * Ftr[j]!;
        colI[iT]![j]! += Qeff * g1 * Fti[j]!;
      }
    }
    // invert two columns per complex transform (both spectra are Hermitian); each is scaled to
    // unit peak first, since columns differ by up to 1e16 (units) and the round-off of the larger
    // would swamp the smaller
    const peakOf = (c: number) => {
      let v = 0;
      const R = colR[c]!,
        I = colI[c]!;
      for (let j = 0; j < n; j++) v = Math.max(v, Math.abs(R[j]!), Math.abs(I[j]!));
      return v > 0 ? v : 1;
    };
    for (let q = 0; q < cols.length; q += 2) {
      const a = cols[q]!;
      const b = q + 1 < cols.length ? cols[q + 1]! : -1;
      const pa = peakOf(a);
      const pb = b >= 0 ? peakOf(b) : 1;
      const ia = 1 / pa;
      const ib = 1 / pb;
      for (let j = 0; j < n; j++) {
        re[j] = colR[a]![j]! * ia - (b >= 0 ? colI[b]![j]! * ib : 0);
        im[j] = colI[a]![j]! * ia + (b >= 0 ? colR[b]![j]! * ib : 0);
      }
      const ja = jac.subarray(a * m, a * m + m);
      const jb = b >= 0 ? jac.subarray(b * m, b * m + m) : null;
      spectrumToPoints(grid, re, im, x, ja, jb, UPSAMPLE, fineRe, fineIm);
      for (let i = 0; i < m; i++) ja[i]! *= pa;
      if (jb) for (let i = 0; i < m; i++) jb[i]! *= pb;
    }
    // closed-form step at the data points (unblurred 180 wall)
    if (is180 && !stepInFft) {
      const [du, dH, dt, dD] = [Wm[0], Wm[1], Wm[2], Wm[3]];
      stepValues(x, p, stepAt, du, dH, dt, dD);
      for (let i = 0; i < m; i++) {
        jac[i]! -= du[i]!;
        jac[m + i]! += dD[i]!;
        jac[iH * m + i]! += dH[i]!;
        jac[iT * m + i]! += dt[i]!;
        jac[iMs * m + i]! += stepAt[i]! / p[iMs]!;
      }
    }
    if (zeroModes) {
      for (let s2 = 0; s2 < nShape; s2++) {
        const col = jac.subarray(s2 * m, s2 * m + m);
        for (let i = 0; i < m; i++) col[i]! += dQz[s2]! * Zz[i]! + cg * dQx[s2]! * Zx[i]!;
      }
      for (let i = 0; i < m; i++) {
        jac[iNeel * m + i]! += Qx * Zx[i]!;
        jac[iH * m + i]! += Qz * Zzh[i]! + cg * Qx * Zxh[i]!;
        jac[iT * m + i]! += Qz * Zzt[i]! + cg * Qx * Zxt[i]!;
        jac[iMs * m + i]! += (Qz * Zz[i]! + cg * Qx * Zx[i]!) / p[iMs]!;
      }
    }
    jac.fill(1, iOff * m, iOff * m + m);
  }

  return {
    model(p, out) {
      evaluate(p, out, null);
    },
    jacobian(p, out) {
      evaluate(p, scratch, out);
    },
  };
}

function blurredContrast(kind: Kind): ProfileModel {
  const base = kind === "180" ? wall180Mz : wall360Mz;
  const params = [...base.parameters.map((p) => ({ ...p })), P.blur(false)];
  return {
    id: `${base.id}-blur`,
    title: `${base.title}, Gaussian instrument blur`,
    summary: `${base.summary} Convolved with a Gaussian point-spread of standard deviation blur (by FFT on a padded grid).`,
    parameters: params,
    signalUnit: "",
    assumptions: [...base.assumptions, "Gaussian point-spread function"],
    sources: base.sources,
    bind(x, start) {
      const nb = params.length - 1;
      const widths = kind === "180" ? [at(start, 1, "start")] : [at(start, 2, "start"), at(start, 1, "start")];
      const blur0 = at(start, nb, "start");
      const grid = bindGrid(x, [...widths, blur0 > 0 ? blur0 : Infinity], [20 * Math.max(...widths), 6 * blur0]);
      const gx = new Float64Array(grid.n);
      for (let g = 0; g < grid.n; g++) gx[g] = grid.x0 + g * grid.dx;
      const inner = base.bind(gx, start);
      const values = new Float64Array(grid.n);
      return {
        model(p, out) {
          // blur the m_z profile; offset and contrast enter linearly (set offset 0, contrast 1)
          const q = Float64Array.from(p.subarray(0, nb));
          const io = kind === "180" ? 2 : 3;
          q[io] = 0;
          q[io + 1] = 1;
          inner.model(q, values);
          // Remove the far-field value so the periodic blur sees a localized, smooth signal. 180: subtract
          // the smooth step -erf(u / (a sqrt 2)) with the wall's slope at its centre (a = Delta sqrt(2/pi)),
          // whose blur is known in closed form; a sharp sign(u) step would leave a jump on the grid that
          // pins x0 to grid points and spoils the interpolation.
          const a = kind === "180" ? p[1]! * Math.sqrt(2 / Math.PI) : 0;
          if (kind === "180") for (let g = 0; g < grid.n; g++) values[g]! -= smoothStep(gx[g]! - p[0]!, a);
          else for (let g = 0; g < grid.n; g++) values[g]! -= 1;
          const b = blurOnGrid(grid, values, p[nb]!);
          interpolateGrid(grid, b, x, out);
          const aBlurred = Math.sqrt(a * a + (p[nb]! > 0 ? p[nb]! * p[nb]! : 0));
          for (let i = 0; i < x.length; i++) {
            const far = kind === "180" ? smoothStep(x[i]! - p[0]!, aBlurred) : 1;
            out[i] = p[io]! + p[io + 1]! * (out[i]! + far);
          }
        },
      };
    },
  };
}

/**
 * The smooth step -erf(u / (a sqrt 2)), i.e. the ideal step -sign(u) convolved with a Gaussian of
 * standard deviation a; a Gaussian blur of standard deviation s turns it into the same step with
 * sqrt(a^2 + s^2) (variances of convolved Gaussians add). Common practice, no source.
 */
function smoothStep(u: number, a: number): number {
  if (!(a > 0)) return -Math.sign(u);
  return -erf(u / (a * Math.SQRT2));
}

function erf(z: number): number {
  return 1 - erfcLocal(z);
}

export const profileModels: readonly ProfileModel[] = [
  wall180Mz,
  wall180Tilted,
  blurredContrast("180"),
  wall360Mz,
  wall360Tilted,
  blurredContrast("360"),
  strayModel("180", "bz"),
  strayModel("180", "bx"),
  strayModel("360", "bz"),
  strayModel("360", "bx"),
];

export function getProfileModel(id: string): ProfileModel {
  const m = profileModels.find((p) => p.id === id);
  if (!m) throw new InputError("model", id, `one of the profile model ids: ${profileModels.map((p) => p.id).join(", ")}`);
  return m;
}
