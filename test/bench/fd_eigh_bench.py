#!/usr/bin/env python3
"""Speed reference for the 1-D well solver: scipy eigh_tridiagonal on a finite-difference matrix.

Reads from stdin the band profiles the harness solved (test/bench/entries.ts) and, per band, the
energies our solver found. For each band it builds the BenDaniel-Duke 3-point operator
(D. J. BenDaniel and C. B. Duke, Phys. Rev. 152, 683 (1966)) on a uniform cell-centred grid whose
cells tile every slice exactly, plus `tail_nm` of each outer region with psi = 0 beyond:

  -C/h^2 [(psi_{i+1} - psi_i)/m_{i+1/2} - (psi_i - psi_{i-1})/m_{i-1/2}] + V_i psi_i = E psi_i,

with C = hbar^2/2m0 and m_{i+1/2} the arithmetic mean of the two cells' masses (the flux psi'/m
crosses half a cell of each). The spacing is halved from `start_nm` until every energy of every
band agrees with ours within `tolerance_eV` (the error is O(h^2)); then the three bands'
eigh_tridiagonal(d, e, select='v', select_range=(lo, hi)) calls are timed together, repeated until
at least `min_time_s` has passed or `max_repeats` calls were made, and the median wall time of one
three-band solve is printed as JSON on stdout.

Input JSON: {"tolerance_eV", "start_nm", "tail_nm", "min_time_s", "max_repeats",
             "bands": [{"name", "slices": [[width_nm, V_eV, mass_m0], ...], "left": [V, m],
                        "right": [V, m], "lo", "hi", "energies": [...]}]}
Output JSON: {"median_ms", "runs", "h_nm", "cells", "max_diff_meV"}
"""
import json
import sys
import time

import numpy as np
from scipy.linalg import eigh_tridiagonal

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018 (engine/constants.ts)


def cells_of(band, h, tail_nm):
    """Potential (eV) and mass (m0) of each cell of width h (nm)."""
    tail = int(round(tail_nm / h))
    V = [band["left"][0]] * tail
    m = [band["left"][1]] * tail
    for width, v, mass in band["slices"]:
        n = int(round(width / h))
        if n < 1 or abs(n * h - width) > 1e-9 * width:
            raise SystemExit(f"fd_eigh_bench: slice width {width} nm is not a multiple of h = {h} nm; "
                             "give slice widths that are multiples of start_nm")
        V += [v] * n
        m += [mass] * n
    V += [band["right"][0]] * tail
    m += [band["right"][1]] * tail
    return np.array(V), np.array(m)


def tridiagonal(V, m, h):
    """Diagonal and off-diagonal of the 3-point operator (eV)."""
    g = HBAR2_OVER_2M0 / (h * h)
    link = 0.5 * (m[:-1] + m[1:])
    inv_left = np.concatenate(([1 / m[0]], 1 / link))
    inv_right = np.concatenate((1 / link, [1 / m[-1]]))
    return V + g * (inv_left + inv_right), -g / link


def solve(matrices, bands):
    return [eigh_tridiagonal(d, e, eigvals_only=True, select="v", select_range=(b["lo"], b["hi"]))
            for (d, e), b in zip(matrices, bands)]


def max_diff(found, bands):
    """Largest |E_fd - E_ours| over the lowest states (eV); inf if FD misses a state."""
    worst = 0.0
    for w, b in zip(found, bands):
        ours = b["energies"]
        if len(w) < len(ours):
            return float("inf")
        if ours:
            worst = max(worst, float(np.max(np.abs(np.sort(w)[:len(ours)] - np.array(ours)))))
    return worst


def main():
    request = json.load(sys.stdin)
    bands = request["bands"]
    h = request["start_nm"]
    while True:
        matrices = [tridiagonal(*cells_of(b, h, request["tail_nm"]), h) for b in bands]
        diff = max_diff(solve(matrices, bands), bands)
        if diff <= request["tolerance_eV"]:
            break
        h /= 2
        if h < 1e-4:
            raise SystemExit(f"fd_eigh_bench: no agreement within {request['tolerance_eV']} eV down to h = {2 * h} nm "
                             f"(last difference {diff} eV); check the energies sent")
    times = []
    start = time.perf_counter()
    while len(times) < request["max_repeats"] and (time.perf_counter() - start < request["min_time_s"] or len(times) < 3):
        t0 = time.perf_counter()
        solve(matrices, bands)
        times.append(time.perf_counter() - t0)
    print(json.dumps({"median_ms": 1e3 * float(np.median(times)), "runs": len(times), "h_nm": h,
                      "cells": [len(d) for d, _ in matrices], "max_diff_meV": 1e3 * diff}))


if __name__ == "__main__":
    main()
