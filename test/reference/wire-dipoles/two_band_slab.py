"""Reference intersubband dipole of a square well with the energy-dependent (two-band) electron mass,
from its closed-form envelopes, for the slab limit of the wire dipoles (engine/wire/dipoles.ts).

Method (different from the product's finite-difference cross-section and its grid inner product):
in each region the single-band equation -(hbar^2/2m0) d/dz(1/m(E) dpsi/dz) + V psi = E psi with
m(E) = m (1 + alpha (E - V)) has the closed-form solutions cos(kz), sin(kz) inside the well and
exp(-kappa |z|) outside, k^2 = m(E) E/c, kappa^2 = m(E)(V0 - E)/c, c = hbar^2/2m0; the levels are
the roots of the BenDaniel-Duke matching (psi and psi'/m(E) continuous at z = +-L/2), even
(k/m_w) tan(kL/2) = kappa/m_b, odd -(k/m_w) cot(kL/2) = kappa/m_b (G. Bastard, Wave Mechanics
Applied to Semiconductor Heterostructures (1988), ch. II), bracketed on a fine energy scan and
refined by brentq. The matrix elements are taken in the inner product in which these states are
orthogonal, the conduction part of the two-band Kane model (E. O. Kane, J. Phys. Chem. Solids 1,
249 (1957); C. Sirtori, F. Capasso, J. Faist, S. Scandolo, Phys. Rev. B 50, 8663 (1994)):
    <i|j> = int [psi_i psi_j + c (m(E_i) - m(E_j))/(E_i - E_j) p_i p_j] dz,   p = psi'/m(E),
with z inserted for the position; the velocity form c int (psi_i p_j - p_i psi_j) dz/(E_j - E_i) is
printed beside it as a check (they agree to the quadrature's ~1e-12). The plain single-band
length form int psi_1 z psi_2 dz (int psi^2 = 1) is printed too: it differs by the valence part.
Integrals by scipy.integrate.quad on the closed forms, the tails to infinity.

Parameters: InGaAs/InAlAs-like values of our choosing (no claim about a real alloy). Units: eV, nm,
masses in m0.
Run: python3 two_band_slab.py   (writes two_band_slab.json)
"""
import json
import pathlib

import numpy as np
from scipy.integrate import quad
from scipy.optimize import brentq

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018
PARAMETERS = {'L_nm': 10.0, 'V0_eV': 0.52, 'well': {'mass': 0.043, 'alpha': 1.2}, 'barrier': {'mass': 0.076, 'alpha': 0.6}}


def solve(p):
    c = HBAR2_OVER_2M0
    a = p['L_nm'] / 2
    V0 = p['V0_eV']
    mw, aw = p['well']['mass'], p['well']['alpha']
    mb, ab = p['barrier']['mass'], p['barrier']['alpha']
    Mw = lambda E: mw * (1 + aw * E)
    Mb = lambda E: mb * (1 + ab * (E - V0))
    k = lambda E: np.sqrt(Mw(E) * E / c)
    kap = lambda E: np.sqrt(Mb(E) * (V0 - E) / c)
    even = lambda E: k(E) / Mw(E) * np.tan(k(E) * a) - kap(E) / Mb(E)
    odd = lambda E: -k(E) / Mw(E) / np.tan(k(E) * a) - kap(E) / Mb(E)

    def lowest_root(f):
        scan = np.linspace(1e-6, V0 - 1e-6, 20001)
        values = [f(E) for E in scan]
        for i in range(len(scan) - 1):
            # A sign change without a pole in between (the poles of tan and cot jump by far more).
            if values[i] * values[i + 1] < 0 and abs(values[i] - values[i + 1]) < 10:
                return brentq(f, scan[i], scan[i + 1], xtol=1e-15, rtol=1e-15)
        raise RuntimeError('no bound level')

    E1, E2 = lowest_root(even), lowest_root(odd)

    def state(E, parity):
        kk, kp, M, Mo = k(E), kap(E), Mw(E), Mb(E)
        if parity == 0:
            A = np.cos(kk * a)
            psi = lambda z: np.cos(kk * z) if abs(z) < a else A * np.exp(-kp * (abs(z) - a))
            pp = lambda z: -kk * np.sin(kk * z) / M if abs(z) < a else -np.sign(z) * kp * A * np.exp(-kp * (abs(z) - a)) / Mo
        else:
            A = np.sin(kk * a)
            psi = lambda z: np.sin(kk * z) if abs(z) < a else np.sign(z) * A * np.exp(-kp * (abs(z) - a))
            pp = lambda z: kk * np.cos(kk * z) / M if abs(z) < a else -kp * A * np.exp(-kp * (abs(z) - a)) / Mo
        return psi, pp

    def weight(z):
        # c (m(E_i) - m(E_j))/(E_i - E_j), the same for every pair under the linear two-band law.
        m, al = (mw, aw) if abs(z) < a else (mb, ab)
        return c * al * m

    def integral(f):
        return sum(quad(f, lo, hi, epsabs=1e-15, epsrel=1e-13, limit=400)[0] for lo, hi in ((-np.inf, -a), (-a, a), (a, np.inf)))

    (s1, p1), (s2, p2) = state(E1, 0), state(E2, 1)
    n1 = integral(lambda z: s1(z) ** 2 + weight(z) * p1(z) ** 2)
    n2 = integral(lambda z: s2(z) ** 2 + weight(z) * p2(z) ** 2)
    position = integral(lambda z: z * (s1(z) * s2(z) + weight(z) * p1(z) * p2(z))) / np.sqrt(n1 * n2)
    velocity = c * integral(lambda z: s1(z) * p2(z) - p1(z) * s2(z)) / (E2 - E1) / np.sqrt(n1 * n2)
    q1 = integral(lambda z: s1(z) ** 2)
    q2 = integral(lambda z: s2(z) ** 2)
    plain = integral(lambda z: z * s1(z) * s2(z)) / np.sqrt(q1 * q2)
    return {'E1_eV': E1, 'E2_eV': E2, 'dipole_two_band_nm': abs(position), 'dipole_velocity_nm': abs(velocity), 'dipole_single_band_nm': abs(plain)}


if __name__ == '__main__':
    out = {'parameters': PARAMETERS, 'result': solve(PARAMETERS)}
    path = pathlib.Path(__file__).with_suffix('.json')
    path.write_text(json.dumps(out, indent=2) + '\n')
    print(json.dumps(out, indent=2))
