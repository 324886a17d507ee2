#!/usr/bin/env python3
"""Fixture for test/solver2d: bound states of a finite-barrier circular wire by exact Bessel matching.

Single-band BenDaniel-Duke envelope psi = R(r) exp(i l phi): R = J_l(k r) inside (r < a),
K_l(kappa r) outside, with psi continuous and (1/m) dpsi/dr continuous at r = a, giving
    (1/m_w) k J_l'(k a) / J_l(k a) = (1/m_b) kappa K_l'(kappa a) / K_l(kappa a),
k = sqrt(m_w E / c), kappa = sqrt(m_b (V0 - E) / c), c = hbar^2/2m0 = 0.0380998212 eV nm^2
(CODATA 2018). Written without denominators as
    g(E) = (1/m_w) k J_l'(ka) K_l(kappa a) - (1/m_b) kappa K_l'(kappa a) J_l(ka) = 0,
roots bracketed on a fine energy scan and refined with scipy.optimize.brentq. The wire (GaAs-like
well mass, AlGaAs-like barrier) is invented for the test. Run: python3 circular_wire.py
"""
import json
import os

import numpy as np
from scipy.optimize import brentq
from scipy.special import jv, jvp, kv, kvp

C = 0.0380998212  # eV nm^2
CASE = {"radius_nm": 7.0, "V_well_eV": 0.0, "V_barrier_eV": 0.3, "mass_well": 0.067, "mass_barrier": 0.092}


def g(E, l, a, V0, mw, mb):
    k = np.sqrt(mw * E / C)
    kap = np.sqrt(mb * (V0 - E) / C)
    return k * jvp(l, k * a) * kv(l, kap * a) / mw - kap * kvp(l, kap * a) * jv(l, k * a) / mb


def bound_states(l, a, V0, mw, mb):
    grid = np.linspace(1e-9, V0 * (1 - 1e-9), 200001)
    vals = g(grid, l, a, V0, mw, mb)
    roots = []
    for i in np.nonzero(np.sign(vals[:-1]) * np.sign(vals[1:]) < 0)[0]:
        roots.append(brentq(g, grid[i], grid[i + 1], args=(l, a, V0, mw, mb), xtol=1e-15, rtol=1e-14))
    return roots


def main():
    a, V0, mw, mb = CASE["radius_nm"], CASE["V_barrier_eV"], CASE["mass_well"], CASE["mass_barrier"]
    states = [{"l": l, "n": n + 1, "E_eV": E} for l in (0, 1, 2) for n, E in enumerate(bound_states(l, a, V0, mw, mb))]
    out = {"source": "exact Bessel matching, circular_wire.py (scipy.special jv/kv, scipy.optimize.brentq)",
           "hbar2_over_2m0_eV_nm2": C, **CASE, "states": states}
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "circular_wire.json")
    with open(path, "w") as f:
        json.dump(out, f, indent=2)
        f.write("\n")


if __name__ == "__main__":
    main()
