/**
 * Physical constants, CODATA 2018 recommended values, SI units.
 * Source: E. Tiesinga, P. Mohr, D. Newell, B. Taylor, "CODATA recommended values of the fundamental
 * physical constants: 2018", Rev. Mod. Phys. 93, 025010 (2021). e, h and k_B are exact in the 2019 SI.
 * Checked against scipy.constants (which carries CODATA 2018) in test/lib/quantity/constants.test.ts.
 */

/** Vacuum magnetic permeability mu0 (N/A^2). */
export const mu0 = 1.25663706212e-6;
/** Bohr magneton muB (J/T). */
export const muB = 9.2740100783e-24;
/** Planck constant h (J s), exact. */
export const h = 6.62607015e-34;
/** Reduced Planck constant hbar = h / 2 pi (J s). */
export const hbar = h / (2 * Math.PI);
/** Boltzmann constant k_B (J/K), exact. */
export const kB = 1.380649e-23;
/** Elementary charge e (C), exact. */
export const e = 1.602176634e-19;
/** Electron g-factor g_e (negative in CODATA's sign convention). */
export const gElectron = -2.00231930436256;
/** Electron gyromagnetic ratio gamma_e (1/(s T)), magnitude. */
export const gammaElectron = 1.76085963023e11;
