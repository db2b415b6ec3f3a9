/**
 * How a command that did not finish tells its caller: as text on standard error, or, with --json, as
 * one JSON object on standard output (a program reading --json output then reads its errors the same
 * way). The exit code is the same either way: 2 the input is wrong, 1 the work ran but failed, 70 a
 * bug of ours.
 */
import { CommanderError } from 'commander';
import { RunFailure, UserError, formatProblem, type Problem } from '../errors.js';
import { toJson } from '../files/json.js';
import { escapeControls } from '../util/printable.js';
import type { CliIO } from './io.js';

/** The JSON form of an error: `{ "error": { exitCode, kind, problems | message, details } }`. */
export interface ErrorJson {
  error: {
    exitCode: number;
    kind: 'input' | 'failed' | 'internal';
    /** kind input: every problem found, each with where, what and how to mend it. */
    problems?: Problem[];
    /** kind failed or internal: what went wrong, and the failure's machine-readable details. */
    message?: string;
    details?: Record<string, unknown>;
  };
}

/** Prints `err` and answers the exit code. `json`: the JSON form on standard output instead of text. */
export function reportError(err: unknown, io: CliIO, json: boolean): number {
  if (err instanceof CommanderError) return reportCommanderError(err, io, json);
  if (err instanceof UserError) {
    if (json) return printJson(io, { error: { exitCode: 2, kind: 'input', problems: err.problems } });
    const n = err.problems.length;
    io.stderr(`rigcal: ${n === 1 ? 'error' : `${n} errors`}:\n${escapeControls(err.problems.map((p) => formatProblem(p)).join('\n'))}\n`);
    return 2;
  }
  if (err instanceof RunFailure) {
    if (json) return printJson(io, { error: { exitCode: 1, kind: 'failed', message: err.message, details: err.details } });
    io.stderr(`rigcal: failed: ${escapeControls(err.message)}\n`);
    return 1;
  }
  // A bug of ours, not the user's: the stack goes to standard error in full so that it can be reported.
  io.stderr(`rigcal: internal error (please report it with the model file): ${err instanceof Error ? err.stack : String(err)}\n`);
  if (json) printJson(io, { error: { exitCode: 70, kind: 'internal', message: err instanceof Error ? err.message : String(err) } });
  return 70;
}

/** --help and --version end here with exit code 0; usage mistakes are input errors. */
function reportCommanderError(err: CommanderError, io: CliIO, json: boolean): number {
  if (err.code === 'commander.helpDisplayed' || err.code === 'commander.version' || err.code === 'commander.help') return 0;
  // Commander has printed the text already (to standard error, or nowhere with --json: see runCli).
  if (json) printJson(io, { error: { exitCode: 2, kind: 'input', problems: [{ where: { key: 'command line' }, what: err.message.replace(/^error: /, ''), fix: 'run with --help for usage and an example' }] } });
  return 2;
}

function printJson(io: CliIO, value: ErrorJson): number {
  // JSON.stringify escapes C0 controls but not C1 (U+0080-U+009F, e.g. CSI): escaped here for the terminal.
  io.stdout(toJson(value).replace(/[\u007f-\u009f]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`));
  return value.error.exitCode;
}
