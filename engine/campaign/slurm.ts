/**
 * Slurm scripts for a campaign spread over a cluster: a job array with one shard per array task
 * (each writes its own store), a merge job that runs once the whole array succeeded
 * (`--dependency=afterok`), and a submit script that chains the two with `sbatch --parsable`.
 * Every path and word comes from the user's files and folders, so none may hold a control
 * character (a newline would end a line of the script and run the rest as a command), and each is
 * quoted.
 */
import { InputError } from '../errors.js';

export interface SlurmPlan {
  /** Absolute path of the campaign file. */
  readonly campaign: string;
  /** Absolute run folder: shards go to OUT/shard-I, the merged store to OUT itself. */
  readonly out: string;
  readonly shards: number;
  /** Folder the jobs run in (where the command's relative paths resolve). */
  readonly workdir: string;
  /** How to run wellsmith on the nodes, as argv words (e.g. [node, dist/bin/wellsmith.js]). */
  readonly command: readonly string[];
  /** CPUs per array task: the shard's --workers. */
  readonly cpusPerTask: number;
  readonly jobName: string;
}

export interface SlurmScripts {
  readonly array: string;
  readonly merge: string;
  readonly submit: string;
}

/**
 * POSIX shell single-quoting. sbatch reads `#SBATCH` lines itself, not through a shell, but its
 * reader takes the same form: quotes group a word, a backslash escapes the next character (sbatch
 * source, src/sbatch/opt.c, _get_argument; seen).
 */
export const shellQuote = (s: string): string => (/^[\w@%+=:,./-]+$/.test(s) ? s : `'${s.replace(/'/g, `'\\''`)}'`);

/**
 * A folder in an sbatch filename pattern (sbatch(1), "filename pattern"): "%" must be written
 * "%%", and a backslash anywhere turns every replacement off, which would give all array tasks one
 * log file, so it is refused.
 */
function logFolder(out: string): string {
  if (out.includes('\\')) throw new InputError('bad-value', `--out: a Slurm log path cannot hold a backslash, got ${JSON.stringify(out)}; choose a run folder without one`);
  return out.replace(/%/g, '%%');
}

/** Refuses a control character (newline, carriage return, tab, NUL, escape…) in anything written into a script. */
function checkWord(where: string, s: string): void {
  const m = /[\u0000-\u001f\u007f]/.exec(s);
  if (m) {
    throw new InputError('bad-value', `${where}: contains the control character ${JSON.stringify(m[0])} (code ${m[0].charCodeAt(0)}), which cannot be written safely into a job script, got ${JSON.stringify(s)}; rename it without control characters`);
  }
}

export function slurmScripts(p: SlurmPlan): SlurmScripts {
  checkWord('campaign file', p.campaign);
  checkWord('--out', p.out);
  checkWord('working folder', p.workdir);
  checkWord('job name', p.jobName);
  for (const w of p.command) checkWord('wellsmith command', w);
  const q = shellQuote;
  const prologue = (name: string, log: string, extra: string[]): string => [
    '#!/bin/bash',
    `#SBATCH --job-name=${q(name)}`,
    `#SBATCH --output=${q(`${logFolder(p.out)}/slurm/${log}`)}`,
    ...extra,
    'set -euo pipefail',
    `cd ${q(p.workdir)}`,
    `wellsmith() { ${p.command.map(q).join(' ')} "$@"; }`,
    '',
  ].join('\n');
  const array = `${prologue(p.jobName, 'shard-%a.log', [`#SBATCH --array=1-${p.shards}`, `#SBATCH --cpus-per-task=${p.cpusPerTask}`])}`
    + '# One shard per array task; rerunning a task resumes its store.\n'
    + `wellsmith campaign ${q(p.campaign)} --out ${q(p.out)}/shard-"$SLURM_ARRAY_TASK_ID" --shard "$SLURM_ARRAY_TASK_ID"/${p.shards} --workers "\${SLURM_CPUS_PER_TASK:-1}"\n`;
  const shardDirs = Array.from({ length: p.shards }, (_, i) => `${q(p.out)}/shard-${i + 1}`).join(' ');
  const merge = `${prologue(`${p.jobName}-merge`, 'merge.log', ['#SBATCH --cpus-per-task=1'])}`
    + `wellsmith merge ${q(p.out)} ${shardDirs}\n`
    + `wellsmith campaign ${q(p.campaign)} --out ${q(p.out)} --workers 1 --export csv\n`;
  const submit = [
    '#!/bin/bash',
    '# Submits the shard array, then the merge as a job that starts only if every shard succeeded.',
    'set -euo pipefail',
    `ARRAY_ID=$(sbatch --parsable ${q(`${p.out}/slurm/array.sbatch`)})`,
    'ARRAY_ID=${ARRAY_ID%%;*}',
    `MERGE_ID=$(sbatch --parsable --dependency=afterok:$ARRAY_ID ${q(`${p.out}/slurm/merge.sbatch`)})`,
    'MERGE_ID=${MERGE_ID%%;*}',
    'echo "array job $ARRAY_ID, merge job $MERGE_ID"',
    '',
  ].join('\n');
  return { array, merge, submit };
}
