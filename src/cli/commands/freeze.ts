/** The `freeze` command: hand calibrated parameters to a simulation team. */
import { Option, type Command } from 'commander';
import { UserError } from '../../errors.js';
import type { FreezeFormat } from '../../verbs/freeze.js';
import type { CommandContext } from '../io.js';

interface FreezeCliOptions {
  params?: string;
  output?: string;
  format: FreezeFormat;
  force?: boolean;
  overwrite?: boolean;
}

export function register(program: Command, ctx: CommandContext): void {
  program
    .command('freeze')
    .description('write a copy of the model with every free parameter fixed at its estimate (comments kept), or the parameter table alone')
    .argument('<model>', 'the model file (YAML) that was fitted')
    .requiredOption('--params <file>', 'estimates.yaml written by `rigcal fit`')
    .requiredOption('-o, --output <file>', 'output file (never the model file itself)')
    .addOption(new Option('--format <format>', 'yaml: calibrated model file; json or csv: the parameter table alone').choices(['yaml', 'json', 'csv']).default('yaml'))
    .option('--force', 'freeze even though the estimates were made for another version of the model file (different SHA-256)')
    .option('--overwrite', 'replace the output file when it exists')
    .addHelpText(
      'after',
      `
Example:
  rigcal freeze models/flywheel.yaml --params flywheel-fit/estimates.yaml -o calibrated/flywheel.yaml
  rigcal freeze models/flywheel.yaml --params flywheel-fit/estimates.yaml -o parameters.csv --format csv

Per-experiment parameters become fixed parameters whose fitted values are written into each
experiment's \`set\`; relative data paths are rewritten so that they stay valid from the output's folder.`,
    )
    .action(
      ctx.action(async (model: string, opts: FreezeCliOptions) => {
        if (!opts.params || !opts.output) {
          throw new UserError({ where: {}, what: 'freeze needs --params and -o', fix: 'see rigcal freeze --help' });
        }
        const { runFreeze } = await import('../../verbs/freeze.js'); // loaded when the command runs
        const outcome = runFreeze({
          modelFile: model,
          estimatesFile: opts.params,
          output: opts.output,
          format: opts.format,
          force: opts.force,
          overwrite: opts.overwrite,
          cwd: ctx.io.cwd,
        });
        const lines: string[] = [];
        if (outcome.summary) {
          const s = outcome.summary;
          lines.push(`Wrote ${opts.output}: a copy of ${model} with the calibrated values fixed.`);
          if (s.frozen.length) lines.push(`  fixed at their estimates: ${s.frozen.join(', ')}`);
          if (s.perExperiment.length) lines.push(`  per experiment (values in each experiment's set): ${s.perExperiment.join(', ')}`);
          if (s.changedFixed.length) lines.push(`  fixed values as used by the fit: ${s.changedFixed.join(', ')}`);
          for (const m of s.movedPaths) lines.push(`  data path of ${m.experiment} rewritten for the output's folder: ${m.file}`);
        } else {
          lines.push(`Wrote ${opts.output}: the parameter table (${outcome.rows} rows, ${outcome.format}).`);
        }
        for (const w of outcome.warnings) lines.push(`warning: ${w}`);
        ctx.io.stdout(`${lines.join('\n')}\n`);
        return 0;
      }),
    );
}
