/**
 * The run store of a campaign: one SQLite file (WAL journal, every write in a transaction) in the
 * run folder. It is the only state of a run: jobs with an explicit state (queued, running, done,
 * failed), every finished start of a design search (the checkpoint), the ranked designs with their
 * full solve result, timings and provenance. A finished job is never rewritten; a `running` job
 * left by a crash is stale and re-queued when the store is opened for a run. A file that is not a
 * wellsmith store, or was written by a newer format, is refused and left untouched.
 */
import { existsSync, mkdirSync, openSync, readSync, closeSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import Database from 'better-sqlite3';
import { InputError } from '../errors.js';
import type { StartOutcome } from '../design/start.js';
import type { DesignResult } from '../design/search.js';
import { toolVersion } from './version.js';

export const STORE_FORMAT = 1;
export const STORE_FILE = 'campaign.sqlite';
const APPLICATION = 'wellsmith-campaign-store';

export type JobState = 'queued' | 'running' | 'done' | 'failed';

export interface JobRecord {
  readonly name: string;
  readonly idx: number;
  readonly kind: string;
  readonly hash: string;
  readonly state: JobState;
  readonly spec_json: string;
  readonly options_json: string;
  readonly seed: number;
  readonly status: string | null;
  readonly message: string | null;
  readonly attempts: number;
}

export interface DesignRecord {
  readonly job: string;
  readonly rank: number;
  readonly loss: number;
  readonly satisfied: number;
  readonly start: number;
  readonly values_json: string;
  readonly result_json: string;
}

const SCHEMA = `
CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE jobs (
  name TEXT PRIMARY KEY, idx INTEGER NOT NULL, kind TEXT NOT NULL, hash TEXT NOT NULL,
  state TEXT NOT NULL CHECK (state IN ('queued', 'running', 'done', 'failed')),
  spec_json TEXT NOT NULL, options_json TEXT NOT NULL, seed INTEGER NOT NULL,
  tool_version TEXT NOT NULL, parameter_set TEXT, status TEXT, message TEXT,
  attempts INTEGER NOT NULL DEFAULT 0, queued_at TEXT NOT NULL, started_at TEXT, finished_at TEXT,
  evaluations INTEGER, failures INTEGER);
CREATE TABLE starts (
  job TEXT NOT NULL REFERENCES jobs(name), start INTEGER NOT NULL, loss REAL, snapped_loss REAL,
  evaluations INTEGER NOT NULL, outcome_json TEXT NOT NULL, seconds REAL NOT NULL, finished_at TEXT NOT NULL,
  PRIMARY KEY (job, start));
CREATE TABLE designs (
  job TEXT NOT NULL REFERENCES jobs(name), rank INTEGER NOT NULL, loss REAL NOT NULL, satisfied INTEGER NOT NULL,
  start INTEGER NOT NULL, values_json TEXT NOT NULL, result_json TEXT NOT NULL,
  PRIMARY KEY (job, rank));
`;

const now = (): string => new Date().toISOString();

/** The first 16 bytes of every SQLite 3 database file. */
const SQLITE_MAGIC = 'SQLite format 3\0';

function refuse(path: string, why: string): never {
  throw new InputError('io', `run store "${path}": ${why}; it was left untouched: use another --out folder or move that file away`);
}

/** Checks an existing file without opening it for writing: SQLite header, then our meta table and format. */
function checkExisting(path: string): void {
  if (statSync(path).size === 0) refuse(path, 'is an empty file, not a wellsmith run store');
  const fd = openSync(path, 'r');
  const head = Buffer.alloc(16);
  try { readSync(fd, head, 0, 16, 0); } finally { closeSync(fd); }
  if (head.toString('latin1') !== SQLITE_MAGIC) refuse(path, 'is not an SQLite database (corrupted, or a foreign file)');
  let db: Database.Database | undefined;
  try {
    db = new Database(path, { readonly: true, fileMustExist: true });
    const hasMeta = db.prepare("SELECT count(*) FROM sqlite_master WHERE type = 'table' AND name = 'meta'").pluck().get() === 1;
    const app = hasMeta ? db.prepare("SELECT value FROM meta WHERE key = 'application'").pluck().get() : undefined;
    if (app !== APPLICATION) refuse(path, 'is an SQLite database but not a wellsmith run store');
    const format = Number(db.prepare("SELECT value FROM meta WHERE key = 'format'").pluck().get());
    if (!(format <= STORE_FORMAT)) refuse(path, `has store format ${format}, newer than this wellsmith understands (${STORE_FORMAT}); upgrade wellsmith to read it`);
    db.prepare('SELECT count(*) FROM jobs').get();
  } catch (e) {
    if (e instanceof InputError) throw e;
    refuse(path, `cannot be read as a wellsmith run store (${(e as Error).message})`);
  } finally {
    db?.close();
  }
}

export class RunStore {
  private constructor(readonly path: string, private readonly db: Database.Database) {}

  /** Opens (or creates) the store of a run folder. `create: false` requires it to exist. */
  /** Opens (or creates) a run store; `readonly` opens an existing one without ever writing to it (reports). */
  static open(dir: string, { create = true, readonly = false } = {}): RunStore {
    const path = dir.endsWith('.sqlite') ? dir : join(dir, STORE_FILE);
    const exists = existsSync(path);
    if (exists) checkExisting(path);
    else if (!create || readonly) throw new InputError('io', `no run store at "${path}"; give the --out folder of a campaign run`);
    else {
      try {
        mkdirSync(dirname(path), { recursive: true });
      } catch (e) {
        const code = (e as NodeJS.ErrnoException).code;
        throw new InputError('io', `cannot create the run folder "${dirname(path)}"${code ? ` (${code})` : ''}; give --out a folder you can write`);
      }
    }
    if (readonly) return new RunStore(path, new Database(path, { readonly: true, fileMustExist: true }));
    const db = new Database(path);
    db.pragma('journal_mode = WAL');
    db.pragma('synchronous = FULL');
    db.pragma('foreign_keys = ON');
    if (!exists) {
      db.transaction(() => {
        db.exec(SCHEMA);
        const put = db.prepare('INSERT INTO meta (key, value) VALUES (?, ?)');
        put.run('application', APPLICATION);
        put.run('format', String(STORE_FORMAT));
        put.run('created_at', now());
        put.run('tool_version', toolVersion());
      })();
    }
    return new RunStore(path, db);
  }

  close(): void {
    this.db.close();
  }

  meta(key: string): string | undefined {
    return this.db.prepare('SELECT value FROM meta WHERE key = ?').pluck().get(key) as string | undefined;
  }

  /** Ties the store to one campaign (its hash); a store of another campaign is refused. */
  bindCampaign(hash: string, title: string): void {
    const have = this.meta('campaign_hash');
    if (have !== undefined && have !== hash) {
      throw new InputError('bad-value', `run store "${this.path}" belongs to another campaign (hash ${have}, this file gives ${hash}); the campaign file changed since the run started: use a new --out folder`);
    }
    if (have === undefined) {
      this.db.transaction(() => {
        this.db.prepare('INSERT INTO meta (key, value) VALUES (?, ?)').run('campaign_hash', hash);
        this.db.prepare('INSERT INTO meta (key, value) VALUES (?, ?)').run('campaign_title', title);
      })();
    }
  }

  /** Re-queues jobs left `running` by a crashed or killed run; returns how many. */
  requeueStale(): number {
    return this.db.prepare("UPDATE jobs SET state = 'queued', started_at = NULL WHERE state = 'running'").run().changes;
  }

  job(name: string): JobRecord | undefined {
    return this.db.prepare('SELECT * FROM jobs WHERE name = ?').get(name) as JobRecord | undefined;
  }

  jobs(): JobRecord[] {
    return this.db.prepare('SELECT * FROM jobs ORDER BY idx').all() as JobRecord[];
  }

  /** Adds a job as queued unless it is there already (with the same hash). */
  enqueue(job: { name: string; index: number; kind: string; hash: string; spec: unknown; options: unknown; seed: number }): JobRecord {
    const have = this.job(job.name);
    if (have) {
      if (have.hash !== job.hash) throw new InputError('bad-value', `run store "${this.path}": job "${job.name}" was stored with spec hash ${have.hash}, the campaign now gives ${job.hash}; use a new --out folder`);
      return have;
    }
    this.db.prepare(`INSERT INTO jobs (name, idx, kind, hash, state, spec_json, options_json, seed, tool_version, queued_at)
      VALUES (?, ?, ?, ?, 'queued', ?, ?, ?, ?, ?)`)
      .run(job.name, job.index, job.kind, job.hash, JSON.stringify(job.spec), JSON.stringify(job.options), job.seed, toolVersion(), now());
    return this.job(job.name)!;
  }

  /** queued -> running (counts the attempt). */
  markRunning(name: string): void {
    const r = this.db.prepare("UPDATE jobs SET state = 'running', started_at = ?, attempts = attempts + 1 WHERE name = ? AND state = 'queued'").run(now(), name);
    if (r.changes !== 1) throw new Error(`run store: job "${name}" is not queued`);
  }

  /** Start outcomes stored so far for a job, by start index. */
  outcomes(job: string): StartOutcome[] {
    return (this.db.prepare('SELECT outcome_json FROM starts WHERE job = ? ORDER BY start').pluck().all(job) as string[]).map((s) => JSON.parse(s, reviveNonFinite) as StartOutcome);
  }

  /** The checkpoint: one finished start, written once (a repeat of the same start is ignored). */
  saveOutcome(job: string, outcome: StartOutcome, seconds: number): void {
    this.db.prepare('INSERT OR IGNORE INTO starts (job, start, loss, snapped_loss, evaluations, outcome_json, seconds, finished_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)')
      .run(job, outcome.index, finiteOrNull(outcome.loss), finiteOrNull(outcome.snapped.loss), outcome.evaluations, JSON.stringify(outcome, keepNonFinite), seconds, now());
  }

  /** running -> done with the ranked designs, in one transaction. */
  finishJob(name: string, result: DesignResult): void {
    this.db.transaction(() => {
      const r = this.db.prepare("UPDATE jobs SET state = 'done', finished_at = ?, status = ?, message = ?, parameter_set = ?, evaluations = ?, failures = ? WHERE name = ? AND state = 'running'")
        .run(now(), result.status, result.message, result.designs[0]?.result.parameterSet ?? null, result.evaluations, result.failures, name);
      if (r.changes !== 1) throw new Error(`run store: job "${name}" is not running`);
      const put = this.db.prepare('INSERT INTO designs (job, rank, loss, satisfied, start, values_json, result_json) VALUES (?, ?, ?, ?, ?, ?, ?)');
      for (const d of result.designs) put.run(name, d.rank, d.loss, d.satisfied ? 1 : 0, d.start, JSON.stringify(d.values), JSON.stringify(d.result, keepNonFinite));
    })();
  }

  /** running -> failed with a one-line reason. */
  failJob(name: string, message: string): void {
    this.db.prepare("UPDATE jobs SET state = 'failed', finished_at = ?, status = 'failed', message = ? WHERE name = ? AND state = 'running'").run(now(), message, name);
  }

  designs(job?: string): DesignRecord[] {
    return (job === undefined
      ? this.db.prepare('SELECT d.* FROM designs d JOIN jobs j ON j.name = d.job ORDER BY j.idx, d.rank').all()
      : this.db.prepare('SELECT * FROM designs WHERE job = ? ORDER BY rank').all(job)) as DesignRecord[];
  }

  /**
   * Copies another store's records in (idempotent): jobs missing here, start outcomes missing
   * here, and a finished job with its designs where this store has it unfinished. A job stored
   * here and there with different hashes, or stores of different campaigns, are refused.
   */
  mergeFrom(other: RunStore): { jobs: number; starts: number } {
    const theirs = other.meta('campaign_hash');
    if (theirs !== undefined) this.bindCampaign(theirs, other.meta('campaign_title') ?? '');
    let jobs = 0;
    let starts = 0;
    this.db.transaction(() => {
      for (const j of other.jobs()) {
        const mine = this.job(j.name);
        if (mine && mine.hash !== j.hash) throw new InputError('bad-value', `merge: job "${j.name}" has spec hash ${mine.hash} in "${this.path}" but ${j.hash} in "${other.path}"; these are runs of different campaigns`);
        const full = other.db.prepare('SELECT * FROM jobs WHERE name = ?').get(j.name) as Record<string, unknown>;
        const state = full['state'] === 'running' ? 'queued' : full['state'];
        const finished = state === 'done' || state === 'failed';
        if (!mine || (finished && (mine.state === 'queued' || mine.state === 'running'))) {
          const cols = Object.keys(full);
          this.db.prepare(`INSERT OR REPLACE INTO jobs (${cols.join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`)
            .run(...cols.map((c) => (c === 'state' ? state : full[c])));
          if (state === 'done') {
            const put = this.db.prepare('INSERT INTO designs (job, rank, loss, satisfied, start, values_json, result_json) VALUES (?, ?, ?, ?, ?, ?, ?)');
            for (const d of other.designs(j.name)) put.run(d.job, d.rank, d.loss, d.satisfied, d.start, d.values_json, d.result_json);
          }
          jobs++;
        }
        const rows = other.db.prepare('SELECT * FROM starts WHERE job = ?').all(j.name) as Record<string, unknown>[];
        for (const s of rows) {
          const cols = Object.keys(s);
          starts += this.db.prepare(`INSERT OR IGNORE INTO starts (${cols.join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`).run(...cols.map((c) => s[c])).changes;
        }
      }
    })();
    return { jobs, starts };
  }

  /**
   * The store's results without timings or attempt counts: equal for an interrupted-and-resumed,
   * a sharded-and-merged and an uninterrupted run of the same campaign.
   */
  snapshot(): { jobs: unknown[]; starts: unknown[]; designs: unknown[] } {
    return {
      jobs: this.db.prepare('SELECT name, idx, kind, hash, state, seed, status, message, parameter_set, evaluations, failures FROM jobs ORDER BY idx').all(),
      starts: this.db.prepare('SELECT job, start, outcome_json FROM starts ORDER BY job, start').all(),
      designs: this.db.prepare('SELECT job, rank, loss, satisfied, start, values_json, result_json FROM designs ORDER BY job, rank').all(),
    };
  }
}

/** JSON has no Infinity or NaN: an unevaluable start's loss is kept as the string "Infinity" and read back as the number. */
const NON_FINITE = new Set(['Infinity', '-Infinity', 'NaN']);
const keepNonFinite = (_key: string, v: unknown): unknown => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v);
const reviveNonFinite = (_key: string, v: unknown): unknown => (typeof v === 'string' && NON_FINITE.has(v) ? Number(v) : v);

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);
