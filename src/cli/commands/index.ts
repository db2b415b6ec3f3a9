/** Every command registers itself here; each lives in its own file. */
import type { Command } from 'commander';
import type { CommandContext } from '../io.js';

type Register = (program: Command, ctx: CommandContext) => void;
const registrations: Register[] = [];

export function registerCommands(program: Command, ctx: CommandContext): void {
  for (const register of registrations) register(program, ctx);
}
