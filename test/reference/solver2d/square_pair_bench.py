#!/usr/bin/env python3
"""Speed reference for the wire benchmark at equal accuracy: scipy eigsh shift-invert on the grid
pair a Richardson extrapolation needs to put the lowest six levels of the 10 nm GaAs square of
square_wire.json within `tolerance_eV` of its continuum answer.

The whole 30 nm box on a cell-centred grid (the discretisation of square_wire.py, without using the
square's symmetry, as the wire solver does not), spacing halved from `start_nm` until
E(h/2) + (E(h/2) - E(h))/3 is within tolerance of the fixture for every level; then both solves,
eigsh(A, k=6, sigma=V_well, which='LM') with the factorisation, are timed together (median of
`repeats`). Prints JSON: median_ms, h_nm (the coarser of the pair), cells (per side of each grid),
true_error_eV (largest over the levels), and the levels.

Usage: python3 square_pair_bench.py [tolerance_eV=1e-4] [start_nm=2] [repeats=7]
"""
import json
import sys
import time

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import eigsh

from square_wire import C, HALF_BOX, HALF_WIRE, M_BAR, M_WELL, V_BAR, V_WELL, COUNT


def operator(h):
    """Cell-centred 5-point operator on the whole box, the wall half a cell beyond the outer centres."""
    n = int(round(2 * HALF_BOX / h))
    c = (np.arange(n) + 0.5) * h - HALF_BOX
    X, Y = np.meshgrid(c, c, indexing="xy")
    inside = (np.abs(X) < HALF_WIRE) & (np.abs(Y) < HALF_WIRE)
    V = np.where(inside, V_WELL, V_BAR)
    m = np.where(inside, M_WELL, M_BAR)
    g = C / (h * h)
    ex = 2 * g / (m[:, :-1] + m[:, 1:])
    ey = 2 * g / (m[:-1, :] + m[1:, :])
    diag = V.copy()
    diag[:, :-1] += ex
    diag[:, 1:] += ex
    diag[:-1, :] += ey
    diag[1:, :] += ey
    for sl in ((slice(None), 0), (slice(None), -1), (0, slice(None)), (-1, slice(None))):
        diag[sl] += 2 * g / m[sl]
    N = n * n
    idx = np.arange(N).reshape(n, n)
    rows = np.concatenate([idx.ravel(), idx[:, :-1].ravel(), idx[:-1, :].ravel()])
    cols = np.concatenate([idx.ravel(), idx[:, 1:].ravel(), idx[1:, :].ravel()])
    vals = np.concatenate([diag.ravel(), -ex.ravel(), -ey.ravel()])
    A = sp.coo_matrix((vals, (rows, cols)), shape=(N, N)).tocsr()
    return (A + sp.triu(A, 1).T).tocsc(), n


def levels(A):
    return np.sort(eigsh(A, k=COUNT, sigma=V_WELL, which="LM", return_eigenvectors=False))


def main():
    tolerance = float(sys.argv[1]) if len(sys.argv) > 1 else 1e-4
    h = float(sys.argv[2]) if len(sys.argv) > 2 else 2.0
    repeats = int(sys.argv[3]) if len(sys.argv) > 3 else 7
    with open(__file__.replace("square_pair_bench.py", "square_wire.json")) as f:
        exact = np.array(json.load(f)["energies_eV"])
    while True:
        (A, n1), (B, n2) = operator(h), operator(h / 2)
        e1, e2 = levels(A), levels(B)
        err = float(np.max(np.abs(e2 + (e2 - e1) / 3 - exact)))
        if err <= tolerance:
            break
        h /= 2
        if h < 0.05:
            raise SystemExit(f"square_pair_bench: no pair within {tolerance} eV down to h = {2 * h} nm")
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        e1, e2 = levels(A), levels(B)
        times.append(time.perf_counter() - t0)
    print(json.dumps({"median_ms": 1e3 * float(np.median(times)), "h_nm": h, "cells": [n1, n2], "true_error_eV": err,
                      "levels_eV": [float(x) for x in e2 + (e2 - e1) / 3]}))


if __name__ == "__main__":
    main()
