"""Non-parabolicity alpha of the Gamma conduction band from E. O. Kane's three-band secular equation
(J. Phys. Chem. Solids 1, 249 (1957)) with the free-electron term, solved numerically: a different
method from materials/nonparabolicity.ts, which uses the closed first-order form.

For eps = hbar^2 k^2 / (2 m0) the conduction root E' of
    E' (E' + Eg) (E' + Eg + D) = eps * Ep * (E' + Eg + 2 D / 3)
gives E = E' + eps and the energy mass m(E)/m0 = eps / E. Ep is chosen so that the band-edge mass
is me: m0/me = 1 + Ep (Eg + 2D/3) / (Eg (Eg + D)). alpha is the slope of m(E)/me - 1 against E at
E -> 0, from a cubic least-squares fit on small E.

Run: python3 kane_nonparabolicity.py  (writes kane_nonparabolicity.json beside this file)
"""
import json
import os
import numpy as np

CASES = [
    # (label, Eg eV, D eV, me m0)
    ("GaAs-like", 1.519, 0.341, 0.067),
    ("InAs-like", 0.417, 0.39, 0.026),
    ("InP-like", 1.4236, 0.108, 0.0795),
    ("InSb-like", 0.235, 0.81, 0.0135),
    ("small split-off", 1.0, 1e-4, 0.05),
    ("large split-off", 1.0, 1e3, 0.05),
    ("heavy electron", 2.0, 0.3, 0.3),
]


def conduction_energy(eps, Eg, D, Ep):
    # cubic in E': E'^3 + (2Eg + D) E'^2 + (Eg(Eg + D) - eps Ep) E' - eps Ep (Eg + 2D/3) = 0
    roots = np.roots([1.0, 2 * Eg + D, Eg * (Eg + D) - eps * Ep, -eps * Ep * (Eg + 2 * D / 3)])
    real = roots[np.abs(roots.imag) < 1e-12].real
    return real.max() + eps


def alpha(Eg, D, me):
    Ep = (1 / me - 1) * Eg * (Eg + D) / (Eg + 2 * D / 3)
    E_top = 2e-3 * Eg
    eps = np.linspace(E_top * me / 40, E_top * me, 40)
    E = np.array([conduction_energy(e, Eg, D, Ep) for e in eps])
    ratio = (eps / E) / me - 1.0
    coeffs = np.polyfit(E, ratio, 3)
    return coeffs[-2]


out = {"source": "Kane three-band secular equation with free-electron term, numerical roots (this script)",
       "cases": [{"label": l, "Eg": Eg, "Dso": D, "me": me, "alpha": alpha(Eg, D, me)} for (l, Eg, D, me) in CASES]}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "kane_nonparabolicity.json"), "w") as f:
    json.dump(out, f, indent=2)
    f.write("\n")
