/** The `freeze` command: hand calibrated parameters to a simulation team. */
import { Option, type Command } from 'commander';
import { UserError } from '../../errors.js';
import { printableLines } from '../../presentation/printable.js';
import type { FreezeFormat, FreezeOutcome } from '../../verbs/freeze.js';
import type { CommandContext } from '../io.js';
import { isStandardOutput, mannerOptions } from '../options.js';

interface FreezeCliOptions {
  params?: string;
  output?: string;
  format: FreezeFormat;
  force?: boolean;
  overwrite?: boolean;
  json?: boolean;
}

export function register(program: Command, ctx: CommandContext): void {
  const command = program
    .command('freeze')
    .description('write a copy of the model with every free parameter fixed at its estimate (comments kept), or the parameter table alone')
    .argument('<model>', 'the model file (YAML) that was fitted')
    .requiredOption('--params <file>', 'estimates.yaml written by `rigcal fit`')
    .requiredOption('-o, --output <file>', 'output file (never the model file itself); - for standard output')
    .addOption(new Option('--format <format>', 'yaml: calibrated model file; json or csv: the parameter table alone').choices(['yaml', 'json', 'csv']).default('yaml'))
    .option('--force', 'freeze even though the estimates were made for another version of the model file or of a data file (different SHA-256; both are then recorded)')
    .option('--overwrite', 'replace the output file when it exists');
  mannerOptions(command, 'print what was written as JSON (output, format, what was fixed, warnings)')
    .addHelpText(
      'after',
      `
Example:
  rigcal freeze models/flywheel.yaml --params flywheel-fit/estimates.yaml -o calibrated/flywheel.yaml
  rigcal freeze models/flywheel.yaml --params flywheel-fit/estimates.yaml -o parameters.csv --format csv
  rigcal freeze models/flywheel.yaml --params flywheel-fit/estimates.yaml -o - --format json

Per-experiment parameters become fixed parameters whose fitted values are written into each
experiment's \`set\`; relative data paths are rewritten so that they stay valid from the output's folder
(with -o -, from the working folder).`,
    )
    .action(
      ctx.action(async (model: string, opts: FreezeCliOptions) => {
        if (!opts.params || !opts.output) {
          throw new UserError({ where: {}, what: 'freeze needs --params and -o', fix: 'see rigcal freeze --help' });
        }
        const toStdout = isStandardOutput(opts.output);
        if (toStdout && opts.json) {
          throw new UserError({ where: { key: '--json' }, what: '--json prints what was written on standard output, where -o - sends the frozen file', fix: 'write the file with -o FILE, or drop --json' });
        }
        const [{ prepareFreeze, runFreeze }, { toJson }] = await Promise.all([import('../../verbs/freeze.js'), import('../../files/json.js')]); // loaded when the command runs
        const options = { modelFile: model, estimatesFile: opts.params, format: opts.format, force: opts.force, overwrite: opts.overwrite, cwd: ctx.io.cwd };
        if (toStdout) {
          // Standard output carries the frozen file alone; what was done goes to standard error.
          const { text, outcome } = prepareFreeze(options);
          ctx.io.stdout(text);
          ctx.io.stderr(printableLines(`${freezeNotes(outcome, 'standard output', model).join('\n')}\n`));
          return 0;
        }
        const outcome = runFreeze({ ...options, output: opts.output });
        if (opts.json) ctx.io.stdout(toJson({ ...outcome, output: opts.output, path: outcome.output }));
        else ctx.io.stdout(printableLines(`${freezeNotes(outcome, opts.output, model).join('\n')}\n`));
        return 0;
      }),
    );
}

/** What freeze did, in words: the file written and what changed in it, then any warnings. */
function freezeNotes(outcome: FreezeOutcome, written: string, model: string): string[] {
  const lines: string[] = [];
  if (outcome.summary) {
    const s = outcome.summary;
    lines.push(`Wrote ${written}: a copy of ${model} with the calibrated values fixed.`);
    if (s.frozen.length) lines.push(`  fixed at their estimates: ${s.frozen.join(', ')}`);
    if (s.perExperiment.length) lines.push(`  per experiment (values in each experiment's set): ${s.perExperiment.join(', ')}`);
    if (s.changedFixed.length) lines.push(`  fixed values as used by the fit: ${s.changedFixed.join(', ')}`);
    for (const m of s.movedPaths) lines.push(`  data path of ${m.experiment} rewritten for the output's folder: ${m.file}`);
  } else {
    lines.push(`Wrote ${written}: the parameter table (${outcome.rows} rows, ${outcome.format}).`);
  }
  for (const w of outcome.warnings) lines.push(`warning: ${w}`);
  return lines;
}
