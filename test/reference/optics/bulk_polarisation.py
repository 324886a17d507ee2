#!/usr/bin/env python3
"""Fixture for test/optics/momentum.test.ts: TE and TM interband factors of bulk valence states,
summed over each Kramers pair, computed in the orbital (X, Y, Z) x spin basis directly.

Hamiltonian (units hbar^2/2m0, electron energies, holes below; the Dresselhaus-Kip-Kittel orbital
form with the Luttinger parameters, common practice):
    H_XX = L kx^2 + M (ky^2 + kz^2) (and cyclic), H_XY = N kx ky (and cyclic),
    L = -g1 - 4 g2, M = -g1 + 2 g2, N = -6 g3,
with spin-orbit coupling from L.sigma (L_k)_ij = -i eps_kij: the j = 3/2 projector is
P = (2 + L.sigma)/3. kp6: H = H_orb x 1 - Delta (1 - P). kp4: P H P, with the j = 1/2 states pushed
far above (+100 eV) and dropped. Factors of a state v: TE = 3/2 sum_s (|v_Xs|^2 + |v_Ys|^2),
TM = 3 sum_s |v_Zs|^2 (|e.p|^2 over the bulk average P^2/3). The engine instead builds its
Hamiltonian in the rotated |j, m> basis T(phi) and maps back with Clebsch-Gordan tables.
Run: python3 bulk_polarisation.py > bulk_polarisation.json
"""
import json
import math

import numpy as np

T = 0.0380998212  # hbar^2/2m0 in eV nm^2 (CODATA 2018)
GAAS = {"g1": 6.98, "g2": 2.06, "g3": 2.93, "Dso": 0.341}

SIGMA = [np.array([[0, 1], [1, 0]], complex), np.array([[0, -1j], [1j, 0]], complex), np.array([[1, 0], [0, -1]], complex)]
EPS = np.zeros((3, 3, 3))
for (a, b, c) in ((0, 1, 2), (1, 2, 0), (2, 0, 1)):
    EPS[a, b, c] = 1
    EPS[a, c, b] = -1
LK = [-1j * EPS[k] for k in range(3)]
# Spin-major ordering (X up, Y up, Z up, X down, Y down, Z down), as the engine's rows.
LS = sum(np.kron(SIGMA[k], LK[k]) for k in range(3))
P32 = (2 * np.eye(6) + LS) / 3


def orbital(p, k):
    g1, g2, g3 = p["g1"], p["g2"], p["g3"]
    L, M, N = -g1 - 4 * g2, -g1 + 2 * g2, -6 * g3
    H = np.zeros((3, 3))
    for i in range(3):
        H[i, i] = L * k[i] ** 2 + M * sum(k[j] ** 2 for j in range(3) if j != i)
        for j in range(i + 1, 3):
            H[i, j] = H[j, i] = N * k[i] * k[j]
    return T * H


def factors(model, p, k):
    Ho = np.kron(np.eye(2), orbital(p, k))
    if model == "kp6":
        H = Ho - p["Dso"] * (np.eye(6) - P32)
        keep = 6
    else:
        H = P32 @ Ho @ P32 + 100.0 * (np.eye(6) - P32)
        keep = 4
    w, v = np.linalg.eigh(H)
    order = np.argsort(-w)  # highest first
    w, v = w[order], v[:, order]
    if model == "kp4":
        w, v = w[2:], v[:, 2:]  # drop the two pushed j = 1/2 states
    out = []
    for pair in range(keep // 2):
        te = tm = 0.0
        for s in (2 * pair, 2 * pair + 1):
            x = v[:, s]
            te += 1.5 * sum(abs(x[3 * sp + 0]) ** 2 + abs(x[3 * sp + 1]) ** 2 for sp in (0, 1))
            tm += 3.0 * sum(abs(x[3 * sp + 2]) ** 2 for sp in (0, 1))
        out.append({"energy_eV": float(w[2 * pair]), "te": float(te), "tm": float(tm)})
    return out


cases = []
for model in ("kp4", "kp6"):
    for phi_deg in (0.0, 22.5, 45.0, 30.0):
        for kk in (0.3, 0.7):  # k = 0 is fourfold degenerate: no pairs to compare
            phi = math.radians(phi_deg)
            k = (kk * math.cos(phi), kk * math.sin(phi), 0.0)
            cases.append({"model": model, "phi_deg": phi_deg, "k_per_nm": kk, "pairs": factors(model, GAAS, k)})
print(json.dumps({"source": "test/reference/optics/bulk_polarisation.py (orbital x spin basis, numpy eigh)", "material": GAAS, "cases": cases}, indent=1))
