#!/usr/bin/env python3
"""Fixture for test/solver1d/linear.test.ts: bound states of profiles that are linear in z piece by
piece (fields, grades), from two methods that share nothing with engine/solver1d.ts.

Each case is a list of pieces [width_nm, V_a, V_b, m_a, m_b, alpha_a, alpha_b] (V in eV, particle
sense, masses in m0, alpha the two-band non-parabolicity in 1/eV; every quantity linear in z across a
piece from its left value a to its right value b) between two flat outer regions [V, m, alpha].
The two-band mass is m(z, E) = m(z) * max(1 + alpha(z) (E - V(z)), 0.1) (engine/solver1d.ts,
twoBandFactor), BenDaniel-Duke continuity of psi and psi'/m.

"airy" cases (constant mass and alpha = 0 in every piece): the exact solution in each piece is
a Ai(xi) + b Bi(xi), xi = beta (z - z_t), beta^3 = m g / C (scipy.special.airy), carried from the
decaying left solution to the right edge; the eigenvalues are the roots of p + kappa_R u / m_R there,
bracketed on a fine energy scan and found by scipy.optimize.brentq.

"fd" cases: the 3-point BenDaniel-Duke operator on a cell-centred grid whose cells tile every
piece, V at the cell centres and each link's mass the mean of m over the link (exact flux for a
piecewise-linear m), 25 nm of each outer region with psi = 0 beyond; for a two-band mass each state
is the fixed point E = E_n(H(m(E))) (scipy.linalg.eigh_tridiagonal, select by index); spacings
h, h/2, h/4 and two Richardson steps (errors O(h^2), O(h^4)) give O(h^6). The "airy" cases are
also solved this way, and the largest difference between the two methods over the states bound by
more than 50 meV is recorded (fd_agreement_eV).

Run: python3 linear_wells.py > linear_wells.json
"""
import json

import numpy as np
from scipy.linalg import eigh_tridiagonal
from scipy.optimize import brentq
from scipy.special import airy

C = 0.0380998212  # hbar^2/(2 m0), eV nm^2 (CODATA 2018; engine/constants.ts)
FLOOR = 0.1
TAIL_NM = 25.0


def tilted(g, zc, layers):
    """Pieces of flat layers [width, V, m, alpha] tilted by g (eV/nm) about zc."""
    out, z = [], 0.0
    for w, v, m, a in layers:
        out.append([w, v + g * (z - zc), v + g * (z + w - zc), m, m, a, a])
        z += w
    return out


CASES = [
    {"name": "triangular well: 5 eV wall, 0.02 eV/nm over 80 nm, m 0.067", "method": "airy",
     "pieces": [[80.0, 0.0, 1.6, 0.067, 0.067, 0.0, 0.0]], "left": [5.0, 0.067, 0.0], "right": [1.6, 0.067, 0.0]},
    {"name": "8 nm well, 0.3 eV barriers (m 0.092 / 0.067), 30 kV/cm", "method": "airy",
     "pieces": tilted(0.003, 24.0, [[20.0, 0.3, 0.092, 0.0], [8.0, 0.0, 0.067, 0.0], [20.0, 0.3, 0.092, 0.0]]),
     "left": [0.3 - 0.072, 0.092, 0.0], "right": [0.3 + 0.072, 0.092, 0.0]},
    {"name": "8 nm well, heavy masses (0.35 / 0.38), 0.15 eV barriers, 20 kV/cm", "method": "airy",
     "pieces": tilted(0.002, 24.0, [[20.0, 0.15, 0.38, 0.0], [8.0, 0.0, 0.35, 0.0], [20.0, 0.15, 0.38, 0.0]]),
     "left": [0.15 - 0.048, 0.38, 0.0], "right": [0.15 + 0.048, 0.38, 0.0]},
    {"name": "10 nm well, two-band mass (alpha 0.7 / 0.5), 0.3 eV barriers, 50 kV/cm", "method": "fd",
     "pieces": tilted(0.005, 20.0, [[15.0, 0.3, 0.092, 0.5], [10.0, 0.0, 0.067, 0.7], [15.0, 0.3, 0.092, 0.5]]),
     "left": [0.3 - 0.1, 0.092, 0.5], "right": [0.3 + 0.1, 0.092, 0.5]},
    {"name": "15 nm grade 0.3 -> 0 eV (m 0.092 -> 0.067) into a 6 nm well", "method": "fd",
     "pieces": [[20.0, 0.3, 0.3, 0.092, 0.092, 0.0, 0.0], [15.0, 0.3, 0.0, 0.092, 0.067, 0.0, 0.0],
                [6.0, 0.0, 0.0, 0.067, 0.067, 0.0, 0.0], [20.0, 0.3, 0.3, 0.092, 0.092, 0.0, 0.0]],
     "left": [0.3, 0.092, 0.0], "right": [0.3, 0.092, 0.0]},
    {"name": "the same grade, two-band (alpha 0.5 -> 0.7), under 40 kV/cm", "method": "fd",
     "pieces": [[w, va + 0.004 * (z0 - 30.5), vb + 0.004 * (z0 + w - 30.5), ma, mb, aa, ab]
                for (w, va, vb, ma, mb, aa, ab), z0 in zip(
                    [[20.0, 0.3, 0.3, 0.092, 0.092, 0.5, 0.5], [15.0, 0.3, 0.0, 0.092, 0.067, 0.5, 0.7],
                     [6.0, 0.0, 0.0, 0.067, 0.067, 0.7, 0.7], [20.0, 0.3, 0.3, 0.092, 0.092, 0.5, 0.5]],
                    [0.0, 20.0, 35.0, 41.0])],
     "left": [0.3 - 0.122, 0.092, 0.5], "right": [0.3 + 0.122, 0.092, 0.5]},
]


