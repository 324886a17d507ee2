/**
 * The run store of a campaign: one SQLite file (WAL journal, every write in a transaction) in the
 * run folder. It is the only state of a run: jobs with an explicit state (queued, running, done,
 * failed), every finished start of a design search (the checkpoint), the ranked designs with their
 * full solve result, timings and provenance. A finished job is never rewritten (a failed one is
 * re-queued only when asked); a `running` job left by a crash is stale and re-queued when the store
 * is opened for a run. One writer at a time: the folder is locked (lock.ts). A store is created
 * whole or not at all. A file that is not a wellsmith store, or was written by a newer format, is
 * refused and left untouched. Errors of the machine (disk full, I/O, read-only, damaged file) are
 * StoreErrors, never a job's failure.
 *
 * Durability: write-ahead log with synchronous = NORMAL (SQLite, "Write-Ahead Logging" and "PRAGMA
 * synchronous", sqlite.org): every write is a committed transaction the moment its call returns
 * (one per finished start, one per finished job), and a commit is in the operating system's hands
 * at once, but the disk is flushed only when the log is checkpointed (every ~4 MB of log, and on
 * close), not on every commit. So a kill or crash of the process (SIGKILL included) loses nothing
 * committed; a power cut or an operating-system crash leaves a consistent store (never a damaged
 * one) that may lack the starts and jobs of its last moments, which a resume re-runs (a start is
 * deterministic, so the results do not change). An fsync per start cost 70–85 ms per job.
 *
 * A stored design keeps its full solve result except the sampled arrays (wavefunctions of a stack,
 * |ψ|² maps of a wire), which are recomputed from the spec and the design's values when a report
 * needs them. The rest is stored as its JSON skeleton, every number written 0 and the skeleton
 * brotli-compressed, followed by the numbers as binary float64 (format 3): a design of pump-976
 * (~1400 numbers) is packed in about a third of the time its JSON text took through a replacer and
 * zlib, read back three times faster, and 16 % smaller (measured). Older records stay readable, each
 * by its own form: zlib-compressed JSON (format 2), plain JSON text with the arrays (format 1).
 */
import { accessSync, closeSync, constants, existsSync, fsyncSync, mkdirSync, openSync, readdirSync, readSync, renameSync, rmSync, statSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { basename, dirname, join, resolve } from 'node:path';
import { brotliCompressSync, brotliDecompressSync, constants as zlib, inflateSync } from 'node:zlib';
import Database from 'better-sqlite3';
import { InputError } from '../errors.js';
import type { StartOutcome } from '../design/start.js';
import type { DesignResult } from '../design/search.js';
import { FolderLock } from './lock.js';
import { toolVersion } from './version.js';

/**
 * 3: design results as a compressed skeleton and binary numbers; 2 (read too): zlib-compressed JSON
 * without sampled arrays; 1 (read too): plain JSON text with them. A store opened for writing is
 * marked with the current format, since it may then hold records older tools cannot read.
 */
export const STORE_FORMAT = 3;
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
  /** The stored solve result: a packed record (format 3), zlib-compressed JSON (format 2) or JSON text (format 1); read it with storedResult. */
  readonly result_json: string | Buffer;
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

// better-sqlite3 reads this once, when it loads SQLite (at the first `new Database`): it lets a
// store in a read-only folder be opened as an immutable URI (openReader). Plain paths are always
// absolute here, so no other name is read as a URI.
process.env['SQLITE_USE_URI'] ??= '1';

/** What went wrong with the machine rather than with the run: the disk, the file system, another process. */
export type StoreTrouble = 'full' | 'io' | 'read-only' | 'busy' | 'damaged';

const ADVICE: Readonly<Record<StoreTrouble, string>> = {
  full: 'every record stored before is kept: free space (or raise the file-size limit) and run the command again',
  io: 'every record stored before is kept: check the disk (space, file-size limit, health) and run the command again',
  'read-only': 'reading needs no writing, but this does: copy the run folder somewhere writable and run the command there',
  busy: 'another process is writing it: wait for that process to end and run the command again',
  damaged: 'the store is damaged: rerun its jobs into a fresh --out folder (or restore the store from a copy)',
};

/**
 * An error of the run store's environment (disk full, I/O error, read-only, locked, damaged): never
 * a job's failure. An InputError, so the CLI prints it as one line and exits 2.
 */
export class StoreError extends InputError {
  constructor(readonly trouble: StoreTrouble, message: string) {
    super('io', message);
  }
}

/** The trouble behind an SQLite result code or a file-system errno, or undefined for anything else (a bug). */
function troubleOf(e: unknown): { trouble: StoreTrouble; what: string } | undefined {
  if (e instanceof SyntaxError) return { trouble: 'damaged', what: `a stored record is not valid JSON (${e.message})` };
  const code = (e as { code?: unknown } | null)?.code;
  if (typeof code !== 'string') return undefined;
  const why = (trouble: StoreTrouble, what: string, detail = '') => ({ trouble, what: `${what} (${code}${detail})` });
  if (code === 'SQLITE_FULL' || code === 'ENOSPC' || code === 'EDQUOT') return why('full', 'the disk is full');
  if (code === 'EFBIG') return why('full', 'a file-size limit was reached');
  if (code.startsWith('SQLITE_IOERR') || code === 'EIO') return why('io', 'a disk I/O error occurred', ': a full disk, a file-size limit or a failing disk');
  if (code.startsWith('SQLITE_READONLY') || code === 'EROFS' || code === 'EACCES' || code === 'EPERM' || code.startsWith('SQLITE_CANTOPEN') || code === 'SQLITE_PERM') return why('read-only', 'it is read-only here');
  if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) return why('busy', 'another process holds it locked');
  if (code.startsWith('SQLITE_CORRUPT') || code === 'SQLITE_NOTADB') return why('damaged', 'the file is damaged');
  return undefined;
}

