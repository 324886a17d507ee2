/**
 * Prints the doped reference structures (structures.ts) as JSON, the input of the python reference:
 * node --import tsx print_parameters.ts | python3 schrodinger_poisson.py
 */
import { REFERENCE_CASES, parametersOf } from './structures.js';

const out: Record<string, unknown> = {};
for (const c of REFERENCE_CASES()) out[c.name] = parametersOf(c);
process.stdout.write(`${JSON.stringify(out, null, 1)}\n`);
