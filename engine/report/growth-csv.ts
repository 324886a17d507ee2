/** The growth sheet as CSV (RFC 4180), one row per layer and a total line; text cells cannot start a spreadsheet formula. */
import { csvLine as line } from '../text.js';
import type { GrowthSheet } from './growth.js';

export function growthCsv(g: GrowthSheet): string {
  const head = line(['layer', 'label', 'material', 'thickness_nm', 'monolayers', 'rate_from', 'rate_ML_per_s', 'rate_nm_per_s', 'shutter_s', 'note']);
  const rows = g.rows.map((r) => line([r.index + 1, r.label, r.formula, r.thickness_nm, r.monolayers, r.source, r.rate_ml_per_s ?? NaN, r.rate_nm_per_s ?? NaN, r.time_s ?? NaN, r.note]));
  return `${[head, ...rows, line(['total', '', '', '', '', '', '', '', g.total_s ?? NaN, g.consistent ? '' : 'check the notes'])].join('\n')}\n`;
}
