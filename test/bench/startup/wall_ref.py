# Reference for the start-up row of test/bench/startup.bench.mjs: the minimal Python + numpy +
# scipy script for the 180-degree wall of a film (width, energy, critical DMI, exchange length,
# K_eff, Q), printing JSON. Closed forms (Common practice, no source: the textbook wall formulas
# delta = sqrt(A / K_eff), sigma = 4 sqrt(A K_eff) - pi |D|, D_c = 4 sqrt(A K_eff) / pi).
import json, sys
import numpy as np
from scipy import constants

Ms, A, Ku, D, t = 1.1e6, 15e-12, 1.2e6, 1.5e-3, 1e-9  # invented demo film (the calculator's defaults)
mu0 = constants.mu_0
Kd = mu0 * Ms**2 / 2
Keff = Ku - Kd
out = {
    "width": np.sqrt(A / Keff),
    "energy": 4 * np.sqrt(A * Keff) - np.pi * abs(D),
    "criticalDmi": 4 * np.sqrt(A * Keff) / np.pi,
    "exchangeLength": np.sqrt(2 * A / (mu0 * Ms**2)),
    "effectiveAnisotropy": Keff,
    "qualityFactor": Ku / Kd,
}
json.dump({k: float(v) for k, v in out.items()}, sys.stdout)