/** Runs `f`, turning an error of the environment into a StoreError naming the store and what was being done. */
function guarded<T>(path: string, doing: string, f: () => T): T {
  try {
    return f();
  } catch (e) {
    const t = e instanceof StoreError ? undefined : troubleOf(e);
    if (!t) throw e;
    throw new StoreError(t.trouble, `run store "${path}": ${t.what} while ${doing}; ${ADVICE[t.trouble]}`);
  }
}

function refuse(path: string, why: string): never {
  throw new InputError('io', `run store "${path}": ${why}; it was left untouched: use another --out folder or move that file away`);
}

let expectedColumns: Map<string, string[]> | undefined;

/** Table -> column names of the current format, read off SCHEMA itself. */
function schemaColumns(): Map<string, string[]> {
  if (expectedColumns) return expectedColumns;
  const db = new Database(':memory:');
  try {
    db.exec(SCHEMA);
    const tables = db.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").pluck().all() as string[];
    expectedColumns = new Map(tables.map((t) => [t, (db.prepare(`PRAGMA table_info(${t})`).all() as { name: string }[]).map((c) => c.name)]));
    return expectedColumns;
  } finally {
    db.close();
  }
}

const hasWal = (path: string): boolean => existsSync(`${path}-wal`) && statSync(`${path}-wal`).size > 0;

/**
 * Opens an existing store for reading only. In a folder that cannot be written, SQLite cannot make
 * the -shm file a write-ahead-log database needs: with no log left to replay (no -wal file, so
 * nothing can be writing it) the file is opened immutable (SQLite URI parameter immutable=1).
 */
function openReader(path: string): Database.Database {
  const probe = (db: Database.Database): Database.Database => {
    try {
      db.prepare('SELECT count(*) FROM sqlite_master').get();
      return db;
    } catch (e) {
      db.close();
      throw e;
    }
  };
  try {
    return probe(new Database(path, { readonly: true, fileMustExist: true }));
  } catch (e) {
    const code = String((e as { code?: unknown }).code ?? '');
    if (!(code.startsWith('SQLITE_READONLY') || code.startsWith('SQLITE_CANTOPEN'))) throw e;
    if (hasWal(path)) {
      throw new StoreError('read-only', `run store "${path}": was not closed cleanly and its log "${path}-wal" must be replayed, which needs write access to its folder (${code}); copy the run folder somewhere writable and open it there`);
    }
    const uri = `file:${path.split('/').map(encodeURIComponent).join('/')}?immutable=1`;
    try {
      return probe(new Database(uri, { readonly: true, fileMustExist: true }));
    } catch {
      throw e;
    }
  }
}

