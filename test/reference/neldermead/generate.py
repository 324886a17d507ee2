"""Reference runs of scipy.optimize.minimize(method='Nelder-Mead') for wellsmith's bounded
Nelder-Mead tests, and reference outputs of the seeded generator transcribed from its published C.

Run from this folder: python3 generate.py  (writes fixtures.json beside this file).
Python is needed only to regenerate; the tests read the JSON.

Every case gives scipy the same initial simplex that wellsmith builds in x-space (x0 plus
initial_step * (hi - lo) along each coordinate, downwards when the step would leave the box), so
that the two runs start from the same points.
  mode "bounded":    scipy gets the box too (scipy clips trial points to it; wellsmith maps
                     through x = lo + (hi - lo)(1 + sin y)/2), so paths differ and only the
                     minimiser, the value and the order of the evaluation count are compared.
  mode "equivalent": a very wide box (+-1e5) centred on 0 and scipy unbounded; near the centre the
                     sine map is affine to ~1e-10, Nelder-Mead is affine invariant, so the two
                     runs should nearly coincide.
"""
import json
import os

import numpy as np
import scipy
from scipy.optimize import minimize

MONOLAYER_NM = 0.2827  # GaAs (001) monolayer a/2 (common practice)


def rosenbrock(x, p):
    x = np.asarray(x, dtype=float)
    return float(np.sum(100.0 * (x[1:] - x[:-1] ** 2) ** 2 + (1.0 - x[:-1]) ** 2))


def sphere(x, p):
    c = np.asarray(p["centre"])
    return float(np.sum((np.asarray(x) - c) ** 2))


def beale(x, p):
    a, b = x
    return float((1.5 - a + a * b) ** 2 + (2.25 - a + a * b ** 2) ** 2 + (2.625 - a + a * b ** 3) ** 2)


def himmelblau(x, p):
    a, b = x
    return float((a * a + b - 11.0) ** 2 + (a + b * b - 7.0) ** 2)


def booth(x, p):
    a, b = x
    return float((a + 2.0 * b - 7.0) ** 2 + (2.0 * a + b - 5.0) ** 2)


def weighted_quadratic(x, p):
    c = np.asarray(p["centre"])
    w = np.asarray(p["weights"])
    return float(np.sum(w * (np.asarray(x) - c) ** 2))


def staircase(x, p):
    # Monolayer-snapped widths: piecewise constant, flat on each monolayer step.
    t = np.asarray(p["targets"])
    snapped = MONOLAYER_NM * np.round(np.asarray(x) / MONOLAYER_NM)
    return float(np.sum((snapped - t) ** 2))


FUNCTIONS = {
    "rosenbrock": rosenbrock,
    "sphere": sphere,
    "beale": beale,
    "himmelblau": himmelblau,
    "booth": booth,
    "weighted-quadratic": weighted_quadratic,
    "staircase": staircase,
}

def staircase_minimum(targets, box):
    # Snapped widths reachable from the box: round(x / ML) for x in [lo, hi].
    counts = np.arange(int(np.round(box[0] / MONOLAYER_NM)), int(np.round(box[1] / MONOLAYER_NM)) + 1)
    return float(sum(np.min((MONOLAYER_NM * counts - t) ** 2) for t in targets))


WIDE = 1.0e5
SMOOTH = {"xTolerance": 1e-8, "fTolerance": 1e-12}


def initial_simplex(x0, bounds, step):
    x0 = np.asarray(x0, dtype=float)
    sim = [x0.copy()]
    for k, (lo, hi) in enumerate(bounds):
        x = x0.copy()
        up = x[k] + step * (hi - lo)
        x[k] = up if up <= hi else x[k] - step * (hi - lo)
        sim.append(x)
    return np.array(sim)


