/**
 * A campaign's run store (engine/store/store.ts) read into what its report shows: provenance and
 * every job with its best design scored against the job's own targets. The store is only read: its
 * records are never rewritten.
 */
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { RunStore, STORE_FILE, type DesignRecord, type JobRecord } from '../store/store.js';
import { scoreStoredDesigns } from '../campaign/score.js';
import type { Evaluation } from '../../objectives/types.js';

/** One job of a campaign with its best (rank-1) design scored against that job's own targets. */
export interface CampaignJob {
  readonly index: number;
  readonly name: string;
  readonly state: JobRecord['state'];
  readonly status: string | null;
  readonly message: string | null;
  /** Loss Σ w·r² of the best design; null when the job has no design. */
  readonly loss: number | null;
  readonly satisfied: boolean | null;
  /** Objective evaluations of the search (null until the job is done). */
  readonly evaluations: number | null;
  /** Target evaluations of the best design (empty when there is none). */
  readonly targets: readonly Evaluation[];
  /** Per target (spec order): true for a transition target. */
  readonly transition: readonly boolean[];
}

export interface CampaignReport {
  readonly path: string;
  readonly title: string;
  readonly hash: string;
  readonly toolVersion: string;
  readonly parameterSets: readonly string[];
  readonly jobs: readonly CampaignJob[];
}

/** True for a run folder holding a run store, or a path naming an .sqlite file (which the store then checks). */
export function isRunStorePath(path: string): boolean {
  if (path.toLowerCase().endsWith('.sqlite')) return true;
  return existsSync(path) && statSync(path).isDirectory() && existsSync(join(path, STORE_FILE));
}

/** Extra columns that `SELECT *` returns beside JobRecord's. */
interface JobRow extends JobRecord {
  readonly evaluations: number | null;
  readonly parameter_set: string | null;
}

/** A job's best design scored against its own targets (engine/campaign/score.ts). */
function jobOf(row: JobRow, best: DesignRecord | undefined): CampaignJob {
  const base = { index: row.idx, name: row.name, state: row.state, status: row.status, message: row.message, evaluations: row.evaluations };
  if (!best) return { ...base, loss: null, satisfied: null, targets: [], transition: [] };
  const { targets, scored } = scoreStoredDesigns(row, [best]);
  return { ...base, loss: best.loss, satisfied: best.satisfied === 1, targets: scored[0]!.evaluations, transition: targets.map((t) => t.objective.kind === 'transition') };
}

/**
 * Reads a run store (a run folder or its campaign.sqlite) into a report. A corrupted or foreign
 * file is refused by RunStore.open with its own message (InputError, exit 2).
 */
export function readCampaign(path: string): CampaignReport {
  const store = RunStore.open(path, { create: false, readonly: true });
  try {
    const best = new Map(store.designs().filter((d) => d.rank === 1).map((d) => [d.job, d]));
    const rows = store.jobs() as JobRow[];
    return {
      path: store.path,
      title: store.meta('campaign_title') ?? store.path,
      hash: store.meta('campaign_hash') ?? '–',
      toolVersion: store.meta('tool_version') ?? 'unknown',
      parameterSets: [...new Set(rows.map((r) => r.parameter_set).filter((p): p is string => p !== null))],
      jobs: rows.map((r) => jobOf(r, best.get(r.name))),
    };
  } finally {
    store.close();
  }
}