/**
 * Opens an existing file as a store for reading after checking it without writing: SQLite header,
 * our meta table and format, then every table and column of the format (a forged or truncated
 * file is refused, exit 2).
 */
function inspect(path: string): Database.Database {
  if (statSync(path).size === 0) refuse(path, 'is an empty file, not a wellsmith run store');
  const fd = openSync(path, 'r');
  const head = Buffer.alloc(16);
  try { readSync(fd, head, 0, 16, 0); } finally { closeSync(fd); }
  if (head.toString('latin1') !== SQLITE_MAGIC) refuse(path, 'is not an SQLite database (corrupted, or a foreign file)');
  let db: Database.Database | undefined;
  try {
    db = openReader(path);
    const hasMeta = db.prepare("SELECT count(*) FROM sqlite_master WHERE type = 'table' AND name = 'meta'").pluck().get() === 1;
    const app = hasMeta ? db.prepare("SELECT value FROM meta WHERE key = 'application'").pluck().get() : undefined;
    if (app !== APPLICATION) refuse(path, 'is an SQLite database but not a wellsmith run store');
    const format = Number(db.prepare("SELECT value FROM meta WHERE key = 'format'").pluck().get());
    if (!(format <= STORE_FORMAT)) refuse(path, `has store format ${format}, newer than this wellsmith understands (${STORE_FORMAT}); upgrade wellsmith to read it`);
    for (const [table, columns] of schemaColumns()) {
      const have = new Set((db.prepare(`PRAGMA table_info(${table})`).all() as { name: string }[]).map((c) => c.name));
      const missing = columns.filter((c) => !have.has(c));
      if (missing.length > 0) refuse(path, `claims to be a wellsmith run store but its table "${table}" lacks ${have.size === 0 ? 'entirely' : `the columns ${missing.join(', ')}`} (a damaged or forged file)`);
    }
    return db;
  } catch (e) {
    db?.close();
    if (e instanceof InputError) throw e;
    const t = troubleOf(e);
    if (t && t.trouble !== 'damaged') throw new StoreError(t.trouble, `run store "${path}": ${t.what} while opening it; ${ADVICE[t.trouble]}`);
    refuse(path, `cannot be read as a wellsmith run store (${(e as Error).message})`);
  }
}

/** True when this process may write the store's folder and (if it exists) the store file. */
function writable(path: string): boolean {
  try {
    accessSync(dirname(path), constants.W_OK);
    if (existsSync(path)) accessSync(path, constants.W_OK);
    return true;
  } catch {
    return false;
  }
}

/** fsync of a folder, so a rename in it survives a power cut (where the platform allows it). */
function syncFolder(dir: string): void {
  try {
    const fd = openSync(dir, 'r');
    try { fsyncSync(fd); } finally { closeSync(fd); }
  } catch {
    // Some platforms and file systems cannot sync a folder; the rename is still atomic.
  }
}

/** Temporary files of a store being created (`campaign.sqlite.PID.new` and its journal). */
const tempOf = (path: string, pid: number): string => `${path}.${pid}.new`;
const isTempOf = (path: string, name: string): boolean =>
  name.startsWith(`${basename(path)}.`) && /^\.\d+\.new(-journal|-wal|-shm)?$/.test(name.slice(basename(path).length));

/**
 * Creates a complete store at `path` or nothing: schema and meta are written to a temporary file
 * in the same folder, which is renamed into place only once committed (rename is atomic). A kill
 * before the rename leaves only the temporary file, which the next opener (holding the lock) removes.
 */
