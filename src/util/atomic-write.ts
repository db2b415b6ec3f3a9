/**
 * Writing files and folders so that a reader never sees half of them: everything is written beside
 * the target under a temporary name and renamed into place (a rename within one directory is atomic
 * on POSIX file systems). On any error the temporary copy is removed and the old target is left as
 * it was.
 */
import { existsSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';

function tempName(target: string, tag: string): string {
  return join(dirname(target), `.${basename(target)}.${tag}-${process.pid}-${randomBytes(4).toString('hex')}`);
}

/** Write one file through a temporary sibling and a rename. */
export function writeFileAtomic(file: string, content: string | Uint8Array): void {
  const target = resolve(file);
  const tmp = tempName(target, 'tmp');
  try {
    writeFileSync(tmp, content, { flag: 'wx' });
    renameSync(tmp, target);
  } catch (err) {
    rmSync(tmp, { force: true });
    throw err;
  }
}

/** A file of a folder: its content, or a function producing it (called while the folder is built). */
export type FolderEntry = string | Uint8Array | (() => string | Uint8Array);

/**
 * Write a whole folder at once: build it as a temporary sibling, then swap it into place. An existing
 * folder is replaced as a whole, but only when `mayReplace(existing)` says it is one of ours; the
 * caller decides (and raises the user-facing error) before anything is written.
 */
export function writeFolderAtomic(folder: string, files: Record<string, FolderEntry>, mayReplace: (existing: string) => boolean): void {
  const target = resolve(folder);
  if (existsSync(target) && !mayReplace(target)) throw new Error(`refusing to replace ${target}`);
  mkdirSync(dirname(target), { recursive: true });
  const tmp = tempName(target, 'tmp');
  mkdirSync(tmp);
  let old: string | undefined;
  try {
    for (const [name, entry] of Object.entries(files)) {
      if (name.includes('/') || name.includes('\\') || name === '..' || name === '.') throw new Error(`bad file name in results folder: ${name}`);
      const content = typeof entry === 'function' ? entry() : entry;
      writeFileSync(join(tmp, name), content, { flag: 'wx' });
    }
    if (existsSync(target)) {
      old = tempName(target, 'old');
      renameSync(target, old);
    }
    renameSync(tmp, target);
  } catch (err) {
    rmSync(tmp, { recursive: true, force: true });
    if (old !== undefined && !existsSync(target)) renameSync(old, target);
    throw err;
  }
  if (old !== undefined) rmSync(old, { recursive: true, force: true });
}
