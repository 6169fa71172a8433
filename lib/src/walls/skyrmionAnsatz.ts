/**
 * Isolated skyrmion with the 360-degree-wall ansatz tan(theta/2) = sinh(R/w) / sinh(rho/w):
 * minimize the full energy (skyrmionEnergy.ts, including non-local thin-film magnetostatics) over the
 * radius R (m_z = 0 at rho = R), the wall width w and, for interfacial DMI, the helicity.
 * Sources: ansatz of H.-B. Braun, PRB 50, 16501 (1994) and F. Buettner, I. Lemesh, G. Beach,
 * Sci. Rep. 8, 4464 (2018); energy functional of S. Rohart, A. Thiaville, PRB 88, 184422 (2013).
 *
 * Scaling (ours). With x = rho / w and a = R / w the profile depends on a only, so
 *   E(a, w, psi) = 2 pi t [ A I_ex(a) + (K_eff I_K(a) + Ms B I_Z(a)) w^2 + D h I_D(a) w ]
 *                  + mu0 Ms^2 t w^2 [ Phi_s(a, t/w) + cos^2(psi) Phi_v(a, t/w) ],
 *   I_ex = Int (theta_x^2 + sin^2 theta / x^2) x dx, I_K = Int sin^2 theta x dx,
 *   I_D = Int (theta_x x + sin theta cos theta) dx (< 0), I_Z = Int (1 - cos theta) x dx,
 * h = cos psi (interfacial) or sin psi (bulk), and Phi_s, Phi_v the dimensionless surface and volume
 * magnetostatic integrals of magnetostatics.ts in the length unit w. Closed forms used for the profile:
 * 1 - cos theta = 2 sinh^2 a / (sinh^2 x + sinh^2 a), sin theta = 2 sinh a sinh x / (sinh^2 x + sinh^2 a),
 * theta_x = -sin theta coth x.
 *
 * Speed. Phi_s, Phi_v and the I_* are universal functions of (a, tau = t / w), shared by all films
 * and fields, kept in a table built lazily where solves go: one row per step 0.1 in ln a, built on
 * first use, holding the row's exact I_* and its Hankel transforms; ln(-Phi_s), ln(Phi_v) are
 * computed from them per column of step 0.25 in ln tau, again on first use, and interpolated by
 * 6-point Lagrange (tensor product in ln a, ln tau; outside the tau range Phi is computed from the
 * row's transforms at the exact tau). A row's transforms come from the lattice (2D trapezoid) rule
 * (ansatzTransformsLattice; spacing set by the profile's analytic strip, about 1 ms per row), not from
 * Bessel-function quadrature: ansatzTransforms / ansatzNonlocalDirect keep the direct Gauss-Legendre
 * route as the independent reference (agreement to about 2e-6, the direct route's own k-grid error).
 * Accuracy of the interpolated energy terms: about 1e-6 relative (Phi) and 1e-7 (I_*), checked in
 * test/lib/walls/magnetostatics.test.ts and skyrmionAnsatz.test.ts.
 * Search (findAnsatzMinima). Window: 0.3 <= a <= 100 (the tables), Delta / 40 <= w <= 40 Delta.
 *  1. Global scan: at 74 points of ln a (step 0.08) the energy is minimized over w on the whole
 *     window (coarse scan of ln w, step 0.5, then Brent); every discrete minimum of this w-minimized
 *     curve is a candidate, and so is the last interval at a window edge the curve falls towards.
 *  2. Local search from each candidate and from each warm start (a state of a neighbouring field):
 *     Brent over ln a with the inner minimum over w followed from the last one (Newton with the
 *     analytic w-dependence of each term and the table's derivatives in ln tau, Brent as fallback;
 *     the interfacial helicity in closed form, cos psi = clamp(-X / 2Y)), then Newton steps on a
 *     central-difference stencil in (ln a, ln w) (results do not depend on last-ulp differences
 *     between JavaScript engines).
 *  3. Verification of each candidate before it is reported: relative gradient below 1e-6, Hessian in
 *     (ln a, ln w) positive definite at stencils 1e-3 and 1e-2, and at least 0.03 (in ln) away from
 *     every window edge. A point on an edge is never reported; the trend towards an edge is
 *     (status "below-window": the minimum, if any, is smaller than the window, where the continuum
 *     energy tends to the Belavin-Polyakov value 8 pi A t, not a collapse; "expanded": run-away
 *     expansion or a bubble larger than the window).
 * Branches over a field sweep (skyrmionBranches): minima at neighbouring fields are linked by
 * continuation with step control, up and down in field; each end of a branch inside the range is
 * located by halving the continuation step to a stated tolerance. Above D_c the ground state at each
 * field follows from the saturation field B_sat of wall360.ts (Bogdanov and Hubert 1994) and the sign
 * of the skyrmion energy (fieldPhase). *
 * Files (skyrmionAnsatz/): integrals.ts (the profile and its local integrals), transforms.ts (Hankel
 * transforms, lattice and direct), table.ts (the shared table of Phi_s, Phi_v and I_*: one
 * AnsatzTable object owning its rows and scratch), energy.ts (energy terms, helicity, the minimum over
 * w), search.ts (global scan, local search, Newton polish, verification), solve.ts (the reported
 * state, its status and the field phase), sweep.ts (field sweeps and branch continuation). This file
 * is their entry point.
 */
export { ANSATZ_A_MAX, ANSATZ_A_MIN, ansatzLocalIntegrals, ansatzProfile, type AnsatzIntegrals } from "./skyrmionAnsatz/integrals.js";
export {
  ansatzAnalyticStrip,
  ansatzNonlocalDirect,
  ansatzTransforms,
  ansatzTransformsLattice,
  ansatzWavenumberNodes,
  type LatticeTransformOptions,
} from "./skyrmionAnsatz/transforms.js";
export { ANSATZ_TABLE_TAU_RANGE, ansatzLocalIntegralsTabulated, ansatzNonlocal, ansatzTableRowsBuilt } from "./skyrmionAnsatz/table.js";
export { ansatzEnergyTerms, type AnsatzEnergyTerms, type AnsatzOptions } from "./skyrmionAnsatz/energy.js";
export { ANSATZ_STATIONARY_TOLERANCE, findAnsatzMinima, type AnsatzSearch, type AnsatzStart, type AnsatzState, type AnsatzVerification } from "./skyrmionAnsatz/search.js";
export { fieldPhase, solveSkyrmionAnsatz, zeroFieldRadiusEstimate, type AnsatzSkyrmion, type FieldPhase } from "./skyrmionAnsatz/solve.js";
export { skyrmionBranches, skyrmionFieldSweep, type AnsatzSweep, type BranchEnd, type SkyrmionBranch, type SkyrmionBranchSweep } from "./skyrmionAnsatz/sweep.js";