function createStore(path: string): void {
  const tmp = tempOf(path, process.pid);
  const clean = (): void => {
    for (const f of [tmp, `${tmp}-journal`, `${tmp}-wal`, `${tmp}-shm`]) rmSync(f, { force: true });
  };
  clean();
  try {
    // In WAL mode from the start: switching a finished file over would itself be a write that a
    // kill could interrupt (a hot rollback journal that read-only openers cannot replay).
    const db = new Database(tmp);
    try {
      db.pragma('journal_mode = WAL');
      db.transaction(() => {
        db.exec(SCHEMA);
        const put = db.prepare('INSERT INTO meta (key, value) VALUES (?, ?)');
        put.run('application', APPLICATION);
        put.run('format', String(STORE_FORMAT));
        put.run('created_at', now());
        put.run('tool_version', toolVersion());
      })();
    } finally {
      // Closing the only connection checkpoints the log into the file and removes -wal and -shm.
      db.close();
    }
    renameSync(tmp, path);
    syncFolder(dirname(path));
  } catch (e) {
    clean();
    throw e;
  }
}

export class RunStore {
  private constructor(
    readonly path: string,
    private readonly db: Database.Database,
    /** Held while open for writing; none for a store opened without write access, whose writes then fail as read-only. */
    private readonly lock: FolderLock | undefined,
  ) {}

  private readonly statements = new Map<string, Database.Statement>();

  /**
   * Opens (or creates) the run store of a folder (or an .sqlite path). For writing, the folder is
   * locked for this process (a second writer is refused, exit 2) and a missing store is created
   * whole; a store whose folder or file cannot be written is opened for reading, so that whatever
   * needs no writing still works. `create: false` requires the store to exist; `readonly` opens an
   * existing one without ever writing to it or its folder (reports, merge sources).
   */
  static open(target: string, { create = true, readonly = false } = {}): RunStore {
    const path = resolve(target.endsWith('.sqlite') ? target : join(target, STORE_FILE));
    if (!existsSync(path) && (!create || readonly)) throw new InputError('io', `no run store at "${path}"; give the --out folder of a campaign run`);
    if (readonly) return new RunStore(path, inspect(path), undefined);
    try {
      mkdirSync(dirname(path), { recursive: true });
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      throw new InputError('io', `cannot create the run folder "${dirname(path)}"${code ? ` (${code})` : ''}; give --out a folder you can write`);
    }
    if (!writable(path)) {
      if (!existsSync(path)) throw new StoreError('read-only', `run store "${path}": cannot be created, the folder is read-only; give --out a folder you can write`);
      return new RunStore(path, inspect(path), undefined);
    }
    const lock = guarded(path, 'locking its folder', () => FolderLock.acquire(`${path}.lock`, `run folder "${dirname(path)}"`));
    try {
      return guarded(path, 'opening it for writing', () => {
        for (const f of readdirSync(dirname(path))) if (isTempOf(path, f)) rmSync(join(dirname(path), f), { force: true });
        if (existsSync(path)) inspect(path).close();
        else createStore(path);
        const db = new Database(path, { fileMustExist: true });
        try {
          db.pragma('journal_mode = WAL');
          db.pragma('synchronous = NORMAL');
          db.pragma('foreign_keys = ON');
          // An older store takes current records from now on; older tools must then refuse it.
          if (Number(db.prepare("SELECT value FROM meta WHERE key = 'format'").pluck().get()) < STORE_FORMAT) {
            db.prepare("UPDATE meta SET value = ? WHERE key = 'format'").run(String(STORE_FORMAT));
          }
        } catch (e) {
          db.close();
          throw e;
        }
        return new RunStore(path, db, lock);
      });
    } catch (e) {
      lock.release();
      throw e;
    }
  }

  /** The statement of `text`, prepared once per open store: preparing costs as much as a small write. */
  private sql(text: string): Database.Statement {
    let statement = this.statements.get(text);
    if (statement === undefined) this.statements.set(text, (statement = this.db.prepare(text)));
    return statement;
  }

  /** Runs one store operation, naming it in any error of the environment. */
  private guard<T>(doing: string, f: () => T): T {
    return guarded(this.path, doing, f);
  }

  /** Closes the store and gives its folder back. */
  close(): void {
    try {
      this.db.close();
    } finally {
      this.lock?.release();
    }
  }

  meta(key: string): string | undefined {
    return this.guard('reading its meta table', () => this.sql('SELECT value FROM meta WHERE key = ?').pluck().get(key) as string | undefined);
  }

