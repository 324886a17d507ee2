"""Thermal contraction of a lattice from 300 K to 0 K in the Debye-Grueneisen picture, in units of
the 300 K slope: I(Theta) = int_0^300 C_V(T) dT / C_V(300 K), with the Debye heat capacity
C_V(T) = 9 N k (T/Theta)^3 int_0^{Theta/T} t^4 e^t / (e^t - 1)^2 dt and the expansion coefficient
proportional to C_V (Grueneisen relation, constant Grueneisen parameter). A linear law with the
300 K slope contracts by 300 K x slope; materials/temperature.ts 'held-below-100K' by 200 K x slope.
Debye temperatures span 250-450 K for the III-V binaries (from memory).

Run: python3 debye_contraction.py  (writes debye_contraction.json beside this file)
"""
import json
import os
import numpy as np
from scipy.integrate import quad


def cv(T, theta):
    if T <= 0:
        return 0.0
    x = theta / T
    f = lambda t: t**4 * np.exp(-t) / (-np.expm1(-t)) ** 2
    return (T / theta) ** 3 * quad(f, 0, x, limit=200)[0]


def contraction_K(theta):
    c300 = cv(300.0, theta)
    return quad(lambda T: cv(T, theta), 0.0, 300.0, limit=200, points=[50.0, 100.0])[0] / c300


out = {"source": "Debye heat capacity integrated with scipy.integrate.quad (this script)",
       "cases": [{"theta_K": th, "contraction_K": contraction_K(th)} for th in (250.0, 300.0, 345.0, 400.0, 450.0)]}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "debye_contraction.json"), "w") as f:
    json.dump(out, f, indent=2)
    f.write("\n")
