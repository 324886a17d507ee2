/** The shipped JSON Schema of spec files, generated from the same zod schema that validates them. */
import { z } from 'zod';
import { specSchema } from './schema.js';

export function specJsonSchema(): Record<string, unknown> {
  return {
    ...z.toJSONSchema(specSchema, { io: 'input', target: 'draft-2020-12' }),
    $id: 'https://wellsmith.invalid/schema/spec.schema.json',
    title: 'wellsmith spec',
    description: 'A layer stack (or wire cross-section) with free variables and design targets.',
  };
}