  /** Ties the store to one campaign (its hash); a store of another campaign is refused. */
  bindCampaign(hash: string, title: string): void {
    const have = this.meta('campaign_hash');
    if (have !== undefined && have !== hash) {
      throw new InputError('bad-value', `run store "${this.path}" belongs to another campaign (hash ${have}, this file gives ${hash}); the campaign file changed since the run started: use a new --out folder`);
    }
    if (have === undefined) {
      this.guard('recording its campaign', () => this.db.transaction(() => {
        this.sql('INSERT INTO meta (key, value) VALUES (?, ?)').run('campaign_hash', hash);
        this.sql('INSERT INTO meta (key, value) VALUES (?, ?)').run('campaign_title', title);
      })());
    }
  }

  /** Re-queues jobs left `running` by a crashed or killed run; returns how many. Writes only when there are some. */
  requeueStale(): number {
    return this.guard('re-queueing jobs left running', () => {
      if (this.sql("SELECT count(*) FROM jobs WHERE state = 'running'").pluck().get() === 0) return 0;
      return this.sql("UPDATE jobs SET state = 'queued', started_at = NULL WHERE state = 'running'").run().changes;
    });
  }

  /** running -> queued for one job: a run stopped by its environment gives the job back untouched. */
  requeue(name: string): void {
    this.guard(`re-queueing job "${name}"`, () => this.sql("UPDATE jobs SET state = 'queued', started_at = NULL WHERE name = ? AND state = 'running'").run(name));
  }

  /** failed -> queued for the named jobs (their stored starts are kept); returns how many. */
  retryFailed(names: readonly string[]): number {
    return this.guard('re-queueing failed jobs', () => {
      const failed = new Set(this.sql("SELECT name FROM jobs WHERE state = 'failed'").pluck().all() as string[]);
      const retry = names.filter((n) => failed.has(n));
      if (retry.length === 0) return 0;
      const put = this.sql("UPDATE jobs SET state = 'queued', status = NULL, message = NULL, started_at = NULL, finished_at = NULL WHERE name = ? AND state = 'failed'");
      this.db.transaction(() => { for (const n of retry) put.run(n); })();
      return retry.length;
    });
  }

  job(name: string): JobRecord | undefined {
    return this.guard('reading a job', () => this.sql('SELECT * FROM jobs WHERE name = ?').get(name) as JobRecord | undefined);
  }

  jobs(): JobRecord[] {
    return this.guard('reading its jobs', () => this.sql('SELECT * FROM jobs ORDER BY idx').all() as JobRecord[]);
  }

  /**
   * Adds the jobs missing from the store as queued, in one transaction; a job stored with
   * another hash is refused. Writes only when some job is missing.
   */
  enqueue(jobs: readonly { name: string; index: number; kind: string; hash: string; spec: unknown; options: unknown; seed: number }[]): void {
    this.guard('queueing the jobs', () => {
      const get = this.sql('SELECT hash FROM jobs WHERE name = ?').pluck();
      const missing = jobs.filter((job) => {
        const have = get.get(job.name) as string | undefined;
        if (have !== undefined && have !== job.hash) throw new InputError('bad-value', `run store "${this.path}": job "${job.name}" was stored with spec hash ${have}, the campaign now gives ${job.hash}; use a new --out folder`);
        return have === undefined;
      });
      if (missing.length === 0) return;
      const put = this.sql(`INSERT INTO jobs (name, idx, kind, hash, state, spec_json, options_json, seed, tool_version, queued_at)
        VALUES (?, ?, ?, ?, 'queued', ?, ?, ?, ?, ?)`);
      this.db.transaction(() => {
        for (const job of missing) put.run(job.name, job.index, job.kind, job.hash, JSON.stringify(job.spec), JSON.stringify(job.options), job.seed, toolVersion(), now());
      })();
    });
  }

  /** queued -> running (counts the attempt). */
  markRunning(name: string): void {
    const r = this.guard(`starting job "${name}"`, () => this.sql("UPDATE jobs SET state = 'running', started_at = ?, attempts = attempts + 1 WHERE name = ? AND state = 'queued'").run(now(), name));
    if (r.changes !== 1) throw new Error(`run store: job "${name}" is not queued`);
  }

