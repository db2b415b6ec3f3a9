/** The `check` command (not built yet: this placeholder only registers the name). */
import type { Command } from 'commander';
import { RunFailure } from '../../errors.js';
import type { CommandContext } from '../io.js';

export function register(program: Command, ctx: CommandContext): void {
  program
    .command('check')
    .description('(not available yet)')
    .allowUnknownOption()
    .argument('[args...]')
    .action(ctx.action(() => {
      throw new RunFailure('the check command is not available in this build');
    }));
}
