"""Independent reference for resonances under an electric field: finite differences with smooth
exterior complex scaling (ECS), a different method from the product's (Siegert poles of the exact
piecewise transfer, engine/resonance.ts).

Model (the product's, stated here from its description, not from its code): single-band envelope
function, BenDaniel-Duke continuity, a linear potential s*e*F*(z - T/2) across the stack [0, T]
(s = +1 for electrons; s = -1 for holes in the particle sense V = -Ev), flat contacts beyond it at
the values of the stack's ends. Parabolic masses, or the two-band mass m(E) = m (1 + alpha (E - V))
solved self-consistently in complex E.

Method: the outer coordinate is rotated into the complex plane beyond R_NM of each contact,
z(x) = x + (e^{i theta} - 1) G(x) with a C2 ramp over RAMP_NM (B. Simon, Phys. Lett. A 71, 211
(1979) for exterior scaling; N. Moiseyev, Phys. Rep. 302, 212 (1998), section 5, for the smooth form),
so outgoing waves decay and resonances become isolated complex eigenvalues E - i Gamma/2 that do
not move with theta, while the rotated continuum does. Finite volumes on cell centres with complex
cell widths and the series (harmonic) mass of each face; hard walls at the ends; scipy's
shift-invert Arnoldi (ARPACK) for the eigenvalues nearest a guess. Each state is followed from its
zero-field energy (real symmetric problem, scipy eigh_tridiagonal) in FIELD_STEPS field steps,
taking at each the theta-stable eigenvalue nearest the previous one. Grid steps h and h/2 are
Richardson-extrapolated (second order).

Units: nm, eV, kV/cm (1 kV/cm = 1e-4 eV/nm for a unit charge), masses m0.
Run: python3 ecs_resonances.py  (writes ecs_resonances.json beside this script; about 13 min on two cores)
"""
import json
import math
import pathlib

import numpy as np
import scipy.sparse as sp
from scipy.linalg import eigh_tridiagonal
from scipy.sparse.linalg import eigs

C = 0.0380998212  # hbar^2/(2 m0), eV nm^2, CODATA 2018
R_NM = 20.0  # unscaled part of each contact kept beside the stack
RAMP_NM = 10.0
SCALED_NM = 150.0
THETAS = (0.5, 0.7)
H_NM = 0.05
FIELD_STEPS = 6

# Layers: (thickness nm, band edge V at zero field in the particle sense eV, mass m0, alpha 1/eV).
W5 = (5.2, 0.0, 0.067, 0.69)
B = (30.0, 0.25, 0.0886, 0.55)
W6 = (6.0, 0.0, 0.067, 0.69)
B6 = (6.0, 0.25, 0.0886, 0.55)
HW = (8.0, 1.5, 0.35, 0.0)  # heavy hole: V = -Ev, Ev(W) = -1.5 eV, Ev(B) = -1.6 eV
HB = (20.0, 1.6, 0.35, 0.0)

CASES = [
    {"name": "5.2 nm well, 30 nm claddings, 30 kV/cm, e2", "layers": [B, W5, B], "field": 30.0, "sign": 1, "state": 2, "nonparabolic": False},
    {"name": "5.2 nm well, 30 nm claddings, 30 kV/cm, e2, two-band mass", "layers": [B, W5, B], "field": 30.0, "sign": 1, "state": 2, "nonparabolic": True},
    {"name": "5.2 nm well, 30 nm claddings, 60 kV/cm, e1", "layers": [B, W5, B], "field": 60.0, "sign": 1, "state": 1, "nonparabolic": False},
    {"name": "6 nm well, 6 nm claddings, 250 kV/cm, e1", "layers": [B6, W6, B6], "field": 250.0, "sign": 1, "state": 1, "nonparabolic": False},
    {"name": "8 nm well, heavy holes, 20 nm claddings, 40 kV/cm, hh3", "layers": [HB, HW, HB], "field": 40.0, "sign": -1, "state": 3, "nonparabolic": False},
]


