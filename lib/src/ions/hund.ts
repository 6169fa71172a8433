/**
 * Hund's rules for the trivalent rare-earth ions 4f^n (n = 1 ... 13, Ce3+ ... Yb3+) and the Lande
 * factor g_J = 1 + [J(J+1) + S(S+1) - L(L+1)] / [2 J(J+1)] (closed form; Russell-Saunders coupling).
 * Source: F. Hund, Z. Phys. 33, 345 (1925); J. Jensen, A. Mackintosh, *Rare Earth Magnetism* (1991),
 * ch. 1 (the ground multiplets and g_J of the series).
 * Rules: maximize S (fill m_l = 3, 2, ... -3 with parallel spins first), then maximize L = |sum m_l|,
 * then J = |L - S| for a less than half-filled shell, J = L + S for more than half filled.
 * The Stevens factors alpha_J, beta_J, gamma_J are computed in stevensFactors.ts.
 */
import { InputError } from "../errors.js";

export const rareEarthNames = ["Ce", "Pr", "Nd", "Pm", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Yb"] as const;

export interface HundTerm {
  ion: string;
  electrons: number;
  S: number;
  L: number;
  J: number;
  /** Lande factor; null for J = 0. */
  gJ: number | null;
  /** Term symbol like "4I9/2". */
  term: string;
}

export function landeFactor(L: number, S: number, J: number): number {
  if (!(J > 0)) throw new InputError("J", J, "J > 0 (g_J is undefined for J = 0)");
  return 1 + (J * (J + 1) + S * (S + 1) - L * (L + 1)) / (2 * J * (J + 1));
}

export function hundGroundTerm(electrons: number): Omit<HundTerm, "ion"> {
  if (!Number.isInteger(electrons) || electrons < 1 || electrons > 13) throw new InputError("electrons", electrons, "a whole number of 4f electrons from 1 to 13");
  // spin up electrons fill m_l = 3 ... -3, then spin down fill 3 ... -3
  let up = 0,
    down = 0,
    Ml = 0;
  for (let k = 0; k < electrons; k++) {
    const ml = 3 - (k % 7);
    if (k < 7) up++;
    else down++;
    Ml += ml;
  }
  const S = (up - down) / 2;
  const L = Math.abs(Ml);
  const J = electrons < 7 ? Math.abs(L - S) : L + S;
  const letters = "SPDFGHIKLMNOQ";
  const jText = Number.isInteger(J) ? String(J) : `${2 * J}/2`;
  return { electrons, S, L, J, gJ: J > 0 ? landeFactor(L, S, J) : null, term: `${2 * S + 1}${letters[L]}${jText}` };
}

/** The ground multiplets of Ce3+ ... Yb3+ from Hund's rules. */
export function rareEarthTable(): HundTerm[] {
  return rareEarthNames.map((name, i) => ({ ion: `${name}3+`, ...hundGroundTerm(i + 1) }));
}
