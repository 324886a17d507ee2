"""Reference intersubband energies, dipoles and sums of oscillator strength from the two-band (2x2 Kane)
Hamiltonian, discretised by finite differences as a linear, real symmetric eigenproblem.

Method (different from the product's exact piecewise transfer of the energy-dependent single-band
equation with Pruefer counting, and its Gauss-Legendre matrix elements): per slice of potential V,
band-edge mass m and non-parabolicity alpha, the conduction component c and the valence component
w (the imaginary part of the second component, made real) obey
    V c - d/dz(hP w) = E c,      hP dc/dz + (V - 1/alpha) w = E w,      (hP)^2 = (hbar^2/2m0)/(alpha m),
whose elimination of w gives back -(hbar^2/2m0) d/dz(1/m(E) dc/dz) + V c = E c with
m(E) = m (1 + alpha (E - V)) (E. O. Kane, J. Phys. Chem. Solids 1, 249 (1957) for the two-band
model; G. Bastard, Wave Mechanics Applied to Semiconductor Heterostructures (1988) for its envelope
form). c lives on the nodes z_k = k h and w on the midpoints, so H is a symmetric tridiagonal matrix
in the order c0, w1/2, c1, ...: its eigenvectors are orthonormal in sum h (c^2 + w^2) by
construction, and z is diagonal in both components. Interfaces sit on nodes, where V is the mean
of the two sides. Energies and dipoles are Richardson-extrapolated from h and h/2 (second order: at
h = 0.04, 0.02, 0.01 nm the error of e1 in the InGaAs well falls 4.0-fold per halving). Each state
is signed positive at the left edge of the stack (as the product's).

Sums: for a state i, S_i = sum_j (E_j - E_i) z_ij^2 / (hbar^2/2m0) (in 1/m0), so that the oscillator
strengths f_ij = m_ref (E_j - E_i) z_ij^2/(hbar^2/2m0) sum to m_ref S_i. Over all states of the
two-band model (conduction and valence-like) S_i = 0, since [z, [H, z]] = 0 (Thomas-Reiche-Kuhn with
an interband velocity); the conduction states alone carry S_i > 0.

Input: the electron profiles printed by print_parameters.ts (the product's public path); they are
copied into the fixture. Units: eV, nm, masses in m0.
Run: node --import tsx print_parameters.ts | python3 two_band_kane.py   (writes two_band_kane.json)
"""
import json
import pathlib
import sys

import numpy as np
from scipy.linalg import eigh_tridiagonal

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018
OPEN_EXTENSION_NM = 80.0  # the outer regions of an open well, cut far beyond the bound states' tails
BOX_EXTENSION_NM = 10.0  # the outer walls of the box (states below the wall top decay within ~1 nm)
H_WELL = 0.01
H_BOX = 0.04
H_BOX_ALL = 0.05


def layers_of(profile, extension):
    out = [(extension, profile["left"])]
    out += [(s["width_nm"], s) for s in profile["slices"]]
    out.append((extension, profile["right"]))
    return out


def hamiltonian(layers, h):
    counts = [round(w / h) for w, _ in layers]
    for (w, _), n in zip(layers, counts):
        assert abs(n * h - w) < 1e-9, f"slice {w} nm is not a multiple of h = {h} nm"
    n_cells = sum(counts)
    cell = np.concatenate([[k] * n for k, n in enumerate(counts)])
    V = np.array([r["V"] for _, r in layers])[cell]
    m = np.array([r["mass"] for _, r in layers])[cell]
    a = np.array([r["alpha"] for _, r in layers])[cell]
    hp = np.sqrt(HBAR2_OVER_2M0 / (a * m))
    v_node = np.empty(n_cells + 1)
    v_node[0], v_node[-1] = V[0], V[-1]
    v_node[1:-1] = 0.5 * (V[:-1] + V[1:])
    diag = np.empty(2 * n_cells + 1)
    diag[0::2] = v_node
    diag[1::2] = V - 1 / a
    off = np.empty(2 * n_cells)
    off[0::2] = -hp / h
    off[1::2] = hp / h
    z_node = np.arange(n_cells + 1) * h - layers[0][0]
    z_mid = z_node[:-1] + h / 2
    return diag, off, z_node, z_mid, dict(V=V, m=m, a=a)


def states(layers, h, lo, hi):
    """Eigenpairs with lo < E < hi: energies, c on nodes, w on midpoints (normalised, signed)."""
    diag, off, z_node, z_mid, cells = hamiltonian(layers, h)
    E, vec = eigh_tridiagonal(diag, off, select="v", select_range=(lo, hi))
    vec = vec / np.sqrt(h)
    c, w = vec[0::2], vec[1::2]
    edge = int(np.argmin(np.abs(z_node)))
    sign = np.sign(c[edge])
    assert np.all(sign != 0)
    return E, c * sign, w * sign, z_node, z_mid, cells


def dipoles(c, w, z_node, z_mid, h, centre):
    return h * (c.T @ ((z_node - centre)[:, None] * c) + w.T @ ((z_mid - centre)[:, None] * w))


def sum_rule_mass(c, E, cells, h):
    """1/<1/m(z, E)> with the conduction component's weight alone (the product's in-plane/sum-rule mass)."""
    c2 = 0.5 * (c[1:] ** 2 + c[:-1] ** 2)
    mE = cells["m"] * (1 + cells["a"] * (E - cells["V"]))
    return np.sum(c2) / np.sum(c2 / mE)


def richardson(fine, coarse):
    return fine + (fine - coarse) / 3


