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
import { gridFor, interpolateGrid, blurOnGrid, type UniformGrid } from "./strayField.js";
import { strayBound, type Kind } from "./strayBound.js";
import { at, unpack } from "../numeric/indexing.js";

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
        const [x0, Delta, off, c] = unpack(p, 4, "wall180-mz parameters");
        for (let i = 0; i < m; i++) out[i] = off + c * -Math.tanh((x[i]! - x0) / Delta);
      },
      jacobian(p, out) {
        const [x0, Delta, , c] = unpack(p, 4, "wall180-mz parameters");
        for (let i = 0; i < m; i++) {
          const u = (x[i]! - x0) / Delta;
          const th = Math.tanh(u);
          const s2 = 1 - th * th;
          out[i] = (c * s2) / Delta;
          out[m + i] = (c * s2 * u) / Delta;
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
        const [x0, Delta, helicity, tilt, off, c] = unpack(p, 6, "wall180-tilted parameters");
        const ct = Math.cos(tilt);
        const st = Math.sin(tilt);
        const cg = Math.cos(helicity);
        for (let i = 0; i < m; i++) {
          const u = (x[i]! - x0) / Delta;
          out[i] = off + c * (ct * -Math.tanh(u) + st * (-cg / Math.cosh(u)));
        }
      },
    };
  },
};

function w360Signal(x: Float64Array, p: Float64Array, out: Float64Array) {
  const [x0, R, w, off, c] = unpack(p, 5, "parameters (x0, R, w, offset, contrast)");
  wall360MzValues(x, x0, R, w, out);
  for (let i = 0; i < x.length; i++) out[i] = off + c * out[i]!;
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
        const [x0, R, w, off, c] = unpack(p, 5, "wall360-mz parameters");
        if (R / w > 300) {
          w360Signal(x, p, out);
          return;
        }
        expsFor(x0, w);
        const sb = Math.sinh(R / w);
        const sb2 = sb * sb;
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
        const [x0, R, w, , c] = unpack(p, 5, "wall360-mz parameters");
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
        const [x0, R, w, helicity, tilt, off, c] = unpack(p, 7, "wall360-tilted parameters");
        const ct = Math.cos(tilt);
        const st = Math.sin(tilt);
        const cg = Math.cos(helicity);
        for (let i = 0; i < x.length; i++) {
          const q = wall360Point(x[i]!, x0, R, w);
          out[i] = off + c * (ct * q.mz + st * cg * q.signedSin);
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
