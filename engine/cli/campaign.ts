/**
 * `wellsmith campaign FILE`: runs (or resumes) a campaign's jobs into the run store of --out,
 * optionally one shard of them, or writes Slurm scripts for the whole campaign. SIGINT/SIGTERM stop
 * the run at the next checkpoint (the next finished start) and exit 128 + signal number. Progress
 * is a bar on a terminal and, when stderr is a log file, a timestamped line per finished job.
 */
import { chmodSync } from 'node:fs';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { loadCampaignFile, type Campaign } from '../campaign/campaign.js';
import { isSpecFile, parseYamlText, readInputText } from '../input/load.js';
import { designsCsv } from '../campaign/export.js';
import { runCampaign, type JobEnd, type RunSummary, type Shard } from '../campaign/run.js';
import { slurmScripts } from '../campaign/slurm.js';
import { InputError } from '../errors.js';
import { RunStore, StoreError } from '../store/store.js';
import { EXIT, failure, success, type Outcome } from './exit.js';
import { sig, table, toJson } from '../text.js';
import { ensureFolder, writeFileAtomic } from './output.js';
import { progressBar, progressLog } from './progress.js';

export interface CampaignArgs {
  readonly file: string;
  readonly out: string | undefined;
  readonly workers: number;
  readonly shard: string | undefined;
  readonly export: string | undefined;
  readonly slurm: number | undefined;
  readonly json?: boolean;
  /** Run the store's failed jobs again (--retry-failed). */
  readonly retryFailed?: boolean;
}

/** The run folder when --out is not given: beside the campaign file, named after it. */
export const defaultRunFolder = (file: string): string => join(dirname(file), `${basename(file, extname(file))}.run`);

/** "2/3" -> shard 2 of 3. */
export function parseShard(text: string | undefined): Shard {
  if (text === undefined) return { index: 1, count: 1 };
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const shard = m ? { index: Number(m[1]), count: Number(m[2]) } : undefined;
  if (!shard || shard.count < 1 || shard.index < 1 || shard.index > shard.count) {
    throw new InputError('bad-value', `--shard: expected i/N with 1 ≤ i ≤ N (e.g. 2/3), got ${JSON.stringify(text)}`);
  }
  return shard;
}

/** How this process was started (node, its flags, the main script), so cluster nodes run the same wellsmith. */
function selfCommand(): string[] {
  const main = process.argv[1] ?? '';
  if (!/[\\/](main|wellsmith)\.[jt]s$/.test(main)) return ['wellsmith'];
  return [process.execPath, ...process.execArgv, resolve(main)];
}

function writeSlurm(campaign: Campaign, file: string, out: string, shards: number, cpus: number): Outcome {
  if (!Number.isInteger(shards) || shards < 1) throw new InputError('bad-value', `--slurm: the number of array tasks must be a whole number ≥ 1, got ${shards}`);
  const dir = resolve(out);
  const scripts = slurmScripts({
    campaign: resolve(file), out: dir, shards, workdir: process.cwd(), command: selfCommand(), cpusPerTask: cpus,
    jobName: `wellsmith-${basename(file, extname(file))}`.replace(/[^\w.-]/g, '_'),
  });
  for (const [name, text] of [['array.sbatch', scripts.array], ['merge.sbatch', scripts.merge], ['submit.sh', scripts.submit]] as const) {
    writeFileAtomic(join(dir, 'slurm', name), text);
    chmodSync(join(dir, 'slurm', name), 0o755);
  }
  return success(`${campaign.jobs.length} jobs in ${shards} shards; scripts in ${join(dir, 'slurm')}\nsubmit with: ${join(dir, 'slurm', 'submit.sh')}\n`, EXIT.ok, campaign.warnings);
}

function describe(store: RunStore, summary: RunSummary, shard: Shard): string {
  const jobs = store.jobs();
  const rows = jobs.map((j) => {
    const best = store.designs(j.name)[0];
    const values = best ? Object.entries(JSON.parse(best.values_json) as Record<string, number>).map(([k, v]) => `${k}=${sig(v, 5)}`).join(' ') : '';
    return [String(j.idx + 1), j.name, j.state, j.status ?? '', best ? sig(best.loss, 3) : '', values];
  });
  const met = jobs.filter((j) => j.status === 'ok').length;
  return [
    table(['#', 'job', 'state', 'status', 'best loss', 'best design'], rows),
    `${shard.count > 1 ? `shard ${shard.index}/${shard.count}: ` : ''}${summary.jobs} jobs, ${summary.alreadyDone} already finished, ${summary.ran} run now (${summary.startsRun} starts run, ${summary.startsReused} taken from the store${summary.requeued ? `, ${summary.requeued} stale job re-queued` : ''}${summary.retried ? `, ${summary.retried} failed job retried` : ''}); ${met} of the stored jobs meet every target`,
    ...summary.failedStored.map((f) => `failed: ${f.job}: ${f.message}`),
    ...(summary.failedStored.length > 0 ? ['rerun with --retry-failed to run the failed jobs again (their finished starts are kept)'] : []),
  ].join('\n');
}

