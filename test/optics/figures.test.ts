/**
 * Derived figures and options of the optical spectra: the logarithmic fit (exact on exact data),
 * the transparency density (peak gain zero there), the differential gain (a derivative of the
 * spectra), band-gap renormalisation (the universal 2-D law's value, and a rigid shift of every
 * spectrum), the `optics:` section's settings and errors, and the report section's plots.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../engine/errors.js';
import { opticsSection } from '../../engine/report/optics.js';
import { describeOptics } from '../../engine/optics/describe.js';
import { differentialGain, gainPeak, logFit, peakAt, transparencyDensity } from '../../engine/optics/figures.js';
import { opticsContext, opticsOfSpec } from '../../engine/optics/optics.js';
import { gapShift } from '../../engine/optics/renormalisation.js';
import { adachiIndex, wellIndex } from '../../engine/optics/refractive.js';
import { opticsSettings, type OpticsSpec } from '../../engine/optics/schema.js';
import { expectClose } from '../observables/close.js';
import { solvedStack } from './helpers.js';

const WELL = [['GaAs', 20], ['In0.2Ga0.8As', 7], ['GaAs', 20]] as const;
const r = solvedStack(WELL);

describe('logarithmic fit', () => {
  it('recovers g0 and N_tr of exact g0 ln(N/N_tr) data to 1e-12 and ignores points without gain', () => {
    const N = [0.5e12, 1e12, 2e12, 3e12, 5e12];
    const g = N.map((n) => 2000 * Math.log(n / 1.2e12));
    const fit = logFit(N, g)!;
    expectClose(fit.g0_per_cm, 2000, { rel: 1e-12 }, 'g0');
    expectClose(fit.transparency_cm2, 1.2e12, { rel: 1e-12 }, 'N_tr');
    expect(fit.from_cm2).toBe(2e12);
    expect(logFit([1e12, 2e12], [-5, 3])).toBeNull();
  });
});

describe('figures of a 7 nm In0.2Ga0.8As/GaAs well', () => {
  const ctx = opticsContext(r, opticsSettings(undefined))!;

  it('transparency: the peak gain there is zero to 0.1 cm⁻¹, negative 1 % below, positive 1 % above', () => {
    const n = transparencyDensity(ctx.engine, 'te');
    const at = (s: number): number => peakAt(ctx.engine, { electrons_cm2: s * n, holes_cm2: s * n }, 'te').gain_per_cm;
    console.log(`transparency ${n.toExponential(4)} cm⁻²: peak gain ${at(0.99).toFixed(2)} / ${at(1).toFixed(3)} / ${at(1.01).toFixed(2)} cm⁻¹ at 0.99 / 1 / 1.01 n_tr`);
    expectClose(at(1), 0, { abs: 0.1 }, 'peak gain at transparency');
    expect(at(0.99)).toBeLessThan(0);
    expect(at(1.01)).toBeGreaterThan(0);
  });

  it('differential gain is the density derivative of the gain at the peak photon energy (a ±5 % difference agrees within 2 %)', () => {
    const p = { electrons_cm2: 3e12, holes_cm2: 3e12 };
    const dg = differentialGain(ctx.engine, p, 'te');
    const peak = peakAt(ctx.engine, p, 'te');
    const g = (s: number): number => ctx.engine.gainAt(ctx.engine.binSums(ctx.engine.levels({ electrons_cm2: s * 3e12, holes_cm2: s * 3e12 })), 'te', peak.energy_eV);
    const wide = ((g(1.05) - g(0.95)) / (0.1 * 3e12)) * 7e-7;
    console.log(`dg/dN at 3e12 cm⁻²: ${dg.toExponential(4)} cm² (±1 %), ${wide.toExponential(4)} cm² (±5 %)`);
    expectClose(dg, wide, { rel: 0.02 }, 'differential gain');
    expect(dg).toBeGreaterThan(1e-16);
    expect(dg).toBeLessThan(5e-15);
  });

  it('the peak refinement never falls below the grid maximum and moves by less than one grid step', () => {
    const sums = ctx.engine.binSums(ctx.engine.levels({ electrons_cm2: 3e12, holes_cm2: 3e12 }));
    const onGrid = ctx.engine.gainOn(sums, 'te');
    const peak = gainPeak(ctx.engine, sums, 'te');
    const w = ctx.engine.photon_eV;
    const i = onGrid.indexOf(Math.max(...onGrid));
    expect(peak.gain_per_cm).toBeGreaterThanOrEqual(onGrid[i]!);
    expect(Math.abs(peak.energy_eV - w[i]!)).toBeLessThan(w[1]! - w[0]!);
    expectClose(peak.gain_per_cm, ctx.engine.gainAt(sums, 'te', peak.energy_eV), { rel: 1e-12 }, 'peak value is the spectrum there');
  });
});

describe('band-gap renormalisation', () => {
  it('the universal 2-D law: μ = 0.05, ε = 12.9, 2e12 cm⁻² → −3.1 (n a_B²)^(1/3) Ry* = −19.66 meV', () => {
    // Ry* = 13.6057 eV · 0.05/12.9² = 4.0881 meV, a_B = 0.052918 nm · 12.9/0.05 = 13.653 nm (CODATA 2018 Rydberg and Bohr radius).
    const ry = 13.605693122994 * 0.05 / 12.9 ** 2;
    const a = 0.0529177210903 * 12.9 / 0.05;
    const expected = -3.1 * Math.cbrt(2e12 * 1e-14 * a * a) * ry;
    expectClose(gapShift(2e12, 0.05, 12.9), expected, { rel: 1e-12 }, 'ΔEg');
    expectClose(expected * 1000, -19.66, { abs: 0.01 }, 'ΔEg in meV');
    expect(gapShift(0, 0.05, 12.9)).toBe(0);
  });

  it('shifts every transition rigidly: with renormalisation, ħω·g(ħω) equals the unshifted (ħω − ΔEg)·g(ħω − ΔEg) (1/ħω is the photon\'s)', () => {
    const on = opticsContext(r, opticsSettings({ band_gap_renormalisation: true }))!;
    const off = opticsContext(r, opticsSettings(undefined))!;
    const p = { electrons_cm2: 3e12, holes_cm2: 3e12 };
    const shift = on.shiftOf(p);
    expect(shift).toBeLessThan(-0.01);
    const s = on.engine.binSums(on.engine.levels(p));
    const shifted = on.engine.gainOn(s, 'te', shift);
    const s0 = off.engine.binSums(off.engine.levels(p));
    for (const j of [20, 60, 100, 140]) {
      const w = on.engine.photon_eV[j]!;
      expectClose(w * shifted[j]!, (w - shift) * off.engine.gainAt(s0, 'te', w - shift), { rel: 1e-9, abs: 1e-9 }, `ħω·g at ${w.toFixed(4)} eV`);
    }
    console.log(`ΔEg at 3e12 cm⁻² in the 7 nm In0.2Ga0.8As well: ${(shift * 1000).toFixed(2)} meV (μ ${on.bands.reducedMass.toFixed(4)} m0, ε ${on.bands.permittivity.toFixed(2)})`);
  });
});

describe('the optics: section', () => {
  it('reads units and defaults, and names the field of every bad value', () => {
    const s = opticsSettings({ densities: ['2e12 cm-2', { electrons: '1e12', holes: '3e12 cm-2' }], intraband_time: '150 fs', photon_energies: { from: '1000 nm', to: '1.3 eV', points: 101 }, kane_energy: '25 eV' });
    expect(s.populations).toEqual([{ electrons_cm2: 2e12, holes_cm2: 2e12 }, { electrons_cm2: 1e12, holes_cm2: 3e12 }]);
    expectClose(s.tau_ps, 0.15, { rel: 1e-12 }, 'τ');
    expectClose(s.photon!.from_eV, 1239.84198 / 1000, { rel: 1e-12 }, 'from');
    expect(s.photon!.to_eV).toBe(1.3);
    expect(s.kaneEnergy_eV).toBe(25);
    expect(opticsSettings(undefined)).toMatchObject({ lineshape: 'sech', tau_ps: 0.1, renormalisation: false });
    const refuse = (section: OpticsSpec, field: RegExp): void => {
      let err: unknown;
      try { opticsSettings(section); } catch (e) { err = e; }
      expect(err).toBeInstanceOf(InputError);
      expect((err as InputError).message).toMatch(field);
    };
    refuse({ densities: ['3e12 m-2'] }, /^optics\.densities\[0\]: unknown sheet-density unit/);
    refuse({ densities: [{ electrons: '1e12', holes: 'lots' }] }, /^optics\.densities\[0\]\.holes: expected a positive sheet density/);
    refuse({ intraband_time: '-1 ps' }, /^optics\.intraband_time: expected a positive time/);
    refuse({ photon_energies: { from: '1 eV', to: '1 eV' } }, /^optics\.photon_energies: from and to must differ/);
    refuse({ gain_curve: { from: '5e12', to: '1e12' } }, /^optics\.gain_curve\.to: must exceed from/);
    refuse({ kane_energy: '25 meV' }, /^optics\.kane_energy: expected a positive energy such as "25 eV"/);
  });

  it('solve-level result: densities from the section, else carriers.sheet_density; text summary and report section with three plots', async () => {
    const fromCarriers = opticsOfSpec(r, { photon_energies: { from: '1.20 eV', to: '1.40 eV', points: 81 }, gain_curve: { from: '1e12', to: '4e12', points: 4 } }, '2.5e12 cm-2')!;
    expect(fromCarriers.spectra.map((s) => s.electrons_cm2)).toEqual([2.5e12]);
    expect(fromCarriers.photon_eV.length).toBe(81);
    const text = describeOptics(fromCarriers);
    expect(text).toMatch(/Transparency \(peak gain 0, n = p\): TE \d/);
    const section = await opticsSection(fromCarriers);
    expect((section.html.match(/<svg/g) ?? []).length).toBe(3);
    expect(section.lead).toMatch(/Chinn, P\. S\. Zory and A\. R\. Reisinger/);
  }, 30_000);
});

describe('refractive index of a well layer', () => {
  it('Adachi\'s A, B linear over the binaries (his AlGaAs relation A = 6.3 + 19.0x, B = 9.4 − 10.2x, from memory), a note for binaries without values, or the given index', () => {
    const al = solvedStack([['Al0.5Ga0.5As', 20], ['Al0.2Ga0.8As', 6], ['Al0.5Ga0.5As', 20]]);
    const layer = al.structure.layers[1]!;
    const n = wellIndex(layer, 1.7);
    expectClose(n.value, adachiIndex({ A: 6.3 + 19.0 * 0.2, B: 9.4 - 10.2 * 0.2, E0: layer.material.EgG, Dso: layer.material.Dso, photon_eV: 1.7 }), { rel: 1e-12 }, 'Al0.2Ga0.8As at 1.7 eV');
    expect(n.source).not.toMatch(/not tabulated/);
    expect(wellIndex(r.structure.layers[1]!, 1.25).source).toMatch(/InAs taken with GaAs's A and B/);
    expect(wellIndex(layer, 1.7, 3.3).value).toBe(3.3);
  });

  it('no spectra at 0 K (no quasi-Fermi levels): null, not an error', () => {
    const cold = solvedStack(WELL, { T: 0 });
    expect(opticsContext(cold, opticsSettings(undefined))).toBeNull();
  });
});
