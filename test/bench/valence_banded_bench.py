#!/usr/bin/env python3
"""Speed reference for the multiband valence solver: scipy.linalg.eig_banded (LAPACK dsbevx) on the
very matrices our solver factorises (test/bench/entries.ts sends them), the highest `count`
eigenvalues of each.

Input JSON (stdin): {"count", "min_time_s", "max_repeats", "matrices": [{"n", "bw", "data"}]}, data in
our lower band layout (entry (r, c), r - bw <= c <= r, at r*(bw+1) + r - c).
One timed call solves every matrix (eigenvalues only, select='i'); calls repeat until min_time_s has
passed or max_repeats were made. Output: {"median_ms", "runs", "values": [[highest first] per matrix]}.
"""
import json
import sys
import time

import numpy as np
from scipy.linalg import eig_banded


def lapack_lower(m):
    n, bw = m["n"], m["bw"]
    a = np.asarray(m["data"], float).reshape(n, bw + 1)
    ab = np.zeros((bw + 1, n))
    # LAPACK lower storage: ab[i - j, j] = A[i, j]; ours holds A[r, r - k] at a[r, k].
    for k in range(bw + 1):
        ab[k, : n - k] = a[k:, k]
    return ab


def main():
    req = json.load(sys.stdin)
    count = req["count"]
    bands = [(lapack_lower(m), m["n"]) for m in req["matrices"]]

    def solve_all():
        return [eig_banded(ab, lower=True, eigvals_only=True, select="i", select_range=(n - count, n - 1)) for ab, n in bands]

    values = solve_all()
    times = []
    start = time.perf_counter()
    while len(times) < req["max_repeats"] and (len(times) < 3 or time.perf_counter() - start < req["min_time_s"]):
        t = time.perf_counter()
        solve_all()
        times.append((time.perf_counter() - t) * 1e3)
    json.dump({"median_ms": float(np.median(times)), "runs": len(times), "values": [sorted(v.tolist(), reverse=True) for v in values]}, sys.stdout)


if __name__ == "__main__":
    main()
