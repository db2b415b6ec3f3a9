/** Every command registers itself here; each lives in its own file. */
import type { Command } from 'commander';
import type { CommandContext } from '../io.js';
import { register as check } from './check.js';
import { register as simulate } from './simulate.js';
import { register as fit } from './fit.js';
import { register as report } from './report.js';
import { register as validate } from './validate.js';
import { register as rank } from './rank.js';
import { register as freeze } from './freeze.js';

const registrations = [check, simulate, fit, report, validate, rank, freeze];

export function registerCommands(program: Command, ctx: CommandContext): void {
  for (const register of registrations) register(program, ctx);
}