  /** Start outcomes stored so far for a job, by start index. */
  outcomes(job: string): StartOutcome[] {
    return this.guard(`reading the starts of job "${job}"`, () =>
      (this.sql('SELECT outcome_json FROM starts WHERE job = ? ORDER BY start').pluck().all(job) as string[]).map((s) => JSON.parse(s, reviveNonFinite) as StartOutcome));
  }

  /** The checkpoint: one finished start, written once (a repeat of the same start is ignored). */
  saveOutcome(job: string, outcome: StartOutcome, seconds: number): void {
    this.guard(`storing start ${outcome.index} of job "${job}"`, () => this.sql('INSERT OR IGNORE INTO starts (job, start, loss, snapped_loss, evaluations, outcome_json, seconds, finished_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)')
      .run(job, outcome.index, finiteOrNull(outcome.loss), finiteOrNull(outcome.snapped.loss), outcome.evaluations, JSON.stringify(outcome, keepNonFinite), seconds, now()));
  }

  /** running -> done with the ranked designs, in one transaction. */
  finishJob(name: string, result: DesignResult): void {
    this.guard(`storing the designs of job "${name}"`, () => this.db.transaction(() => {
      const r = this.sql("UPDATE jobs SET state = 'done', finished_at = ?, status = ?, message = ?, parameter_set = ?, evaluations = ?, failures = ? WHERE name = ? AND state = 'running'")
        .run(now(), result.status, result.message, result.designs[0]?.result.parameterSet ?? null, result.evaluations, result.failures, name);
      if (r.changes !== 1) throw new Error(`run store: job "${name}" is not running`);
      const put = this.sql('INSERT INTO designs (job, rank, loss, satisfied, start, values_json, result_json) VALUES (?, ?, ?, ?, ?, ?, ?)');
      for (const d of result.designs) put.run(name, d.rank, d.loss, d.satisfied ? 1 : 0, d.start, JSON.stringify(d.values), packResult(d.result));
    })());
  }

  /** running -> failed with a one-line reason. */
  failJob(name: string, message: string): void {
    this.guard(`recording the failure of job "${name}"`, () => this.sql("UPDATE jobs SET state = 'failed', finished_at = ?, status = 'failed', message = ? WHERE name = ? AND state = 'running'").run(now(), message, name));
  }

  designs(job?: string): DesignRecord[] {
    return this.guard('reading its designs', () => (job === undefined
      ? this.sql('SELECT d.* FROM designs d JOIN jobs j ON j.name = d.job ORDER BY j.idx, d.rank').all()
      : this.sql('SELECT * FROM designs WHERE job = ? ORDER BY rank').all(job)) as DesignRecord[]);
  }

