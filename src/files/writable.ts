/**
 * Faults of the machine (read-only or full file system, no permission), said in words with the path:
 * checked before long work where possible, and reported as a user error (exit 2) when a write fails.
 */
import { existsSync, mkdtempSync, rmdirSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { UserError } from '../errors.js';

const REASONS: Record<string, string> = {
  EACCES: 'permission denied',
  EPERM: 'the operation is not permitted',
  EROFS: 'the file system is read-only',
  ENOSPC: 'no space left on the device',
  EDQUOT: 'the disk quota is exceeded',
  ENOTDIR: 'a part of the path is a file, not a folder',
  EISDIR: 'the path is a folder',
  EEXIST: 'a file of that name is in the way',
  ENAMETOOLONG: 'the path is too long',
  EMFILE: 'too many open files',
};

/** Words for a file-system error, with its code: "no space left on the device (ENOSPC)". */
export function fileErrorReason(err: unknown): string {
  const e = err as NodeJS.ErrnoException;
  const words = e?.code ? REASONS[e.code] : undefined;
  return words ? `${words} (${e.code})` : String(e?.message ?? err);
}

/** True for the errors a file system raises (a code such as ENOSPC), as opposed to bugs of ours. */
export function isFileError(err: unknown): boolean {
  const code = (err as NodeJS.ErrnoException)?.code;
  return typeof code === 'string' && /^E[A-Z]+$/.test(code);
}

/**
 * Checks, before the work, that `target` (a file or folder to be written) can be created: a probe
 * folder is made and removed in the nearest folder that exists on its path. Throws a UserError that
 * names the folder and the reason.
 */
export function assertCanWrite(target: string, label: string, fix: string): void {
  let dir = dirname(resolve(target));
  while (!existsSync(dir) && dirname(dir) !== dir) dir = dirname(dir);
  try {
    if (!statSync(dir).isDirectory()) throw Object.assign(new Error('not a folder'), { code: 'ENOTDIR' });
    rmdirSync(mkdtempSync(join(dir, '.rigcal-probe-')));
  } catch (err) {
    if (!isFileError(err)) throw err;
    throw new UserError({ where: { file: dir }, what: `cannot write the ${label} ${target} here: ${fileErrorReason(err)}`, fix });
  }
}

/** A failed write as a user error that names the path and the reason. */
export function writeFailure(target: string, label: string, err: unknown, fix: string): UserError {
  return new UserError({ where: { file: target }, what: `could not write the ${label}: ${fileErrorReason(err)}; nothing was written`, fix });
}