/** The machine-readable form: the run summary and every job with its ranked designs' values and losses. */
function campaignJson(store: RunStore, summary: RunSummary, warnings: readonly string[]): string {
  const jobs = store.jobs().map((j) => ({
    name: j.name, index: j.idx, state: j.state, status: j.status, message: j.message,
    designs: store.designs(j.name).map((d) => ({ rank: d.rank, loss: d.loss, satisfied: d.satisfied === 1, values: JSON.parse(d.values_json) as unknown })),
  }));
  return toJson({ store: store.path, summary, jobs, warnings });
}

/** A finished job as a log line says it: "job 12/40 done (wavelength=960nm) in 3.1 s · ok · best loss 2.1e-4 · 28 to go". */
const jobEndText = (e: JobEnd): string =>
  `job ${e.jobsDone}/${e.jobsTotal} ${e.state} (${e.job}) in ${sig(e.seconds, 2)} s · ${e.state === 'done' ? `${e.status} · best loss ${sig(e.loss, 3)}` : e.status} · ${e.jobsTotal - e.jobsDone} to go`;

export async function runCampaignCommand(args: CampaignArgs): Promise<Outcome> {
  const bar = progressBar('campaign');
  const log = progressLog('campaign');
  let signal: NodeJS.Signals | undefined;
  const onSignal = (s: NodeJS.Signals): void => { signal ??= s; };
  let store: RunStore | undefined;
  const out = args.out ?? defaultRunFolder(args.file);
  const resume = `wellsmith campaign ${args.file} --out ${out}${args.shard ? ` --shard ${args.shard}` : ''}`;
  try {
    if (!Number.isInteger(args.workers) || args.workers < 1) throw new InputError('bad-value', `--workers: must be a whole number ≥ 1, got ${args.workers}`);
    if (args.export !== undefined && args.export !== 'csv') throw new InputError('bad-value', `--export: the only format is csv, got ${JSON.stringify(args.export)}`);
    const shard = parseShard(args.shard);
    const peek = parseYamlText(readInputText(args.file, 'campaign file'), args.file).value;
    if (peek !== null && typeof peek === 'object' && !Array.isArray(peek) && isSpecFile(peek as Record<string, unknown>)) {
      throw new InputError('schema', `${args.file}: this is a spec, not a campaign file; design it with "wellsmith design ${args.file}", or write a campaign file that names it under "spec:" with a "sweep:"`);
    }
    const campaign = loadCampaignFile(args.file);
    if (args.slurm !== undefined) return writeSlurm(campaign, args.file, out, args.slurm, args.workers);
    // A finished run folder may be read-only (an archive): the store says when something needs writing.
    ensureFolder(out, '--out', { writable: false });
    store = RunStore.open(out);
    // Said before the work, not after it: an overnight run's log shows them at its top.
    process.stderr.write(success('', EXIT.ok, campaign.warnings).stderr);
    process.on('SIGINT', onSignal);
    process.on('SIGTERM', onSignal);
    const summary = await runCampaign(campaign, store, {
      workers: args.workers,
      shard,
      retryFailed: args.retryFailed ?? false,
      shouldStop: () => signal !== undefined,
      onProgress: (p) => bar.update(p.jobsDone, p.jobsTotal, `${p.job} start ${p.startsDone}/${p.startsTotal} · best loss ${sig(p.bestLoss, 3)}${p.bestJob ? ` (${p.bestJob})` : ''}`),
      onJobEnd: (e) => log.finished(e.jobsDone, e.jobsTotal, jobEndText(e)),
    });
    bar.stop();
    if (summary.status === 'stopped') {
      const stopped = success('', 128 + (signal === 'SIGTERM' ? 15 : 2));
      return { ...stopped, stderr: `${stopped.stderr}wellsmith: campaign stopped by ${signal ?? 'request'} after the last finished start; every finished start is stored in ${store.path}. Resume with: ${resume}\n` };
    }
    if (args.export === 'csv') writeFileAtomic(join(out, 'designs.csv'), designsCsv(store));
    return success(`${args.json ? campaignJson(store, summary, campaign.warnings) : describe(store, summary, shard)}\n`, summary.failedStored.length > 0 ? EXIT.physics : EXIT.ok);
  } catch (e) {
    bar.stop();
    // The run stopped on its machine (disk full, I/O error): nothing is lost, the same command resumes.
    if (e instanceof StoreError && (e.trouble === 'full' || e.trouble === 'io' || e.trouble === 'busy')) return { code: EXIT.input, stdout: '', stderr: `wellsmith: ${e.message}. Resume with: ${resume}\n` };
    return failure(e);
  } finally {
    process.off('SIGINT', onSignal);
    process.off('SIGTERM', onSignal);
    store?.close();
  }
}
