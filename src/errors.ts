/**
 * Errors the library raises. The library never prints or exits: the CLI turns these into messages
 * and exit codes (UserError -> 2, RunFailure -> 1).
 */

/** Where a problem sits in the user's input. Every field is optional; give all that are known. */
export interface SourceLocation {
  /** File path as the user gave it (or relative to the working directory). */
  file?: string;
  /** 1-based line and column in that file. */
  line?: number;
  column?: number;
  /** Dotted key path in the model file, e.g. `parameters.K.free` or `experiments[1].window`. */
  key?: string;
}

/** One problem in the user's input: where, what, and how to mend it. */
export interface Problem {
  where: SourceLocation;
  what: string;
  /** How to mend it, in words (may be omitted only when `what` already says it). */
  fix?: string;
}

export function formatLocation(where: SourceLocation): string {
  let s = where.file ?? '';
  if (where.line !== undefined) s += `${s ? ':' : 'line '}${where.line}`;
  if (where.column !== undefined && where.line !== undefined) s += `:${where.column}`;
  if (where.key) s += `${s ? ' ' : ''}(${where.key})`;
  return s;
}

export function formatProblem(p: Problem): string {
  const loc = formatLocation(p.where);
  return `${loc ? loc + ': ' : ''}${p.what}${p.fix ? `\n  fix: ${p.fix}` : ''}`;
}

/** The input is wrong (command line, model file, data file). Exit code 2. Carries every problem found. */
export class UserError extends Error {
  readonly problems: Problem[];
  constructor(problems: Problem | Problem[]) {
    const list = Array.isArray(problems) ? problems : [problems];
    super(list.map(formatProblem).join('\n'));
    this.name = 'UserError';
    this.problems = list;
  }
}

/** The work ran but failed (cannot simulate at the start values, no step reduces the cost...). Exit code 1. */
export class RunFailure extends Error {
  /** Machine-readable details (time, experiment, parameter values...) for reports. */
  readonly details: Record<string, unknown>;
  constructor(message: string, details: Record<string, unknown> = {}) {
    super(message);
    this.name = 'RunFailure';
    this.details = details;
  }
}

/** Collects problems so that `check` can report all of them, not only the first. */
export class ProblemList {
  readonly items: Problem[] = [];
  add(where: SourceLocation, what: string, fix?: string): void {
    this.items.push({ where, what, fix });
  }
  get empty(): boolean {
    return this.items.length === 0;
  }
  throwIfAny(): void {
    if (this.items.length) throw new UserError(this.items);
  }
}
