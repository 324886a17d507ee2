/**
 * Published and trade values for whole structures through `solve(spec)`: interband e1-hh1 of
 * GaAs/AlGaAs wells at low temperature, a strained InGaAs/GaAs pump well, and the first
 * GaAs/AlGaAs intersubband detector. Parameter set: the product's (Vurgaftman, Meyer and
 * Ram-Mohan, J. Appl. Phys. 89, 5815 (2001)); default solver settings (non-parabolic electrons).
 */
import { describe, expect, it } from 'vitest';
import { findState, findTransition, solve } from '../../../engine/solve.js';
import type { Spec } from '../../../engine/input/schema.js';
import { wellExciton } from '../../../engine/observables/exciton.js';
import { mismatch } from '../../design/check.js';

const GAAS_DIELECTRIC = 12.9; // static ε_r of GaAs, common practice

const alGaAs = (x: number): string => `Al${x}Ga${Number((1 - x).toFixed(3))}As`;

/** A single well between two thick barriers on a GaAs substrate. */
const singleWell = (well: string, width_nm: number, barrier: string, temperature: string): Spec => ({
  substrate: 'GaAs',
  temperature,
  stack: [
    { material: barrier, thickness: '30 nm' },
    { material: well, thickness: `${width_nm} nm` },
    { material: barrier, thickness: '30 nm' },
  ],
});

describe('GaAs/Al0.3Ga0.7As wells at low temperature: e1-hh1 exciton line', () => {
  // Heavy-hole exciton line of GaAs/Al(0.3)Ga(0.7)As single wells at 2–4 K, photoluminescence and
  // excitation spectra as commonly reported (from memory: about 1.61 eV at 5 nm, 1.547 eV at 10 nm,
  // 1.525 eV at 20 nm; the trend with width follows R. C. Miller et al., Phys. Rev. B 24, 1134 (1981),
  // whose abstract (seen) covers widths 4.2–14.5 nm but whose line energies were not seen).
  // Model line = e1-hh1 − exciton binding, the binding from the fractional-dimension estimate in
  // engine/observables/exciton.ts (≈ 11, 8.6, 6.4 meV for 5, 10, 20 nm; the measured 8–10 meV of
  // Miller 1981 for 5–10 nm wells, as summarised in /work/shared/REFERENCES.md).
  // Tolerance 15 meV: the recalled line energies (±5 meV), a one-monolayer width error
  // (≈ 10 meV at 5 nm, 2 meV at 10 nm), the offset rule of the parameter set (the GaAs/AlGaAs
  // conduction share ranges over 0.62–0.69 in the literature, ≈ 3 meV here) and the ±20 % of the
  // exciton estimate (2 meV).
  const cases = [
    { width_nm: 5, line_eV: 1.61 },
    { width_nm: 10, line_eV: 1.547 },
    { width_nm: 20, line_eV: 1.525 },
  ];
  const tolerance = 0.015;
  it.each(cases)('$width_nm nm well: exciton line near $line_eV eV', ({ width_nm, line_eV }) => {
    const r = solve(singleWell('GaAs', width_nm, alGaAs(0.3), '4 K'));
    expect(r.status).toBe('ok');
    const t = findTransition(r, 'e1-hh1')!;
    const e1 = findState(r, 'e1')!;
    const hh1 = findState(r, 'hh1')!;
    const mu = 1 / (1 / e1.mass_inplane + 1 / hh1.mass_inplane);
    const binding = wellExciton({ effectiveWidth_nm: width_nm, reducedMass: mu, dielectricConstant: GAAS_DIELECTRIC }).binding_eV;
    // Miller 1981 (abstract seen) and REFERENCES.md: the binding of 5–20 nm wells lies between the
    // bulk 4.2 meV and the 2-D limit 4 × 4.2 meV.
    expect(binding, mismatch(`binding of a ${width_nm} nm well`, binding, 0.01, 0.006)).toBeGreaterThan(0.0042);
    expect(binding).toBeLessThan(0.0168);
    const line = t.energy_eV - binding;
    expect(Math.abs(line - line_eV), mismatch(`GaAs/Al0.3Ga0.7As ${width_nm} nm at 4 K, e1-hh1 − E_b (eV)`, line, line_eV, tolerance)).toBeLessThanOrEqual(tolerance);
  });

  it('the lines move monotonically to the bulk GaAs exciton (1.515 eV at 2 K, common practice) as the well widens', () => {
    const lines = [4, 6, 8, 12, 16, 24].map((w) => findTransition(solve(singleWell('GaAs', w, alGaAs(0.3), '4 K')), 'e1-hh1')!.energy_eV);
    for (let i = 1; i < lines.length; i++) expect(lines[i]!, `lines ${lines.join(', ')}`).toBeLessThan(lines[i - 1]!);
    // The free-particle edge of a 24 nm well sits a few meV above the bulk gap 1.519 eV (common practice).
    expect(lines.at(-1)! - 1.519, mismatch('24 nm well e1-hh1 − bulk gap (eV)', lines.at(-1)! - 1.519, 0.005, 0.005)).toBeGreaterThan(0);
    expect(lines.at(-1)! - 1.519).toBeLessThan(0.012);
  });
});

