/**
 * Slurm job-array scripts, written for a campaign file and a run folder with hostile names (quotes,
 * `$()`, backticks, `;`, `#`, `%a`, spaces). Always: the generated scripts' text, `bash -n`, and one
 * array task run through bash for real, which must reach wellsmith with the names unchanged and run
 * nothing else; a control character in any name is refused. With a reachable controller:
 * `sbatch --test-only`. With the one-node cluster that .ci/run starts
 * (test/campaign/slurm/cluster.sh, WELLSMITH_SLURM_DIR): the real submit script runs the array and
 * the dependent merge, sbatch writes each log where asked, and the merged store equals a local
 * uninterrupted run.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { shellQuote } from '../../engine/campaign/slurm.js';
import { runCampaignCommand } from '../../engine/cli/campaign.js';
import { MAIN, ROOT, referenceRun, snapshotOf, tempDir, tinyCampaign } from './helpers.js';

const CLUSTER = process.env['WELLSMITH_SLURM_DIR'];
const slurmConf = CLUSTER ? join(CLUSTER, 'slurm.conf') : (process.env['SLURM_CONF'] ?? (existsSync('/etc/slurm/slurm.conf') ? '/etc/slurm/slurm.conf' : undefined));
// `sbatch --version` itself needs a configuration, so look the command up instead.
const hasSbatch = spawnSync('sh', ['-c', 'command -v sbatch']).status === 0;
const env = { ...process.env, ...(slurmConf ? { SLURM_CONF: slurmConf } : {}) };

/** Names a shell or sbatch would misread if they were not quoted. */
const HOSTILE = `it's "a" $(touch PWNED) \`touch PWNED\`; touch PWNED #1 %a`;

let dir: string;
let file: string;
let out: string;
let scripts: { array: string; merge: string; submit: string };

/** Every file named PWNED under `root` (none may ever be created). */
const pwned = (root: string): string[] => readdirSync(root, { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('PWNED'));

beforeAll(() => {
  dir = tempDir('slurm');
  const nasty = join(dir, HOSTILE);
  mkdirSync(nasty);
  file = tinyCampaign(nasty, `tiny ${HOSTILE}.yaml`);
  out = join(nasty, 'run');
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
    expect(scripts.array).toContain(`campaign ${shellQuote(file)} --out ${shellQuote(out)}/shard-"$SLURM_ARRAY_TASK_ID"`);
    expect(scripts.merge).toContain(`merge ${shellQuote(out)} ${[1, 2, 3].map((i) => `${shellQuote(out)}/shard-${i}`).join(' ')}`);
    // sbatch fills in %a, so the literal "%a" of the folder name is written "%%a".
    expect(scripts.array).toContain(`#SBATCH --output=${shellQuote(`${out.replace(/%/g, '%%')}/slurm/shard-%a.log`)}\n`);
    expect(scripts.submit).toContain('sbatch --parsable --dependency=afterok:$ARRAY_ID');
    for (const name of ['array.sbatch', 'merge.sbatch', 'submit.sh']) {
      const r = spawnSync('bash', ['-n', join(out, 'slurm', name)], { encoding: 'utf8' });
      expect(r.status, `bash -n ${name}: ${r.stderr}`).toBe(0);
    }
  });

  it('one array task run through bash reaches wellsmith with the names unchanged and runs nothing else', () => {
    const r = spawnSync('bash', [join(out, 'slurm', 'array.sbatch')], { encoding: 'utf8', cwd: dir, env: { ...process.env, SLURM_ARRAY_TASK_ID: '2', SLURM_CPUS_PER_TASK: '1' } });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/shard 2\/3: 1 jobs, 0 already finished, 1 run now/);
    expect(existsSync(join(out, 'shard-2', 'campaign.sqlite')), `the shard store is not where --out said: ${readdirSync(dir, { recursive: true })}`).toBe(true);
    expect(pwned(dir)).toEqual([]);
    expect(pwned(ROOT)).toEqual([]);
  });

  it('refuses a control character in the run folder or the campaign file name, writing no script', async () => {
    const base = { workers: 1, shard: undefined, export: undefined, slurm: 2 };
    const bad = join(dir, 'run\ntouch PWNED');
    const a = await runCampaignCommand({ ...base, file, out: bad });
    expect(a.code, a.stderr).toBe(2);
    expect(a.stderr).toMatch(/--out: contains the control character "\\n" \(code 10\), which cannot be written safely into a job script/);
    expect(existsSync(bad)).toBe(false);
    const named = join(dir, 'tiny\rx.yaml');
    copyFileSync(file, named);
    const b = await runCampaignCommand({ ...base, file: named, out: join(dir, 'run-cr') });
    expect(b.code, b.stderr).toBe(2);
    expect(b.stderr).toMatch(/campaign file: contains the control character "\\r" \(code 13\)/);
    expect(existsSync(join(dir, 'run-cr'))).toBe(false);
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
    const names = ['merge.log', 'shard-1.log', 'shard-2.log', 'shard-3.log'];
    const logs = names.map((l) => join(out, 'slurm', l)).filter(existsSync).map((l) => `${l}:\n${readFileSync(l, 'utf8')}`).join('\n');
    expect(existsSync(join(out, 'designs.csv')), `the merge job did not finish; logs:\n${logs}`).toBe(true);
    for (const l of names) expect(existsSync(join(out, 'slurm', l)), `sbatch did not write ${l} where --output said`).toBe(true);
    expect(snapshotOf(out)).toEqual(reference);
    expect(pwned(dir)).toEqual([]);
  }, 300_000);
});
