/** The `wellsmith` command line: parses arguments and dispatches to one file per command. */
import yargs from 'yargs';
import { EXIT, type Outcome } from './exit.js';
import { runSolve } from './solve.js';
import { runMaterials } from './materials.js';
import { runDesign, targetHelp } from './design.js';
import { runTargets } from './targets.js';
import { closestNames } from '../input/suggest.js';
import { REPORT_SAMPLES } from '../report/defaults.js';
import { runTolerance } from './tolerance.js';
import { DEFAULT_TOLERANCE } from '../tolerance/analyse.js';
import { ROBUST_SAMPLES } from './design.js';
import { defaultWorkers } from '../pool.js';
import { toolVersion } from '../store/version.js';
import { DEFAULT_DESIGN_OPTIONS, DEFAULT_WIRE_DESIGN_OPTIONS } from '../design/search.js';

// The plotting stack (vega), the run store (a native module) and their commands load only when
// used: a solve or design should not pay their start-up time.
const reportCommand = () => import('./report.js');
const campaignCommand = () => import('./campaign.js');
const mergeCommand = () => import('./merge.js');

const COMMANDS = ['solve', 'design', 'tolerance', 'report', 'materials', 'targets', 'campaign', 'merge'];

/** Options of each command, for "did you mean" on a mistyped one (yargs says only "Unknown argument"). */
const OPTIONS: Readonly<Record<string, readonly string[]>> = {
  solve: ['json', 'wavefunctions', 'maps', 'plot'],
  design: ['starts', 'seed', 'top', 'workers', 'step', 'evaluations', 'out', 'json', 'robust'],
  tolerance: ['samples', 'seed', 'workers', 'dx', 'rate', 'dT', 'ml', 'ml-sigma', 'x-sigma', 'rate-sigma', 'periods', 'json'],
  report: ['out', 'growth-sheet', 'tolerance', 'samples', 'workers'],
  materials: ['on', 'temperature', 'json'],
  targets: ['json'],
  campaign: ['out', 'workers', 'shard', 'export', 'slurm', 'retry-failed', 'json'],
  merge: [],
};

/** Options whose value may start with "-" (a negative number, "-1:0.15,…"), which yargs would take for an option of its own. */
const VALUE_OPTIONS = new Set(['--ml', '--temperature', '--seed', '--dx', '--rate', '--dT', '--step']);

/** "--ml -1:0.5" -> "--ml=-1:0.5", so that a value starting with "-" and a digit stays the option's value. */
export function joinNegativeValues(argv: readonly string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    const next = argv[i + 1];
    if (VALUE_OPTIONS.has(a) && next !== undefined && /^-[\d.]/.test(next)) {
      out.push(`${a}=${next}`);
      i++;
    } else out.push(a);
  }
  return out;
}

/** yargs' "Unknown argument: x" with the command or option that was probably meant. */
function withSuggestions(msg: string, argv: readonly string[]): string {
  const m = /^Unknown arguments?: (.+)$/.exec(msg);
  if (!m) return msg;
  const command = argv.find((a) => !a.startsWith('-'));
  const known = command !== undefined && COMMANDS.includes(command) ? OPTIONS[command]! : null;
  // Without a known command only the first word matters: the rest are that command's arguments.
  const unknown = known === null ? m[1]!.split(', ').slice(0, 1) : m[1]!.split(', ');
  const hints = unknown.map((arg) => {
    if (known === null) {
      const hit = closestNames(arg, COMMANDS, 1)[0];
      return hit ? `"${arg}" is not a command (did you mean "${hit}"?)` : `"${arg}" is not a command; the commands are ${COMMANDS.join(', ')}`;
    }
    const hit = closestNames(arg, known, 1)[0];
    const flag = arg.length === 1 ? `-${arg}` : `--${arg}`;
    return hit ? `${command} has no option ${flag} (did you mean --${hit}?)` : `${command} has no option ${flag}; its options are ${known.map((o) => `--${o}`).join(', ')}`;
  });
  return hints.join('; ');
}

