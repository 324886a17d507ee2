/**
 * One number format per quantity: a row of numbers that `solve` prints and the report shows reads
 * the same in both (same cells, same decimals), and densities, which span orders of magnitude within
 * one column, are always in exponent form with 4 significant figures (engine/text.ts inUnit).
 */
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { buildReport, loadReportInput } from '../../engine/report/index.js';
import { inUnit } from '../../engine/text.js';

const STATE_ROW = /^(e|hh|lh|c)\d+(-\w+)?$/;

describe('one number format per quantity', () => {
  it.each(['runs/qwip-doped-9um.yaml', 'runs/tm-gain-tensile.yaml', 'runs/pump-976.yaml'])('%s: every state or line row shown by both solve and the report reads the same in both', async (file) => {
    const text = (await cli(['solve', file])).stdout.split('\n').map((l) => l.trim().split(/\s+/));
    const html = await buildReport(loadReportInput(file));
    const rows = [...html.matchAll(/<tr><td>([^<]*)<\/td>(.*?)<\/tr>/g)].map((m) => [m[1]!, ...[...m[2]!.matchAll(/<td[^>]*>([^<]*)<\/td>/g)].map((c) => c[1]!)]);
    let compared = 0;
    for (const r of rows.filter((x) => STATE_ROW.test(x[0]!))) {
      const candidates = text.filter((t) => t[0] === r[0] && t.length === r.length);
      if (candidates.length === 0) continue; // a table only the report has (longer line lists, DOS masses)
      compared++;
      expect(candidates.map((t) => t.join(' | ')), `report row ${r.join(' | ')}`).toContain(r.join(' | '));
    }
    expect(compared, 'rows shown by both').toBeGreaterThan(5);
  }, 60_000);

  it('densities read in exponent form with 4 significant figures, whatever their size', () => {
    expect([2.3e11, 21.22, 68.98, 0, 1.5e18].map((x) => inUnit(x, 'cm⁻²'))).toEqual(['2.300e+11', '2.122e+1', '6.898e+1', '0', '1.500e+18']);
    expect(inUnit(3.018e13, 'cm⁻² eV⁻¹')).toBe('3.018e+13');
    expect(inUnit(1.415e18, 'cm⁻³')).toBe('1.415e+18');
  });
});
