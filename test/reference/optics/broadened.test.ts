/**
 * Broadened spectra against an independent computation: test/reference/optics/broadened_gain.py
 * integrates Fermi's golden rule over k with scipy's adaptive quadrature, in SI units from the
 * constants up, for parabolic subband pairs with Lorentzian and hyperbolic-secant lineshapes
 * (S. R. Chinn, P. S. Zory, A. R. Reisinger, IEEE J. Quantum Electron. 24, 2191 (1988), from
 * memory) at given quasi-Fermi levels and for the empty well. The engine instead bins transition
 * energies and convolves bin by bin (engine/optics/spectra.ts), so this checks its integration,
 * bins, kernel and prefactor. Also: the two lineshapes have unit area, and the sech's tail below the
 * gap is exponentially small where the Lorentzian's is not.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { HBAR2_OVER_2M0 } from '../../../engine/constants.js';
import type { OpticalBands, OpticalPair } from '../../../engine/optics/bands.js';
import { lineshape } from '../../../engine/optics/lineshape.js';
import { SpectrumEngine } from '../../../engine/optics/spectra.js';
import { expectClose } from '../../observables/close.js';

interface Fixture {
  readonly temperature_K: number; readonly refractive_index: number; readonly well_nm: number; readonly k_max_per_nm: number; readonly tau_ps: number;
  readonly electrons: readonly { E: number; m: number }[]; readonly holes: readonly { E: number; m: number }[];
  readonly pairs: readonly (readonly [number, number, number, number])[];
  readonly photon_eV: readonly number[];
  readonly cases: readonly { levels: { electron: number | null; hole: number | null }; lineshape: 'lorentzian' | 'sech'; te: number[]; tm: number[] }[];
}

const fx = JSON.parse(readFileSync(new URL('./broadened_gain.json', import.meta.url), 'utf8')) as Fixture;

/** The fixture's pairs as optical bands on the engine's usual 49-point k grid. */
function bands(): OpticalBands {
  const nk = 49;
  const k = Float64Array.from({ length: nk }, (_, i) => (fx.k_max_per_nm * i) / (nk - 1));
  const Ec = fx.electrons.map((e) => k.map((q) => e.E + (HBAR2_OVER_2M0 * q * q) / e.m));
  const Ev = fx.holes.map((h) => k.map((q) => h.E - (HBAR2_OVER_2M0 * q * q) / h.m));
  const pairs: OpticalPair[] = fx.pairs.map(([n, j, te, tm]) => ({ electron: n, hole: j, branch: 0, Ec: Ec[n]!, Ev: Ev[j]!, te: new Float64Array(nk).fill(te), tm: new Float64Array(nk).fill(tm) }));
  return {
    model: 'parabolic', axial: true, nonparabolic: false, temperature_K: fx.temperature_K, k_per_nm: k,
    electronLabels: fx.electrons.map((_, i) => `e${i + 1}`), holeLabels: fx.holes.map((_, i) => `h${i + 1}`),
    directions: [{ name: 'isotropic', angle_rad: 0, weight: 1, pairs }],
    electrons: { k_per_nm: k, directions: [{ weight: 1, branches: Ec }] },
    holes: { k_per_nm: k, directions: [{ weight: 1, branches: Ev }] },
    well_nm: fx.well_nm, wells: [0], edge_eV: Math.min(...fx.pairs.map(([n, j]) => fx.electrons[n]!.E - fx.holes[j]!.E)),
    reducedMass: 0.04, permittivity: 12.9,
  };
}

describe('broadened gain against scipy quadrature over k', () => {
  const b = bands();
  it.each(fx.cases.map((c) => [c.lineshape, c.levels.electron === null ? 'empty well' : `Fc ${c.levels.electron} eV, Fv ${c.levels.hole} eV`, c] as const))('%s, %s: within 5e-4 of the largest |g|', (shape, _, c) => {
    const engine = new SpectrumEngine(b, { photon_eV: Float64Array.from(fx.photon_eV), lineshape: lineshape(shape, fx.tau_ps), refractiveIndex: fx.refractive_index });
    const sums = engine.binSums(c.levels.electron === null ? { electron_eV: -Infinity, hole_eV: Infinity } : { electron_eV: c.levels.electron, hole_eV: c.levels.hole! });
    let worst = 0;
    for (const which of ['te', 'tm'] as const) {
      const got = engine.gainOn(sums, which);
      const want = c[which];
      const scale = Math.max(...want.map(Math.abs));
      want.forEach((w, j) => {
        // Bins of Γ/8 represent the spectrum to about (1/8)²/12 ≈ 1e-3 of its scale at worst.
        expectClose(got[j]!, w, { abs: 5e-4 * scale }, `${shape} ${which} at ${fx.photon_eV[j]!.toFixed(3)} eV`);
        worst = Math.max(worst, Math.abs(got[j]! - w) / scale);
      });
    }
    console.log(`${shape}, ${c.levels.electron === null ? 'empty' : 'pumped'}: worst |Δg| / max|g| = ${worst.toExponential(2)}`);
  });
});

describe('lineshapes', () => {
  it.each([['lorentzian'], ['sech']] as const)('%s has unit area, its cumulative is the integral of its density, and Γ = ħ/τ', (kind) => {
    const L = lineshape(kind, 0.1);
    // ħ/τ for τ = 0.1 ps: 6.582119569e-16 eV s / 1e-13 s (CODATA 2018 ħ).
    expectClose(L.gamma_eV, 6.582119569e-3, { rel: 1e-12 }, 'Γ for 0.1 ps');
    const h = L.gamma_eV / 200;
    let area = 0;
    for (let x = -40 * L.gamma_eV; x < 40 * L.gamma_eV; x += h) area += h * L.density(x + h / 2);
    const inside = L.cumulative(40 * L.gamma_eV) - L.cumulative(-40 * L.gamma_eV);
    expectClose(area, inside, { rel: 1e-5 }, `${kind} midpoint area (step Γ/200) vs cumulative over ±40Γ`);
    expectClose(L.cumulative(1e3) - L.cumulative(-1e3), 1, { abs: 1e-5 }, `${kind} total area`);
    // Equal centre heights 1/(πΓ) for the same τ.
    expectClose(L.density(0), 1 / (Math.PI * L.gamma_eV), { rel: 1e-12 }, `${kind} peak`);
  });

  it('10Γ below a line the sech lineshape is below 1e-4 of its peak, the Lorentzian about 1 %', () => {
    const lor = lineshape('lorentzian', 0.1);
    const sech = lineshape('sech', 0.1);
    const x = 10 * lor.gamma_eV;
    const rl = lor.density(x) / lor.density(0);
    const rs = sech.density(x) / sech.density(0);
    console.log(`L(10Γ)/L(0): Lorentzian ${rl.toExponential(3)} (closed form 1/101), sech ${rs.toExponential(3)} (sech 10 = ${(1 / Math.cosh(10)).toExponential(3)})`);
    expectClose(rl, 1 / 101, { rel: 1e-12 }, 'Lorentzian tail');
    expectClose(rs, 1 / Math.cosh(10), { rel: 1e-12 }, 'sech tail');
    expect(rs).toBeLessThan(1e-4);
  });
});
