/**
 * `rigcal check MODEL`: loads the model and every experiment's log and lists every problem found
 * (model file and all data files together, not only the first), then prints a summary of what the
 * model declares and what the logs hold.
 */
import type { Command } from 'commander';
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
    .action(ctx.action(async (modelArg: string) => (await import('./check-run.js')).runCheck(modelArg, ctx))); // loaded when the command runs
}
