/** Regenerates schema/spec.schema.json from the zod schema (npm run schema). */
import { writeFileSync } from 'node:fs';
import { specJsonSchema } from '../engine/spec/json-schema.js';

writeFileSync(new URL('../schema/spec.schema.json', import.meta.url), `${JSON.stringify(specJsonSchema(), null, 2)}\n`);
