/**
 * `npm run -s bench [-- --json] [--write] [--filter SUBSTRING]`: runs the entries of
 * test/bench/entries.ts and prints a table (or, with --json, only a JSON array on stdout).
 * Progress and notes go to stderr. Exit 0 when every benchmark ran, 1 when one produced NaN or
 * failed, 2 on a bad argument. --write also saves the JSON to bench-results.json at the repo root.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ENTRIES as CORE, ROOT } from './entries.js';
import { SCENARIO_ENTRIES } from './scenario-entries.js';
import { SPEED_ENTRIES } from './speed-entries.js';
import { OPTICS_ENTRIES } from './optics-entries.js';
import { POISSON_ENTRIES } from './poisson-entries.js';
import { formatTable, runEntry, type BenchRow, type BenchEntry } from './harness.js';

/** Every entry, the core ones first. */
const ENTRIES: readonly BenchEntry[] = [...CORE, ...SPEED_ENTRIES, ...OPTICS_ENTRIES, ...POISSON_ENTRIES, ...SCENARIO_ENTRIES];

interface Args {
  readonly json: boolean;
  readonly write: boolean;
  readonly filter: string | null;
}

function parseArgs(argv: readonly string[]): Args | string {
  let json = false;
  let write = false;
  let filter: string | null = null;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a === '--json') json = true;
    else if (a === '--write') write = true;
    else if (a === '--filter') {
      if (i + 1 >= argv.length) return 'bench: --filter needs a value; give part of a benchmark name';
      filter = argv[++i]!;
    }
    else if (a.startsWith('--filter=')) filter = a.slice('--filter='.length);
    else return `bench: unknown argument "${a}"; use --json, --write or --filter SUBSTRING`;
  }
  return { json, write, filter };
}

async function main(): Promise<number> {
  const args = parseArgs(process.argv.slice(2));
  if (typeof args === 'string') {
    process.stderr.write(`${args}\n`);
    return 2;
  }
  const filter = args.filter?.toLowerCase();
  const entries = ENTRIES.filter((e) => filter === undefined || e.name.toLowerCase().includes(filter));
  if (entries.length === 0) {
    process.stderr.write(`bench: no benchmark name contains "${args.filter}"; names are:\n${ENTRIES.map((e) => `  ${e.name}`).join('\n')}\n`);
    return 2;
  }
  const rows: BenchRow[] = [];
  let failed = false;
  for (const entry of entries) {
    process.stderr.write(`bench: ${entry.name} …\n`);
    try {
      rows.push(await runEntry(entry, (line) => process.stderr.write(`  ${line}\n`)));
    } catch (err) {
      failed = true;
      process.stderr.write(`bench: FAILED ${entry.name}: ${err instanceof Error ? err.message : String(err)}\n`);
    }
  }
  const json = JSON.stringify(rows, null, 2);
  process.stdout.write(args.json ? `${json}\n` : `${formatTable(rows, entries)}\n`);
  if (args.write) writeFileSync(join(ROOT, 'bench-results.json'), `${json}\n`);
  return failed ? 1 : 0;
}

process.exitCode = await main();
