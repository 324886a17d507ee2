"""Reference self-consistent Schroedinger-Poisson solutions of doped GaAs/AlGaAs wells (Hartree),
by methods different from the product's (engine/poisson: exact transfer on mesh slices, finite
elements for Poisson, Anderson mixing, closed-form series for the gas).

Model (the same physics as the product, stated there): electrons of the net donors; donors
ionised; bound subbands below the barrier edge E_b (the lower outer band edge) filled by Fermi-Dirac
with the 2-D density of states of each state's in-plane mass m_i = 1/<1/(m_par (1 + alpha (E_i - V)))>
over the stack; above E_b a semiclassical 3-D gas in the stack,
    n(z) = (1/2 pi^2) (m/C)^(3/2) int_{max(E_b, E_c(z))}^inf sqrt(E - E_c(z)) f(E) dE,  C = hbar^2/2m0;
one Fermi level makes the stack neutral; U = -e phi obeys d/dz(eps dU/dz) = (e/eps0) c, U = 0 and no
field at the stack's start, the stack neutral. A state's probability beyond the stack is placed at
the stack's end nodes; the density is the conduction component, normalised to 1.

Methods:
- Schroedinger: the two-band (2x2 Kane) Hamiltonian by staggered finite differences (as
  test/reference/intersubband/two_band_kane.py: conduction component on nodes, valence component on
  midpoints, a linear real symmetric tridiagonal eigenproblem, scipy.linalg.eigh_tridiagonal), the
  stack extended by EXT_NM of its outer barriers (at the band edge of its end) and closed there.
- Gas: Gauss-Legendre quadrature (numpy.polynomial.legendre) on a fixed grid in s, t = b + s^2,
  vectorised over the nodes; Fermi level by scipy.optimize.brentq.
- Poisson: three-point finite differences with nodal (lumped) charges, solved by
  scipy.linalg.solve_banded.
- Self-consistency: plain linear mixing U <- U + BETA (U_out - U) until max |U_out - U| < TOL_EV.
- Grids h and h/2, Richardson-extrapolated (second order).

Input: print_parameters.ts (the product's public path for band parameters and doping).
Run: node --import tsx print_parameters.ts | python3 schrodinger_poisson.py   (writes schrodinger_poisson.json)
Units: eV, nm, K; densities nm^-3 and cm^-2 in the fixture.
"""
import json
import pathlib
import sys

import numpy as np
from numpy.polynomial.legendre import leggauss
from scipy.linalg import eigh_tridiagonal, solve_banded
from scipy.optimize import brentq

C = 0.0380998212  # hbar^2/(2 m0), eV nm^2, CODATA 2018
KB = 8.617333262e-5  # eV/K
E_OVER_EPS0 = 1.602176634e-19 / 8.8541878128e-12 * 1e9  # V nm
EXT_NM = 60.0
H = 0.05
BETA = 0.3
TOL_EV = 1e-10
EMPTY_KT = 45.0
GL_S, GL_W = leggauss(32)


def grid_of(case, h):
    layers = [(EXT_NM, case["left"], 0.0)] + [(l["width_nm"], l, l["donors_nm3"]) for l in case["layers"]] + [(EXT_NM, case["right"], 0.0)]
    counts = [round(w / h) for w, _, _ in layers]
    for (w, _, _), n in zip(layers, counts):
        assert abs(n * h - w) < 1e-9, (w, h)
    cell = np.concatenate([[k] * n for k, n in enumerate(counts)])
    pick = lambda key: np.array([r[key] for _, r, _ in layers])[cell]
    cells = dict(V=pick("V"), m=pick("mass"), a=pick("alpha"), mpar=pick("massInPlane"))
    eps_layers = [case["layers"][0]["permittivity"]] + [l["permittivity"] for l in case["layers"]] + [case["layers"][-1]["permittivity"]]
    cells["eps"] = np.array(eps_layers)[cell]
    cells["donors"] = np.array([d for _, _, d in layers])[cell]
    n_cells = len(cell)
    first = counts[0]
    last = n_cells - counts[-1]
    return cells, n_cells, first, last


