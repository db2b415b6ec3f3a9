/**
 * Writing a file so that a reader never sees half of it: it is written beside the target under a
 * temporary name and renamed into place (a rename within one directory is atomic on POSIX file
 * systems). On any error the temporary copy is removed and the old target is left as it was.
 * Whole folders: results-folder.ts.
 */
import { renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import { repairInterruptedWrite } from './interrupted-writes.js';

/** A hidden sibling of `target` (`.name.tag-pid-random`), unique to this write. */
export function tempName(target: string, tag: string): string {
  return join(dirname(target), `.${basename(target)}.${tag}-${process.pid}-${randomBytes(4).toString('hex')}`);
}

/** Write one file through a temporary sibling and a rename. */
export function writeFileAtomic(file: string, content: string | Uint8Array): void {
  const target = resolve(file);
  repairInterruptedWrite(target);
  const tmp = tempName(target, 'tmp');
  try {
    writeFileSync(tmp, content, { flag: 'wx' });
    renameSync(tmp, target);
  } catch (err) {
    rmSync(tmp, { force: true });
    throw err;
  }
}