/** Runs the command line and returns what to print; main() below does the printing. */
export async function cli(argv: string[]): Promise<Outcome> {
  let outcome: Outcome = { code: EXIT.ok, stdout: '', stderr: '' };
  let usage: string | undefined;
  // yargs lays out a command's whole help text on every run (to cache it): only --help shows it,
  // so other runs get it unwrapped and without the long epilogue, at a fraction of the cost.
  const wantsHelp = argv.some((a) => a === '--help' || a === '-h');
  await yargs(joinNegativeValues(argv))
    .scriptName('wellsmith')
    .usage('$0 <command> [options]\n\nInverse design of semiconductor quantum wells and wires.')
    .command('solve <spec>', 'states, transitions and density of states of a fixed structure', (y) =>
      y.positional('spec', { type: 'string', demandOption: true, describe: 'spec file (YAML or JSON)' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' })
        .option('wavefunctions', { type: 'boolean', default: false, describe: 'include sampled wavefunctions in --json' })
        .option('maps', { type: 'boolean', default: false, describe: 'wire specs: include the cross-section grid, |ψ|² maps and sampled 1-D DOS in --json' })
        .option('plot', { type: 'string', describe: 'also write the band diagram with states to this .svg file' }),
    async (a) => {
      const args = { spec: a.spec!, json: a.json, wavefunctions: a.wavefunctions, maps: a.maps };
      outcome = a.plot === undefined ? runSolve(args) : await (await reportCommand()).runSolvePlot(args, a.plot);
    })
    .command('design <spec>', 'inverse design: ranked, growable designs for the spec\'s targets', (y) =>
      y.positional('spec', { type: 'string', demandOption: true, describe: 'spec file with vary: and targets:' })
        .option('starts', { type: 'number', describe: `Nelder–Mead starts (Latin hypercube); default ${DEFAULT_DESIGN_OPTIONS.starts} for stacks, ${DEFAULT_WIRE_DESIGN_OPTIONS.starts} for wires` })
        .option('seed', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.seed, describe: 'seed of the start design' })
        .option('top', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.top, describe: 'designs to keep' })
        .option('workers', { type: 'number', default: defaultWorkers(), describe: 'worker threads' })
        .option('step', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.compositionStep, describe: 'grower\'s composition step for alloy fractions' })
        .option('evaluations', { type: 'number', describe: `Nelder–Mead evaluation budget per start; default ${DEFAULT_DESIGN_OPTIONS.maxEvaluations} for stacks, ${DEFAULT_WIRE_DESIGN_OPTIONS.maxEvaluations} for wires` })
        .option('out', { type: 'string', describe: 'folder for design-N.yaml specs and ranking.csv' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' })
        .option('robust', { type: 'boolean', default: false, describe: `rank the top designs by Monte Carlo growth yield (${ROBUST_SAMPLES} samples, default growth errors of "wellsmith tolerance"), then by loss` })
        .epilogue(wantsHelp ? targetHelp() : ''),
    async (a) => { outcome = await runDesign({ spec: a.spec!, starts: a.starts, seed: a.seed, top: a.top, workers: a.workers, step: a.step, evaluations: a.evaluations, out: a.out, json: a.json, robust: a.robust }); })
    .command('tolerance <spec>', 'growth-error sensitivities, Monte Carlo yield and monolayer-island lines of one design', (y) =>
      y.positional('spec', { type: 'string', demandOption: true, describe: 'spec with nominal values (e.g. a design-N.yaml written by design --out)' })
        .option('samples', { type: 'number', default: DEFAULT_TOLERANCE.samples, describe: 'Monte Carlo samples (0 skips the yield)' })
        .option('seed', { type: 'number', default: DEFAULT_TOLERANCE.seed, describe: 'seed of the samples' })
        .option('workers', { type: 'number', default: defaultWorkers(), describe: 'worker threads' })
        .option('dx', { type: 'number', default: DEFAULT_TOLERANCE.sensitivity.dx, describe: 'sensitivity: alloy-fraction step Δx' })
        .option('rate', { type: 'number', default: DEFAULT_TOLERANCE.sensitivity.ratePercent, describe: 'sensitivity: growth-rate step (%)' })
        .option('dT', { type: 'number', default: DEFAULT_TOLERANCE.sensitivity.dT, describe: 'sensitivity: temperature step (K)' })
        .option('ml', { type: 'string', default: '-1:0.15,0:0.7,1:0.15', describe: 'Monte Carlo: per-layer monolayer-error probabilities, e.g. --ml=-1:0.15,0:0.7,1:0.15' })
        .option('ml-sigma', { type: 'number', describe: 'Monte Carlo: per-layer monolayer σ (ML, rounded to whole ML); replaces --ml' })
        .option('x-sigma', { type: 'number', default: DEFAULT_TOLERANCE.growth.compositionSigma, describe: 'Monte Carlo: alloy-fraction σ per layer' })
        .option('rate-sigma', { type: 'number', default: DEFAULT_TOLERANCE.growth.rateSigmaPercent, describe: 'Monte Carlo: growth-rate σ (%)' })
        .option('periods', { type: 'string', choices: ['independent', 'correlated'], default: 'independent', describe: 'Monte Carlo: growth errors of repeated periods drawn independently, or one draw repeated in every period' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' }),
    async (a) => {
      outcome = await runTolerance({ spec: a.spec!, samples: a.samples, seed: a.seed, workers: a.workers, dx: a.dx, rate: a.rate, dT: a.dT,
        mlTable: a.ml, mlSigma: a['ml-sigma'], xSigma: a['x-sigma'], rateSigma: a['rate-sigma'], periods: a.periods, json: a.json });
    })
    .command('report <input>', 'self-contained HTML report of a spec, a design, a solve/design/tolerance --json file or a campaign run folder', (y) =>
      y.positional('input', { type: 'string', demandOption: true, describe: 'spec file (solved, targets scored) or a JSON file from solve/design --json' })
        .option('out', { type: 'string', describe: 'HTML file to write (default: INPUT with .html)' })
        .option('growth-sheet', { type: 'string', describe: 'also write the growth sheet (per-layer shutter times) as CSV; needs growth.rates in the spec' })
        .option('tolerance', { type: 'boolean', default: false, describe: 'add the growth-tolerance section (sensitivities, Monte Carlo yield, island lines); spec inputs with targets' })
        .option('samples', { type: 'number', default: REPORT_SAMPLES, describe: 'Monte Carlo samples of --tolerance' })
        .option('workers', { type: 'number', default: defaultWorkers(), describe: 'worker threads of --tolerance' }),
    async (a) => { outcome = await (await reportCommand()).runReport({ input: a.input!, out: a.out, growthSheet: a.growthSheet, tolerance: a.tolerance, samples: a.samples, workers: a.workers }); })
    .command('materials [formula]', 'material parameters at a temperature and on a substrate', (y) =>
      y.positional('formula', { type: 'string', describe: 'e.g. In0.2Ga0.8As (omit to list the binaries)' })
        .option('on', { type: 'string', describe: 'substrate the layer is strained on, e.g. GaAs' })
        .option('temperature', { type: 'string', default: '300 K', describe: 'temperature, e.g. "77 K"' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' }),
    (a) => { outcome = runMaterials({ formula: a.formula, on: a.on, temperature: a.temperature, json: a.json }); })
    .command('targets [kind]', 'the target kinds a spec\'s "targets:" takes, each with its keys and an example', (y) =>
      y.positional('kind', { type: 'string', describe: 'one kind (transition, subband_edge, …) with every key' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' }),
    (a) => { outcome = runTargets({ kind: a.kind, json: a.json }); })
    .command('campaign <file>', 'run or resume a campaign of design jobs into a run store (or write Slurm scripts for it)', (y) =>
      y.positional('file', { type: 'string', demandOption: true, describe: 'campaign file (YAML or JSON): spec, sweep, design options' })
        .option('out', { type: 'string', describe: 'run folder holding campaign.sqlite (default: FILE without extension + ".run"); rerun to resume' })
        .option('workers', { type: 'number', default: defaultWorkers(), describe: 'worker threads' })
        .option('shard', { type: 'string', describe: 'run only shard i of N, e.g. 2/3 (jobs with index mod N = i - 1)' })
        .option('export', { type: 'string', choices: ['csv'], describe: 'also write all ranked designs to OUT/designs.csv' })
        .option('slurm', { type: 'number', describe: 'write a Slurm job array of N shards, a dependent merge job and submit.sh to OUT/slurm; runs nothing' })
        .option('retry-failed', { type: 'boolean', default: false, describe: 'run the failed jobs of the store again (their finished starts are kept)' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' }),
    async (a) => { outcome = await (await campaignCommand()).runCampaignCommand({ file: a.file!, out: a.out, workers: a.workers, shard: a.shard, export: a.export, slurm: a.slurm, json: a.json, retryFailed: a.retryFailed }); })
    .command('merge <out> <dirs..>', 'join shard run stores into the run store of OUT (idempotent)', (y) =>
      y.positional('out', { type: 'string', demandOption: true, describe: 'run folder to merge into (created if missing)' })
        .positional('dirs', { type: 'string', array: true, demandOption: true, describe: 'shard run folders' }),
    async (a) => { outcome = (await mergeCommand()).runMerge({ out: a.out!, dirs: a.dirs! }); })
    .demandCommand(1, `give a command: ${COMMANDS.join(', ')} (see --help)`)
    .strict()
    .help()
    // Given, not looked up: yargs searches for package.json from its own folder, which a bundle does not have.
    .version(toolVersion())
    .wrap(wantsHelp ? Math.min(100, process.stdout.columns ?? 100) : null)
    .fail((msg, err) => {
      if (err) throw err;
      usage = `wellsmith: ${withSuggestions(msg, argv)}; see "wellsmith --help"\n`;
    })
    .exitProcess(false)
    .parseAsync();
  return usage === undefined ? outcome : { code: EXIT.input, stdout: '', stderr: usage };
}
