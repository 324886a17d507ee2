/** Text of a tolerance result that the terminal table and the HTML report both print. */
import { sig, signed, withUnit } from '../text.js';
import type { ToleranceResult } from './analyse.js';

/** The worst sample: its loss, every quantity, and the growth errors that made it (per layer: ML and, for mixed alloys, Δx; the growth rate). */
export function worstText(w: NonNullable<NonNullable<ToleranceResult['montecarlo']>['worst']>, q: ToleranceResult['quantities']): string {
  const values = q.map((x, k) => `${x.label} ${Number.isFinite(w.values[k]) ? withUnit(w.values[k]!, x.unit) : 'missing'}`).join('; ');
  const errors = w.layers.map((l) => `${l.label} ${l.ml >= 0 ? '+' : ''}${l.ml} ML${l.dx === null ? '' : `, Δx ${signed(l.dx, 4)}`}`).join('; ');
  return `worst sample #${w.index}: loss ${sig(w.loss, 3)}; ${values}; growth errors: ${errors}; growth rate ${signed(((w.perturbation.thicknessScale ?? 1) - 1) * 100, 2)} %`;
}
