/**
 * The exclusive lock of a run folder: a lock file naming its owner (pid, host, boot and process
 * start), created whole or not at all (written to a private file, then hard-linked into place,
 * which fails if the lock exists). A lock whose owner is gone — a dead pid on this host, a pid
 * now held by another process, a host rebooted since — is stale and taken over; a live owner, or
 * one on another host that cannot be checked from here, keeps the folder.
 */
import { linkSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../errors.js';

interface Owner {
  readonly pid: number;
  readonly host: string;
  /** /proc/sys/kernel/random/boot_id where available: a different one means the host rebooted. */
  readonly boot: string | null;
  /** Start time of the owning process in clock ticks since boot (/proc/PID/stat field 22), against pid reuse. */
  readonly start: string | null;
  readonly since: string;
}

const readOr = (path: string): string | null => {
  try {
    return readFileSync(path, 'utf8');
  } catch {
    return null;
  }
};

const bootId = (): string | null => readOr('/proc/sys/kernel/random/boot_id')?.trim() || null;

/** Field 22 of /proc/PID/stat (proc(5)); the command name before it may hold spaces, so count from its closing parenthesis. */
function processStart(pid: number): string | null {
  const stat = readOr(`/proc/${pid}/stat`);
  if (stat === null) return null;
  return stat.slice(stat.lastIndexOf(')') + 2).split(' ')[19] ?? null;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    // EPERM: the process exists but belongs to another user.
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function parseOwner(text: string | null): Owner | null {
  try {
    const o = JSON.parse(text ?? '') as Partial<Owner>;
    return typeof o.pid === 'number' && typeof o.host === 'string' && typeof o.since === 'string'
      ? { pid: o.pid, host: o.host, boot: o.boot ?? null, start: o.start ?? null, since: o.since }
      : null;
  } catch {
    return null;
  }
}

/** True when the owner is certainly gone; an owner on another host cannot be checked and is never stale. */
function stale(owner: Owner | null): boolean {
  // Lock files are created whole, so one that does not parse was not written by a lock holder.
  if (owner === null) return true;
  if (owner.host !== hostname()) return false;
  const boot = bootId();
  if (owner.boot !== null && boot !== null && owner.boot !== boot) return true;
  if (!alive(owner.pid)) return true;
  const start = processStart(owner.pid);
  return owner.start !== null && start !== null && owner.start !== start;
}

/** Removes the private files (PATH.HOST.PID.new / .stale) that processes of this host killed while taking the lock left behind. */
function sweep(path: string): void {
  const prefix = `${basename(path)}.${hostname()}.`;
  for (const f of readdirSync(dirname(path))) {
    const m = f.startsWith(prefix) ? /^(\d+)\.(new|stale)$/.exec(f.slice(prefix.length)) : null;
    if (m && Number(m[1]) !== process.pid && !alive(Number(m[1]))) rmSync(join(dirname(path), f), { force: true });
  }
}

/** Hard-links `from` to `to`; where the file system has no hard links, creates `to` exclusively with `text`. */
function link(from: string, to: string, text: string): void {
  try {
    linkSync(from, to);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code !== 'EPERM' && code !== 'ENOTSUP' && code !== 'EOPNOTSUPP' && code !== 'ENOSYS') throw e;
    writeFileSync(to, text, { flag: 'wx' });
  }
}

export class FolderLock {
  private constructor(readonly path: string, private readonly text: string) {}

  /**
   * Takes the lock file `path` for this process. `what` names the folder in the refusal, which
   * says who holds it and exits 2. Errors of the file system (read-only, full) are thrown as they are.
   */
  static acquire(path: string, what: string): FolderLock {
    const text = JSON.stringify({ pid: process.pid, host: hostname(), boot: bootId(), start: processStart(process.pid), since: new Date().toISOString() } satisfies Owner);
    const mine = `${path}.${hostname()}.${process.pid}.new`;
    writeFileSync(mine, `${text}\n`);
    try {
      for (let attempt = 0; attempt < 5; attempt++) {
        try {
          link(mine, path, `${text}\n`);
          sweep(path);
          return new FolderLock(path, `${text}\n`);
        } catch (e) {
          if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
        }
        const seen = readOr(path);
        if (seen === null) continue;
        const owner = parseOwner(seen);
        if (!stale(owner)) {
          const who = owner!.host === hostname() ? `process ${owner!.pid}` : `process ${owner!.pid} on host ${owner!.host}`;
          throw new InputError('io', `${what} is in use by wellsmith ${who} since ${owner!.since} (lock file "${path}"); wait for that run to end, or delete the lock file if that process is gone`);
        }
        // Move the stale lock aside, then make sure it was the one judged stale: a process that took
        // the folder in between must keep its lock.
        const aside = `${path}.${hostname()}.${process.pid}.stale`;
        try {
          renameSync(path, aside);
        } catch (e) {
          if ((e as NodeJS.ErrnoException).code === 'ENOENT') continue;
          throw e;
        }
        if (readOr(aside) !== seen) {
          try { link(aside, path, readOr(aside) ?? ''); } catch { /* a third process holds it now: the next round meets it */ }
        }
        rmSync(aside, { force: true });
      }
      throw new InputError('io', `${what}: could not take its lock file "${path}" (other processes keep taking it); wait for them to end and try again`);
    } finally {
      rmSync(mine, { force: true });
    }
  }

  /** Removes the lock file if it is still this process's. */
  release(): void {
    if (readOr(this.path) === this.text) rmSync(this.path, { force: true });
  }
}