def smoothstep_integral(t):
    """Integral of the C2 ramp 6t^5 - 15t^4 + 10t^3 from 0 to t, t in [0, 1]."""
    return t ** 6 - 3 * t ** 5 + 2.5 * t ** 4


def grid(layers, h):
    total = sum(l[0] for l in layers)
    ext = R_NM + RAMP_NM + SCALED_NM
    n_ext = int(round(ext / h))
    n_stack = [int(round(l[0] / h)) for l in layers]
    for l, n in zip(layers, n_stack):
        assert abs(n * h - l[0]) < 1e-9, "layer thickness must be a multiple of h"
    n = 2 * n_ext + sum(n_stack)
    x0 = -n_ext * h
    faces = x0 + h * np.arange(n + 1)
    centres = x0 + h * (np.arange(n) + 0.5)
    return total, faces, centres


def complex_z(x, total, theta):
    """Complex coordinate: identity on [-R, T + R], rotated by theta beyond with a C2 ramp."""
    rot = np.exp(1j * theta) - 1
    g = np.zeros_like(x, dtype=float)
    right = x - (total + R_NM)
    left = -R_NM - x
    for d, sgn in ((right, 1.0), (left, -1.0)):
        t = np.clip(d / RAMP_NM, 0.0, 1.0)
        val = RAMP_NM * smoothstep_integral(t) + np.where(d > RAMP_NM, d - RAMP_NM, 0.0)
        g = g + sgn * np.where(d > 0, val, 0.0)
    return x + rot * g


def profile(layers, field, sign, centres, total):
    """Band edge V, mass and alpha at each cell centre (particle sense)."""
    V = np.empty_like(centres)
    m = np.empty_like(centres)
    a = np.empty_like(centres)
    edges = np.cumsum([0.0] + [l[0] for l in layers])
    slope = sign * field * 1e-4
    for i, x in enumerate(centres):
        k = int(np.searchsorted(edges, x, side="right")) - 1
        k = min(max(k, 0), len(layers) - 1)
        V[i] = layers[k][1] + slope * (min(max(x, 0.0), total) - total / 2)
        m[i] = layers[k][2]
        a[i] = layers[k][3]
    return V, m, a


def hamiltonian(V, mass, faces, centres, z_faces, z_centres):
    """Tridiagonal finite-volume operator -C (1/w_i)[F_{i+1/2} - F_{i-1/2}] + V_i, F = (psi_{i+1} - psi_i)/R_face."""
    n = len(centres)
    w = z_faces[1:] - z_faces[:-1]
    # Face resistance: (z_face - z_i) m_i + (z_{i+1} - z_face) m_{i+1}, the series form of psi'/m continuity.
    res = (z_faces[1:-1] - z_centres[:-1]) * mass[:-1] + (z_centres[1:] - z_faces[1:-1]) * mass[1:]
    g = 1.0 / res
    diag = V.astype(complex) + C * (np.concatenate([g, [0]]) + np.concatenate([[0], g])) / w
    # Dirichlet walls half a cell beyond the end centres.
    diag[0] += C / (w[0] * (z_centres[0] - z_faces[0]) * mass[0])
    diag[-1] += C / (w[-1] * (z_faces[-1] - z_centres[-1]) * mass[-1])
    upper = -C * g / w[:-1]
    lower = -C * g / w[1:]
    return sp.diags([lower, diag, upper], [-1, 0, 1], shape=(n, n), format="csc")


def zero_field_levels(layers, sign, h, nonparabolic):
    total, faces, centres = grid(layers, h)
    V, m, a = profile(layers, 0.0, sign, centres, total)
    if nonparabolic:
        # A guess only: the masses at the barrier edge; the field steps converge the two-band pole.
        m = m * (1 + a * (min(V[0], V[-1]) - V))
    H = hamiltonian(V, m, faces, centres, faces.astype(complex), centres.astype(complex)).toarray()
    # Real symmetric after the similarity with sqrt(w) (uniform h here: already symmetric).
    d = np.real(np.diag(H))
    e = np.real(np.diag(H, 1))
    vals = eigh_tridiagonal(d, e, select="v", select_range=(V.min(), min(V[0], V[-1])), eigvals_only=True)
    return np.sort(vals)


