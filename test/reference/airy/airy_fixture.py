#!/usr/bin/env python3
"""Fixture for engine/airy.ts: Airy functions from two reference libraries.

values: scipy.special.airy (x < 0) and scipy.special.airye (x >= 0, scaled: Ai, Ai' times
exp(zeta), Bi, Bi' times exp(-zeta), zeta = (2/3) x^(3/2)) at points spread over [-60, 60], dense
around |x| = 10 where engine/airy.ts switches from its Taylor table to asymptotic series, plus
the same four values from mpmath at 40 digits (an independent arbitrary-precision implementation),
which show how far scipy itself is from the exact values.

transfers: for pairs (x0, x0 + dx) the entries of the exact transfer of y'' = x y,
  uu = pi (Ai1 Bi0' - Bi1 Ai0'), ud = pi (Bi1 Ai0 - Ai1 Bi0),
  du = pi (Ai1' Bi0' - Bi1' Ai0'), dd = pi (Bi1' Ai0 - Ai1' Bi0)   (Wronskian 1/pi, DLMF 9.2.7),
and the phase change dtheta of arg(Ai + i Bi), from mpmath at 50 digits with x0 and dx taken as the
exact binary doubles. Where both ends lie far out (|x| up to 1e6, a weak field) this is what a
direct double-precision evaluation at the two ends cannot give: the phase itself is then large.
Evanescent pairs whose entries overflow are given as (log of the largest |entry|, entries / it).

Run: python3 airy_fixture.py > airy.json
"""
import json

import mpmath as mp
import numpy as np
from scipy.special import airy, airye

mp.mp.dps = 50


def scipy_values(x):
    if x >= 0:
        return [float(v) for v in airye(x)]
    return [float(v) for v in airy(x)]


def mp_values(x):
    X = mp.mpf(x)
    a, ap, b, bp = mp.airyai(X), mp.airyai(X, 1), mp.airybi(X), mp.airybi(X, 1)
    if x >= 0:
        z = mp.mpf(2) / 3 * X ** mp.mpf(1.5)
        a, ap, b, bp = a * mp.exp(z), ap * mp.exp(z), b * mp.exp(-z), bp * mp.exp(-z)
    return [float(v) for v in (a, ap, b, bp)]


def phase(X):
    """Continuous arg(Ai + i Bi): atan2 plus the branch nearest pi/4 - zeta for X < 0."""
    a, b = mp.airyai(X), mp.airybi(X)
    raw = mp.atan2(b, a)
    if X >= 0:
        return raw
    z = mp.mpf(2) / 3 * (-X) ** mp.mpf(1.5)
    k = mp.nint((mp.pi / 4 - z - raw) / (2 * mp.pi))
    return raw + 2 * mp.pi * k


def transfer(x0, dx):
    X0 = mp.mpf(x0)
    X1 = X0 + mp.mpf(dx)
    a0, ap0, b0, bp0 = mp.airyai(X0), mp.airyai(X0, 1), mp.airybi(X0), mp.airybi(X0, 1)
    a1, ap1, b1, bp1 = mp.airyai(X1), mp.airyai(X1, 1), mp.airybi(X1), mp.airybi(X1, 1)
    e = [mp.pi * (a1 * bp0 - b1 * ap0), mp.pi * (b1 * a0 - a1 * b0),
         mp.pi * (ap1 * bp0 - bp1 * ap0), mp.pi * (bp1 * a0 - ap1 * b0)]
    big = max(abs(v) for v in e)
    log = float(mp.log(big)) if big > mp.mpf(10) ** 300 else 0.0
    scale = mp.exp(log) if log else 1
    return {"x0": x0, "dx": dx, "log": log, "entries": [float(v / scale) for v in e],
            "dtheta": float(phase(X1) - phase(X0))}


def main():
    rng = np.random.default_rng(18)
    xs = sorted(set([0.0, 10.0, -10.0] + list(np.linspace(-60, 60, 241))
                    + list(np.linspace(-10.5, -9.5, 21)) + list(np.linspace(9.5, 10.5, 21))
                    + [float(x) for x in rng.uniform(-12, 12, 60)]))
    values = []
    worst = 0.0
    for x in xs:
        s, m = scipy_values(float(x)), mp_values(float(x))
        for k in range(4):
            # Where the functions oscillate, an error is measured against the modulus (|Ai| + |Bi|).
            ref = abs(m[k]) if x >= 0 else abs(m[k & 1]) + abs(m[2 + (k & 1)])
            worst = max(worst, abs(s[k] - m[k]) / ref)
        values.append({"x": float(x), "scipy": s, "mpmath": m})
    pairs = [(-3.0, 2.5), (-0.7, 1.4), (2.0, 3.0), (-11.0, 2.0), (-9.0, -2.5), (9.0, 2.0), (11.0, -2.0),
             (-12.0, 24.0), (12.0, 8.0), (30.0, 0.5), (-30.0, 0.5), (-1e3, 0.37), (-1e3, -0.01),
             (1e3, 0.37), (-1e6, 3e-4), (-1e6, 0.02), (1e6, 3e-4), (-4e4, 1.0), (15.0, 60.0), (-200.0, 150.0)]
    transfers = [transfer(float(a), float(b)) for a, b in pairs]
    print(json.dumps({"source": "scipy.special.airy/airye and mpmath 1.3 (50 digits)",
                      "scipy_vs_mpmath_max_relative": worst, "values": values, "transfers": transfers}, indent=1))


if __name__ == "__main__":
    main()
