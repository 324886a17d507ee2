/**
 * Running a campaign's jobs against its run store. Each design job is its starts on the worker
 * pool; every finished start is stored at once (the checkpoint), so a resumed run re-runs only
 * the starts the store lacks and then ranks all of them. Starts are deterministic in (spec, seed,
 * index), so the ranking equals that of an uninterrupted run. A stop request is honoured at the
 * next checkpoint. An error of the store's environment (disk full, I/O, read-only) is not the job's
 * failure: the run stops there, the job goes back to the queue, and the error is thrown on.
 */
import { isInputError } from '../errors.js';
import { runTasks } from '../pool.js';
import { designTasks, rankDesigns } from '../design/search.js';
import { StoreError, type RunStore } from '../store/store.js';
import type { Campaign, Job } from './campaign.js';

/** A slice of the jobs for one machine: shard i of n (1-based) takes the jobs with index mod n = i − 1. */
export interface Shard {
  readonly index: number;
  readonly count: number;
}

export const inShard = (job: Job, shard: Shard): boolean => job.index % shard.count === shard.index - 1;

export interface CampaignProgress {
  readonly jobsDone: number;
  readonly jobsTotal: number;
  readonly job: string;
  readonly startsDone: number;
  readonly startsTotal: number;
  /** Lowest snapped loss of any start stored in this run or before. */
  readonly bestLoss: number;
  readonly bestJob: string;
}

/** A job this run finished (done or failed), for a log line per job. */
export interface JobEnd {
  readonly job: string;
  /** Jobs of the shard finished so far, this one and those finished before this run included; of jobsTotal. */
  readonly jobsDone: number;
  readonly jobsTotal: number;
  readonly state: 'done' | 'failed';
  /** Design status of a done job ('ok', 'infeasible', …); the error message of a failed one. */
  readonly status: string;
  /** Loss of the job's best design; Infinity when it has none. */
  readonly loss: number;
  /** Wall time of this run's work on the job (s). */
  readonly seconds: number;
}

export interface RunOptions {
  readonly workers: number;
  readonly shard: Shard;
  readonly onProgress?: (p: CampaignProgress) => void;
  readonly onJobEnd?: (end: JobEnd) => void;
  /** Polled at every checkpoint; true stops the run there. */
  readonly shouldStop?: () => boolean;
  /** Re-queue this shard's failed jobs (keeping their stored starts) before running. */
  readonly retryFailed?: boolean;
}

export type RunStatus = 'complete' | 'stopped';

export interface RunSummary {
  readonly status: RunStatus;
  /** Jobs of this shard. */
  readonly jobs: number;
  /** Jobs of this shard finished before this run began (skipped). */
  readonly alreadyDone: number;
  /** Jobs finished in this run, of which failed. */
  readonly ran: number;
  readonly failed: readonly { readonly job: string; readonly message: string }[];
  /** Failed jobs of this shard in the store once the run ends: this run's and earlier runs' (the exit code counts these). */
  readonly failedStored: readonly { readonly job: string; readonly message: string }[];
  /** Jobs found `running` (left by a crash) and re-queued. */
  readonly requeued: number;
  /** Failed jobs re-queued by retryFailed. */
  readonly retried: number;
  /** Starts run now; starts taken from the store. */
  readonly startsRun: number;
  readonly startsReused: number;
}

class Stopped extends Error {}

/** Runs (or resumes) this shard's jobs; the store must be open for writing. */
export async function runCampaign(campaign: Campaign, store: RunStore, options: RunOptions): Promise<RunSummary> {
  store.bindCampaign(campaign.hash, campaign.title);
  const requeued = store.requeueStale();
  const jobs = campaign.jobs.filter((j) => inShard(j, options.shard));
  store.enqueue(jobs.map((j) => ({ name: j.name, index: j.index, kind: j.kind, hash: j.hash, spec: j.spec, options: j.options, seed: j.options.seed })));
  const retried = options.retryFailed ? store.retryFailed(jobs.map((j) => j.name)) : 0;
  const stop = options.shouldStop ?? (() => false);
  let best = { loss: Infinity, job: '' };
  const note = (job: string, loss: number): void => {
    if (loss < best.loss) best = { loss, job };
  };
  for (const j of jobs) for (const o of store.outcomes(j.name)) note(j.name, o.snapped.loss);
  const alreadyDone = jobs.filter((j) => store.job(j.name)!.state !== 'queued').length;
  let jobsDone = alreadyDone;
  let ran = 0;
  let startsRun = 0;
  let startsReused = 0;
  const failed: { job: string; message: string }[] = [];
  const report = (job: string, startsDone: number, startsTotal: number): void =>
    options.onProgress?.({ jobsDone, jobsTotal: jobs.length, job, startsDone, startsTotal, bestLoss: best.loss, bestJob: best.job });
  const summary = (status: RunStatus): RunSummary => {
    const mine = new Set(jobs.map((j) => j.name));
    const failedStored = store.jobs().filter((j) => j.state === 'failed' && mine.has(j.name)).map((j) => ({ job: j.name, message: j.message ?? '' }));
    return { status, jobs: jobs.length, alreadyDone, ran, failed, failedStored, requeued, retried, startsRun, startsReused };
  };

  for (const job of jobs) {
    if (store.job(job.name)!.state !== 'queued') continue;
    if (stop()) return summary('stopped');
    store.markRunning(job.name);
    const began = performance.now();
    let end: Pick<JobEnd, 'state' | 'status' | 'loss'>;
    try {
      const tasks = designTasks(job.spec, job.options);
      const have = new Set(store.outcomes(job.name).map((o) => o.index));
      const remaining = tasks.filter((t) => !have.has(t.index));
      startsReused += have.size;
      report(job.name, have.size, tasks.length);
      let t0 = performance.now();
      await runTasks(remaining, {
        workers: options.workers,
        onProgress: (done, _total, result) => {
          if (result.type !== 'design-start') throw new Error(`campaign: a design start returned a ${result.type} result`);
          const outcome = result;
          const t1 = performance.now();
          store.saveOutcome(job.name, outcome, (t1 - t0) / 1000);
          t0 = t1;
          startsRun++;
          note(job.name, outcome.snapped.loss);
          report(job.name, have.size + done, tasks.length);
          if (stop()) throw new Stopped();
        },
      });
      const ranked = rankDesigns(job.spec, store.outcomes(job.name), job.options);
      store.finishJob(job.name, ranked);
      end = { state: 'done', status: ranked.status, loss: ranked.designs[0]?.loss ?? Infinity };
    } catch (e) {
      if (e instanceof Stopped) {
        store.requeueStale();
        return summary('stopped');
      }
      if (e instanceof StoreError) {
        try {
          store.requeue(job.name);
        } catch {
          // The store cannot take even that: the job stays `running`, which the next run re-queues as stale.
        }
        throw e;
      }
      // One bad job never kills a campaign: it is recorded as failed and the others go on.
      const message = isInputError(e) ? e.message : `internal error: ${e instanceof Error ? e.message : String(e)}`;
      store.failJob(job.name, message);
      failed.push({ job: job.name, message });
      end = { state: 'failed', status: message, loss: Infinity };
    }
    ran++;
    jobsDone++;
    options.onJobEnd?.({ job: job.name, jobsDone, jobsTotal: jobs.length, ...end, seconds: (performance.now() - began) / 1000 });
    report(job.name, 0, 0);
  }
  return summary('complete');
}
