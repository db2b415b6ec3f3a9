/**
 * `rigcal check MODEL`: loads the model and every experiment's log and lists every problem found
 * (model file and all data files together, not only the first), then prints a summary of what the
 * model declares and what the logs hold.
 */
import type { Command } from 'commander';
import { UserError } from '../../errors.js';
import type { CommandContext } from '../io.js';

export function register(program: Command, ctx: CommandContext): void {
  program
    .command('check')
    .description('check a model file and its data logs; list every problem and summarise what was found')
    .argument('<model>', 'the model file (YAML)')
    .addHelpText('after', [
      '',
      'Exit code 0 when no problem was found, 2 when the model or a data file is wrong (every problem',
      'is listed with its file, line and key, and how to mend it).',
      '',
      'Example:',
      '  rigcal check models/flywheel.yaml',
    ].join('\n'))
    .action(ctx.action(async (modelArg: string) => {
      // Loaded when the command runs, not when the CLI starts (DEVELOPERS.md, "How to add a command").
      const [{ runCheck }, { fitReadinessNotes, renderCheckSummary }] = await Promise.all([import('../../verbs/check.js'), import('../../reports/check-summary.js')]);
      const { io } = ctx;
      const { model, data, problems } = runCheck({ modelFile: modelArg, cwd: io.cwd });
      io.stdout(renderCheckSummary({ model, data }));
      const notes = fitReadinessNotes(model, data);
      if (notes.length) io.stdout(`\nnotes\n${notes.map((n) => `  - ${n}`).join('\n')}\n`);
      if (problems.length) throw new UserError(problems);
      io.stdout('\nno problems found\n');
      return 0;
    }));
}
