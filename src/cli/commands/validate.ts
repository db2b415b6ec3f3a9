/** The `validate` command: score a calibrated model on data it was not fitted to. */
import type { Command } from 'commander';
import path from 'node:path';
import type { CommandContext } from '../io.js';
import { mannerOptions } from '../options.js';

interface ValidateCliOptions {
  params: string;
  experiment?: string[];
  data?: string;
  timeUnit?: string;
  output?: string;
  set?: string[];
  force?: boolean;
  json?: boolean;
}

const collect = (value: string, previous: string[] = []) => [...previous, value];

export function register(program: Command, ctx: CommandContext): void {
  const command = program
    .command('validate')
    .description('score a calibrated model (model file + estimates.yaml) on data it was not fitted to: RMSE, NRMSE, R^2 and residual whiteness per output')
    .argument('<model>', 'the model file (YAML)')
    .requiredOption('--params <file>', 'estimates.yaml written by `rigcal fit`')
    .option('-e, --experiment <name>', 'an experiment of the model file, of any role (repeatable); default: every validation experiment', collect)
    .option('--data <file>', 'a new log (CSV) read with the model\'s columns; time column and unit as in the model\'s first experiment')
    .option('--time-unit <unit>', 'unit of the new log\'s time column (with --data; default: as in the model\'s first experiment)')
    .option('-o, --output <dir>', 'folder for validation.json, residuals.csv and report.html (default ./<model name>-validate/)')
    .option('--set <name=value>', 'a parameter value for this run (wins over the estimates), e.g. a per-experiment initial value of a new log', collect)
    .option('--force', 'validate even though the estimates were made for another version of the model file or of a data file (both SHA-256 are then recorded)');
  mannerOptions(command, 'print validation.json to standard output instead of the table')
    .addHelpText(
      'after',
      `
Example:
  rigcal validate models/flywheel.yaml --params flywheel-fit/estimates.yaml -e prbs-check
  rigcal validate models/flywheel.yaml --params flywheel-fit/estimates.yaml --data logs/friday.csv`,
    )
    .action(
      ctx.action(async (modelFile: string, opts: ValidateCliOptions) => {
        // Loaded when the command runs: start-up (and every other command) does without them.
        const [{ parseOverrides }, { validationText }, { runValidate }, { toJson }] = await Promise.all([
          import('../../model/load/index.js'),
          import('../../validation/validation-report.js'),
          import('../../verbs/validate.js'),
          import('../../files/json.js'),
        ]);
        const { result, folder } = await runValidate({
          modelFile,
          estimatesFile: opts.params,
          experiments: opts.experiment,
          dataFile: opts.data,
          dataTimeUnit: opts.timeUnit,
          overrides: opts.set?.length ? parseOverrides(opts.set) : undefined,
          force: opts.force,
          cwd: ctx.io.cwd,
          output: opts.output,
        });
        if (opts.json) ctx.io.stdout(toJson(result));
        else ctx.io.stdout(`${validationText(result)}results: ${opts.output ?? (path.relative(ctx.io.cwd, folder) || '.')}\n`);
        return 0;
      }),
    );
}
