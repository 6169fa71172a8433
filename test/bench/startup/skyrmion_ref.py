# Reference for the start-up row of test/bench/startup.bench.mjs: the minimal Python + numpy +
# scipy script a competent user would write for "an isolated skyrmion's radius, width and energy in
# this film at this field", printing JSON. It does LESS work than `helicoid calc skyrmion`: one
# field (not a 200-point branch-following sweep), local magnetostatics (K_eff), one local minimum
# (no global scan, no verification). The start-up ratio against it is therefore conservative.
# With local magnetostatics this film's default field has no finite-radius minimum: the search ends
# at the collapse (R -> 0); the calculator finds R = 1.4 nm only with non-local surface charges.
# Its CPU time is what a user pays to start Python, import numpy and scipy and minimize once.
# Model: 360-degree-wall ansatz tan(theta/2) = sinh(R/w) / sinh(rho/w), energy relative to the
# uniform film E = 2 pi t int [A (theta'^2 + sin^2/rho^2) + K_eff sin^2 + D (theta' + sin cos / rho)
# + Ms B (1 - cos theta)] rho drho (Common practice, no source: the textbook thin-film functional).
import json, sys
import numpy as np
from scipy.optimize import minimize
trapezoid = getattr(np, "trapezoid", None) or np.trapz
np.seterr(over="ignore")

Ms, A, Ku, D, t, B = 1.1e6, 15e-12, 1.2e6, 1.5e-3, 1e-9, 0.05  # invented demo film (the calculator's defaults)
mu0 = 1.25663706212e-6
Keff = Ku - mu0 * Ms**2 / 2
delta = np.sqrt(A / Keff)
x = np.linspace(1e-4, 40.0, 8001)  # rho / delta


def energy(p):
    R, w = np.exp(p)
    rho = x * delta
    th = 2 * np.arctan(np.sinh(R / w) / np.sinh(rho / w))
    dth = np.gradient(th, rho)
    s, c = np.sin(th), np.cos(th)
    e = A * (dth**2 + s**2 / rho**2) + Keff * s**2 + D * (dth + s * c / rho) + Ms * B * (1 - c)
    return 2 * np.pi * t * trapezoid(e * rho, rho) / (8 * np.pi * A * t)


r = minimize(energy, np.log([3 * delta, delta]), method="Nelder-Mead", options={"xatol": 1e-6, "fatol": 1e-10})
R, w = np.exp(r.x)
json.dump({"radius": R, "wallWidth": w, "energy": energy(r.x) * 8 * np.pi * A * t}, sys.stdout)