def states(cells, U_nodes, h, lo, hi):
    V = cells["V"] + 0.5 * (U_nodes[:-1] + U_nodes[1:])
    m, a = cells["m"], cells["a"]
    hp = np.sqrt(C / (a * m))
    n = len(V)
    v_node = np.empty(n + 1)
    v_node[0], v_node[-1] = V[0], V[-1]
    v_node[1:-1] = 0.5 * (V[:-1] + V[1:])
    diag = np.empty(2 * n + 1)
    diag[0::2] = v_node
    diag[1::2] = V - 1 / a
    off = np.empty(2 * n)
    off[0::2] = -hp / h
    off[1::2] = hp / h
    E, vec = eigh_tridiagonal(diag, off, select="v", select_range=(lo, hi))
    c = vec[0::2]
    c = c / np.sqrt(h * np.sum(c ** 2, axis=0))
    return E, c, V


def gas_loads(cells, U, first, last, Eb, F, kT, h):
    """Gas per unit area at the stack's nodes (nm^-2): each stack cell's two ends by the trapezoid rule,
    the band edge at a node being the cell's edge plus U there."""
    loads = np.zeros(last - first + 1)
    if kT == 0:
        return loads
    for side in (0, 1):
        idx = np.arange(first, last)
        nodes = idx + side
        edge = cells["V"][idx] + U[nodes]
        frm = np.maximum(Eb, edge)
        # States more than EMPTY_KT above the Fermi level are empty (e^-45).
        keep = (F - frm) / kT > -EMPTY_KT
        idx, nodes, edge, frm = idx[keep], nodes[keep], edge[keep], frm[keep]
        g = (cells["m"][idx] / C) ** 1.5 / (2 * np.pi ** 2) * kT ** 1.5
        b = (frm - edge) / kT
        shifted = (F - frm) / kT
        smax = np.sqrt(np.maximum(shifted, 0) + EMPTY_KT)
        s = 0.5 * (GL_S[None, :] + 1) * smax[:, None]
        w = 0.5 * GL_W[None, :] * smax[:, None]
        x = np.clip(s ** 2 - shifted[:, None], -700, 700)
        f = np.where(x > 0, np.exp(-x) / (1 + np.exp(-x)), 1 / (1 + np.exp(x)))
        integral = np.sum(w * 2 * s * np.sqrt(b[:, None] + s ** 2) * f, axis=1)
        np.add.at(loads, nodes - first, 0.5 * h * g * integral)
    return loads


