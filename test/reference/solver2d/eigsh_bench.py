#!/usr/bin/env python3
"""Speed reference for engine/solver2d.ts: scipy eigsh shift-invert on the same 5-point matrix.

Builds the BenDaniel-Duke operator of engine/solver2d/operator.ts (1/m between nodes as
2/(m_a + m_b), with m_x on x-edges and m_y on y-edges, the node's own mass at the Dirichlet wall, nodes at x0 + i*h inside a box with the
wall one spacing outside) for a rectangular or circular wire and prints the median wall and CPU
time of repeated eigsh(A, k, sigma=min(V), which='LM') runs (factorisation included) and the energies.

Usage: python3 eigsh_bench.py [rect|circle] [n=120] [k=6] [repeats=7]
"""
import json
import sys
import time

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import eigsh

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018 (engine/constants.ts)


def case(kind, n):
    """Node potential (eV) and mass (m0) of the benchmark cases, with the box side (nm)."""
    if kind == "rect":
        side = 10.0
        h = side / (n + 1)
        return np.zeros((n, n)), np.full((n, n), 0.067), h
    side = 30.0  # GaAs-like disc of radius 5 nm in a 0.3 eV, 0.092 m0 barrier
    h = side / (n + 1)
    c = (np.arange(n) + 1) * h - side / 2
    x, y = np.meshgrid(c, c, indexing="xy")  # row j, column i -> index i + n*j
    inside = x * x + y * y < 25.0
    return np.where(inside, 0.0, 0.3), np.where(inside, 0.067, 0.092), h


def operator(V, m, dx, dy, my=None):
    """The 5-point operator; m is the mass along x, my the mass along y (default m): a diagonal mass tensor."""
    my = m if my is None else my
    ny, nx = V.shape
    cx, cy = HBAR2_OVER_2M0 / dx**2, HBAR2_OVER_2M0 / dy**2
    ex = 2 * cx / (m[:, :-1] + m[:, 1:])  # edge (i, i+1) in row j
    ey = 2 * cy / (my[:-1, :] + my[1:, :])  # edge (j, j+1) in column i
    diag = V.copy()
    diag[:, :-1] += ex
    diag[:, 1:] += ex
    diag[:-1, :] += ey
    diag[1:, :] += ey
    diag[:, 0] += cx / m[:, 0]
    diag[:, -1] += cx / m[:, -1]
    diag[0, :] += cy / my[0, :]
    diag[-1, :] += cy / my[-1, :]
    N = nx * ny
    idx = np.arange(N).reshape(ny, nx)
    rows = [idx.ravel(), idx[:, :-1].ravel(), idx[:-1, :].ravel()]
    cols = [idx.ravel(), idx[:, 1:].ravel(), idx[1:, :].ravel()]
    vals = [diag.ravel(), -ex.ravel(), -ey.ravel()]
    A = sp.coo_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(N, N))
    upper = A.tocsr()
    return (upper + sp.triu(upper, 1).T).tocsc()


def main():
    kind = sys.argv[1] if len(sys.argv) > 1 else "rect"
    n = int(sys.argv[2]) if len(sys.argv) > 2 else 120
    k = int(sys.argv[3]) if len(sys.argv) > 3 else 6
    repeats = int(sys.argv[4]) if len(sys.argv) > 4 else 7
    V, m, h = case(kind, n)
    A = operator(V, m, h, h)
    times, cpu = [], []
    for _ in range(repeats):
        t0, c0 = time.perf_counter(), time.process_time()
        w = eigsh(A, k=k, sigma=V.min(), which="LM", return_eigenvectors=True)[0]
        times.append(time.perf_counter() - t0)
        cpu.append(time.process_time() - c0)
    print(json.dumps({"case": kind, "n": n, "k": k, "median_ms": 1e3 * float(np.median(times)),
                      "median_cpu_ms": 1e3 * float(np.median(cpu)),
                      "energies_eV": sorted(float(e) for e in w)}))


if __name__ == "__main__":
    main()
