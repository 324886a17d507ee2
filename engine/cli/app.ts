/** The `wellsmith` command line: parses arguments and dispatches to one file per command. */
import yargs from 'yargs';
import { EXIT, type Outcome } from './exit.js';
import { runSolve } from './solve.js';
import { runMaterials } from './materials.js';
import { runDesign, TARGET_HELP } from './design.js';
import { defaultWorkers } from '../pool.js';
import { DEFAULT_DESIGN_OPTIONS } from '../design/search.js';

/** Runs the command line and returns what to print; main() below does the printing. */
export async function cli(argv: string[]): Promise<Outcome> {
  let outcome: Outcome = { code: EXIT.ok, stdout: '', stderr: '' };
  let usage: string | undefined;
  await yargs(argv)
    .scriptName('wellsmith')
    .usage('$0 <command> [options]\n\nInverse design of semiconductor quantum wells and wires.')
    .command('solve <spec>', 'states, transitions and density of states of a fixed structure', (y) =>
      y.positional('spec', { type: 'string', demandOption: true, describe: 'spec file (YAML or JSON)' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' })
        .option('wavefunctions', { type: 'boolean', default: false, describe: 'include sampled wavefunctions in --json' }),
    (a) => { outcome = runSolve({ spec: a.spec!, json: a.json, wavefunctions: a.wavefunctions }); })
    .command('design <spec>', 'inverse design: ranked, growable designs for the spec\'s targets', (y) =>
      y.positional('spec', { type: 'string', demandOption: true, describe: 'spec file with vary: and targets:' })
        .option('starts', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.starts, describe: 'Nelder–Mead starts (Latin hypercube)' })
        .option('seed', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.seed, describe: 'seed of the start design' })
        .option('top', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.top, describe: 'designs to keep' })
        .option('workers', { type: 'number', default: defaultWorkers(), describe: 'worker threads' })
        .option('step', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.compositionStep, describe: 'grower\'s composition step for alloy fractions' })
        .option('evaluations', { type: 'number', default: DEFAULT_DESIGN_OPTIONS.maxEvaluations, describe: 'Nelder–Mead evaluation budget per start' })
        .option('out', { type: 'string', describe: 'folder for design-N.yaml specs and ranking.csv' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' })
        .epilogue(TARGET_HELP),
    async (a) => { outcome = await runDesign({ spec: a.spec!, starts: a.starts, seed: a.seed, top: a.top, workers: a.workers, step: a.step, evaluations: a.evaluations, out: a.out, json: a.json }); })
    .command('materials [formula]', 'material parameters at a temperature and on a substrate', (y) =>
      y.positional('formula', { type: 'string', describe: 'e.g. In0.2Ga0.8As (omit to list the binaries)' })
        .option('on', { type: 'string', describe: 'substrate the layer is strained on, e.g. GaAs' })
        .option('temperature', { type: 'string', default: '300 K', describe: 'temperature, e.g. "77 K"' })
        .option('json', { type: 'boolean', default: false, describe: 'machine-readable output on stdout' }),
    (a) => { outcome = runMaterials({ formula: a.formula, on: a.on, temperature: a.temperature, json: a.json }); })
    .demandCommand(1, 'give a command: solve, design, materials (see --help)')
    .strict()
    .help()
    .version()
    .wrap(Math.min(100, process.stdout.columns ?? 100))
    .fail((msg, err) => {
      if (err) throw err;
      usage = `wellsmith: ${msg}; see "wellsmith --help"\n`;
    })
    .exitProcess(false)
    .parseAsync();
  return usage === undefined ? outcome : { code: EXIT.input, stdout: '', stderr: usage };
}
