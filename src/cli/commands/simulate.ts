/**
 * `rigcal simulate MODEL`: integrates the model for one experiment (-e) or all of them, driven by
 * each log's inputs at its time stamps, or over a given span without data (--duration); writes the
 * CSV of cli-and-results.md and prints the fit quality per output where data exist (the work:
 * src/verbs/simulate.ts).
 */
import type { Command } from 'commander';
import type { CommandContext } from '../io.js';

interface SimulateCliOptions {
  experiment?: string[];
  set?: string[];
  params?: string;
  output?: string;
  duration?: string;
  interval?: string;
  input?: string[];
}

// No default list in the option definitions: commander would print "(default: [])" in the help.
const collect = (value: string, previous: string[] | undefined) => [...(previous ?? []), value];

export function register(program: Command, ctx: CommandContext): void {
  program
    .command('simulate')
    .description('integrate the model for its experiments (their inputs and time stamps) or over a given span; write a CSV and print the fit quality per output')
    .argument('<model>', 'the model file (YAML)')
    .option('-e, --experiment <name>', 'simulate only this experiment (repeat for several); default: all', collect)
    .option('--set <name=value>', 'use this parameter value for this run, in the parameter\'s unit; name@experiment=value for a per-experiment copy (repeatable)', collect)
    .option('--params <file>', 'take the estimated values from a results file of `rigcal fit` (estimates.yaml)')
    .option('-o, --output <file.csv>', 'write the CSV here (written whole or not at all); default: standard output')
    .option('--duration <T>', 'simulate from t = 0 over this span (in the model\'s time unit) without data')
    .option('--interval <dt>', 'with --duration: time between output rows (default: duration / 1000)')
    .option('--input <name=value>', 'with --duration: a constant input value in the input\'s unit (repeatable; default 0)', collect)
    .addHelpText('after', [
      '',
      'The CSV has the columns experiment, time (in the experiment\'s time unit), every output (model',
      'units), <output>_measured where measured, and every state as <state>_state. The fit quality',
      'table goes to standard output, or to standard error when the CSV does.',
      '',
      'Examples:',
      '  rigcal simulate models/flywheel.yaml -e steps -o steps-sim.csv',
      '  rigcal simulate models/flywheel.yaml --params flywheel-fit/estimates.yaml --set Tc=0.01 -o sim.csv',
      '  rigcal simulate models/heated-block.yaml --duration 3600 --interval 10 --input P=40 --input Ta=295',
    ].join('\n'))
    .action(ctx.action(async (modelArg: string, options: SimulateCliOptions) => {
      // Loaded when the command runs, not when the CLI starts (DEVELOPERS.md, "How to add a command").
      const [{ runSimulate }, { parseOverrides }, { renderQuality }] = await Promise.all([
        import('../../verbs/simulate.js'),
        import('../../model/load/index.js'),
        import('../../reports/simulation-quality.js'),
      ]);
      const { io } = ctx;
      const result = runSimulate({
        modelFile: modelArg,
        cwd: io.cwd,
        experiments: options.experiment ?? [],
        overrides: parseOverrides(options.set ?? []),
        estimatesFile: options.params,
        output: options.output,
        duration: options.duration,
        interval: options.interval,
        inputs: options.input ?? [],
        onNote: (note) => io.stderr(`rigcal: note: ${note}\n`),
      });
      const quality = renderQuality(result.model, result.runs);
      if (result.written) {
        io.stdout(`wrote ${options.output} (${result.rows} rows)\n`);
        if (quality) io.stdout(quality);
      } else {
        io.stdout(result.csv);
        if (quality) io.stderr(quality);
      }
      return 0;
    }));
}
