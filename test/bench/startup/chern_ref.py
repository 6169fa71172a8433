# Reference for the start-up row of test/bench/startup.bench.mjs: the minimal Python + numpy
# script for `helicoid calc chern` (defaults: t2 = 0.1, phi = pi/2, M = 0.2; a 30 x 30 grid; the
# sweep of the mass M over 21 values in [-1.5, 1.5] on a 24 x 24 grid): Chern numbers of the
# Haldane model's bands by the lattice link-variable method (Fukui, Hatsugai and Suzuki,
# J. Phys. Soc. Jpn. 74, 1674 (2005)), with numpy's batched eigh, printing JSON.
# Bloch Hamiltonian in reduced coordinates (k1, k2) (Common practice, no source: Haldane,
# Phys. Rev. Lett. 61, 2015 (1988), periodic gauge): d_x - i d_y = t1 (1 + e^{-i k1} + e^{-i k2}),
# d_z = M + 2 t2 sin(phi) (sin k1 - sin k2 - sin(k1 - k2)), d_0 = 2 t2 cos(phi) (cos k1 + cos k2 + cos(k1 - k2)).
import json, sys
import numpy as np

t1, t2, phi = 1.0, 0.1, np.pi / 2


def chern(M, n):
    k = 2 * np.pi * np.arange(n) / n
    k1, k2 = np.meshgrid(k, k, indexing="ij")
    off = t1 * (1 + np.exp(-1j * k1) + np.exp(-1j * k2))
    dz = M + 2 * t2 * np.sin(phi) * (np.sin(k1) - np.sin(k2) - np.sin(k1 - k2))
    d0 = 2 * t2 * np.cos(phi) * (np.cos(k1) + np.cos(k2) + np.cos(k1 - k2))
    H = np.empty((n, n, 2, 2), complex)
    H[..., 0, 0], H[..., 1, 1] = d0 + dz, d0 - dz
    H[..., 0, 1], H[..., 1, 0] = off, off.conj()
    _, v = np.linalg.eigh(H)
    out = []
    for b in range(2):
        u = v[..., :, b]
        link = lambda a, c: np.sum(a.conj() * c, axis=-1)
        u1, u2 = np.roll(u, -1, 0), np.roll(u, -1, 1)
        u12 = np.roll(u1, -1, 1)
        F = np.angle(link(u, u1) * link(u1, u12) * link(u12, u2) * link(u2, u))
        out.append(F.sum() / (2 * np.pi))
    return out


lower, upper = chern(0.2, 30)
masses = np.linspace(-1.5, 1.5, 21)
sweep = [chern(M, 24)[0] for M in masses]
json.dump({"chernLower": round(lower), "chernUpper": round(upper), "sweep": [round(c) for c in sweep]}, sys.stdout)
