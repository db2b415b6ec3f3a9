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

/**
 * The sane range of each whole-number option: a range no real use leaves, so that a slip of the
 * keyboard (`--starts 1000000000`) is a clear error instead of hours of work or an out-of-memory
 * abort. Common practice, no source: 1000 starts of a large model already take hours; the seed is
 * the 32-bit state of the project's generator; 100,000 iterations are 200 times the solver's default.
 */
export const INTEGER_RANGES = {
  '--starts': [1, 1000],
  '--seed': [0, 2 ** 32 - 1],
  '--max-iterations': [1, 100_000],
} as const satisfies Record<string, readonly [number, number]>;

/** A whole number within the option's range, or undefined when the option is absent. */
export function integerOption(text: string | undefined, option: keyof typeof INTEGER_RANGES): number | undefined {
  if (text === undefined) return undefined;
  const [min, max] = INTEGER_RANGES[option];
  const v = Number(text);
  if (!Number.isInteger(v) || v < min) {
    throw new UserError({ where: { key: option }, what: `${option} must be an integer of at least ${min}, not "${text}"`, fix: `e.g. ${option} ${Math.max(min, 8)}` });
  }
  if (v > max) {
    throw new UserError({ where: { key: option }, what: `${option} ${text} is more than ${max.toLocaleString('en-US')}, the most rigcal accepts`, fix: `give at most ${option} ${max}` });
  }
  return v;
}
