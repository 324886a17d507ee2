/**
 * Structures the envelope-function model must not be trusted on, found before any number is
 * printed: a layer whose conduction edge lies at or below its valence edge (an inverted or closed
 * gap), a broken-gap alignment between layers (one layer's conduction edge below another's valence
 * edge, where single-band electrons and holes mix), and strained layers far beyond pseudomorphic
 * growth. A solve of such a structure reports status 'unphysical' and a search scores it infeasible.
 */
import type { Structure } from './structure.js';

/** Beyond this many critical thicknesses a layer has long relaxed: its strained edges are fiction. */
export const RELAXED_FACTOR = 10;

/** One line per problem found; empty when the structure is within the model. */
export function physicalIssues(s: Structure): string[] {
  const issues: string[] = [];
  const name = (i: number): string => `layer ${i + 1} (${s.layers[i]!.label}, ${s.layers[i]!.formula})`;
  let lowestEc = { E: Infinity, layer: -1 };
  let highestEv = { E: -Infinity, layer: -1 };
  for (const l of s.layers) {
    for (const b of l.bands) {
      const Ev = Math.max(b.Ehh, b.Elh);
      if (b.Ec - Ev <= 0) {
        issues.push(`${name(l.index)} has its conduction edge ${((Ev - b.Ec) * 1000).toFixed(0)} meV below its valence edge (an inverted or closed gap); the single-band model does not describe it`);
        break;
      }
      if (b.Ec < lowestEc.E) lowestEc = { E: b.Ec, layer: l.index };
      if (Ev > highestEv.E) highestEv = { E: Ev, layer: l.index };
    }
    const hc = l.material.criticalThickness_nm;
    if (hc < l.monolayer_nm) {
      issues.push(`${name(l.index)} cannot be grown coherently on the substrate at any thickness (mismatch ${(l.material.mismatch * 100).toFixed(1)} %, critical thickness below one monolayer)`);
    } else if (l.thickness_nm > RELAXED_FACTOR * hc) {
      issues.push(`${name(l.index)} is ${l.thickness_nm.toPrecision(3)} nm, more than ${RELAXED_FACTOR} times its critical thickness ${hc.toPrecision(3)} nm: it has relaxed, and its strained band edges do not apply`);
    }
  }
  if (lowestEc.layer >= 0 && highestEv.layer >= 0 && lowestEc.E <= highestEv.E) {
    issues.push(`broken-gap alignment: the conduction edge of ${name(lowestEc.layer)} lies ${((highestEv.E - lowestEc.E) * 1000).toFixed(0)} meV below the valence edge of ${name(highestEv.layer)}; electrons and holes mix there, which the single-band model does not describe`);
  }
  return issues;
}
