/**
 * Real dilogarithm Li2(x) = -int_0^x ln(1 - t) / t dt for x <= 1.
 * Method: the Bernoulli series in u = -ln(1 - x), Li2 = sum_n B_n u^(n+1) / (n+1)!, used for
 * -1 <= x <= 1/2 (|u| <= ln 2), with the reflections Li2(x) = -pi^2/6 - ln^2(-x)/2 - Li2(1/x) for
 * x < -1 and Li2(x) = pi^2/6 - ln(x) ln(1 - x) - Li2(1 - x) for 1/2 < x <= 1.
 * Source: L. Lewin, *Polylogarithms and Associated Functions* (North-Holland 1981), ch. 1;
 * checked against scipy.special.spence (Li2(x) = spence(1 - x)) in the tests.
 */
import { InputError } from "../errors.js";

// B_n / (n+1)! for n = 0..; B_1 = -1/2, odd B_n (n >= 3) vanish.
const BERN = [1, -1 / 2, 1 / 6, 0, -1 / 30, 0, 1 / 42, 0, -1 / 30, 0, 5 / 66, 0, -691 / 2730, 0, 7 / 6, 0, -3617 / 510, 0, 43867 / 798, 0, -174611 / 330, 0, 854513 / 138];
const COEF: number[] = [];
{
  let f = 1;
  for (let n = 0; n < BERN.length; n++) {
    f *= n + 1;
    COEF.push(BERN[n]! / f);
  }
}

export function dilogarithm(x: number): number {
  if (!Number.isFinite(x) || x > 1) throw new InputError("x", x, "a real number <= 1 (the real dilogarithm)");
  if (x === 1) return (Math.PI * Math.PI) / 6;
  if (x < -1) {
    const l = Math.log(-x);
    return -(Math.PI * Math.PI) / 6 - 0.5 * l * l - dilogarithm(1 / x);
  }
  if (x > 0.5) return (Math.PI * Math.PI) / 6 - Math.log(x) * Math.log1p(-x) - dilogarithm(1 - x);
  const u = -Math.log1p(-x);
  let sum = 0;
  let p = u;
  for (let n = 0; n < COEF.length; n++) {
    sum += COEF[n]! * p;
    p *= u;
  }
  return sum;
}
