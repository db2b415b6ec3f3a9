/** The `freeze` command (not built yet: this placeholder only registers the name). */
import type { Command } from 'commander';
import { RunFailure } from '../../errors.js';
import type { CommandContext } from '../io.js';

export function register(program: Command, ctx: CommandContext): void {
  program
    .command('freeze')
    .description('(not available yet)')
    .allowUnknownOption()
    .argument('[args...]')
    .action(ctx.action(() => {
      throw new RunFailure('the freeze command is not available in this build');
    }));
}
