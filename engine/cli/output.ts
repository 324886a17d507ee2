/** Writing result files so that a failure never leaves a partial or corrupted file behind. */
import { accessSync, constants, mkdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, parse, resolve, sep } from 'node:path';
import { InputError } from '../errors.js';

/** Why a folder cannot be made or written, from the errno of the failing call. */
function folderProblem(code: string | undefined, at: string): string {
  switch (code) {
    case 'EACCES': case 'EPERM': return `no permission to create or write "${at}"`;
    case 'EROFS': return `"${at}" is on a read-only file system`;
    case 'ENOSPC': return `the disk holding "${at}" is full`;
    case 'ENOTDIR': case 'EEXIST': return `"${at}" is a file, not a folder`;
    default: return `"${at}" cannot be created here (${code ?? 'unknown error'}; a special file system such as /proc or /sys holds no folders of ours)`;
  }
}

/**
 * Makes sure `folder` exists and (unless options.writable is false) is writable, creating missing folders one level at a time
 * (Node's recursive mkdir loops for ever under /proc), before any work starts. Throws InputError
 * 'io' naming the field, the component at fault and why: a file in the way, no permission, a
 * read-only or special file system.
 */
export function ensureFolder(folder: string, label: string, options: { readonly writable?: boolean } = {}): void {
  // The label names an option or a file, not a spec field: no field is attached, so no spec line is looked up.
  const fail = (why: string): never => { throw new InputError('io', `${label}: ${why}; choose another path`); };
  const full = resolve(folder);
  const parts = full.split(sep).filter((p) => p !== '');
  let at = parse(full).root;
  for (const part of parts) {
    at = join(at, part);
    let exists = true;
    try {
      if (!statSync(at).isDirectory()) fail(folderProblem('ENOTDIR', at));
    } catch (e) {
      if (e instanceof InputError) throw e;
      const code = (e as NodeJS.ErrnoException).code;
      if (code !== 'ENOENT') fail(folderProblem(code, at));
      exists = false;
    }
    if (exists) continue;
    try {
      mkdirSync(at);
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === 'EEXIST' && statSync(at, { throwIfNoEntry: false })?.isDirectory()) continue;
      fail(folderProblem(code, at));
    }
  }
  if (options.writable === false) return;
  try {
    accessSync(full, constants.W_OK);
  } catch (e) {
    fail(folderProblem((e as NodeJS.ErrnoException).code, full));
  }
}

/** Checks, before the work, that an output file can be written: its folder (ensureFolder) and no folder in its place. */
export function checkOutputFile(path: string, label: string): void {
  ensureFolder(dirname(resolve(path)), label);
  if (statSync(path, { throwIfNoEntry: false })?.isDirectory()) throw new InputError('io', `${label}: "${path}" is a folder; give a file name`);
}

/** Writes `text` to `path` through a temporary file in the same folder and an atomic rename. */
export function writeFileAtomic(path: string, text: string): void {
  ensureFolder(dirname(resolve(path)), `cannot write "${path}"`);
  const tmp = join(dirname(path), `.${process.pid}.${Date.now()}.tmp`);
  try {
    writeFileSync(tmp, text);
    renameSync(tmp, path);
  } catch (e) {
    try {
      rmSync(tmp, { force: true });
    } catch {
      // The folder itself is unusable (a file in its place, no permission): nothing was written.
    }
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError('io', `cannot write "${path}": ${code === 'EISDIR' ? 'a folder has that name' : folderProblem(code, path)}`);
  }
}
