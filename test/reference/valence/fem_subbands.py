#!/usr/bin/env python3
"""Independent reference for the multiband valence solver (engine/valence/): quadratic (P2)
Lagrange finite elements for the Luttinger-Kohn 4x4 / 6x6 Hamiltonian of a layered (001) well.

Method (different from the product's box-integration finite differences): the weak form
  a(v, u) = sum over elements of int [ (kz v)^H C (kz u) + v^H B (kz u) + (kz v)^H B^H u + v^H A u ] dz,
  m(v, u) = int v^H u dz,           kz = -i d/dz,
with piecewise-quadratic shape functions on elements that end at every interface, 3-point Gauss
quadrature (exact for these polynomial products with constant coefficients per element), psi = 0 at
both ends, and the generalised Hermitian eigenproblem solved densely with scipy.linalg.eigh.
The integration by parts in the weak form gives the Burt-Foreman operator ordering
(M. G. Burt, J. Phys.: Condens. Matter 4, 6651 (1992); B. A. Foreman, Phys. Rev. B 48, 4964 (1993),
from memory) directly: H_XZ = kx N+ kz + kz N- kx with N- = M - 1 (units hbar^2/2m0), in the
spinless (X, Y, Z) basis with L = -g1 - 4 g2, M = -g1 + 2 g2, N+ + N- = -6 g3.

Independent of the product's basis: the spin-orbit operator (Delta/3)(L.sigma) is built from the
orbital angular momentum matrices (L_k)_ij = -i eps_kij of the p orbitals and diagonalised
numerically; the 4x4 model is the projection on its j = 3/2 eigenspace, the 6x6 model keeps all
six states with the j = 1/2 pair at -Delta. Band edges: diag(u, u, w) on (X, Y, Z) with u = Ehh and
w = (3 Elh - Ehh)/2 (4x4) or w = Ev + 2 Qe, Ev = Ehh + Qe (6x6): this puts the heavy hole at Ehh and
the light hole at Elh (4x4), or the Bir-Pikus pair Ev + Qe / Ev - Delta coupled by sqrt(2) Qe (6x6;
S. L. Chuang, Phys. Rev. B 43, 9649 (1991), from memory).

Input (stdin or argv[1]): {"model": "kp4"|"kp6", "h_nm": element size, "layers": [{"thickness_nm",
"Ehh", "Elh", "gamma1", "gamma2", "gamma3", "Dso", "Qe"}], "cases": [{"angle_deg", "k_per_nm": [...],
"count": states}]}
Output: {"cases": [{"angle_deg", "k_per_nm", "energies_eV": [[highest count values per k]]}]}
"""
import json
import sys

import numpy as np
from scipy.linalg import eigh

HBAR2_OVER_2M0 = 0.0380998212  # eV nm^2, CODATA 2018


def orbital_momentum():
    """(L_k)_ij = -i eps_kij on (X, Y, Z)."""
    eps = np.zeros((3, 3, 3))
    eps[0, 1, 2] = eps[1, 2, 0] = eps[2, 0, 1] = 1
    eps[0, 2, 1] = eps[2, 1, 0] = eps[1, 0, 2] = -1
    return [-1j * eps[k] for k in range(3)]


SIGMA = [np.array([[0, 1], [1, 0]], complex), np.array([[0, -1j], [1j, 0]]), np.array([[1, 0], [0, -1]], complex)]


def basis(model):
    """Columns: the states kept, in (X, Y, Z) (x) spin with spin as the outer index."""
    Lk = orbital_momentum()
    LS = sum(np.kron(SIGMA[k], Lk[k]) for k in range(3))  # L.sigma, eigenvalues +1 (j=3/2), -2 (j=1/2)
    w, v = np.linalg.eigh(LS)
    if model == "kp4":
        return v[:, w > 0], None
    return v, LS


def layer_matrices(p, kx, ky, model):
    """A, B (coefficient of kz on the right), C (kz . kz) on (X, Y, Z) (x) spin, electron energies."""
    t = HBAR2_OVER_2M0
    g1, g2, g3 = p["gamma1"], p["gamma2"], p["gamma3"]
    L = -g1 - 4 * g2
    M = -g1 + 2 * g2
    Nm = M - 1.0
    Np = -6 * g3 - Nm
    A3 = t * np.array([[L * kx * kx + M * ky * ky, (Np + Nm) * kx * ky, 0],
                       [(Np + Nm) * kx * ky, M * kx * kx + L * ky * ky, 0],
                       [0, 0, M * (kx * kx + ky * ky)]], complex)
    # H_XZ = kx N+ kz + kz N- kx: the part with kz on the right is B, the part with kz on the left is B^H.
    B3 = t * np.array([[0, 0, kx * Np], [0, 0, ky * Np], [kx * Nm, ky * Nm, 0]], complex)
    C3 = t * np.diag([M, M, L]).astype(complex)
    if model == "kp4":
        w = 0.5 * (3 * p["Elh"] - p["Ehh"])
    else:
        w = p["Ehh"] + 3 * p["Qe"]
    A3 = A3 + np.diag([p["Ehh"], p["Ehh"], w])
    I2 = np.eye(2)
    A, B, C = np.kron(I2, A3), np.kron(I2, B3), np.kron(I2, C3)
    return A, B, C


