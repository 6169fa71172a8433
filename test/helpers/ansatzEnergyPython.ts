/**
 * An independent numpy/scipy evaluation of the isolated-skyrmion ansatz energy
 * tan(theta/2) = sinh(R/w) / sinh(rho/w) with thin-film magnetostatics, for tests of
 * lib/src/walls/skyrmionAnsatz.ts: local terms by Gauss-Legendre quadrature in rho, the non-local
 * surface and volume terms from Hankel transforms with scipy.special.j0/j1 on a Gauss-Legendre k grid
 * (E_s = pi mu0 Ms^2 t Int k F0^2 (g - 1) dk, E_v = pi mu0 Ms^2 t cos^2 psi Int k G1^2 (1 - g) dk,
 * g = (1 - exp(-kt)) / kt; the helicity minimizes X cos psi + V cos^2 psi). No table, no code shared
 * with the library. Python source to prepend to a test script; defines energy(film, B, R, w) in J.
 */
export const ANSATZ_ENERGY_PY = String.raw`
import json, sys, numpy as np
from scipy.special import j0, j1
mu0 = 4e-7 * np.pi
GX, GW = np.polynomial.legendre.leggauss(8)

def nodes(lo, hi, width):
    n = max(1, int(np.ceil((hi - lo) / width)))
    e = np.linspace(lo, hi, n + 1)
    a = e[:-1][:, None]; b = e[1:][:, None]
    return (0.5 * (a + b) + 0.5 * (b - a) * GX[None, :]).ravel(), (0.5 * (b - a) * GW[None, :]).ravel()

def energy(f, B, R, w):
    Ms, A, Ku, D, t = f["Ms"], f["A"], f["Ku"], f["D"], f["t"]
    K = Ku - 0.5 * mu0 * Ms**2
    a = R / w
    core = max(0.0, (a - 25) * w)   # 1 - cos(theta) = 2 and sin(theta) = 0 to 1e-21 inside
    rmax = R + 40 * w
    rho, wr = nodes(core, rmax, 0.8 * w)
    x = rho / w
    sa = 0.5 * (1 - np.exp(-2 * a))               # sinh(a) e^-a
    sx = 0.5 * (np.exp(x - a) - np.exp(-x - a))   # sinh(x) e^-a
    cx = 0.5 * (np.exp(x - a) + np.exp(-x - a))
    den = sx**2 + sa**2
    omc = 2 * sa**2 / den
    sn = 2 * sa * sx / den
    cs = (sx**2 - sa**2) / den
    thp = -2 * sa * cx / den / w
    ex = np.sum((thp**2 + sn**2 / rho**2) * rho * wr)
    Kt = np.sum(sn**2 * rho * wr)
    Z = np.sum(omc * rho * wr) + core**2          # Int_0^core 2 rho d rho
    Dm = np.sum((thp + sn * cs / rho) * rho * wr)
    local = 2 * np.pi * t * (A * ex + K * Kt + Ms * B * Z)
    X = 2 * np.pi * t * D * Dm
    kmax = 20.0 / w
    k, wk = nodes(0.0, kmax, min(6.0 / rmax, 0.3 / t, 0.8 / w))
    F0 = np.zeros_like(k); G1 = np.zeros_like(k)
    for i in range(0, len(k), 500):
        kk = k[i:i + 500]
        kr = np.outer(kk, rho)
        F0[i:i + 500] = j0(kr) @ (omc * rho * wr) + (2 * core * j1(kk * core) / kk if core > 0 else 0)
        G1[i:i + 500] = j1(kr) @ (sn * rho * wr)
    kt = k * t
    g = -np.expm1(-kt) / kt
    Es = np.pi * mu0 * Ms**2 * t * np.sum(k * F0**2 * (g - 1) * wk)
    V = np.pi * mu0 * Ms**2 * t * np.sum(k * G1**2 * (1 - g) * wk)
    c = np.clip(-X / (2 * V), -1, 1) if V > 0 else -np.sign(X)
    return local + X * c + Es + V * c * c
`;
