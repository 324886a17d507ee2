/** Subband-edge targets: where a state sits, as a confinement energy above its band's extremum or as an absolute energy. */
import { z } from 'zod';
import { InputError } from '../engine/errors.js';
import { MISSING_STATE_PENALTY, type Objective } from './types.js';
import { checkStateLabel, energyOf, quantity, stateEnergy, unitNotes, weight } from './common.js';
import { bandOfLabel, findState } from '../engine/solve.js';

const schema = z.object({
  subband_edge: z.string().describe('State label: e1, hh1, lh2 …'),
  confinement: quantity.optional().describe('Goal above (electrons) or below (holes) the band extremum, e.g. "40 meV"'),
  energy: quantity.optional().describe('Goal on the absolute energy scale, e.g. "1.52 eV"'),
  within: quantity.describe('Half-width of the window, e.g. "5 meV"'),
  weight,
}).strict();
export type SubbandEdgeTarget = z.infer<typeof schema>;

function mode(t: SubbandEdgeTarget, field?: string): 'confinement' | 'energy' {
  if ((t.confinement === undefined) === (t.energy === undefined)) throw new InputError('bad-value', `${field ? `${field}: ` : ''}subband_edge ${t.subband_edge}: give exactly one of confinement (above the band extremum, e.g. "40 meV") or energy (absolute, e.g. "1.52 eV")`, field);
  return t.confinement !== undefined ? 'confinement' : 'energy';
}

export const subbandEdgeObjective: Objective<SubbandEdgeTarget> = {
  kind: 'subband_edge',
  description: 'a subband edge (e1, hh1…) at a confinement energy or an absolute energy, within a window',
  schema,
  needsWavefunctions: () => false,
  statesNeeded: (t) => [t.subband_edge],
  examples: [
    { subband_edge: 'e1', confinement: '40 meV', within: '5 meV' },
    { subband_edge: 'hh1', energy: '-0.68 eV', within: '10 meV' },
  ],
  check: (t, field) => {
    checkStateLabel(t.subband_edge, `${field}.subband_edge`);
    const m = mode(t, field);
    energyOf(t[m]!, `${field}.${m}`);
    if (!(energyOf(t.within, `${field}.within`) > 0)) throw new InputError('bad-value', `${field}.within: must be positive, got ${JSON.stringify(t.within)}`, `${field}.within`);
  },
  warnings: (t, field, context) => {
    const m = mode(t, field);
    const notes = unitNotes([[t[m], `${field}.${m}`, 'eV'], [t.within, `${field}.within`, 'eV']]);
    const band = bandOfLabel(t.subband_edge)!.band;
    const edge = context.bands?.[band]?.edge_eV;
    if (m === 'energy' && edge !== undefined && Number.isFinite(edge)) {
      // A state lies above its band's extremum (below it for holes): a goal beyond the extremum is out of reach.
      const goal = energyOf(t.energy!, `${field}.energy`);
      const sign = band === 'electron' ? 1 : -1;
      if (sign * (goal - edge) < 0) {
        const depth = Math.abs(goal - edge) * 1000;
        notes.push(`${field}.energy: ${JSON.stringify(t.energy)} is an energy on the absolute scale, ${depth.toFixed(0)} meV ${sign > 0 ? 'below the conduction-band minimum' : 'above the valence-band maximum'} of this structure (${edge.toFixed(4)} eV at the nominal values), where no ${t.subband_edge} can lie; for a level ${JSON.stringify(t.energy)} from the band ${sign > 0 ? 'minimum' : 'maximum'} write confinement: ${JSON.stringify(t.energy)}`);
      }
    }
    return notes;
  },
  evaluate: (t, r) => {
    const m = mode(t);
    const goal = energyOf(t[m]!, m) * 1000;
    const within = energyOf(t.within, 'within') * 1000;
    const band = bandOfLabel(t.subband_edge)!.band;
    const s = findState(r, t.subband_edge);
    const e = stateEnergy(r, t.subband_edge);
    const edge = r.bands[band].edge_eV;
    const sign = band === 'electron' ? 1 : -1;
    const value = m === 'confinement' ? (s ? s.confinement_meV : sign * (e.energy - edge) * 1000) : e.energy * 1000;
    const residual = (value - goal) / within;
    return {
      label: `${t.subband_edge} ${m}`,
      role: 'target',
      achieved: s ? value : null,
      goal,
      unit: 'meV',
      residual: s ? residual : Math.sign(residual || 1) * (Math.abs(residual) + MISSING_STATE_PENALTY),
      weight: t.weight ?? 1,
      satisfied: s !== undefined && Math.abs(residual) <= 1,
    };
  },
};
