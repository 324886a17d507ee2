"""Fixture for sheet and line carrier densities: numerical integration (scipy.integrate.quad) of the
sharp 2-D and 1-D densities of states times the Fermi function, an independent route to the
closed forms n2D = sum m kT/(pi hbar^2) ln(1+e^eta) and n1D = sum sqrt(2 m kT pi)/(pi hbar) F_{-1/2}(eta).
Units: energies eV, masses m0, T K; n2D cm^-2, n1D cm^-1.
Run: python3 carriers_fixture.py  (writes carriers.json beside this script)
"""
import json
import math
import pathlib

from scipy import integrate, special

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018
KB = 8.617333262e-5  # eV/K, CODATA 2018 (exact)

WELL = [{"energy": 0.03, "mass": 0.067}, {"energy": 0.11, "mass": 0.067}, {"energy": 0.02, "mass": 0.35}]
WIRE = [{"energy": 0.01, "mass": 0.067}, {"energy": 0.04, "mass": 0.067}, {"energy": 0.05, "mass": 0.1}]
CASES = [(-0.1, 300.0), (0.0, 300.0), (0.05, 77.0), (0.08, 300.0), (0.15, 4.2), (0.3, 500.0)]


def occupation(e, ef, kt):
    return special.expit((ef - e) / kt)


def n2d(ef, t):
    kt = KB * t
    total = 0.0
    for s in WELL:
        g = s["mass"] / (2 * math.pi * HBAR2_OVER_2M0) * 1e14
        top = max(ef, s["energy"]) + 60 * kt
        pts = [ef] if s["energy"] < ef < top else None
        val, _ = integrate.quad(lambda e: occupation(e, ef, kt), s["energy"], top, points=pts,
                                epsabs=0.0, epsrel=1e-13, limit=400)
        total += g * val
    return total


def n1d(ef, t):
    kt = KB * t
    total = 0.0
    for s in WIRE:
        pref = math.sqrt(s["mass"] / HBAR2_OVER_2M0) / math.pi * 1e7
        # E = En + u^2: (E - En)^(-1/2) dE = 2 du
        top = math.sqrt(max(ef - s["energy"], 0.0) + 60 * kt)
        pts = [math.sqrt(ef - s["energy"])] if ef > s["energy"] else None
        val, _ = integrate.quad(lambda u: 2 * occupation(s["energy"] + u * u, ef, kt), 0.0, top, points=pts,
                                epsabs=0.0, epsrel=1e-13, limit=400)
        total += pref * val
    return total


out = {
    "source": "scipy " + __import__("scipy").__version__ + " quad of DOS x Fermi function, epsrel 1e-13",
    "well": WELL,
    "wire": WIRE,
    "cases": [{"fermiLevel_eV": ef, "temperature_K": t, "n2d_cm2": n2d(ef, t), "n1d_cm1": n1d(ef, t)} for ef, t in CASES],
}
pathlib.Path(__file__).with_name("carriers.json").write_text(json.dumps(out, indent=1) + "\n")