def open_edge(case):
    return min(case["left"][0], case["right"][0])


def airy_mismatch(case, E):
    """p + kappa_R u/m_R at the right edge for the solution decaying to the left (normalised)."""
    VL, mL, _ = case["left"]
    kL = np.sqrt(mL * (VL - E) / C)
    u, p = 1.0, kL / mL
    for w, va, vb, m, _mb, _aa, _ab in case["pieces"]:
        g = (vb - va) / w
        if g == 0:
            s = m * (E - va) / C
            k = np.sqrt(complex(s))
            c = np.cos(k * w).real
            S = (np.sin(k * w) / k).real if s != 0 else w
            u, p = u * c + m * p * S, p * c - (s / m) * u * S
        else:
            beta = np.cbrt(m * g / C)
            zt = (E - va) / g
            x0, x1 = beta * (0 - zt), beta * (w - zt)
            a0, ap0, b0, bp0 = airy(x0)
            a1, ap1, b1, bp1 = airy(x1)
            d0 = m * p / beta
            # y = A Ai + B Bi with y(x0) = u, y'(x0) = d0; Wronskian Ai Bi' - Ai' Bi = 1/pi.
            A = np.pi * (u * bp0 - d0 * b0)
            B = np.pi * (d0 * a0 - u * ap0)
            u, d1 = A * a1 + B * b1, A * ap1 + B * bp1
            p = beta * d1 / m
        n = abs(u) + abs(p)
        u, p = u / n, p / n
    VR, mR, _ = case["right"]
    kR = np.sqrt(mR * (VR - E) / C)
    return p + kR * u / mR


def airy_levels(case):
    lo = min(min(pc[1], pc[2]) for pc in case["pieces"])
    hi = open_edge(case)
    Es = np.linspace(lo + 1e-9, hi - 1e-9, 40001)
    f = np.array([airy_mismatch(case, E) for E in Es])
    roots = []
    for i in range(len(Es) - 1):
        if f[i] == 0:
            roots.append(Es[i])
        elif f[i] * f[i + 1] < 0:
            roots.append(brentq(lambda E: airy_mismatch(case, E), Es[i], Es[i + 1], xtol=1e-15, rtol=1e-15))
    return roots


