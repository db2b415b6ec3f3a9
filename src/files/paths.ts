/** Paths as commands receive them. */
import { isAbsolute, resolve } from 'node:path';

/**
 * A path as the user typed it, made absolute against the command's working directory when that
 * differs from the process's (in-process runs, tests); otherwise left as typed, so that messages
 * show it the way the user wrote it.
 */
export function pathFromCwd(path: string, cwd: string): string {
  return isAbsolute(path) || resolve(cwd) === process.cwd() ? path : resolve(cwd, path);
}
