/**
 * The report sections of a doped solve (engine/report/doping.ts): the self-consistent profile with
 * the Fermi level and the subbands' densities, the absorption spectrum with its peak, and a bias
 * sweep's table; each plot rendered to SVG.
 */
import { describe, expect, it } from 'vitest';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';
import { settingsOf } from '../../engine/solve.js';
import { resolveDoping } from '../../engine/poisson/doping.js';
import { biasSummary, dopedOptionsOf, solveDopedStructure } from '../../engine/poisson/doped.js';
import { describeDoped } from '../../engine/poisson/format.js';
import { dopingSections, profileSpec } from '../../engine/report/doping.js';

const spec = parseSpecText('substrate: GaAs\ntemperature: 77 K\nsolver: { valence: parabolic }\nstack:\n  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n  - { material: GaAs, thickness: 4.5 nm }\n  - { material: Al0.3Ga0.7As, thickness: 30 nm }\n', 'report.yaml').spec;
const structure = buildStructure(spec, {});
const doping = resolveDoping({ layers: [undefined, { donors: '1e18 cm-3' }, undefined] }, structure);
const options = dopedOptionsOf(spec);
const base = { ...options, absorption: { ...options.absorption!, continuum_nm: 80 } };

describe('doped solve in the report and the terminal', () => {
  it('sections: the profile with the Fermi level and densities, the absorption spectrum and peak, the bias sweep', async () => {
    const r = solveDopedStructure(structure, doping, settingsOf(spec), base);
    const biased = solveDopedStructure({ ...structure, field_kV_per_cm: 20 }, doping, settingsOf(spec), base);
    const sections = await dopingSections({ ...r, sweep: [biasSummary(r), biasSummary(biased)] });
    expect(sections.map((s) => s.id)).toEqual(['self-consistent', 'absorption', 'bias']);
    const [profile, absorption, bias] = sections;
    expect(profile!.lead).toMatch(/converged in \d+ iterations/);
    expect(profile!.lead).toMatch(/Fermi level 0\.8\d{4} eV/);
    expect(profile!.html).toMatch(/<svg/);
    expect(profile!.html).toMatch(/4\.5\d\de\+11|4\.5e\+11/);
    expect(absorption!.lead).toMatch(/Peak 1\d\d\.\d\d meV \(\d\.\d{3} µm\)/);
    expect(absorption!.html).toMatch(/<svg/);
    expect(bias!.html).toMatch(/20\.0/);
    // The Fermi level is drawn over the cell: a horizontal segment at its energy.
    const layer = (profileSpec(r) as { layer: { data: { values: { E: number }[] } }[] }).layer[2]!;
    expect(layer.data.values.every((p) => p.E === r.selfConsistent.fermi_eV)).toBe(true);
    const text = describeDoped(r);
    expect(text).toMatch(/Self-consistent solve \(Hartree, electrons\): converged/);
    expect(text).toMatch(/Intersubband absorption .* peak \d+\.\d\d meV = \d\.\d{3} µm/);
  }, 30_000);
});
