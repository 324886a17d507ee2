"""Fixture for composite Simpson integration on non-uniform grids: scipy.integrate.simpson (SciPy
>= 1.11, which treats an odd number of intervals with the three-point end correction) on seeded
random grids, as the reference for engine/observables/matrix-elements.ts simpson().
Run: python3 simpson_fixture.py  (writes simpson.json beside this script)
"""
import json
import pathlib

import numpy as np
from scipy import integrate

rng = np.random.default_rng(20240611)
cases = []
for n in [3, 4, 7, 10, 41, 64]:
    z = np.sort(rng.uniform(-5.0, 5.0, n))
    y = np.exp(-0.3 * z * z) * np.cos(1.7 * z) + 0.1 * z ** 3
    cases.append({"z": z.tolist(), "y": y.tolist(), "integral": float(integrate.simpson(y, x=z))})
out = {"source": "scipy.integrate.simpson " + __import__("scipy").__version__, "cases": cases}
pathlib.Path(__file__).with_name("simpson.json").write_text(json.dumps(out, indent=1) + "\n")
