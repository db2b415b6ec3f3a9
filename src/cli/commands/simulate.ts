/**
 * `rigcal simulate MODEL`: integrates the model for one experiment (-e) or all of them, driven by
 * each log's inputs at its time stamps, or over a given span without data (--duration); writes the
 * CSV of cli-and-results.md and prints the fit quality per output where data exist (the work:
 * src/verbs/simulate.ts).
 */
import type { Command } from 'commander';
import { printable } from '../../presentation/printable.js';
import { UserError } from '../../errors.js';
import type { CommandContext } from '../io.js';
import { isStandardOutput, mannerOptions } from '../options.js';

interface SimulateCliOptions {
  experiment?: string[];
  set?: string[];
  params?: string;
  output?: string;
  duration?: string;
  interval?: string;
  input?: string[];
  json?: boolean;
  overwrite?: boolean;
}

// No default list in the option definitions: commander would print "(default: [])" in the help.
const collect = (value: string, previous: string[] | undefined) => [...(previous ?? []), value];

export function register(program: Command, ctx: CommandContext): void {
  const command = program
    .command('simulate')
    .description('integrate the model for its experiments (their inputs and time stamps) or over a given span; write a CSV and print the fit quality per output')
    .argument('<model>', 'the model file (YAML)')
    .option('-e, --experiment <name>', 'simulate only this experiment (repeat for several); default: all', collect)
    .option('--set <name=value>', 'use this parameter value for this run, in the parameter\'s unit; name@experiment=value for a per-experiment copy (repeatable)', collect)
    .option('--params <file>', 'take the estimated values from a results file of `rigcal fit` (estimates.yaml)')
    .option('-o, --output <file.csv>', 'write the CSV here (written whole or not at all); - or none: standard output')
    .option('--overwrite', 'replace the output file even when it is not a simulation CSV of rigcal for this model')
    .option('--duration <T>', 'simulate from t = 0 over this span (in the model\'s time unit) without data')
    .option('--interval <dt>', 'with --duration: time between output rows (default: duration / 1000)')
    .option('--input <name=value>', 'with --duration: a constant input value in the input\'s unit (repeatable; default 0)', collect);
  mannerOptions(command, 'print the fit quality rows as JSON (needs -o FILE.csv: the CSV cannot share standard output)')
    .addHelpText('after', [
      '',
      'The CSV has the columns experiment, time (in the experiment\'s time unit), every output (model',
      'units), <output>_measured where measured, and every state as <state>_state. The fit quality',
      'table goes to standard output, or to standard error when the CSV does (-o - or no -o).',
      '',
      'Examples:',
      '  rigcal simulate models/flywheel.yaml -e steps -o steps-sim.csv',
      '  rigcal simulate models/flywheel.yaml --params flywheel-fit/estimates.yaml --set Tc=0.01 -o sim.csv',
      '  rigcal simulate models/heated-block.yaml --duration 3600 --interval 10 --input P=40 --input Ta=295',
    ].join('\n'))
    .action(ctx.action(async (modelArg: string, options: SimulateCliOptions) => {
      // Loaded when the command runs, not when the CLI starts (DEVELOPERS.md, "How to add a command").
      const [{ runSimulate }, { parseOverrides }, quality] = await Promise.all([
        import('../../verbs/simulate.js'),
        import('../../model/load/index.js'),
        import('../../reports/simulation-quality.js'),
      ]);
      const { io } = ctx;
      const toFile = options.output !== undefined && !isStandardOutput(options.output);
      if (options.json && !toFile) {
        throw new UserError({ where: { key: '--json' }, what: '--json prints the fit quality on standard output, where the CSV would go', fix: 'write the CSV to a file with -o FILE.csv, or drop --json' });
      }
      const result = runSimulate({
        modelFile: modelArg,
        cwd: io.cwd,
        experiments: options.experiment ?? [],
        overrides: parseOverrides(options.set ?? []),
        estimatesFile: options.params,
        output: toFile ? options.output : undefined,
        overwrite: options.overwrite,
        duration: options.duration,
        interval: options.interval,
        inputs: options.input ?? [],
        onNote: (note) => io.stderr(`rigcal: note: ${printable(note)}\n`),
      });
      if (options.json) {
        const { toJson } = await import('../../files/json.js');
        io.stdout(toJson({ written: options.output, rows: result.rows, quality: quality.qualityRows(result.model, result.runs), notes: result.notes }));
        return 0;
      }
      const table = quality.renderQuality(result.model, result.runs);
      if (toFile) {
        io.stdout(`wrote ${printable(options.output!)} (${result.rows} rows)\n`);
        if (table) io.stdout(table);
      } else {
        // Standard output carries the CSV and nothing else.
        io.stdout(result.csv);
        if (table) io.stderr(table);
      }
      return 0;
    }));
}
