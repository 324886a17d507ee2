#!/usr/bin/env python3
"""Writes valence_fem.json: valence subbands of three (001) wells by the independent P2 finite-element
solver fem_subbands.py, for test/valence/reference.test.ts.

Layer parameters are the product's resolved values at 300 K on a GaAs substrate (VMR2001 parameters
through materials/; strained hh/lh edges on the absolute scale, Luttinger parameters, Delta_so and the
shear strain Q_e): the test checks that the product still resolves exactly these, so the comparison
isolates the Hamiltonian, its interface ordering, the discretisation and the eigen-solver.
Walls (psi = 0) at the outer ends of the 40 nm barriers, as the product with outer_nm = 0.

Run: python3 test/reference/valence/valence_fixture.py  (about five minutes; numpy, scipy)
"""
import json
import os

import numpy as np

from fem_subbands import solve_case

HERE = os.path.dirname(os.path.abspath(__file__))

ALGAAS = {"Ehh": -0.9580503213797705, "Elh": -0.9613488496726799, "gamma1": 6.014, "gamma2": 1.6880000000000002,
          "gamma3": 2.4770000000000003, "Dso": 0.3227, "Qe": -0.0016578245031101176}
GAAS = {"Ehh": -0.8, "Elh": -0.8, "gamma1": 6.98, "gamma2": 2.0600000000000005, "gamma3": 2.9300000000000006,
        "Dso": 0.341, "Qe": 0.0}
INGAAS = {"Ehh": -0.6599212863650367, "Elh": -0.748004493631051, "gamma1": 8.087278556736887,
          "gamma2": 2.6907776448936644, "gamma3": 3.5267776448936647, "Dso": 0.32680000000000003,
          "Qe": -0.054005188923584725}


def stack(barrier, well, width):
    return [dict(barrier, thickness_nm=40.0), dict(well, thickness_nm=float(width)), dict(barrier, thickness_nm=40.0)]


STRUCTURES = [
    {"name": "GaAs/Al0.3Ga0.7As 8 nm", "spec": ["Al0.3Ga0.7As", "GaAs", 8], "layers": stack(ALGAAS, GAAS, 8),
     "models": ["kp4", "kp6"], "k": [round(0.1 * i, 10) for i in range(9)]},
    {"name": "In0.2Ga0.8As/GaAs 8 nm", "spec": ["GaAs", "In0.2Ga0.8As", 8], "layers": stack(GAAS, INGAAS, 8),
     "models": ["kp4", "kp6"], "k": [round(0.1 * i, 10) for i in range(9)]},
    {"name": "GaAs/Al0.3Ga0.7As 10 nm (anticrossings)", "spec": ["Al0.3Ga0.7As", "GaAs", 10],
     "layers": stack(ALGAAS, GAAS, 10), "models": ["kp4"], "k": [round(0.01 * i, 10) for i in range(41)]},
]

H_NM = 0.5
COUNT = 8


def main():
    out = {"generator": "test/reference/valence/valence_fixture.py (P2 finite elements, fem_subbands.py)",
           "h_nm": H_NM, "temperature_K": 300, "substrate": "GaAs", "structures": []}
    for s in STRUCTURES:
        runs = []
        for model in s["models"]:
            for angle in (0.0, 45.0):
                e = solve_case(s["layers"], model, H_NM, angle, s["k"], COUNT)
                runs.append({"model": model, "angle_deg": angle, "energies_eV": e})
        out["structures"].append({"name": s["name"], "barrier": s["spec"][0], "well": s["spec"][1],
                                  "width_nm": s["spec"][2], "layers": s["layers"], "k_per_nm": s["k"], "runs": runs})
    with open(os.path.join(HERE, "valence_fem.json"), "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    np.set_printoptions(precision=12)
    main()