def solve_case(case, h, start=None):
    cells, n_cells, first, last = grid_of(case, h)
    kT = KB * case["temperature_K"]
    z = np.arange(n_cells + 1) * h - EXT_NM
    stack = slice(first, last + 1)
    eps = cells["eps"]
    U = np.zeros(n_cells + 1)
    # Donor loads (nm^-2) at the stack's nodes: each cell's h N split between its two nodes.
    donor_loads = np.zeros(last - first + 1)
    donor_loads[:-1] += 0.5 * h * cells["donors"][first:last]
    donor_loads[1:] += 0.5 * h * cells["donors"][first:last]
    wanted = np.sum(donor_loads)
    if start is not None:
        # A coarser grid's solution (every other node of this one), linearly interpolated.
        U[first:last + 1] = np.interp(np.arange(last - first + 1) * h, np.arange(len(start)) * 2 * h, start)
    F = None
    # Poisson on the stack's nodes 0..N: U_0 = 0, zero flux after node N; row k: flux balance of its control volume.
    N = last - first
    e = eps[first:last]
    ab = np.zeros((3, N))
    right = np.append(e[1:], 0.0) / h
    left = e / h
    ab[1] = -(left + right)
    ab[0, 1:] = right[:-1]
    ab[2, :-1] = left[1:]
    for iteration in range(20000):
        # Flat contacts: U beyond the stack is its end value.
        U[:first] = U[first]
        U[last + 1:] = U[last]
        Eb = min(case["left"]["V"] + U[first], case["right"]["V"] + U[last])
        E, c, V = states(cells, U, h, np.min(cells["V"] + U[:-1]) - 0.01, Eb)
        c2 = c ** 2
        c2_cell = 0.5 * (c2[:-1] + c2[1:])
        inside = slice(first, last)
        factor = 1 + cells["a"][inside, None] * (E[None, :] - V[inside, None])
        mass = np.sum(c2_cell[inside], axis=0) / np.sum(c2_cell[inside] / (cells["mpar"][inside, None] * factor), axis=0)
        # Electron loads per unit density of each state: trapezoid weights inside, the tails on the end nodes.
        weights = h * c2[stack].copy()
        weights[0] = h * (np.sum(c2[:first], axis=0) + 0.5 * c2[first])
        weights[-1] = h * (np.sum(c2[last + 1:], axis=0) + 0.5 * c2[last])
        weights = weights / np.sum(weights, axis=0)
        dos = mass / (2 * np.pi * C)

        def carriers(Fl):
            return np.sum(dos * kT * np.logaddexp(0, (Fl - E) / kT)) + np.sum(gas_loads(cells, U, first, last, Eb, Fl, kT, h)) - wanted

        if F is None or carriers(F - 2 * kT) > 0 or carriers(F + 2 * kT) < 0:
            lo, hi = (np.min(E) if len(E) else Eb) - 0.5, Eb + 0.5
        else:
            lo, hi = F - 2 * kT, F + 2 * kT
        F = brentq(carriers, lo, hi, xtol=1e-14, rtol=1e-15, maxiter=500)
        pops = dos * kT * np.logaddexp(0, (F - E) / kT)
        gas = gas_loads(cells, U, first, last, Eb, F, kT, h)
        loads = donor_loads - weights @ pops - gas
        Uout = np.zeros(N + 1)
        Uout[1:] = solve_banded((1, 1), ab, E_OVER_EPS0 * loads[1:])
        change = Uout - U[stack]
        if np.max(np.abs(change)) < TOL_EV:
            break
        U[stack] = U[stack] + BETA * change
    else:
        raise RuntimeError("no convergence")
    centre = first + round(case["well_centre_nm"] / h)
    return {
        "e1_eV": float(E[0]), "e2_eV": float(E[1]) if len(E) > 1 else None,
        "fermi_eV": float(F), "bending_eV": float(U[centre]), "U_max_eV": float(np.max(U[stack])),
        "gas_cm2": float(np.sum(gas) * 1e14), "e1_density_cm2": float(pops[0] * 1e14),
        "iterations": iteration + 1, "bound_states": int(len(E)), "U": U[stack].copy(),
    }


def main():
    parameters = json.load(sys.stdin)
    out = {}
    for name, case in parameters.items():
        coarse = solve_case(case, H)
        fine = solve_case(case, H / 2, coarse["U"])
        ref = {}
        for key in ("e1_eV", "e2_eV", "fermi_eV", "bending_eV", "U_max_eV", "gas_cm2"):
            if fine[key] is None:
                ref[key] = None
            else:
                ref[key] = fine[key] + (fine[key] - coarse[key]) / 3
        ref["richardson_change_eV"] = max(abs(ref[k] - fine[k]) for k in ("e1_eV", "e2_eV", "fermi_eV", "bending_eV") if ref[k] is not None)
        ref["bound_states"] = fine["bound_states"]
        ref["iterations"] = [coarse["iterations"], fine["iterations"]]
        out[name] = ref
        print(name, ref, file=sys.stderr)
    fixture = {
        "generator": "schrodinger_poisson.py: 2x2 Kane finite differences (eigh_tridiagonal), FD Poisson (solve_banded), linear mixing, Gauss-Legendre gas, Richardson h/h2",
        "grid_nm": [H, H / 2], "extension_nm": EXT_NM, "mixing": BETA, "tolerance_eV": TOL_EV,
        "parameters": parameters,
        "results": out,
    }
    pathlib.Path(__file__).with_suffix(".json").write_text(json.dumps(fixture, indent=1) + "\n")


if __name__ == "__main__":
    main()
