/**
 * NIST Statistical Reference Datasets for nonlinear regression, from both NIST starting points.
 * Source: NIST StRD, https://www.itl.nist.gov/div898/strd/nls/nls_main.shtml (certified values to
 * 11 significant digits; files and provenance in test/data/nist/).
 *
 * Tolerance: NIST asks software to reproduce the certified values; the customary yardstick is the
 * log relative error LRE = -log10(|value - certified| / |certified|) (B. McCullough, Am. Stat. 52,
 * 358 (1998), who rates LRE >= 4 to 6 as good for nonlinear problems). We require LRE >= 6 for
 * every parameter (6 significant digits, relative tolerance 1e-6) and LRE >= 6 for the residual sum
 * of squares. The certified standard deviations come from the Jacobian at the optimum, which for
 * the ill-conditioned sets (Bennett5, MGH09, Thurber) is sensitive to the last digits of the
 * optimum: we require LRE >= 4 for them (relative 1e-4) and LRE >= 6 elsewhere.
 */
import { describe, it, expect } from "vitest";
import { readNist, lre } from "./nistHelpers.js";
import { solveLeastSquares, type LeastSquaresProblem } from "../../../lib/src/fit/leastSquares.js";

type Model = (b: Float64Array, x: number) => number;
type Grad = (b: Float64Array, x: number, g: Float64Array) => void;
const models: Record<string, { f: Model; g: Grad }> = {
  Misra1a: {
    f: (b, x) => b[0] * (1 - Math.exp(-b[1] * x)),
    g: (b, x, g) => {
      const e = Math.exp(-b[1] * x);
      g[0] = 1 - e;
      g[1] = b[0] * x * e;
    },
  },
  BoxBOD: {
    f: (b, x) => b[0] * (1 - Math.exp(-b[1] * x)),
    g: (b, x, g) => {
      const e = Math.exp(-b[1] * x);
      g[0] = 1 - e;
      g[1] = b[0] * x * e;
    },
  },
  Eckerle4: {
    f: (b, x) => (b[0] / b[1]) * Math.exp(-0.5 * ((x - b[2]) / b[1]) ** 2),
    g: (b, x, g) => {
      const u = (x - b[2]) / b[1];
      const e = Math.exp(-0.5 * u * u);
      g[0] = e / b[1];
      g[1] = (b[0] / b[1]) * e * (-1 / b[1] + (u * u) / b[1]);
      g[2] = (b[0] / b[1]) * e * (u / b[1]);
    },
  },
  MGH09: {
    f: (b, x) => (b[0] * (x * x + x * b[1])) / (x * x + x * b[2] + b[3]),
    g: (b, x, g) => {
      const num = x * x + x * b[1];
      const den = x * x + x * b[2] + b[3];
      g[0] = num / den;
      g[1] = (b[0] * x) / den;
      g[2] = (-b[0] * num * x) / (den * den);
      g[3] = (-b[0] * num) / (den * den);
    },
  },
  Rat43: {
    f: (b, x) => b[0] / (1 + Math.exp(b[1] - b[2] * x)) ** (1 / b[3]),
    g: (b, x, g) => {
      const e = Math.exp(b[1] - b[2] * x);
      const base = 1 + e;
      const p = base ** (-1 / b[3]);
      g[0] = p;
      g[1] = (-b[0] / b[3]) * p * (e / base);
      g[2] = (b[0] / b[3]) * p * ((x * e) / base);
      g[3] = (b[0] * p * Math.log(base)) / (b[3] * b[3]);
    },
  },
  Thurber: {
    f: (b, x) => (b[0] + b[1] * x + b[2] * x * x + b[3] * x ** 3) / (1 + b[4] * x + b[5] * x * x + b[6] * x ** 3),
    g: (b, x, g) => {
      const num = b[0] + b[1] * x + b[2] * x * x + b[3] * x ** 3;
      const den = 1 + b[4] * x + b[5] * x * x + b[6] * x ** 3;
      g[0] = 1 / den;
      g[1] = x / den;
      g[2] = (x * x) / den;
      g[3] = x ** 3 / den;
      const q = -num / (den * den);
      g[4] = q * x;
      g[5] = q * x * x;
      g[6] = q * x ** 3;
    },
  },
  Bennett5: {
    f: (b, x) => b[0] * (b[1] + x) ** (-1 / b[2]),
    g: (b, x, g) => {
      const base = b[1] + x;
      const p = base ** (-1 / b[2]);
      g[0] = p;
      g[1] = ((-b[0] / b[2]) * p) / base;
      g[2] = (b[0] * p * Math.log(base)) / (b[2] * b[2]);
    },
  },
};
const hard = new Set(["Bennett5", "MGH09", "Thurber"]);

function problemFor(name: string, start: number[], analytic: boolean): { p: LeastSquaresProblem; set: ReturnType<typeof readNist> } {
  const set = readNist(name);
  const { f, g } = models[name];
  const n = set.names.length;
  const m = set.x.length;
  const p: LeastSquaresProblem = {
    parameters: set.names.map((nm, j) => ({ name: nm, value: start[j] })),
    m,
    y: set.y,
    sigma: null,
    model(b, out) {
      for (let i = 0; i < m; i++) out[i] = f(b, set.x[i]);
    },
  };
  if (analytic) {
    const gr = new Float64Array(n);
    p.modelJacobian = (b, out) => {
      for (let i = 0; i < m; i++) {
        g(b, set.x[i], gr);
        for (let j = 0; j < n; j++) out[j * m + i] = gr[j];
      }
    };
  }
  return { p, set };
}

describe("NIST StRD nonlinear regression", () => {
  for (const name of Object.keys(models)) {
    for (const which of ["start1", "start2"] as const) {
      for (const analytic of [true, false]) {
        it(`${name} from ${which} (${analytic ? "analytic" : "central-difference"} Jacobian)`, () => {
          const set = readNist(name);
          const { p } = problemFor(name, set[which], analytic);
          const r = solveLeastSquares(p, { maxEvaluations: 5000 });
          expect(r.status, r.message).toBe("converged");
          // Source: NIST StRD certified values (test/data/nist/<name>.dat)
          set.names.forEach((nm, j) => {
            expect(lre(r.parameters[nm].value, set.certified[j]), `${nm}: ${r.parameters[nm].value} vs ${set.certified[j]}`).toBeGreaterThanOrEqual(6);
            expect(lre(r.parameters[nm].stderr!, set.certifiedSd[j]), `sd ${nm}: ${r.parameters[nm].stderr} vs ${set.certifiedSd[j]}`).toBeGreaterThanOrEqual(
              hard.has(name) ? 4 : 6,
            );
          });
          expect(lre(r.chiSquare, set.rss)).toBeGreaterThanOrEqual(6);
          expect(r.dof).toBe(set.dof);
        });
      }
    }
  }
});