def grid(case, h):
    """Cell centres: V, M, alpha, and per link (between neighbouring cells) the values needed for its mean mass."""
    VL, mL, aL = case["left"]
    VR, mR, aR = case["right"]
    nt = int(round(TAIL_NM / h))
    V, M, A = [np.full(nt, VL)], [np.full(nt, mL)], [np.full(nt, aL)]
    # Each cell as (V, M, alpha) at its left edge, centre and right edge (one-sided at piece boundaries).
    edges = [(np.full(nt, VL), np.full(nt, mL), np.full(nt, aL), np.full(nt, VL), np.full(nt, mL), np.full(nt, aL))]
    for w, va, vb, ma, mb, aa, ab in case["pieces"]:
        n = int(round(w / h))
        if abs(n * h - w) > 1e-9:
            raise SystemExit(f"linear_wells: piece width {w} is not a multiple of h = {h}")
        t0, tc, t1 = np.arange(n) / n, (np.arange(n) + 0.5) / n, (np.arange(n) + 1) / n
        lin = lambda a, b, t: a + (b - a) * t
        V.append(lin(va, vb, tc)); M.append(lin(ma, mb, tc)); A.append(lin(aa, ab, tc))
        edges.append((lin(va, vb, t0), lin(ma, mb, t0), lin(aa, ab, t0), lin(va, vb, t1), lin(ma, mb, t1), lin(aa, ab, t1)))
    V.append(np.full(nt, VR)); M.append(np.full(nt, mR)); A.append(np.full(nt, aR))
    edges.append((np.full(nt, VR), np.full(nt, mR), np.full(nt, aR), np.full(nt, VR), np.full(nt, mR), np.full(nt, aR)))
    cat = lambda k: np.concatenate([e[k] for e in edges])
    return np.concatenate(V), np.concatenate(M), np.concatenate(A), [cat(k) for k in range(6)]


def two_band(M, A, V, E):
    return M * np.maximum(1 + A * (E - V), FLOOR)


def fd_matrix(cells, h, E):
    V, M, A, (Vl, Ml, Al, Vr, Mr, Ar) = cells
    mc = two_band(M, A, V, E)
    ml = two_band(Ml, Al, Vl, E)
    mr = two_band(Mr, Ar, Vr, E)
    # Mean mass over the link from centre i to centre i+1: trapezoids on the two half-cells.
    link = 0.25 * (mc[:-1] + mr[:-1] + ml[1:] + mc[1:])
    g = C / (h * h)
    inv_l = np.concatenate(([1 / mc[0]], 1 / link))
    inv_r = np.concatenate((1 / link, [1 / mc[-1]]))
    return V + g * (inv_l + inv_r), -g / link


def fd_levels_at(case, h, count, guesses):
    cells = grid(case, h)
    out = []
    for n in range(count):
        E = guesses[n]
        for _ in range(200):
            d, e = fd_matrix(cells, h, E)
            E1 = float(eigh_tridiagonal(d, e, eigvals_only=True, select="i", select_range=(n, n))[0])
            if abs(E1 - E) < 1e-14:
                E = E1
                break
            E = E1
        out.append(E)
    return np.array(out)


def fd_levels(case, count, guesses, h=0.04):
    e1, e2, e4 = (fd_levels_at(case, h / k, count, guesses) for k in (1, 2, 4))
    r1 = (4 * e2 - e1) / 3
    r2 = (4 * e4 - e2) / 3
    best = (16 * r2 - r1) / 15
    return best, float(np.max(np.abs(best - r2))) if count else 0.0


def main():
    out = []
    for case in CASES:
        entry = {k: case[k] for k in ("name", "method", "pieces", "left", "right")}
        if case["method"] == "airy":
            levels = airy_levels(case)
            fd, est = fd_levels(case, len(levels), levels)
            entry["energies"] = [float(x) for x in levels]
            # Within 50 meV of the open edge the 25 nm FD box is too short for the slow decay there.
            deep = np.array(levels) < open_edge(case) - 0.05
            entry["fd_agreement_eV"] = float(np.max(np.abs(fd - np.array(levels))[deep])) if deep.any() else 0.0
        else:
            # Count and first guesses from the parabolic (alpha = 0) problem's levels below the open edge.
            cells = grid(case, 0.04)
            d, e = fd_matrix(cells, 0.04, open_edge(case))
            lo = min(min(pc[1], pc[2]) for pc in case["pieces"])
            guess = np.sort(eigh_tridiagonal(d, e, eigvals_only=True, select="v", select_range=(lo, open_edge(case))))
            levels, est = fd_levels(case, len(guess), guess)
            keep = levels < open_edge(case)
            entry["energies"] = [float(x) for x in levels[keep]]
            entry["richardson_step_eV"] = est
        out.append(entry)
    print(json.dumps({"source": "scipy.special.airy + brentq (airy), 3-point BenDaniel-Duke FD with two Richardson steps (fd)", "cases": out}, indent=1))


if __name__ == "__main__":
    main()
