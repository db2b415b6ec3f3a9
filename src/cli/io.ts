/** What a command may touch of the outside world, so that tests can run commands in-process. */
export interface CliIO {
  stdout(text: string): void;
  stderr(text: string): void;
  /** True when standard error is a terminal (progress is shown only then). */
  stderrIsTTY: boolean;
  cwd: string;
}

/** A command's action: returns the exit code (0 done, 1 the work failed); throws UserError for exit 2. */
export type CommandAction = (...args: any[]) => Promise<number> | number;

export interface CommandContext {
  io: CliIO;
  /** Wrap an action so that its exit code is recorded for runCli. */
  action(fn: CommandAction): (...args: any[]) => Promise<void>;
}
