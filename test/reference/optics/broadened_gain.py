#!/usr/bin/env python3
"""Fixture for test/reference/optics/broadened.test.ts: material gain of parabolic subband pairs
with Lorentzian and hyperbolic-secant broadening, by direct adaptive quadrature over k (scipy.quad),
in SI units from Fermi's golden rule:

    g(hw) = pi e^2 / (n_r c eps0 m0^2 w L_w) * sum_pairs int_0^kmax k dk / (2 pi) |e.p|^2 (f_c - f_v) L(E_cv(k) - hw)

with |e.p|^2 = (m0/6) * factor (factor in eV, as engine/optics/momentum.ts defines it), E_c = E_n +
hbar^2 k^2/(2 m_e m0), E_v = E_j - hbar^2 k^2/(2 m_h m0), f the Fermi functions at the given
quasi-Fermi levels, L(x) = (G/pi)/(x^2 + G^2) or sech(x/G)/(pi G), G = hbar/tau.
The engine bins transition energies and convolves bin by bin; this integrates in k directly.
Run: python3 broadened_gain.py > broadened_gain.json
"""
import json
import math

import numpy as np
from scipy.integrate import quad

E = 1.602176634e-19
HBAR = 1.054571817e-34
M0 = 9.1093837015e-31
EPS0 = 8.8541878128e-12
C = 299792458.0
KB = 8.617333262e-5  # eV/K

T = 300.0
N_R = 3.5
L_W = 8e-9
K_MAX = 1.2e9  # 1/m (1.2 1/nm, the engine's grid end)
TAU = 0.1e-12
GAMMA = HBAR / TAU / E  # eV

ELECTRONS = [{"E": 1.50, "m": 0.067}, {"E": 1.62, "m": 0.070}]
HOLES = [{"E": 0.0, "m": 0.11}, {"E": -0.02, "m": 0.09}, {"E": -0.05, "m": 0.12}]
# (electron, hole, TE factor, TM factor), factors in eV.
PAIRS = [(0, 0, 43.2, 0.0), (0, 1, 14.4, 57.6), (1, 2, 40.0, 0.0), (0, 2, 1.0, 0.0), (1, 0, 0.8, 0.3)]
LEVELS = [{"electron": 1.53, "hole": -0.025}, {"electron": None, "hole": None}]
PHOTONS = [1.45 + 0.005 * i for i in range(61)]


def lorentz(x):
    return GAMMA / math.pi / (x * x + GAMMA * GAMMA)


def sech(x):
    y = abs(x) / GAMMA
    return 2.0 * math.exp(-y) / (1.0 + math.exp(-2.0 * y)) / (math.pi * GAMMA) if y < 700 else 0.0


def fermi(x):
    return 1.0 / (1.0 + math.exp(x)) if x < 700 else 0.0


def gain(hw, which, shape, level):
    kT = KB * T
    total = 0.0
    for (n, j, te, tm) in PAIRS:
        factor = te if which == "te" else tm
        if factor == 0:
            continue
        el, ho = ELECTRONS[n], HOLES[j]

        def energies(k):
            t = HBAR * HBAR * k * k / (2 * M0) / E  # eV
            return el["E"] + t / el["m"], ho["E"] - t / ho["m"]

        def integrand(k):
            ec, ev = energies(k)
            if level["electron"] is None:
                inv = -1.0
            else:
                inv = fermi((ec - level["electron"]) / kT) - fermi((ev - level["hole"]) / kT)
            return k / (2 * math.pi) * inv * shape(ec - ev - hw)

        # Where the transition meets the photon energy, the lineshape peaks: split there.
        mr = 1.0 / (1.0 / el["m"] + 1.0 / ho["m"])
        x = hw - (el["E"] - ho["E"])
        points = [math.sqrt(x * E * 2 * M0 * mr) / HBAR] if x > 0 else []
        points = [p for p in points if p < K_MAX]
        val, _ = quad(integrand, 0.0, K_MAX, points=points or None, limit=400, epsabs=0.0, epsrel=1e-11)
        p2 = (M0 / 6.0) * factor * E  # kg * J
        omega = hw * E / HBAR
        # val is in 1/(m^2 eV): per J divide by E.
        total += math.pi * E * E / (N_R * C * EPS0 * M0 * M0 * omega * L_W) * p2 * val / E
    return total / 100.0  # 1/cm


out = {
    "source": "test/reference/optics/broadened_gain.py (scipy.integrate.quad over k)",
    "temperature_K": T, "refractive_index": N_R, "well_nm": L_W * 1e9, "k_max_per_nm": K_MAX * 1e-9, "tau_ps": TAU * 1e12,
    "electrons": ELECTRONS, "holes": HOLES, "pairs": [list(p) for p in PAIRS], "photon_eV": PHOTONS,
    "cases": [],
}
for level in LEVELS:
    for name, shape in (("lorentzian", lorentz), ("sech", sech)):
        out["cases"].append({
            "levels": level, "lineshape": name,
            "te": [gain(w, "te", shape, level) for w in PHOTONS],
            "tm": [gain(w, "tm", shape, level) for w in PHOTONS],
        })
print(json.dumps(out, indent=1))