def case(name, function, x0, bounds, mode, params=None, step=0.05, tol=SMOOTH, max_evaluations=None, minimiser=None, minimum=None, adaptive=None):
    n = len(x0)
    return {
        "name": name,
        "function": function,
        "params": params or {},
        "x0": list(map(float, x0)),
        "bounds": [list(map(float, b)) for b in bounds],
        "mode": mode,
        "initialStep": step,
        "adaptive": n > 2 if adaptive is None else adaptive,
        "xTolerance": tol["xTolerance"],
        "fTolerance": tol["fTolerance"],
        "maxEvaluations": max_evaluations or 1000 * n,
        "knownMinimiser": minimiser,
        "knownMinimum": minimum,
    }


def wide(n):
    return [(-WIDE, WIDE)] * n


# Step of the initial simplex in "equivalent" mode: 0.1 in x for a box 2e5 wide.
WIDE_STEP = 0.1 / (2 * WIDE)

# Known minimisers (closed forms, common practice): Rosenbrock (1, ..., 1) f = 0; Beale (3, 0.5)
# f = 0; Booth (1, 3) f = 0; Himmelblau (3, 2) and three more zeros of f = 0 (found numerically).
CASES = [
    case("rosenbrock-2d", "rosenbrock", [-1.2, 1.0], [(-5, 5), (-5, 5)], "bounded", minimiser=[1, 1], minimum=0),
    case("rosenbrock-4d", "rosenbrock", [-1.2, 1.0, -0.5, 0.8], [(-3, 3)] * 4, "bounded", minimiser=[1, 1, 1, 1], minimum=0),
    case("sphere-3d", "sphere", [2.0, 2.0, -2.0], [(-4, 4)] * 3, "bounded", params={"centre": [0.3, -0.7, 1.1]}, minimiser=[0.3, -0.7, 1.1], minimum=0),
    case("beale", "beale", [1.0, 1.0], [(-4.5, 4.5), (-4.5, 4.5)], "bounded", minimiser=[3, 0.5], minimum=0),
    case("booth", "booth", [-5.0, 7.0], [(-10, 10), (-10, 10)], "bounded", minimiser=[1, 3], minimum=0),
    # Optimum on the box: the minimiser of a separable quadratic over a box is the clipped centre.
    case("quadratic-bound-active", "weighted-quadratic", [0.5, 0.5, 0.5], [(0, 1)] * 3, "bounded",
         params={"centre": [1.5, -0.4, 0.25], "weights": [1.0, 2.0, 0.5]}, minimiser=[1.0, 0.0, 0.25], minimum=0.25 + 2 * 0.16),
    # Monolayer-snapped widths in nm: flat plateaus. Global minimum by enumeration of monolayer counts.
    case("staircase", "staircase", [4.5, 9.5], [(4, 10), (4, 10)], "bounded", params={"targets": [6.1, 8.3]},
         tol={"xTolerance": 1e-4, "fTolerance": 1e-9}, minimum=staircase_minimum([6.1, 8.3], (4, 10))),
    case("rosenbrock-2d-wide", "rosenbrock", [-1.2, 1.0], wide(2), "equivalent", step=WIDE_STEP, minimiser=[1, 1], minimum=0),
    case("rosenbrock-4d-wide", "rosenbrock", [-1.2, 1.0, -0.5, 0.8], wide(4), "equivalent", step=WIDE_STEP, minimiser=[1, 1, 1, 1], minimum=0),
    # Standard coefficients forced in 4-D (wellsmith's default there is Gao-Han's).
    case("rosenbrock-4d-wide-standard", "rosenbrock", [-1.2, 1.0, -0.5, 0.8], wide(4), "equivalent", step=WIDE_STEP, minimiser=[1, 1, 1, 1], minimum=0, adaptive=False),
    case("beale-wide", "beale", [1.0, 1.0], wide(2), "equivalent", step=WIDE_STEP, minimiser=[3, 0.5], minimum=0),
    case("booth-wide", "booth", [-5.0, 7.0], wide(2), "equivalent", step=WIDE_STEP, minimiser=[1, 3], minimum=0),
] + [
    case(f"himmelblau-{i}", "himmelblau", x0, [(-6, 6), (-6, 6)], "bounded", minimum=0)
    for i, x0 in enumerate([[0.0, 0.0], [-1.0, 1.0], [1.0, -1.0], [-4.0, -4.0], [4.0, 4.0]])
] + [
    case(f"himmelblau-wide-{i}", "himmelblau", x0, wide(2), "equivalent", step=WIDE_STEP, minimum=0)
    for i, x0 in enumerate([[0.0, 0.0], [-1.0, 1.0], [1.0, -1.0], [-4.0, -4.0], [4.0, 4.0]])
]


