/**
 * Slurm scripts for a campaign spread over a cluster: a job array with one shard per array task
 * (each writes its own store), a merge job that runs once the whole array succeeded
 * (`--dependency=afterok`), and a submit script that chains the two with `sbatch --parsable`.
 */

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

/** POSIX shell single-quoting. */
export const shellQuote = (s: string): string => (/^[\w@%+=:,./-]+$/.test(s) ? s : `'${s.replace(/'/g, `'\\''`)}'`);

export function slurmScripts(p: SlurmPlan): SlurmScripts {
  const q = shellQuote;
  const prologue = (name: string, log: string, extra: string[]): string => [
    '#!/bin/bash',
    `#SBATCH --job-name=${q(name)}`,
    `#SBATCH --output=${q(`${p.out}/slurm/${log}`)}`,
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
