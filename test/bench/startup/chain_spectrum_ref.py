# Reference for the start-up row of test/bench/startup.bench.mjs: the minimal Python + numpy +
# scipy script for `helicoid calc chain-spectrum` (defaults: a ring of N = 12 spins 1/2,
# Jz = 10 K, Jperp = 2 K, no field; S^z = 0 and 1; the two lowest levels at each momentum),
# printing JSON. Sector Hamiltonians from bit operations, momentum blocks from the translation
# orbits (numpy eigh), the ground state and the lowest gap (Common practice, no source:
# H = sum_i Jz Sz_i Sz_i+1 + Jperp/2 (S+_i S-_i+1 + h.c.)).
import json, sys
from itertools import combinations
import numpy as np
from scipy import sparse

N, Jz, Jp = 12, 10.0, 2.0


def sector(up):
    states = np.array(sorted(sum(1 << i for i in c) for c in combinations(range(N), up)))
    index = {s: i for i, s in enumerate(states)}
    rows, cols, vals = [], [], []
    for a, s in enumerate(states):
        diag = 0.0
        for i in range(N):
            j = (i + 1) % N
            bi, bj = (s >> i) & 1, (s >> j) & 1
            diag += Jz * (0.25 if bi == bj else -0.25)
            if bi != bj:
                rows.append(index[s ^ (1 << i) ^ (1 << j)]), cols.append(a), vals.append(Jp / 2)
        rows.append(a), cols.append(a), vals.append(diag)
    H = sparse.csr_matrix((vals, (rows, cols)), shape=(len(states),) * 2)
    # orbits under translation: orbit[a, j] = index of T^j |state a>
    orbit = np.empty((len(states), N), int)
    t = states.copy()
    for j in range(N):
        orbit[:, j] = [index[x] for x in t]
        t = ((t << 1) | (t >> (N - 1))) & ((1 << N) - 1)
    reps = np.unique(orbit.min(axis=1))
    return H, orbit[reps]


levels = {}
for up in (N // 2, N // 2 + 1):  # S^z = 0 and 1
    H, orbits = sector(up)
    for m in range(N // 2 + 1):
        phase = np.exp(-2j * np.pi * m * np.arange(N) / N)
        V = np.zeros((H.shape[0], len(orbits)), complex)
        for c, orb in enumerate(orbits):
            np.add.at(V[:, c], orb, phase)
        norms = np.linalg.norm(V, axis=0)
        V = V[:, norms > 1e-9] / norms[norms > 1e-9]
        e = np.linalg.eigvalsh(V.conj().T @ (H @ V))
        levels.setdefault(m, []).extend(e[:2].tolist())
E0 = min(min(v) for v in levels.values())
per_k = {m: sorted(v)[:2] for m, v in levels.items()}
allE = sorted(e for v in per_k.values() for e in v)
json.dump({"groundEnergy": E0, "gap": allE[1] - allE[0], "levels": [[e - E0 for e in per_k[m]] for m in sorted(per_k)]}, sys.stdout)
