import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { specJsonSchema } from '../../engine/spec/json-schema.js';

describe('shipped JSON Schema', () => {
  it('equals the schema generated from the validator (run "npm run schema" after changing it)', () => {
    const shipped: unknown = JSON.parse(readFileSync(new URL('../../schema/spec.schema.json', import.meta.url), 'utf8'));
    expect(shipped).toEqual(JSON.parse(JSON.stringify(specJsonSchema())));
  });
});