def eigenvalues_near(layers, field, sign, h, theta, guess, energy, k=8):
    """Eigenvalues nearest `guess` with the masses taken at the (complex) energy `energy` (parabolic: None)."""
    total, faces, centres = grid(layers, h)
    V, m, a = profile(layers, field, sign, centres, total)
    if energy is not None:
        m = m * (1 + a * (energy - V))
    H = hamiltonian(V, m, faces, centres, complex_z(faces, total, theta), complex_z(centres, total, theta))
    return eigs(H, k=k, sigma=guess, which="LM", return_eigenvectors=False, tol=1e-14)


def stable_pole(layers, field, sign, h, guess, energy):
    """The eigenvalue nearest the guess that moves least between the two rotation angles."""
    a = eigenvalues_near(layers, field, sign, h, THETAS[0], guess, energy)
    b = eigenvalues_near(layers, field, sign, h, THETAS[1], guess, energy)
    best = None
    for v in a:
        drift = np.min(np.abs(b - v))
        if drift > 1e-6 + 1e-3 * abs(v.imag):
            continue
        if best is None or abs(v - guess) < abs(best[0] - guess):
            best = (v, drift)
    if best is None:
        raise RuntimeError(f"no theta-stable eigenvalue near {guess}")
    return best


def pole(layers, field, sign, h, guess, nonparabolic):
    """The theta-stable pole near the guess; with the two-band mass, iterated until E is the pole of H(E)."""
    if not nonparabolic:
        return stable_pole(layers, field, sign, h, guess, None)
    E = guess
    for _ in range(60):
        new, drift = stable_pole(layers, field, sign, h, E, E)
        if abs(new - E) < 1e-13:
            return new, drift
        E = new
    raise RuntimeError("two-band iteration did not converge")


def follow(case, h):
    levels = zero_field_levels(case["layers"], case["sign"], h, case["nonparabolic"])
    E = complex(levels[case["state"] - 1])
    drift = 0.0
    for step in range(1, FIELD_STEPS + 1):
        E, drift = pole(case["layers"], case["field"] * step / FIELD_STEPS, case["sign"], h, E, case["nonparabolic"])
    return E, drift, levels[case["state"] - 1]


def main():
    out = []
    for case in CASES:
        coarse, _, e0 = follow(case, H_NM)
        fine, drift, _ = follow(case, H_NM / 2)
        extrapolated = fine + (fine - coarse) / 3
        out.append({
            "name": case["name"],
            "layers": [{"thickness_nm": l[0], "V_eV": l[1], "mass": l[2], "alpha": l[3]} for l in case["layers"]],
            "field_kV_per_cm": case["field"],
            "sign": case["sign"],
            "state": case["state"],
            "nonparabolic": case["nonparabolic"],
            "zero_field_eV": float(e0),
            "energy_eV": float(extrapolated.real),
            "width_eV": float(-2 * extrapolated.imag),
            "energy_h_eV": float(coarse.real),
            "width_h_eV": float(-2 * coarse.imag),
            "energy_h2_eV": float(fine.real),
            "width_h2_eV": float(-2 * fine.imag),
            "theta_drift_eV": float(drift),
        })
        print(case["name"], extrapolated, "drift", drift)
    meta = {
        "generator": "ecs_resonances.py",
        "method": "finite volumes with smooth exterior complex scaling, Richardson h/2",
        "h_nm": [H_NM, H_NM / 2],
        "thetas": list(THETAS),
        "contacts_nm": {"unscaled": R_NM, "ramp": RAMP_NM, "scaled": SCALED_NM},
    }
    path = pathlib.Path(__file__).with_suffix(".json")
    path.write_text(json.dumps({"meta": meta, "cases": out}, indent=2) + "\n")


if __name__ == "__main__":
    main()