def p2_reference():
    """Shape functions on [0, 1] at the 3 Gauss points: values and derivatives (d/dxi)."""
    g = np.array([0.5 - np.sqrt(15) / 10, 0.5, 0.5 + np.sqrt(15) / 10])
    wq = np.array([5, 8, 5]) / 18
    N = np.array([2 * (g - 0.5) * (g - 1), -4 * g * (g - 1), 2 * g * (g - 0.5)])
    dN = np.array([4 * g - 3, -8 * g + 4, 4 * g - 1])
    return wq, N, dN


def solve_case(layers, model, h, angle, ks, count):
    V, LS = basis(model)
    d = V.shape[1]
    wq, Nq, dNq = p2_reference()
    elements = []
    for p in layers:
        n = max(1, int(np.ceil(p["thickness_nm"] / h - 1e-9)))
        elements += [(p, p["thickness_nm"] / n)] * n
    ne = len(elements)
    nodes = 2 * ne + 1
    inner = nodes - 2
    out = []
    phi = np.radians(angle)
    for k in ks:
        kx, ky = k * np.cos(phi), k * np.sin(phi)
        K = np.zeros((inner * d, inner * d), complex)
        Mm = np.zeros((inner * d, inner * d), complex)
        for e, (p, le) in enumerate(elements):
            A, B, C = layer_matrices(p, kx, ky, model)
            if model == "kp6":
                A = A + (p["Dso"] / 3) * LS - (p["Dso"] / 3) * np.eye(6)
            A, B, C = V.conj().T @ A @ V, V.conj().T @ B @ V, V.conj().T @ C @ V
            # local 3x3 scalar integrals: int Ni Nj, int Ni (-i dNj), int (-i dNi)^* Nj ... per Gauss point
            ke = np.zeros((3 * d, 3 * d), complex)
            me = np.zeros((3 * d, 3 * d), complex)
            for q in range(3):
                Nv = Nq[:, q]
                kz = -1j * dNq[:, q] / le  # kz applied to shape functions
                jac = wq[q] * le
                for a in range(3):
                    for b in range(3):
                        blk = (np.conj(kz[a]) * kz[b]) * C + Nv[a] * kz[b] * B + np.conj(kz[a]) * Nv[b] * B.conj().T + Nv[a] * Nv[b] * A
                        ke[a * d:(a + 1) * d, b * d:(b + 1) * d] += jac * blk
                        me[a * d:(a + 1) * d, b * d:(b + 1) * d] += jac * Nv[a] * Nv[b] * np.eye(d)
            gl = [2 * e, 2 * e + 1, 2 * e + 2]
            for a in range(3):
                for b in range(3):
                    ia, ib = gl[a] - 1, gl[b] - 1
                    if ia < 0 or ib < 0 or ia >= inner or ib >= inner:
                        continue
                    K[ia * d:(ia + 1) * d, ib * d:(ib + 1) * d] += ke[a * d:(a + 1) * d, b * d:(b + 1) * d]
                    Mm[ia * d:(ia + 1) * d, ib * d:(ib + 1) * d] += me[a * d:(a + 1) * d, b * d:(b + 1) * d]
        n = K.shape[0]
        w = eigh(K, Mm, eigvals_only=True, subset_by_index=(n - count, n - 1))
        out.append(sorted(w.tolist(), reverse=True))
    return out


def main():
    text = open(sys.argv[1]).read() if len(sys.argv) > 1 else sys.stdin.read()
    req = json.loads(text)
    cases = []
    for c in req["cases"]:
        energies = solve_case(req["layers"], req["model"], req["h_nm"], c["angle_deg"], c["k_per_nm"], c["count"])
        cases.append({"angle_deg": c["angle_deg"], "k_per_nm": c["k_per_nm"], "energies_eV": energies})
    json.dump({"cases": cases}, sys.stdout)


if __name__ == "__main__":
    main()
