# Reference for the start-up row of test/bench/startup.bench.mjs: the minimal Python + numpy +
# scipy script for `helicoid calc berry-loop` (defaults: 2S = 3, theta = 1 rad, 200 geodesic
# edges; the same 24-angle sweep): the Berry phase of each |S, m> carried around a cone, from the
# overlaps of the states at the polygon's vertices, beside the closed form -m 2 pi (1 - cos theta),
# printing JSON. Spin states from scipy.linalg.expm of the spin matrices (Common practice, no
# source: |n, m> = exp(-i phi Sz) exp(-i theta Sy) |z, m>; gamma = -Im ln prod <u_i|u_i+1>).
import json, sys
import numpy as np
from scipy.linalg import expm

twoS, theta0, N = 3, 1.0, 200
S = twoS / 2
m = S - np.arange(twoS + 1)
sp = np.diag(np.sqrt(S * (S + 1) - m[1:] * (m[1:] + 1)), 1)  # S+ in the basis m = S, S-1, ...
Sy = (sp - sp.T) / 2j
Sz = np.diag(m)
phis = 2 * np.pi * np.arange(N + 1) / N


def phases(theta):
    ry = expm(-1j * theta * Sy)
    u = [np.exp(-1j * p * m)[:, None] * ry for p in phis]  # columns: the states |n(phi), m>
    u[-1] = u[0]
    prod = np.ones(len(m), complex)
    for a, b in zip(u[:-1], u[1:]):
        prod *= np.einsum("ij,ij->j", a.conj(), b)
    return -np.angle(prod)


g = phases(theta0)
sweep = np.linspace(0.05, 3.09, 24)
gs = [phases(t)[0] for t in sweep]
circle = -m * 2 * np.pi * (1 - np.cos(theta0))
json.dump({"gammaDisc": g.tolist(), "gammaCircle": circle.tolist(), "gammaSweep": gs}, sys.stdout)
