/**
 * `rigcal check MODEL`: loads the model and every experiment's log and lists every problem found
 * (model file and all data files together, not only the first), then prints a summary of what the
 * model declares and what the logs hold.
 */
import type { Command } from 'commander';
import { UserError } from '../../errors.js';
import type { CommandContext } from '../io.js';
import { mannerOptions } from '../options.js';

export function register(program: Command, ctx: CommandContext): void {
  const command = program
    .command('check')
    .description('check a model file and its data logs; list every problem and summarise what was found')
    .argument('<model>', 'the model file (YAML)');
  mannerOptions(command, 'print the summary as JSON (what the model declares and what each log holds)')
    .addHelpText('after', [
      '',
      'Exit code 0 when no problem was found, 2 when the model or a data file is wrong (every problem',
      'is listed with its file, line and key, and how to mend it).',
      '',
      'Example:',
      '  rigcal check models/flywheel.yaml',
    ].join('\n'))
    .action(ctx.action(async (modelArg: string, opts: { json?: boolean }) => {
      // Loaded when the command runs, not when the CLI starts (DEVELOPERS.md, "How to add a command").
      const [{ runCheck }, { fitReadinessNotes, renderCheckSummary }, { checkSummaryData }, { toJson }] = await Promise.all([
        import('../../verbs/check.js'),
        import('../../reports/check-summary.js'),
        import('../../reports/check-summary-data.js'),
        import('../../files/json.js'),
      ]);
      const { io } = ctx;
      const { model, data, problems } = runCheck({ modelFile: modelArg, cwd: io.cwd });
      const notes = fitReadinessNotes(model, data);
      if (opts.json) {
        // With problems, the JSON error lists them (error-report.ts); the summary is for a model that checks.
        if (problems.length) throw new UserError(problems);
        io.stdout(toJson(checkSummaryData({ model, data }, notes)));
        return 0;
      }
      io.stdout(renderCheckSummary({ model, data }));
      if (notes.length) io.stdout(`\nnotes\n${notes.map((n) => `  - ${n}`).join('\n')}\n`);
      if (problems.length) throw new UserError(problems);
      io.stdout('\nno problems found\n');
      return 0;
    }));
}
