#!/usr/bin/env python3
"""Fine-grid reference for the wire benchmark: the lowest six eigenvalues of the continuum
BenDaniel-Duke problem of a 10 nm x 10 nm GaAs square in Al0.3Ga0.7As, electrons at 300 K
(V and masses as wellsmith resolves them, given below), inside a 30 nm x 30 nm box with a hard
(Dirichlet) wall:

  -C div( (1/m) grad psi ) + V psi = E psi,   C = hbar^2/2m0 = 0.0380998212 eV nm^2.

Method: the square is symmetric under x -> -x and y -> -y, so every state is even or odd in each;
each of the four parity classes is solved on the quarter box [0, 15] x [0, 15] nm (Neumann or
Dirichlet on the symmetry lines) by the 5-point finite-difference operator on a cell-centred grid,
whose cell faces hold the material interfaces, with 1/m on a face from the flux-continuous mean
2/(m_a + m_b) of the two cells (D. J. BenDaniel and C. B. Duke, Phys. Rev. 152, 683 (1966)), by
scipy.sparse.linalg.eigsh in shift-invert mode. Spacings h = 0.25, 0.125, 0.0625, 0.03125 nm
(quarter grids of 60 to 480 cells a side): Richardson extrapolation of neighbouring spacings
(second order; the observed orders are recorded), then once more with the observed order of the
three extrapolated values (L. F. Richardson, Phil. Trans. R. Soc. A 210, 307 (1911)); `error_eV`
is that last step's change, an estimate of the fixture's own error.

Run: python3 square_wire.py > square_wire.json (a few minutes)
"""
import json

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import eigsh

C = 0.0380998212
V_WELL, M_WELL = 0.6224821428571428, 0.067      # GaAs, electron edge and mass (eV, m0)
V_BAR, M_BAR = 0.8848484637984857, 0.0919       # Al0.3Ga0.7As
HALF_BOX, HALF_WIRE = 15.0, 5.0                 # nm
COUNT = 6


def quarter(h, even_x, even_y):
    """Cell-centred operator on [0, HALF_BOX]^2: cells (i, j) centred at ((i+1/2)h, (j+1/2)h)."""
    n = int(round(HALF_BOX / h))
    c = (np.arange(n) + 0.5) * h
    X, Y = np.meshgrid(c, c, indexing="xy")
    inside = (X < HALF_WIRE) & (Y < HALF_WIRE)
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
    # Outer wall (psi = 0 half a cell beyond the last centre): face 1/m of the cell, distance h/2.
    diag[:, -1] += 2 * g / m[:, -1]
    diag[-1, :] += 2 * g / m[-1, :]
    # Symmetry line at 0: even -> no flux (Neumann); odd -> psi = 0 there.
    if not even_x:
        diag[:, 0] += 2 * g / m[:, 0]
    if not even_y:
        diag[0, :] += 2 * g / m[0, :]
    N = n * n
    idx = np.arange(N).reshape(n, n)
    rows = np.concatenate([idx.ravel(), idx[:, :-1].ravel(), idx[:-1, :].ravel()])
    cols = np.concatenate([idx.ravel(), idx[:, 1:].ravel(), idx[1:, :].ravel()])
    vals = np.concatenate([diag.ravel(), -ex.ravel(), -ey.ravel()])
    A = sp.coo_matrix((vals, (rows, cols)), shape=(N, N)).tocsr()
    return (A + sp.triu(A, 1).T).tocsc()


def levels(h):
    out = []
    for ex in (True, False):
        for ey in (True, False):
            w = eigsh(quarter(h, ex, ey), k=COUNT, sigma=V_WELL, which="LM", return_eigenvectors=False)
            out += list(w)
    return np.sort(np.array(out))[:COUNT]


def main():
    hs = [0.25, 0.125, 0.0625, 0.03125]
    E = [levels(h) for h in hs]
    # Richardson on neighbouring spacings (second order, observed 1.997-2.001), then once more with
    # the observed order of the three extrapolated sequences.
    R1 = [E[k + 1] + (E[k + 1] - E[k]) / 3 for k in range(3)]
    p2 = np.log2(np.abs((R1[0] - R1[1]) / (R1[1] - R1[2])))
    R2 = R1[2] + (R1[2] - R1[1]) / (2.0 ** p2 - 1)
    print(json.dumps({
        "problem": {"V_well": V_WELL, "m_well": M_WELL, "V_barrier": V_BAR, "m_barrier": M_BAR,
                    "wire_nm": 2 * HALF_WIRE, "box_nm": 2 * HALF_BOX, "count": COUNT},
        "spacings_nm": hs, "energies_by_spacing_eV": [[float(x) for x in e] for e in E],
        "observed_orders": [float(x) for x in np.log2(np.abs((E[1] - E[0]) / (E[2] - E[1])))],
        "extrapolated_orders": [float(x) for x in p2],
        "energies_eV": [float(x) for x in R2], "error_eV": [float(x) for x in np.abs(R2 - R1[2])],
    }, indent=1))


if __name__ == "__main__":
    main()
