/** Regenerates schema/spec.schema.json and schema/campaign.schema.json from the zod schemas (npm run schema). */
import { writeFileSync } from 'node:fs';
import { campaignJsonSchema, specJsonSchema } from '../engine/input/json-schema.js';

writeFileSync(new URL('../schema/spec.schema.json', import.meta.url), `${JSON.stringify(specJsonSchema(), null, 2)}\n`);
writeFileSync(new URL('../schema/campaign.schema.json', import.meta.url), `${JSON.stringify(campaignJsonSchema(), null, 2)}\n`);
