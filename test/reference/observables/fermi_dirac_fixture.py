"""Fixture for the normalised Fermi-Dirac integrals F_j(eta), j = -1/2, 0, 1/2.

F_j(eta) = 1/Gamma(j+1) * int_0^inf t^j / (1 + exp(t - eta)) dt, evaluated with scipy.integrate.quad
after t = s^2 (which removes the t^(-1/2) singularity), split at s = sqrt(eta) where the Fermi edge
sits. The integrand is written with scipy.special.expit, which is overflow-free.
Run: python3 fermi_dirac_fixture.py  (writes fermi_dirac.json beside this script)
"""
import json
import math
import pathlib

import numpy as np
from scipy import integrate, special

ETAS = [-40.0, -20.0, -10.0, -5.0, -2.0, -1.0, -0.5, -0.1, 0.0, 0.1, 0.5, 1.0, 2.0, 3.0, 5.0,
        8.0, 12.0, 20.0, 30.0, 45.0, 60.0, 99.0, 101.0, 150.0, 1000.0]


def fd(j, eta):
    # t = s^2, dt = 2 s ds: t^j dt = 2 s^(2j+1) ds; occupation 1/(1+e^(s^2-eta)) = expit(eta - s^2)
    def f(s):
        return 2.0 * s ** (2 * j + 1) * special.expit(eta - s * s)

    top = math.sqrt(max(eta, 0.0) + 60.0)
    edges = [0.0, top] if eta <= 1 else [0.0, max(math.sqrt(eta) - 2, 0.0), math.sqrt(eta), math.sqrt(eta) + 2, top]
    edges = sorted(set(edges))
    total = 0.0
    for a, b in zip(edges[:-1], edges[1:]):
        # scale by e^-eta for eta < 0 so that the absolute tolerance is not hit first
        scale = math.exp(-eta) if eta < 0 else 1.0
        val, _ = integrate.quad(lambda s: f(s) * scale, a, b, epsabs=0.0, epsrel=1e-13, limit=400)
        total += val / scale
    return total / special.gamma(j + 1)


rows = []
for eta in ETAS:
    rows.append({
        "eta": eta,
        "Fm12": fd(-0.5, eta),
        "F0": fd(0.0, eta),
        "F12": fd(0.5, eta),
    })
    # sanity: F_0 has the closed form ln(1 + e^eta)
    assert abs(rows[-1]["F0"] / np.logaddexp(0.0, eta) - 1) < 1e-12, eta

out = {
    "source": "scipy.integrate.quad " + __import__("scipy").__version__ + ", epsrel 1e-13, t = s^2 substitution",
    "rows": rows,
}
path = pathlib.Path(__file__).with_name("fermi_dirac.json")
path.write_text(json.dumps(out, indent=1) + "\n")
