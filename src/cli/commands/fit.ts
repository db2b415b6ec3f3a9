/**
 * `rigcal fit MODEL`: estimates the free parameters from the model's fit experiments, scores the
 * validation experiments, writes the results folder and prints the summary. Progress goes to
 * standard error only when it is a terminal; standard output carries the summary (or fit.json with
 * --json) and nothing else.
 */
import type { Command } from 'commander';
import { integerOption, mannerOptions } from '../options.js';
import { progressDisplay } from '../progress.js';
import type { CommandContext } from '../io.js';

interface FitCliOptions {
  output?: string;
  starts?: string;
  seed?: string;
  maxIterations?: string;
  json?: boolean;
  quiet?: boolean;
  set: string[];
}

function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

export function register(program: Command, ctx: CommandContext): void {
  const command = program
    .command('fit')
    .summary('estimate the free parameters from the fit experiments and write a results folder')
    .description(
      'Estimates the free parameters of MODEL from all experiments with role `fit` (bounded Levenberg-Marquardt with\n' +
        'sensitivities), scores the `validation` experiments at the estimates, writes the results folder\n' +
        '(estimates.yaml, fit.json, residuals.csv, report.html) and prints a summary table.',
    )
    .argument('<model>', 'the model file (YAML)')
    .option('-o, --output <dir>', 'results folder (default ./<model name>-fit/)')
    .option('--starts <n>', 'number of starts spread over the bounds; the best is kept')
    .option('--seed <s>', 'seed of the spread of starts (reproducible)')
    .option('--max-iterations <n>', 'limit on solver iterations per fit')
    .option('--set <name=value>', 'override a parameter value (its unit); name@experiment=value for one experiment', collect, []);
  mannerOptions(command, 'print fit.json to standard output instead of the summary')
    .addHelpText('after', '\nExample:\n  rigcal fit models/flywheel.yaml --starts 8 --seed 1 -o flywheel-fit\n')
    .action(
      ctx.action(async (modelFile: string, opts: FitCliOptions) => {
        // The verb and the summary load when the command runs, not when the CLI starts (every command
        // registers at start-up; `rigcal --help` or another command need none of this).
        const [{ runFit }, { parseOverrides }, { renderFitJson }, { renderFitSummary }] = await Promise.all([
          import('../../verbs/fit.js'),
          import('../../model/load/index.js'),
          import('../../reports/fit-json.js'),
          import('../../reports/summary-table.js'),
        ]);
        const io = ctx.io;
        const starts = integerOption(opts.starts, '--starts');
        const seed = integerOption(opts.seed, '--seed');
        const maxIterations = integerOption(opts.maxIterations, '--max-iterations');
        const overrides = parseOverrides(opts.set ?? []);
        const progress = progressDisplay(io);
        const { outcome, folder } = await runFit({ modelFile, cwd: io.cwd, output: opts.output, overrides, starts, seed, maxIterations, onProgress: progress.onProgress });
        progress.finish();
        if (opts.json) io.stdout(renderFitJson(outcome.result));
        else io.stdout(renderFitSummary(outcome.result, folder));
        // 3: estimates exist but are not a converged optimum (a script must be able to tell).
        return outcome.result.status === 'failed' ? 1 : outcome.result.status === 'stopped' ? 3 : 0;
      }),
    );
}