describe('strained In0.2Ga0.8As/GaAs well near 980 nm at room temperature', () => {
  // Common practice (from memory): compressively strained 6–8 nm In0.2Ga0.8As wells in GaAs emit
  // near 980 nm at 300 K; that is how 976/980 nm pump lasers are built. Tolerance 20 nm (25 meV):
  // the In fraction of real pump wells is quoted to ±0.01 (≈ 10 nm), the width to ±1 ML (≈ 5 nm),
  // and laser emission sits a few nm from the e1-hh1 edge.
  it.each([{ width_nm: 6 }, { width_nm: 7 }, { width_nm: 8 }])('$width_nm nm well emits within 20 nm of 980 nm', ({ width_nm }) => {
    const r = solve(singleWell('In0.2Ga0.8As', width_nm, 'GaAs', '300 K'));
    const t = findTransition(r, 'e1-hh1')!;
    expect(Math.abs(t.wavelength_nm - 980), mismatch(`In0.2Ga0.8As ${width_nm} nm in GaAs at 300 K, λ(e1-hh1) nm`, t.wavelength_nm, 980, 20)).toBeLessThanOrEqual(20);
    // Compressive strain lifts the heavy hole above the light hole: hh1 is the top valence state
    // (common practice), and the e1-hh1 envelopes overlap strongly (> 0.7).
    expect(findState(r, 'hh1')!.energy_eV).toBeGreaterThan(findState(r, 'lh1')!.energy_eV);
    expect(t.overlap2).toBeGreaterThan(0.7);
  });
});

describe('GaAs/AlGaAs intersubband detector of Levine et al. 1987', () => {
  // B. F. Levine, K. K. Choi, C. G. Bethea, J. Walker and R. J. Malik, Appl. Phys. Lett. 50, 1092
  // (1987): peak response at 10.8 µm, bound-to-bound e1 → e2 with e2 close enough to the barrier top
  // that the electron tunnels out (seen: abstract). Structure from memory: 50 periods of 6.5 nm GaAs
  // wells doped n ≈ 1.4e18 cm⁻³ and 9.5 nm Al0.25Ga0.75As barriers, 77 K.
  // Doping shifts the measured peak from the bare e1-e2: depolarisation raises it and exchange
  // lowers it, each of order 5–15 meV at ~1e12 cm⁻² (common practice); with the recalled structure
  // (±1 ML, Al ±0.02 ≈ ±8 meV) the bare model is held to 18 % in energy (≈ 20 meV at 115 meV).
  // The model's bare value sits on the short-wavelength side (≈ 9.3 µm); see the report.
  it('bare e1-e2 within 18 % in energy of the 10.8 µm peak, e2 bound and within 60 meV of the barrier top', () => {
    const r = solve(singleWell('GaAs', 6.5, alGaAs(0.25), '77 K'));
    const t = findTransition(r, 'e1-e2')!;
    const measured_eV = 1239.84198 / 10800;
    const tolerance = 0.18 * measured_eV;
    expect(Math.abs(t.energy_eV - measured_eV), mismatch('6.5 nm GaAs / Al0.25Ga0.75As at 77 K, e1-e2 (eV)', t.energy_eV, measured_eV, tolerance)).toBeLessThanOrEqual(tolerance);
    const e2 = findState(r, 'e2')!;
    expect(e2.bound).toBe(true);
    const belowTop = r.bands.electron.barrier_eV - e2.energy_eV;
    expect(belowTop, mismatch('barrier top − e2 (eV)', belowTop, 0.03, 0.03)).toBeGreaterThan(0);
    expect(belowTop).toBeLessThan(0.06);
    // A strong e1-e2 line: f of order 1 for a well this size (common practice, ≈ 0.9).
    expect(t.oscillator_strength!).toBeGreaterThan(0.6);
    expect(t.oscillator_strength!).toBeLessThan(1.1);
  });
});
