"""Fixture for test/reference/stacks/strain-balance.test.ts: the strain-balanced thickness of a
tensile GaAs(1-y)P(y) barrier for a compressive In(x)Ga(1-x)As well on GaAs, found by a different
method than the product's closed form: the in-plane lattice constant a of a coherent period is the
minimum of its biaxial elastic energy per unit area,
    E(a) = sum_i t_i A_i (a - a_i)^2 / a_i^2,   A = C11 + C12 - 2 C12^2 / C11
(linear elasticity, strain (a - a_i)/a_i in plane, zero stress along [001]); the barrier thickness
is the root of a_min(t_b) = a_GaAs, with a_min found numerically (scipy minimize_scalar) and the
root by brentq. Parameters: VMR2001 binaries at 300 K (from memory, typed here independently of
materials/binaries.ts), Vegard lattice constants and linear elastic constants.
Run: python3 strain_balance.py > strain_balance.json
"""
import json
from scipy.optimize import brentq, minimize_scalar

# a (Angstrom, 300 K), C11, C12 (GPa): VMR2001, from memory.
BIN = {
    'GaAs': (5.65325, 1221.0, 566.0),
    'InAs': (6.0583, 832.9, 452.6),
    'GaP': (5.4505, 1405.0, 620.3),
}

def mix(a, b, x):
    """x of binary a, 1 - x of b: Vegard lattice and linear elastic constants."""
    return tuple(x * p + (1 - x) * q for p, q in zip(BIN[a], BIN[b]))

def stiffness(c11, c12):
    return c11 + c12 - 2 * c12 * c12 / c11

def relaxed_lattice(layers):
    """Numerical minimum of the elastic energy over the common in-plane lattice constant."""
    def energy(a):
        return sum(t * stiffness(c11, c12) * (a - ai) ** 2 / ai ** 2 for t, (ai, c11, c12) in layers)
    lo = min(ai for _, (ai, _, _) in layers)
    hi = max(ai for _, (ai, _, _) in layers)
    return minimize_scalar(energy, bounds=(lo, hi), method='bounded', options={'xatol': 1e-13}).x

cases = []
sub = BIN['GaAs'][0]
for x, t_well, y in [(0.2, 7.0, 0.2), (0.15, 8.0, 0.1), (0.25, 5.0, 0.3)]:
    well = mix('InAs', 'GaAs', x)
    barrier = mix('GaP', 'GaAs', y)
    t_b = brentq(lambda t: relaxed_lattice([(t_well, well), (t, barrier)]) - sub, 1e-3, 1e3, xtol=1e-12)
    a_half = relaxed_lattice([(t_well, well), (t_b / 2, barrier)])
    cases.append({
        'well': f'In{x}Ga{round(1 - x, 6)}As', 'well_nm': t_well,
        'barrier': f'GaAs{round(1 - y, 6)}P{y}',
        'balancing_barrier_nm': t_b,
        'half_barrier_zero_stress_lattice_A': a_half,
    })
print(json.dumps({'substrate': 'GaAs', 'temperature_K': 300, 'cases': cases}, indent=2))
