/**
 * The CLI as a function: parses argv, runs one command, turns library errors into messages and exit
 * codes (UserError -> 2, RunFailure -> 1). No stack trace for a user error.
 */
import { Command, CommanderError } from 'commander';
import { RunFailure, UserError, formatProblem } from '../errors.js';
import { escapeControls } from '../util/printable.js';
import { VERSION } from '../version.js';
import type { CliIO, CommandAction, CommandContext } from './io.js';
import { registerCommands } from './commands/index.js';

export async function runCli(argv: string[], io: CliIO): Promise<number> {
  let exitCode = 0;
  const program = new Command();
  program
    .name('rigcal')
    .description('Gray-box physical-parameter estimation: fit the unknown parameters of ODE rig models to logged data.')
    .version(VERSION, '-V, --version')
    .exitOverride()
    .configureOutput({
      writeOut: (s) => io.stdout(s),
      writeErr: (s) => io.stderr(s),
    })
    .showHelpAfterError('(run with --help for usage and an example)');

  const ctx: CommandContext = {
    io,
    action(fn: CommandAction) {
      return async (...args: any[]) => {
        exitCode = await fn(...args);
      };
    },
  };
  registerCommands(program, ctx);
  for (const sub of program.commands) sub.exitOverride().configureOutput({ writeOut: (s) => io.stdout(s), writeErr: (s) => io.stderr(s) });

  try {
    await program.parseAsync(argv, { from: 'user' });
    return exitCode;
  } catch (err) {
    return reportError(err, io);
  }
}

function reportError(err: unknown, io: CliIO): number {
  if (err instanceof CommanderError) {
    // --help and --version end here with exit code 0; usage mistakes are input errors.
    if (err.code === 'commander.helpDisplayed' || err.code === 'commander.version' || err.code === 'commander.help') return 0;
    return 2;
  }
  if (err instanceof UserError) {
    const n = err.problems.length;
    io.stderr(`rigcal: ${n === 1 ? 'error' : `${n} errors`}:\n${escapeControls(err.problems.map((p) => formatProblem(p)).join('\n'))}\n`);
    return 2;
  }
  if (err instanceof RunFailure) {
    io.stderr(`rigcal: failed: ${escapeControls(err.message)}\n`);
    return 1;
  }
  // A bug of ours, not the user's: show it in full so that it can be reported.
  io.stderr(`rigcal: internal error (please report it with the model file): ${err instanceof Error ? err.stack : String(err)}\n`);
  return 70;
}
