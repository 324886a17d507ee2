/**
 * A design as a spec file: the original spec with every variable's `value` set to the design's
 * (bounds kept), so `wellsmith solve` on it reproduces the reported values exactly. Numbers are
 * written in JavaScript's shortest round-trip form, so nothing is lost in the text.
 */
import { stringify } from 'yaml';
import type { Spec } from '../input/schema.js';
import { variablesOf } from '../structure.js';

export function designSpec(spec: Spec, values: Readonly<Record<string, number>>): Spec {
  const vary: NonNullable<Spec['vary']> = {};
  const text = (x: number, unit: string): string | number => (unit === '' ? x : `${String(x)} ${unit}`);
  for (const v of variablesOf(spec)) {
    const x = text(values[v.name]!, v.unit);
    // A per_period variable writes one value per period, in period order.
    const key = v.perPeriod?.base ?? v.name;
    const before = vary[key]?.value;
    vary[key] = { ...spec.vary![key]!, value: v.perPeriod ? [...(Array.isArray(before) ? before : []), x] : x };
  }
  return { ...spec, vary };
}

export function designSpecText(spec: Spec, values: Readonly<Record<string, number>>, header: string): string {
  const comment = header.split('\n').map((l) => `# ${l}`).join('\n');
  const full = designSpec(spec, values);
  // A wire spec's parsed form carries an empty stack, which the schema refuses when written out.
  const { stack, ...wire } = full;
  return `${comment}\n${stringify(full.wire !== undefined && stack.length === 0 ? wire : full, { lineWidth: 0 })}`;
}
