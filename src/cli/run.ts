/**
 * The CLI as a function: parses argv, runs one command, turns library errors into messages and exit
 * codes (UserError -> 2, RunFailure -> 1; error-report.ts). No stack trace for a user error.
 */
import { Command } from 'commander';
import { VERSION } from '../version.js';
import { reportError } from './error-report.js';
import type { CliIO, CommandAction, CommandContext } from './io.js';
import { registerCommands } from './commands/index.js';

export async function runCli(argv: string[], io: CliIO): Promise<number> {
  let exitCode = 0;
  const json = asksForJson(argv);
  // With --json, a usage mistake is reported as JSON on standard output (error-report.ts), not as text.
  const writeErr = (s: string) => (json ? undefined : io.stderr(s));
  const program = new Command();
  program
    .name('rigcal')
    .description('Gray-box physical-parameter estimation: fit the unknown parameters of ODE rig models to logged data.')
    .version(VERSION, '-V, --version')
    .exitOverride()
    .configureOutput({
      writeOut: (s) => io.stdout(s),
      writeErr,
    })
    .showHelpAfterError('(run with --help for usage and an example)');

  let quiet = false;
  const ctx: CommandContext = {
    io: silencedWhen(io, () => quiet),
    action(fn: CommandAction) {
      return async (...args: any[]) => {
        // Commander passes the command last; every command has --quiet (options.ts, mannerOptions).
        quiet = Boolean((args[args.length - 1] as Command).opts().quiet);
        exitCode = await fn(...args);
      };
    },
  };
  registerCommands(program, ctx);
  for (const sub of program.commands) sub.exitOverride().configureOutput({ writeOut: (s) => io.stdout(s), writeErr });

  try {
    await program.parseAsync(argv, { from: 'user' });
    return exitCode;
  } catch (err) {
    return reportError(err, io, json);
  }
}

/**
 * Whether --json was given, read before commander parses: an error while parsing (an unknown option)
 * must already know its form. Words after `--` are operands, not options.
 */
function asksForJson(argv: string[]): boolean {
  const end = argv.indexOf('--');
  return (end < 0 ? argv : argv.slice(0, end)).includes('--json');
}

/**
 * The commands' view of `io`: with --quiet, nothing reaches standard error (no notes, no progress),
 * so that a command prints its result alone. Error messages bypass it (runCli reports them on `io`).
 */
function silencedWhen(io: CliIO, quiet: () => boolean): CliIO {
  return {
    stdout: (s) => io.stdout(s),
    stderr: (s) => (quiet() ? undefined : io.stderr(s)),
    get stderrIsTTY() {
      return io.stderrIsTTY && !quiet();
    },
    cwd: io.cwd,
  };
}