TRACE_LENGTH = 60


def trace_scipy(c, length):
    fn = FUNCTIONS[c["function"]]
    values = []

    def recorded(x):
        value = fn(x, c["params"])
        values.append(value)
        return value

    sim = initial_simplex(c["x0"], c["bounds"], c["initialStep"])
    options = {"initial_simplex": sim, "xatol": c["xTolerance"], "fatol": c["fTolerance"], "maxfev": length, "adaptive": c["adaptive"]}
    minimize(recorded, np.asarray(c["x0"]), method="Nelder-Mead", options=options)
    return values


def run_scipy(c):
    fn = FUNCTIONS[c["function"]]
    sim = initial_simplex(c["x0"], c["bounds"], c["initialStep"])
    options = {
        "initial_simplex": sim,
        "xatol": c["xTolerance"],
        "fatol": c["fTolerance"],
        "maxfev": c["maxEvaluations"],
        "maxiter": 10 ** 9,
        "adaptive": c["adaptive"],
    }
    bounds = c["bounds"] if c["mode"] == "bounded" else None
    r = minimize(lambda x: fn(x, c["params"]), np.asarray(c["x0"]), method="Nelder-Mead", bounds=bounds, options=options)
    return {"x": [float(v) for v in r.x], "f": float(r.fun), "evaluations": int(r.nfev), "iterations": int(r.nit), "success": bool(r.success)}


# xoshiro128** transcribed from Blackman & Vigna's published C (ACM TOMS 47(4), 36 (2021)),
# seeded as wellsmith documents: s_i = fmix32(seed + (i + 1) * 0x9E3779B9 mod 2^32), with
# MurmurHash3's fmix32 (Appleby, SMHasher).
M32 = 0xFFFFFFFF


def fmix32(h):
    h &= M32
    h ^= h >> 16
    h = (h * 0x85EBCA6B) & M32
    h ^= h >> 13
    h = (h * 0xC2B2AE35) & M32
    h ^= h >> 16
    return h


def rotl(x, r):
    return ((x << r) | (x >> (32 - r))) & M32


def xoshiro_outputs(seed, count):
    s = [fmix32((seed & M32) + (i + 1) * 0x9E3779B9) for i in range(4)]
    out = []
    for _ in range(count):
        result = (rotl((s[1] * 5) & M32, 7) * 9) & M32
        t = (s[1] << 9) & M32
        s[2] ^= s[0]
        s[3] ^= s[1]
        s[1] ^= s[2]
        s[0] ^= s[3]
        s[2] ^= t
        s[3] = rotl(s[3], 11)
        out.append(result)
    return out


def main():
    cases = []
    for c in CASES:
        c = dict(c)
        c["scipy"] = run_scipy(c)
        if c["mode"] == "equivalent":
            # Objective values in the order scipy evaluated them: the paths should coincide.
            c["scipyTrace"] = trace_scipy(c, TRACE_LENGTH)
        cases.append(c)
    data = {
        "generator": "test/reference/neldermead/generate.py",
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "cases": cases,
        "xoshiro128starstar": [{"seed": seed, "uint32": xoshiro_outputs(seed, 8)} for seed in [0, 1, 42, 4294967295]],
    }
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "fixtures.json")
    with open(path, "w") as fh:
        json.dump(data, fh, indent=1)
        fh.write("\n")


if __name__ == "__main__":
    main()