  /**
   * Checks the whole store before its records are copied elsewhere: SQLite's integrity check
   * (b-trees, pages, indexes), then that every stored record reads back: each JSON text parses, each
   * compressed result inflates, each packed result passes its check. A damaged store is refused with
   * a StoreError naming it (exit 2).
   */
  verify(): void {
    const damaged = (why: string): never => {
      throw new StoreError('damaged', `run store "${this.path}" is damaged: ${why}; ${ADVICE.damaged}`);
    };
    this.guard('checking its integrity', () => {
      const problems = this.sql('PRAGMA integrity_check(5)').pluck().all() as string[];
      if (problems.length !== 1 || problems[0] !== 'ok') damaged(`SQLite integrity check: ${problems.join('; ')}`);
      const columns: readonly [string, readonly string[], string][] = [
        ['jobs', ['spec_json', 'options_json'], 'name'], ['starts', ['outcome_json'], "job || ' start ' || start"], ['designs', ['values_json', 'result_json'], "job || ' rank ' || rank"]];
      for (const [table, fields, key] of columns) {
        for (const row of this.sql(`SELECT ${key} AS key, ${fields.join(', ')} FROM ${table}`).iterate() as IterableIterator<Record<string, unknown>>) {
          for (const f of fields) {
            try {
              const v = row[f];
              if (f === 'result_json') storedResult({ result_json: v as string | Buffer });
              else JSON.parse(String(v));
            } catch {
              damaged(`${table}.${f} of ${String(row['key'])} is not valid JSON${Buffer.isBuffer(row[f]) ? ' (its compressed form is damaged)' : ''}`);
            }
          }
        }
      }
    });
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
    this.guard(`merging "${other.path}" into it`, () => this.db.transaction(() => {
      for (const j of other.jobs()) {
        const mine = this.job(j.name);
        if (mine && mine.hash !== j.hash) throw new InputError('bad-value', `merge: job "${j.name}" has spec hash ${mine.hash} in "${this.path}" but ${j.hash} in "${other.path}"; these are runs of different campaigns`);
        const full = other.sql('SELECT * FROM jobs WHERE name = ?').get(j.name) as Record<string, unknown>;
        const state = full['state'] === 'running' ? 'queued' : full['state'];
        const finished = state === 'done' || state === 'failed';
        if (!mine || (finished && (mine.state === 'queued' || mine.state === 'running'))) {
          const cols = Object.keys(full);
          this.sql(`INSERT OR REPLACE INTO jobs (${cols.join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`)
            .run(...cols.map((c) => (c === 'state' ? state : full[c])));
          if (state === 'done') {
            const put = this.sql('INSERT INTO designs (job, rank, loss, satisfied, start, values_json, result_json) VALUES (?, ?, ?, ?, ?, ?, ?)');
            for (const d of other.designs(j.name)) put.run(d.job, d.rank, d.loss, d.satisfied, d.start, d.values_json, d.result_json);
          }
          jobs++;
        }
        const rows = other.sql('SELECT * FROM starts WHERE job = ?').all(j.name) as Record<string, unknown>[];
        for (const s of rows) {
          const cols = Object.keys(s);
          starts += this.sql(`INSERT OR IGNORE INTO starts (${cols.join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`).run(...cols.map((c) => s[c])).changes;
        }
      }
    })());
    return { jobs, starts };
  }

  /**
   * The store's results without timings or attempt counts: equal for an interrupted-and-resumed,
   * a sharded-and-merged and an uninterrupted run of the same campaign.
   */
  snapshot(): { jobs: unknown[]; starts: unknown[]; designs: unknown[] } {
    return this.guard('reading its records', () => ({
      jobs: this.sql('SELECT name, idx, kind, hash, state, seed, status, message, parameter_set, evaluations, failures FROM jobs ORDER BY idx').all(),
      starts: this.sql('SELECT job, start, outcome_json FROM starts ORDER BY job, start').all(),
      designs: this.sql('SELECT job, rank, loss, satisfied, start, values_json, result_json FROM designs ORDER BY job, rank').all(),
    }));
  }
}

/** The sampled arrays a stored result leaves out: a stack's wavefunctions, a wire's |ψ|² maps (recomputed for reports). */
const SAMPLED = new Set(['wavefunctions', 'maps']);

/**
 * Format 3's first byte. A format-2 record is a zlib stream, whose first byte has 8 (deflate) in its
 * low four bits (RFC 1950, section 2.2), so the two are never confused.
 */
const PACKED = 3;
/** The skeleton is mostly repeated keys: brotli at quality 1 takes a 34 kB one to 1.9 kB in 77 µs, zlib at level 1 to 2.2 kB in 109 µs (measured, pump-976). */
const SKELETON_BROTLI = { params: { [zlib.BROTLI_PARAM_QUALITY]: 1 } };

/** Bytes before a packed record's skeleton: the format byte, the check, the skeleton's length. */
const HEAD = 9;

/** The check of a packed record: the first 4 bytes of the SHA-256 of all that follows it (neither brotli nor the raw numbers carry one of their own). */
const checkOf = (record: Buffer): Buffer => createHash('sha256').update(record.subarray(5)).digest().subarray(0, 4);

/**
 * A design's solve result as stored (format 3), without its sampled arrays: the byte 3; its check
 * (4 bytes, checkOf); the length n of the skeleton (uint32, little-endian); the skeleton, i.e. the
 * result's JSON text with every number written 0, brotli-compressed (n bytes); then the numbers as
 * float64 (little-endian) in the skeleton's order. Numbers are kept bit for bit, Infinity, NaN and −0
 * included.
 */
