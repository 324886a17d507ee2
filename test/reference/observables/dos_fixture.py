"""Fixture for broadened densities of states: numerical convolution (scipy.integrate.quad) of the
sharp 2-D staircase and 1-D inverse-square-root DOS with Gaussian and Lorentzian kernels, as an
independent check of the closed forms in engine/observables/dos.ts. Also scipy.special.erf values.
Units: energies eV, masses m0, g2 per eV per cm^2, g1 per eV per cm.
Run: python3 dos_fixture.py  (writes dos.json beside this script)
"""
import json
import math
import pathlib

import numpy as np
from scipy import integrate, special

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018

WELL = [{"energy": 0.05, "mass": 0.067}, {"energy": 0.20, "mass": 0.08}]
WIRE = [{"energy": 0.03, "mass": 0.067}, {"energy": 0.09, "mass": 0.05}]
SIGMA = 0.01
GAMMA2 = 0.005
GAMMA1 = 0.004
ENERGIES = [float(e) for e in np.round(np.linspace(-0.05, 0.3, 15), 6)] + [0.05, 0.2, 0.03, 0.09]


def step_height(m):
    return m / (2 * math.pi * HBAR2_OVER_2M0) * 1e14


def g2_gauss(e):
    total = 0.0
    for s in WELL:
        # Theta(x - En) convolved with a normalised Gaussian of std SIGMA
        kernel = lambda x: math.exp(-0.5 * ((e - x) / SIGMA) ** 2) / (SIGMA * math.sqrt(2 * math.pi))
        val, _ = integrate.quad(kernel, s["energy"], s["energy"] + 40 * SIGMA + max(0.0, e - s["energy"]),
                                points=[e] if e > s["energy"] else None, epsabs=1e-15, epsrel=1e-13, limit=400)
        total += step_height(s["mass"]) * val
    return total


def g2_lorentz(e):
    total = 0.0
    for s in WELL:
        kernel = lambda x: (GAMMA2 / math.pi) / ((e - x) ** 2 + GAMMA2 ** 2)
        val, _ = integrate.quad(kernel, s["energy"], np.inf, epsabs=1e-15, epsrel=1e-13, limit=800)
        total += step_height(s["mass"]) * val
    return total


def g1_lorentz(e):
    total = 0.0
    for s in WIRE:
        pref = math.sqrt(s["mass"] / HBAR2_OVER_2M0) / math.pi * 1e7
        # x = En + u^2: (x - En)^(-1/2) dx = 2 du, removing the edge singularity
        kernel = lambda u: 2 * (GAMMA1 / math.pi) / ((e - s["energy"] - u * u) ** 2 + GAMMA1 ** 2)
        peak = math.sqrt(max(e - s["energy"], 0.0))
        val = 0.0
        for a, b in [(0.0, peak), (peak, np.inf)]:
            if b > a:
                part, _ = integrate.quad(kernel, a, b, epsabs=1e-15, epsrel=1e-13, limit=800)
                val += part
        total += pref * val
    return total


out = {
    "source": "scipy " + __import__("scipy").__version__ + " quad convolution, epsrel 1e-13",
    "well": WELL, "wire": WIRE, "sigma_eV": SIGMA, "gamma2_eV": GAMMA2, "gamma1_eV": GAMMA1,
    "energies_eV": ENERGIES,
    "g2_gaussian": [g2_gauss(e) for e in ENERGIES],
    "g2_lorentzian": [g2_lorentz(e) for e in ENERGIES],
    "g1_lorentzian": [g1_lorentz(e) for e in ENERGIES],
    "erf": [{"x": x, "erf": float(special.erf(x))} for x in [-7.0, -3.0, -1.0, -0.3, 0.0, 1e-3, 0.5, 1.0, 2.0, 4.0, 5.9, 6.5]],
}
pathlib.Path(__file__).with_name("dos.json").write_text(json.dumps(out, indent=1) + "\n")
