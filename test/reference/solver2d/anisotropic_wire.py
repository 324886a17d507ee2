#!/usr/bin/env python3
"""Fixture for test/solver2d/anisotropic.test.ts: discrete levels of the wire operator with a
diagonal mass tensor and with a two-band non-parabolic mass, by dense diagonalisation.

The grid is the one engine/solver2d.ts takes (nodes i + nx*j, Dirichlet walls one spacing outside,
V and masses given per node); the matrix is eigsh_bench.operator (harmonic mean of m_x on x-edges,
of m_y on y-edges, the node's own mass at the wall), diagonalised in full by numpy.linalg.eigh.
A rectangular well of nodes (i in [I0, I1), j in [J0, J1)) sits in a barrier; the cases are
invented for the test.

- "anisotropic": heavy-hole-like masses, m_y (growth axis) three times m_x, parabolic: the lowest
  levels of H.
- "nonparabolic": electron-like masses m(E) = m (1 + alpha (E - V)) on every node, isotropic. Level
  k solves E = lambda_k(H(E)); found here by the plain fixed-point iteration E <- lambda_k(H(E))
  from the band-edge level (a contraction: |d lambda_k / dE| < 1), until E moves by < 1e-14 eV.
  engine/solver2d.ts finds the same roots by Newton steps on the nonlinear Rayleigh functional.

Run: python3 anisotropic_wire.py (writes anisotropic_wire.json beside it).
"""
import json
import os

import numpy as np

from eigsh_bench import operator

GRID = {"nx": 31, "ny": 23, "dx_nm": 0.5, "dy_nm": 0.4, "well_i": [8, 23], "well_j": [6, 17]}
CASES = {
    "anisotropic": {"V_well_eV": 0.0, "V_barrier_eV": 0.15, "mass_x": [0.11, 0.13], "mass_y": [0.35, 0.40], "alpha_per_eV": [0.0, 0.0], "levels": 4},
    "nonparabolic": {"V_well_eV": 0.0, "V_barrier_eV": 0.25, "mass_x": [0.067, 0.092], "mass_y": [0.067, 0.092], "alpha_per_eV": [0.70, 0.55], "levels": 4},
}


def nodes(well, barrier):
    """Array of shape (ny, nx): `well` inside the node rectangle, `barrier` outside."""
    g = GRID
    a = np.full((g["ny"], g["nx"]), float(barrier))
    a[g["well_j"][0]:g["well_j"][1], g["well_i"][0]:g["well_i"][1]] = well
    return a


def levels(case):
    V = nodes(case["V_well_eV"], case["V_barrier_eV"])
    mx = nodes(*case["mass_x"])
    my = nodes(*case["mass_y"])
    alpha = nodes(*case["alpha_per_eV"])

    def lowest(E, count):
        """Lowest `count` eigenvalues of H with the masses at energy E (band-edge masses for None)."""
        f = 1.0 if E is None else 1 + alpha * (E - V)
        H = operator(V, mx * f, GRID["dx_nm"], GRID["dy_nm"], my * f).toarray()
        return np.linalg.eigvalsh(H)[:count]

    band_edge = lowest(None, case["levels"])
    if not np.any(alpha):
        return [float(e) for e in band_edge]
    out = []
    for k in range(case["levels"]):
        E = float(band_edge[k])
        for _ in range(200):
            nxt = float(lowest(E, k + 1)[k])
            done = abs(nxt - E) < 1e-14
            E = nxt
            if done:
                break
        out.append(E)
    return out


def main():
    out = {
        "source": "anisotropic_wire.py: numpy.linalg.eigh of the 5-point matrix (eigsh_bench.operator), fixed-point iteration for the non-parabolic levels",
        "grid": GRID,
        "cases": {name: {**case, "energies_eV": levels(case)} for name, case in CASES.items()},
    }
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "anisotropic_wire.json")
    with open(path, "w") as f:
        json.dump(out, f, indent=2)
        f.write("\n")


if __name__ == "__main__":
    main()