function packResult(result: object): Buffer {
  const numbers: number[] = [];
  const kept = Object.fromEntries(Object.entries(result).filter(([k]) => !SAMPLED.has(k)));
  const skeleton = brotliCompressSync(Buffer.from(JSON.stringify(liftNumbers(kept, numbers)), 'utf8'), SKELETON_BROTLI);
  const out = Buffer.allocUnsafe(HEAD + skeleton.length + 8 * numbers.length);
  out[0] = PACKED;
  out.writeUInt32LE(skeleton.length, 5);
  skeleton.copy(out, HEAD);
  let at = HEAD + skeleton.length;
  for (const x of numbers) at = out.writeDoubleLE(x, at);
  checkOf(out).copy(out, 1);
  return out;
}

/** A copy of plain data with every number replaced by 0 and appended to `numbers`, in JSON's order of keys. */
function liftNumbers(v: unknown, numbers: number[]): unknown {
  if (typeof v === 'number') {
    numbers.push(v);
    return 0;
  }
  if (typeof v !== 'object' || v === null) return v;
  if (Array.isArray(v)) {
    const a = new Array<unknown>(v.length);
    for (let i = 0; i < v.length; i++) a[i] = liftNumbers(v[i], numbers);
    return a;
  }
  const o: Record<string, unknown> = {};
  for (const k of Object.keys(v)) {
    const x = (v as Record<string, unknown>)[k];
    if (x === undefined) continue;
    // A key "__proto__" (a user's variable may be so named) must stay a key: writing o[k] would replace the prototype instead.
    if (k === '__proto__') Object.defineProperty(o, k, { value: liftNumbers(x, numbers), enumerable: true, writable: true, configurable: true });
    else o[k] = liftNumbers(x, numbers);
  }
  return o;
}

/** Puts the stored numbers back into a parsed skeleton, in place, in the order liftNumbers took them; returns the offset after the last. */
function fillNumbers(o: Record<string | number, unknown>, record: Buffer, at: number): number {
  for (const k of Array.isArray(o) ? o.keys() : Object.keys(o)) {
    const x = o[k];
    if (typeof x === 'number') {
      if (at + 8 > record.length) throw new SyntaxError('a packed result has fewer numbers than its skeleton');
      o[k] = record.readDoubleLE(at); // JSON.parse made every key an own property, "__proto__" too
      at += 8;
    } else if (typeof x === 'object' && x !== null) {
      at = fillNumbers(x as Record<string | number, unknown>, record, at);
    }
  }
  return at;
}

/**
 * A stored design's solve result as plain data, from any format: 3 (packed, without wavefunctions
 * or maps), 2 (zlib-compressed JSON without them) or 1 (JSON text with them). Throws a SyntaxError
 * or a zlib error for a damaged record.
 */
export function storedResult(d: Pick<DesignRecord, 'result_json'>): Record<string, unknown> {
  const r = d.result_json;
  if (!Buffer.isBuffer(r)) return JSON.parse(r, reviveNonFinite) as Record<string, unknown>;
  if (r[0] !== PACKED) return JSON.parse(inflateSync(r).toString('utf8'), reviveNonFinite) as Record<string, unknown>;
  if (r.length < HEAD || !checkOf(r).equals(r.subarray(1, 5))) throw new SyntaxError('a packed result fails its check');
  const n = r.readUInt32LE(5);
  if (HEAD + n > r.length) throw new SyntaxError('a packed result is cut short');
  const result = JSON.parse(brotliDecompressSync(r.subarray(HEAD, HEAD + n)).toString('utf8')) as Record<string, unknown>;
  const end = fillNumbers(result, r, HEAD + n);
  if (end !== r.length) throw new SyntaxError('a packed result has more numbers than its skeleton');
  return result;
}

/** JSON has no Infinity or NaN: an unevaluable start's loss is kept as the string "Infinity" and read back as the number. */
const NON_FINITE = new Set(['Infinity', '-Infinity', 'NaN']);
const keepNonFinite = (_key: string, v: unknown): unknown => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v);
const reviveNonFinite = (_key: string, v: unknown): unknown => (typeof v === 'string' && NON_FINITE.has(v) ? Number(v) : v);

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);