def open_well(profile, count=4):
    layers = layers_of(profile, OPEN_EXTENSION_NM)
    lo = min(s["V"] for s in profile["slices"])
    hi = min(profile["left"]["V"], profile["right"]["V"])
    total = sum(s["width_nm"] for s in profile["slices"])
    runs = []
    for h in (H_WELL, H_WELL / 2):
        E, c, w, zn, zm, cells = states(layers, h, lo, hi)
        assert len(E) >= count, f"only {len(E)} bound states"
        D = dipoles(c[:, :count], w[:, :count], zn, zm, h, total / 2)
        m = [sum_rule_mass(c[:, k], E[k], cells, h) for k in range(count)]
        runs.append((E[:count], D, np.array(m)))
    (Ec, Dc, mc), (Ef, Df, mf) = runs
    E, D, m = richardson(Ef, Ec), richardson(Df, Dc), richardson(mf, mc)
    pairs = [(0, 1), (1, 2), (0, 3), (0, 2), (1, 3), (2, 3)]
    return {
        "energies_eV": [float(x) for x in E],
        "dipoles_nm": {f"z{i + 1}{j + 1}": float(D[i, j]) for i, j in pairs},
        "sum_rule_masses_m0": [float(x) for x in m],
        "richardson_change": {
            "energies_eV": float(np.max(np.abs(E - Ef))),
            "dipoles_nm": float(max(abs(D[i, j] - Df[i, j]) for i, j in pairs)),
        },
        "bound_states": int(len(Ef)),
    }


def conduction_sums(profile, extension, h, states_wanted=2):
    """S_i over every eigenstate, over the conduction ones and over those below the outer potential."""
    layers = layers_of(profile, extension)
    diag, off, z_node, z_mid, cells = hamiltonian(layers, h)
    E, vec = eigh_tridiagonal(diag, off)
    vec = vec / np.sqrt(h)
    c, w = vec[0::2], vec[1::2]
    gap_middle = 0.5 * (cells["V"].min() + (cells["V"] - 1 / cells["a"]).max())
    conduction = E > gap_middle
    first = int(np.argmax(conduction))
    top = min(profile["left"]["V"], profile["right"]["V"])
    out = []
    for i in range(first, first + states_wanted):
        z_row = h * ((c[:, i] * z_node) @ c + (w[:, i] * z_mid) @ w)
        terms = (E - E[i]) * z_row ** 2 / HBAR2_OVER_2M0
        out.append({
            "all": float(np.sum(terms)),
            "conduction": float(np.sum(terms[conduction])),
            "below_top": float(np.sum(terms[conduction & (E < top)])),
        })
    return out


def box(profile):
    layers = layers_of(profile, BOX_EXTENSION_NM)
    lo = min(s["V"] for s in profile["slices"])
    top = min(profile["left"]["V"], profile["right"]["V"])
    total = sum(s["width_nm"] for s in profile["slices"])
    runs = []
    for h in (H_BOX, H_BOX / 2):
        E, c, w, zn, zm, cells = states(layers, h, lo, top)
        D = dipoles(c, w, zn, zm, h, total / 2)
        S = [float(np.sum((E - E[i]) * D[i] ** 2) / HBAR2_OVER_2M0) for i in (0, 1)]
        m = [sum_rule_mass(c[:, i], E[i], cells, h) for i in (0, 1)]
        runs.append((E, np.array(S), np.array(m)))
    (Ec, Sc, mc), (Ef, Sf, mf) = runs
    S, m = richardson(Sf, Sc), richardson(mf, mc)
    whole = conduction_sums(profile, BOX_EXTENSION_NM, H_BOX_ALL)
    for k in whole:
        # Thomas-Reiche-Kuhn of the two-band model: the sum over every state vanishes (to O(h) of the grid).
        assert abs(k["all"]) < 1e-3 * k["conduction"], k
    return {
        "states_below_wall": int(len(Ef)),
        "energies_eV": [float(x) for x in richardson(Ef[:4], Ec[:4])],
        "S_below_wall_per_m0": [float(x) for x in S],
        "sum_rule_masses_m0": [float(x) for x in m],
        "f_sum_below_wall": [float(S[i] * m[i]) for i in (0, 1)],
        "richardson_change_S": float(np.max(np.abs(S - Sf))),
        "all_states_h_0.05": whole,
    }


def main():
    parameters = json.load(sys.stdin)
    open_sums = conduction_sums(parameters["ingaas_well"], OPEN_EXTENSION_NM, H_BOX_ALL)
    fixture = {
        "generator": "two_band_kane.py: 2x2 Kane Hamiltonian, staggered finite differences, scipy.linalg.eigh_tridiagonal",
        "units": {"energy": "eV", "length": "nm", "mass": "m0", "S": "1/m0: sum_j (E_j - E_i) z_ij^2 / (hbar^2/2m0)"},
        "grid_nm": {"wells": [H_WELL, H_WELL / 2], "box": [H_BOX, H_BOX / 2], "all_states": H_BOX_ALL},
        "extension_nm": {"wells": OPEN_EXTENSION_NM, "box": BOX_EXTENSION_NM},
        "parameters": parameters,
        "ingaas_well": open_well(parameters["ingaas_well"]),
        "gaas_well": open_well(parameters["gaas_well"]),
        "ingaas_box": box(parameters["ingaas_box"]),
        "ingaas_well_open_sums_h_0.05": open_sums,
    }
    path = pathlib.Path(__file__).with_suffix(".json")
    path.write_text(json.dumps(fixture, indent=1) + "\n")


if __name__ == "__main__":
    main()
