/**
 * Slurm job-array scripts. Always: the generated scripts' text and `bash -n`. With a reachable
 * controller: `sbatch --test-only`. With the one-node cluster that .ci/run starts
 * (test/campaign/slurm/cluster.sh, WELLSMITH_SLURM_DIR): the real submit script runs the array and
 * the dependent merge, and the merged store equals a local uninterrupted run.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { MAIN, ROOT, referenceRun, snapshotOf, tempDir, tinyCampaign } from './helpers.js';

const CLUSTER = process.env['WELLSMITH_SLURM_DIR'];
const slurmConf = CLUSTER ? join(CLUSTER, 'slurm.conf') : (process.env['SLURM_CONF'] ?? (existsSync('/etc/slurm/slurm.conf') ? '/etc/slurm/slurm.conf' : undefined));
// `sbatch --version` itself needs a configuration, so look the command up instead.
const hasSbatch = spawnSync('sh', ['-c', 'command -v sbatch']).status === 0;
const env = { ...process.env, ...(slurmConf ? { SLURM_CONF: slurmConf } : {}) };

let file: string;
let out: string;
let scripts: { array: string; merge: string; submit: string };

beforeAll(() => {
  const dir = tempDir('slurm');
  file = tinyCampaign(dir);
  out = join(dir, 'run');
  const r = spawnSync(process.execPath, ['--import', 'tsx', MAIN, 'campaign', file, '--out', out, '--slurm', '3', '--workers', '1'], { cwd: ROOT, encoding: 'utf8' });
  expect(r.status, r.stderr).toBe(0);
  const read = (name: string): string => readFileSync(join(out, 'slurm', name), 'utf8');
  scripts = { array: read('array.sbatch'), merge: read('merge.sbatch'), submit: read('submit.sh') };
});

describe('slurm scripts', () => {
  it('array: one shard per task with the task\'s CPUs as workers; merge after every shard succeeded', () => {
    expect(scripts.array).toMatch(/^#SBATCH --array=1-3$/m);
    expect(scripts.array).toMatch(/^#SBATCH --cpus-per-task=1$/m);
    expect(scripts.array).toContain('--shard "$SLURM_ARRAY_TASK_ID"/3 --workers "${SLURM_CPUS_PER_TASK:-1}"');
    expect(scripts.array).toContain(`--out ${out}/shard-"$SLURM_ARRAY_TASK_ID"`);
    expect(scripts.merge).toContain(`merge ${out} ${out}/shard-1 ${out}/shard-2 ${out}/shard-3`);
    expect(scripts.submit).toContain('sbatch --parsable --dependency=afterok:$ARRAY_ID');
    for (const name of ['array.sbatch', 'merge.sbatch', 'submit.sh']) {
      const r = spawnSync('bash', ['-n', join(out, 'slurm', name)], { encoding: 'utf8' });
      expect(r.status, `bash -n ${name}: ${r.stderr}`).toBe(0);
    }
  });

  it.runIf(hasSbatch && slurmConf !== undefined)('sbatch --test-only accepts the array and the merge job', () => {
    for (const name of ['array.sbatch', 'merge.sbatch']) {
      const r = spawnSync('sbatch', ['--test-only', join(out, 'slurm', name)], { encoding: 'utf8', env });
      expect(r.status, `sbatch --test-only ${name} (SLURM_CONF=${slurmConf}): ${r.stderr}`).toBe(0);
      expect(r.stderr).toMatch(/to start at/);
    }
  });

  it.runIf(CLUSTER !== undefined)('runs on the one-node cluster: array, dependent merge, store equal to a local run', async () => {
    const reference = await referenceRun(file, join(out, '..', 'reference'));
    const submit = spawnSync(join(out, 'slurm', 'submit.sh'), { encoding: 'utf8', env });
    expect(submit.status, submit.stderr).toBe(0);
    const ids = /array job (\d+), merge job (\d+)/.exec(submit.stdout);
    expect(ids, submit.stdout).not.toBeNull();
    const deadline = Date.now() + 240_000;
    for (;;) {
      const q = spawnSync('squeue', ['-h', '-j', `${ids![1]},${ids![2]}`, '-o', '%i %T'], { encoding: 'utf8', env });
      if (q.status === 0 && q.stdout.trim() === '') break;
      if (Date.now() > deadline) throw new Error(`slurm jobs still queued after 240 s:\n${q.stdout}`);
      await new Promise((r) => setTimeout(r, 500));
    }
    const logs = ['merge.log', 'shard-1.log', 'shard-2.log', 'shard-3.log'].map((l) => join(out, 'slurm', l)).filter(existsSync).map((l) => `${l}:\n${readFileSync(l, 'utf8')}`).join('\n');
    expect(existsSync(join(out, 'designs.csv')), `the merge job did not finish; logs:\n${logs}`).toBe(true);
    expect(snapshotOf(out)).toEqual(reference);
  }, 300_000);
});
