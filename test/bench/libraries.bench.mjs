// Library or hand-written, decided by measurement: each hand-written numeric kernel of lib/ against the
// well-kept npm library that would serve (fft.js; @stdlib special functions and distributions;
// ml-matrix). Both sides run in this process, interleaved A B A B (each run is a batch of calls, CPU
// time of the process; wall time gives the same ratios on an idle machine), medians and [min-max] of
// the runs. Accuracy of both sides is measured against mpmath at 50 digits (numpy.fft for the FFT) at
// the same points, so "faster" is compared at matched accuracy. The verdict of each row is copied
// into the kernel's file header. The libraries are devDependencies of the workspace root (bench
// only) unless a kernel switched to its library (then a dependency of lib/package.json).
import FFT from "fft.js";
import { spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import { existsSync } from "node:fs";
import { dirname as benchDirname, join as benchJoin } from "node:path";
import { fileURLToPath as benchFileURLToPath } from "node:url";
// The compared libraries live in their own install (test/bench/libs), not in the root one.
const libsDir = benchJoin(benchDirname(benchFileURLToPath(import.meta.url)), "libs");
if (!existsSync(benchJoin(libsDir, "node_modules", "ml-matrix"))) {
  process.stderr.write("bench: installing the compared libraries once: npm ci --prefix test/bench/libs\n");
  const r = spawnSync(process.platform === "win32" ? "npm.cmd" : "npm", ["ci", "--prefix", libsDir, "--no-audit", "--no-fund"], { stdio: ["ignore", "inherit", "inherit"] });
  if (r.status !== 0) throw new Error(`npm ci --prefix ${libsDir} failed (status ${r.status})`);
}
const libRequire = createRequire(benchJoin(libsDir, "package.json"));
const { Matrix, CholeskyDecomposition } = libRequire("ml-matrix");
const sJ0 = libRequire("@stdlib/math-base-special-besselj0");
const sJ1 = libRequire("@stdlib/math-base-special-besselj1");
const sEllipK = libRequire("@stdlib/math-base-special-ellipk");
const sEllipE = libRequire("@stdlib/math-base-special-ellipe");
const sErfc = libRequire("@stdlib/math-base-special-erfc");
const sNormQ = libRequire("@stdlib/stats-base-dists-normal-quantile");
const sTQ = libRequire("@stdlib/stats-base-dists-t-quantile");
import fftMod from "../../lib/dist/numeric/fft.js";
import bessel from "../../lib/dist/numeric/bessel.js";
import ell from "../../lib/dist/numeric/ellipticIntegrals.js";
import dist from "../../lib/dist/numeric/distributions.js";
import dense from "../../lib/dist/numeric/denseLinalg.js";
import { pythonTiming, summary } from "./util.mjs";

const cpuMs = () => {
  const c = process.cpuUsage();
  return (c.user + c.system) / 1e3;
};

/** A B A B: `runs` batches of each, after `warmup` batches of each. */
function abab(ours, lib, { runs = 15, warmup = 3 } = {}) {
  for (let i = 0; i < warmup; i++) {
    ours();
    lib();
  }
  const o = [],
    l = [];
  for (let i = 0; i < runs; i++) {
    let t = cpuMs();
    ours();
    o.push(cpuMs() - t);
    t = cpuMs();
    lib();
    l.push(cpuMs() - t);
  }
  return { o: summary(o), l: summary(l) };
}

// mpmath (50 digits) values at given points; fn is a Python expression of x (and nu where given)
const MP = `
import json, sys, mpmath as mp
mp.mp.dps = 50
d = json.load(sys.stdin)
out = {}
for name, spec in d.items():
    f = eval("lambda x, nu=None: " + spec["expr"], {"mp": mp})
    out[name] = [float(f(mp.mpf(x), None if nu is None else (nu if isinstance(nu, str) else mp.mpf(nu)))) for x, nu in zip(spec["x"], spec.get("nu", [None] * len(spec["x"])))]
print(json.dumps(out))
`;

const NUMPY_FFT = `
import json, sys, numpy as np
d = json.load(sys.stdin)
out = {}
for k, v in d.items():
    z = np.fft.fft(np.array(v[0]) + 1j * np.array(v[1]))
    out[k] = [z.real.tolist(), z.imag.tolist()]
print(json.dumps(out))
`;

/** Largest error: absolute (rel false), relative (true) or relative to max(|ref|, 1) ("mixed"). */
function maxErr(values, ref, rel) {
  let e = 0;
  for (let i = 0; i < ref.length; i++) {
    const d = Math.abs(values[i] - ref[i]) / (rel === "mixed" ? Math.max(Math.abs(ref[i]), 1) : rel ? Math.max(Math.abs(ref[i]), 1e-300) : 1);
    if (!(d <= e)) e = Number.isNaN(d) ? Infinity : Math.max(e, d);
  }
  return e;
}

// The hand-written iterative radix-2 Cooley-Tukey transform that lib/src/numeric/fft.ts used before it
// switched to fft.js, as it was there (offset and stride, for the rows and columns of fft2), kept here so
// the measurement that decided the switch can be repeated.
const handPlans = new Map();
function handRadix2(re, im, offset, stride, n, sign) {
  let p = handPlans.get(n);
  if (!p) {
    const bits = Math.round(Math.log2(n));
    const rev = new Uint32Array(n);
    for (let i = 0; i < n; i++) {
      let r = 0;
      for (let b = 0; b < bits; b++) r |= ((i >> b) & 1) << (bits - 1 - b);
      rev[i] = r;
    }
    const half = n >> 1,
      cos = new Float64Array(half),
      sin = new Float64Array(half);
    for (let i = 0; i < half; i++) {
      cos[i] = Math.cos((2 * Math.PI * i) / n);
      sin[i] = Math.sin((2 * Math.PI * i) / n);
    }
    p = { rev, cos, sin };
    handPlans.set(n, p);
  }
  const { rev, cos, sin } = p;
  for (let i = 0; i < n; i++) {
    const j = rev[i];
    if (j > i) {
      const a = offset + i * stride,
        b = offset + j * stride;
      let t = re[a];
      re[a] = re[b];
      re[b] = t;
      t = im[a];
      im[a] = im[b];
      im[b] = t;
    }
  }
  for (let size = 2; size <= n; size <<= 1) {
    const halfSize = size >> 1,
      step = n / size;
    for (let start = 0; start < n; start += size) {
      for (let k = 0; k < halfSize; k++) {
        const wr = cos[k * step],
          wi = sign * sin[k * step];
        const a = offset + (start + k) * stride,
          b = a + halfSize * stride;
        const xr = re[b] * wr - im[b] * wi,
          xi = re[b] * wi + im[b] * wr;
        re[b] = re[a] - xr;
        im[b] = im[a] - xi;
        re[a] = re[a] + xr;
        im[a] = im[a] + xi;
      }
    }
  }
}

function lcg(seed) {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

export default async () => {
  const rows = [];
  const row = (name, r, reference, accOurs, accLib, accKind, decision) => {
    const ratio = r.o.median / r.l.median;
    rows.push({
      group: "library or hand-written",
      name: `${name}: ours/library ${ratio.toFixed(2)}, ${accKind} error ours ${accOurs.toExponential(1)}, library ${accLib.toExponential(1)}`,
      ours_ms: r.o.median,
      ours_spread: r.o.spread,
      reference,
      reference_ms: r.l.median,
      reference_spread: r.l.spread,
      ratio,
      goal: `informational: ${decision}`,
    });
  };

  // ---- scalar special functions: accuracy points (mpmath) and timing batches
  const rnd = lcg(12345);
  const pts = (n, f) => Array.from({ length: n }, (_, i) => f(i / (n - 1), rnd()));
  const besselX = pts(300, (u, r) => 100 * (u * 0.7 + 0.3 * r));
  const ellK = pts(300, (u) => Math.min(u, 1 - 1e-12) * (1 - 1e-9) + (u === 1 ? 0 : 0));
  const erfcX = pts(400, (u) => -5 + 31.5 * u); // to 26.5: beyond about 26.55 erfc is subnormal (or 0)
  const normP = [...pts(200, (u) => 1e-300 ** (1 - u) * 0.5), ...pts(200, (u) => 0.5 + 0.4999999 * u)];
  const tNu = [1, 2.5, 5, 30, 1000];
  const tP = [1e-10, 1e-4, 0.001, 0.025, 0.1, 0.3, 0.5, 0.7, 0.9, 0.975, 0.999, 0.99999];
  const tx = [],
    tnu = [];
  for (const nu of tNu)
    for (const p of tP) {
      tx.push(p);
      tnu.push(nu);
    }
  const ref = pythonTiming(MP, {
    j0: { expr: "mp.besselj(0, x)", x: besselX },
    j1: { expr: "mp.besselj(1, x)", x: besselX },
    K: { expr: "mp.ellipk(x**2)", x: ellK },
    E: { expr: "mp.ellipe(x**2)", x: ellK },
    erfc: { expr: "mp.erfc(x)", x: erfcX },
    // quantiles: root of the mpmath CDF minus p, started from the library's value (nu carries it)
    normq: { expr: "mp.findroot(lambda z: mp.erfc(-z / mp.sqrt(2)) / 2 - x, nu)", x: normP, nu: normP.map((p) => dist.normalQuantile(p)) },
    // Student t quantile: solve CDF(t) = p with mpmath's regularized incomplete beta
    tq: {
      expr: "(lambda v, t0: mp.findroot(lambda t: (1 - mp.betainc(v/2, mp.mpf(1)/2, 0, v/(v+t*t), regularized=True)/2 if t > 0 else mp.betainc(v/2, mp.mpf(1)/2, 0, v/(v+t*t), regularized=True)/2) - x, t0))(mp.mpf(nu.split()[0]), mp.mpf(nu.split()[1]))",
      x: tx,
      nu: tx.map((p, i) => `${tnu[i]} ${sTQ(p, tnu[i])}`),
    },
  });
  const evalAll = (f, xs) => xs.map(f);

  // timing inputs: 20 000 points over the same ranges
  const N = 20000;
  const tb = Float64Array.from({ length: N }, (_, i) => (100 * i) / N + 1e-3);
  const tk = Float64Array.from({ length: N }, (_, i) => (0.999999 * i) / N);
  const te = Float64Array.from({ length: N }, (_, i) => -5 + (32 * i) / N);
  const tp = Float64Array.from({ length: N }, (_, i) => (i + 0.5) / N);
  let sink = 0;
  const batch = (f, xs) => () => {
    let s = 0;
    for (let i = 0; i < xs.length; i++) s += f(xs[i]);
    sink += s;
  };

  row(
    "Bessel J0, 20 000 points on (0, 100]",
    abab(batch(bessel.besselJ0, tb), batch(sJ0, tb)),
    "@stdlib/math-base-special-besselj0",
    maxErr(evalAll(bessel.besselJ0, besselX), ref.j0, false),
    maxErr(evalAll(sJ0, besselX), ref.j0, false),
    "absolute",
    "kept ours (see bessel.ts header)",
  );
  row(
    "Bessel J1, 20 000 points on (0, 100]",
    abab(batch(bessel.besselJ1, tb), batch(sJ1, tb)),
    "@stdlib/math-base-special-besselj1",
    maxErr(evalAll(bessel.besselJ1, besselX), ref.j1, false),
    maxErr(evalAll(sJ1, besselX), ref.j1, false),
    "absolute",
    "kept ours (see bessel.ts header)",
  );
  const j01 = new Float64Array(2);
  row(
    "Bessel J0 and J1 together (the Hankel-transform use), 20 000 points",
    abab(
      batch((x) => {
        bessel.besselJ01(x, j01);
        return j01[0] + j01[1];
      }, tb),
      batch((x) => sJ0(x) + sJ1(x), tb),
    ),
    "@stdlib besselj0 + besselj1",
    Math.max(maxErr(evalAll(bessel.besselJ0, besselX), ref.j0, false), maxErr(evalAll(bessel.besselJ1, besselX), ref.j1, false)),
    Math.max(maxErr(evalAll(sJ0, besselX), ref.j0, false), maxErr(evalAll(sJ1, besselX), ref.j1, false)),
    "absolute",
    "kept ours (see bessel.ts header)",
  );
  row(
    "elliptic K(k) and E(k), 20 000 moduli in [0, 1)",
    abab(
      batch((k) => {
        const r = ell.completeEllipticIntegrals(k);
        return r.K + r.E;
      }, tk),
      batch((k) => sEllipK(k * k) + sEllipE(k * k), tk),
    ),
    "@stdlib ellipk + ellipe (parameter m = k^2)",
    Math.max(maxErr(evalAll(ell.ellipticK, ellK), ref.K, true), maxErr(evalAll(ell.ellipticE, ellK), ref.E, true)),
    Math.max(
      maxErr(
        evalAll((k) => sEllipK(k * k), ellK),
        ref.K,
        true,
      ),
      maxErr(
        evalAll((k) => sEllipE(k * k), ellK),
        ref.E,
        true,
      ),
    ),
    "relative",
    "kept ours (see ellipticIntegrals.ts header)",
  );
  row(
    "erfc, 20 000 points on [-5, 27] (accuracy on [-5, 26.5])",
    abab(batch(dist.erfc, te), batch(sErfc, te)),
    "@stdlib/math-base-special-erfc",
    maxErr(evalAll(dist.erfc, erfcX), ref.erfc, true),
    maxErr(evalAll(sErfc, erfcX), ref.erfc, true),
    "relative",
    "kept ours, rewritten: 3e-16 below x = 6, 1.5e-15 above (distributions.ts header)",
  );
  row(
    "normal quantile, 20 000 p in (0, 1)",
    abab(
      batch(dist.normalQuantile, tp),
      batch((p) => sNormQ(p, 0, 1), tp),
    ),
    "@stdlib/stats-base-dists-normal-quantile",
    maxErr(evalAll(dist.normalQuantile, normP), ref.normq, "mixed"),
    maxErr(
      evalAll((p) => sNormQ(p, 0, 1), normP),
      ref.normq,
      "mixed",
    ),
    "relative (to max(|z|, 1))",
    "kept ours: the library gives -Infinity below p of about 1e-100 (distributions.ts)",
  );
  const tpSmall = tp.filter((_, i) => i % 10 === 0);
  row(
    "Student t quantile, 2 000 p x nu in {1, 2.5, 5, 30, 1000}",
    abab(
      () => {
        for (const nu of tNu) batch((p) => dist.studentTQuantile(p, nu), tpSmall)();
      },
      () => {
        for (const nu of tNu) batch((p) => sTQ(p, nu), tpSmall)();
      },
      { runs: 9, warmup: 2 },
    ),
    "@stdlib/stats-base-dists-t-quantile",
    maxErr(
      tx.map((p, i) => dist.studentTQuantile(p, tnu[i])),
      ref.tq,
      "mixed",
    ),
    maxErr(
      tx.map((p, i) => sTQ(p, tnu[i])),
      ref.tq,
      "mixed",
    ),
    "relative (to max(|t|, 1))",
    "kept ours: the library (faster, more accurate) weighs about 190 kB minified (distributions.ts)",
  );

  // ---- FFT, powers of two, complex input (numpy.fft as the accuracy reference)
  const fftIn = {};
  const sizes = [1024, 65536];
  for (const n of sizes) {
    const r2 = lcg(n);
    fftIn[n] = [Array.from({ length: n }, () => r2() - 0.5), Array.from({ length: n }, () => r2() - 0.5)];
  }
  const npf = pythonTiming(NUMPY_FFT, fftIn);
  for (const n of sizes) {
    const [xr, xi] = fftIn[n];
    const re = new Float64Array(n),
      im = new Float64Array(n);
    // "ours" is the hand-written radix-2 that fft.ts had; the library side is lib's fft() as it is now
    // (fft.js behind our planar API, copies included) and fft.js alone on its interleaved arrays
    const hand = () => {
      re.set(xr);
      im.set(xi);
      handRadix2(re, im, 0, 1, n, -1);
    };
    const libApi = () => {
      re.set(xr);
      im.set(xi);
      fftMod.fft(re, im);
    };
    const f = new FFT(n);
    const inter = f.createComplexArray(),
      out = f.createComplexArray();
    for (let k = 0; k < n; k++) {
      inter[2 * k] = xr[k];
      inter[2 * k + 1] = xi[k];
    }
    const libOnly = () => f.transform(out, inter);
    const reps = Math.max(1, Math.round(262144 / n));
    const rep = (g) => () => {
      for (let q = 0; q < reps; q++) g();
    };
    const [rr, ri] = npf[n];
    const scale = Math.sqrt(n);
    hand();
    const eo = Math.max(maxErr(re, rr, false), maxErr(im, ri, false)) / scale;
    libApi();
    const el = Math.max(maxErr(re, rr, false), maxErr(im, ri, false)) / scale;
    libOnly();
    const el2 =
      Math.max(
        maxErr(
          out.filter((_, k) => k % 2 === 0),
          rr,
          false,
        ),
        maxErr(
          out.filter((_, k) => k % 2 === 1),
          ri,
          false,
        ),
      ) / scale;
    row(
      `FFT n = ${n} complex, ${reps} transforms a run, hand-written radix-2 vs lib fft() now (fft.js, planar copies included)`,
      abab(rep(hand), rep(libApi)),
      "lib fft() through fft.js 4",
      eo,
      el,
      "max |X - numpy| / sqrt(n)",
      "switched to fft.js (fft.ts header)",
    );
    row(
      `FFT n = ${n} complex, ${reps} transforms a run, hand-written radix-2 vs fft.js alone (interleaved arrays)`,
      abab(rep(hand), rep(libOnly)),
      "fft.js 4 transform()",
      eo,
      el2,
      "max |X - numpy| / sqrt(n)",
      "switched to fft.js (fft.ts header)",
    );
  }

  // ---- Cholesky of SPD Gram matrices (the least-squares use: n = 4 ... 60)
  for (const n of [5, 20, 60]) {
    const r3 = lcg(n + 7);
    const A = Array.from({ length: 3 * n * n }, () => r3() - 0.5);
    const G = new Float64Array(n * n);
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k < 3 * n; k++) s += A[k * n + i] * A[k * n + j];
        G[i + j * n] = s + (i === j ? 1e-3 : 0);
      }
    const reps = Math.max(1, Math.round(20000 / (n * n)));
    const ours = () => {
      for (let q = 0; q < reps; q++) dense.choleskyLower(G, n, 0);
    };
    const viaLib = () => {
      for (let q = 0; q < reps; q++) {
        const rowsArr = [];
        for (let i = 0; i < n; i++) {
          const rw = new Array(n);
          for (let j = 0; j < n; j++) rw[j] = G[i + j * n];
          rowsArr.push(rw);
        }
        const L = new CholeskyDecomposition(new Matrix(rowsArr)).lowerTriangularMatrix;
        const out = new Float64Array(n * n);
        for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) out[i + j * n] = L.get(i, j);
      }
    };
    const resid = (L) => {
      let e = 0,
        g = 0;
      for (let i = 0; i < n; i++)
        for (let j = 0; j < n; j++) {
          let s = 0;
          for (let k = 0; k < n; k++) s += L(i, k) * L(j, k);
          e = Math.max(e, Math.abs(s - G[i + j * n]));
          g = Math.max(g, Math.abs(G[i + j * n]));
        }
      return e / g;
    };
    const Lo = dense.choleskyLower(G, n, 0);
    const rowsArr = [];
    for (let i = 0; i < n; i++) {
      const rw = [];
      for (let j = 0; j < n; j++) rw.push(G[i + j * n]);
      rowsArr.push(rw);
    }
    const Ll = new CholeskyDecomposition(new Matrix(rowsArr)).lowerTriangularMatrix;
    row(
      `Cholesky n = ${n}, ${reps} factorizations a run (column-major Float64Array in and out)`,
      abab(ours, viaLib),
      "ml-matrix 6 CholeskyDecomposition",
      resid((i, k) => Lo[i + k * n]),
      resid((i, k) => Ll.get(i, k)),
      "max |L L^T - G| / max |G|",
      "kept ours (denseLinalg.ts choleskyLower)",
    );
  }
  if (sink === 42) console.log("");
  return rows;
};
