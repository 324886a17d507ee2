/**
 * Bias of a doped stack: voltages and fields as the spec writes them (V/L = F, 1 V over 100 nm =
 * 100 kV/cm), refusals naming the field, and the doped detector under bias: the structure's field
 * tilts the self-consistent potential, e2 becomes a resonance of engine/resonance.ts with a width,
 * the electrons stay in e1 and the stack stays neutral.
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';
import { settingsOf } from '../../engine/solve.js';
import type { Spec } from '../../engine/input/schema.js';
import { atBias, biasPoints } from '../../engine/poisson/bias.js';
import { resolveDoping } from '../../engine/poisson/doping.js';
import { dopedOptionsOf, solveDopedStructure } from '../../engine/poisson/doped.js';
import { InputError } from '../../engine/errors.js';
import { expectClose } from '../observables/close.js';

const text = 'substrate: GaAs\ntemperature: 77 K\nsolver: { valence: parabolic }\nstack:\n  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n  - { material: GaAs, thickness: 4.5 nm }\n  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n';
const spec = parseSpecText(text, 'bias.yaml').spec;
const structure = buildStructure(spec, {});
const withBias = (bias: unknown, extra: Record<string, unknown> = {}): Spec => ({ ...spec, bias, ...extra }) as Spec;

describe('bias points', () => {
  it('voltages become V/L, fields stay; no bias: the structure\'s own field', () => {
    const L = structure.total_nm;
    const points = biasPoints(withBias(['0 V', '-150 mV', '0.2 V', '20 kV/cm']), structure);
    expectClose(points[1]!.field_kV_per_cm, (-0.15 / L) * 1e4, { rel: 1e-14 }, '-150 mV');
    expectClose(points[2]!.field_kV_per_cm, (0.2 / L) * 1e4, { rel: 1e-14 }, '0.2 V');
    expectClose(points[3]!.voltage_V, (20 * L) / 1e4, { rel: 1e-14 }, '20 kV/cm as a voltage');
    expect(biasPoints(spec, structure)).toEqual([{ field_kV_per_cm: 0, voltage_V: 0 }]);
    expect(atBias(structure, points[3]!).field_kV_per_cm).toBe(20);
  });
  it('refused, naming the field: beside "field:", a bare number, a field beyond the limit', () => {
    const message = (f: () => unknown): string => { try { f(); } catch (e) { expect(e).toBeInstanceOf(InputError); return (e as Error).message; } return ''; };
    expect(message(() => biasPoints(withBias('0.1 V', { field: '10 kV/cm' }), structure))).toMatch(/^bias: a bias sets the field across the stack; remove "field:"/);
    expect(message(() => biasPoints(withBias([0.1]), structure))).toMatch(/^bias\[0\]: expected a voltage .* give the unit/);
    expect(message(() => biasPoints(withBias('50 V'), structure))).toMatch(/^bias: "50 V" makes .* kV\/cm .* beyond ±2000 kV\/cm/);
  });
});

describe('the doped detector under bias', () => {
  it('20 kV/cm: e2 a resonance with a width, e1 holds the electrons, neutral, the band tilted by the bias across the stack', () => {
    const doping = resolveDoping({ layers: [undefined, { donors: '1e18 cm-3' }, undefined] }, structure);
    const options = { ...dopedOptionsOf(spec), absorption: null };
    const r = solveDopedStructure(atBias(structure, { field_kV_per_cm: 20, voltage_V: (20 * structure.total_nm) / 1e4 }), doping, settingsOf(spec), options);
    expect(r.status).toBe('ok');
    expect(r.selfConsistent.status).toBe('converged');
    expect(r.selfConsistent.neutrality).toBeLessThan(1e-6);
    const [e1, e2] = r.bands.electron.states;
    expect(e1!.bound).toBe(true);
    expect(e2!.bound).toBe(false);
    expect(e2!.width_meV).toBeGreaterThan(1);
    expectClose(r.selfConsistent.subbands[0]!.density_cm2, 4.5e11, { rel: 1e-3 }, 'e1 holds the doping');
    const { band_eV: band, potential_eV: U } = r.selfConsistent.profile;
    // The drop over the stack: the field's 20 kV/cm × 64.5 nm = 0.129 eV plus the electrons' dipole,
    // which the field pulls downhill (towards z = 0): under a meV, lowering the far end (it screens the field).
    const dipole = U[U.length - 1]! - U[0]!;
    expectClose(band[band.length - 1]! - band[0]!, 20e-4 * structure.total_nm + dipole, { abs: 1e-12 }, 'drop across the stack');
    expect(dipole).toBeLessThan(0);
    expect(Math.abs(dipole)).toBeLessThan(1e-3);
  });
});
