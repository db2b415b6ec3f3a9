/** Option values as the commands parse them (light: every command registers at start-up). */
import type { Command } from 'commander';
import { UserError } from '../errors.js';

/**
 * --json and --quiet, which every command has: `json` says what the command prints as JSON; errors
 * are JSON too with --json (error-report.ts). --quiet silences standard error (runCli) except errors.
 */
export function mannerOptions(command: Command, json: string): Command {
  return command
    .option('--json', `${json}; errors too, as {"error": ...} (exit code unchanged)`)
    .option('--quiet', 'nothing on standard error but error messages (no notes, no progress)');
}

/** True when an output option names standard output (`-o -`). */
export const isStandardOutput = (file: string | undefined): boolean => file === '-';

/** A whole number of at least `min` given to `option`, or undefined when the option is absent. */
export function integerOption(text: string | undefined, option: string, min: number): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (!Number.isInteger(v) || v < min) {
    throw new UserError({ where: { key: option }, what: `${option} must be an integer of at least ${min}, not "${text}"`, fix: `e.g. ${option} ${Math.max(min, 8)}` });
  }
  return v;
}
