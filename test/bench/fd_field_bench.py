#!/usr/bin/env python3
"""Speed reference for the 1-D solver under a field: scipy eigh_tridiagonal + Richardson.

Reads from stdin the layers of each band (linear potential across each layer, constant mass) and
the energies our solver found, and builds, per band, the BenDaniel-Duke 3-point operator
(D. J. BenDaniel and C. B. Duke, Phys. Rev. 152, 683 (1966)) on a uniform cell-centred grid whose
cells tile every layer exactly, with the potential taken exactly at each cell centre, plus `tail_nm`
of each flat outer region with psi = 0 beyond:

  -C/h^2 [(psi_{i+1} - psi_i)/m_{i+1/2} - (psi_i - psi_{i-1})/m_{i-1/2}] + V_i psi_i = E psi_i,

C = hbar^2/2m0, m_{i+1/2} the arithmetic mean of the two cells' masses. Its eigenvalues err at
O(h^2), so each band is solved at h and h/2 and extrapolated, E = E(h/2) + (E(h/2) - E(h))/3
(L. F. Richardson, Phil. Trans. R. Soc. A 210, 307 (1911)). h is halved from `start_nm` until
every extrapolated energy of every band is within `tolerance_eV` of ours; then the whole method
(both grids of the three bands, eigh_tridiagonal(d, e, select='v', select_range=(lo, hi)), and the
extrapolation) is timed, repeated until `min_time_s` has passed, and the median printed as JSON.

Input JSON: {"tolerance_eV", "start_nm", "tail_nm", "min_time_s", "max_repeats",
             "bands": [{"name", "layers": [[width_nm, V_left_eV, V_right_eV, mass_m0], ...],
                        "left": [V, m], "right": [V, m], "lo", "hi", "energies": [...]}]}
Output JSON: {"median_ms", "runs", "h_nm", "cells", "max_diff_eV"}
"""
import json
import sys
import time

import numpy as np
from scipy.linalg import eigh_tridiagonal

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018 (engine/constants.ts)


def cells_of(band, h, tail_nm):
    """Potential at each cell centre (eV) and mass (m0) of cells of width h (nm)."""
    tail = int(round(tail_nm / h))
    V = [np.full(tail, band["left"][0])]
    m = [np.full(tail, band["left"][1])]
    for width, va, vb, mass in band["layers"]:
        n = int(round(width / h))
        if n < 1 or abs(n * h - width) > 1e-9 * width:
            raise SystemExit(f"fd_field_bench: layer width {width} nm is not a multiple of h = {h} nm")
        t = (np.arange(n) + 0.5) / n
        V.append(va + (vb - va) * t)
        m.append(np.full(n, mass))
    V.append(np.full(tail, band["right"][0]))
    m.append(np.full(tail, band["right"][1]))
    return np.concatenate(V), np.concatenate(m)


def tridiagonal(V, m, h):
    g = HBAR2_OVER_2M0 / (h * h)
    link = 0.5 * (m[:-1] + m[1:])
    inv_left = np.concatenate(([1 / m[0]], 1 / link))
    inv_right = np.concatenate((1 / link, [1 / m[-1]]))
    return V + g * (inv_left + inv_right), -g / link


def solve(pairs, bands):
    """Richardson-extrapolated lowest energies of each band from its (coarse, fine) matrices."""
    out = []
    for ((dc, ec), (df, ef)), b in zip(pairs, bands):
        k = len(b["energies"])
        c = np.sort(eigh_tridiagonal(dc, ec, eigvals_only=True, select="v", select_range=(b["lo"], b["hi"])))[:k]
        f = np.sort(eigh_tridiagonal(df, ef, eigvals_only=True, select="v", select_range=(b["lo"], b["hi"])))[:k]
        if len(c) < k or len(f) < k:
            out.append(None)
        else:
            out.append(f + (f - c) / 3)
    return out


def max_diff(found, bands):
    worst = 0.0
    for w, b in zip(found, bands):
        if w is None:
            return float("inf")
        if b["energies"]:
            worst = max(worst, float(np.max(np.abs(w - np.array(b["energies"])))))
    return worst


def main():
    request = json.load(sys.stdin)
    bands = request["bands"]
    h = request["start_nm"]
    while True:
        pairs = [(tridiagonal(*cells_of(b, h, request["tail_nm"]), h), tridiagonal(*cells_of(b, h / 2, request["tail_nm"]), h / 2)) for b in bands]
        diff = max_diff(solve(pairs, bands), bands)
        if diff <= request["tolerance_eV"]:
            break
        h /= 2
        if h < 1e-4:
            raise SystemExit(f"fd_field_bench: no agreement within {request['tolerance_eV']} eV down to h = {2 * h} nm (last difference {diff} eV)")
    times = []
    start = time.perf_counter()
    while len(times) < request["max_repeats"] and (time.perf_counter() - start < request["min_time_s"] or len(times) < 3):
        t0 = time.perf_counter()
        solve(pairs, bands)
        times.append(time.perf_counter() - t0)
    print(json.dumps({"median_ms": 1e3 * float(np.median(times)), "runs": len(times), "h_nm": h,
                      "cells": [len(p[1][0]) for p in pairs], "max_diff_eV": diff}))


if __name__ == "__main__":
    main()
