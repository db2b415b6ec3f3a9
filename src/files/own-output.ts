/**
 * The one rule for replacing an output file (simulate's CSV, freeze's outputs): a file that rigcal
 * wrote for this kind of output is replaced without asking, like a results folder of ours; any other
 * existing file only with --overwrite. What marks a file as ours is the caller's (the header it
 * writes); only the head of the file is read, so a huge file costs nothing.
 */
import { closeSync, existsSync, openSync, readSync, statSync } from 'node:fs';
import { UserError } from '../errors.js';

/** How much of an existing file is read to recognise it. */
const HEAD_BYTES = 64 * 1024;

/** The first bytes of a file as text (at most HEAD_BYTES). */
export function fileHead(path: string): string {
  const fd = openSync(path, 'r');
  try {
    const buf = Buffer.alloc(HEAD_BYTES);
    const n = readSync(fd, buf, 0, HEAD_BYTES, 0);
    return buf.subarray(0, n).toString('utf8');
  } finally {
    closeSync(fd);
  }
}

/** The first line of a text (without its line break). */
export function firstLine(text: string): string {
  const i = text.search(/\r?\n/);
  return i < 0 ? text : text.slice(0, i);
}

/**
 * Throws a UserError when `path` exists and may not be replaced: it is a folder, or a file that is
 * not ours (`isOurs` of its head) and `overwrite` was not given.
 */
export function assertReplaceableFile(path: string, asGiven: string, overwrite: boolean | undefined, isOurs: (head: string) => boolean, ours: string): void {
  if (!existsSync(path)) return;
  if (statSync(path).isDirectory()) {
    throw new UserError({ where: { file: asGiven }, what: 'is a folder, not a file', fix: 'give the name of a file to write' });
  }
  if (overwrite || isOurs(fileHead(path))) return;
  throw new UserError({ where: { file: asGiven }, what: `exists already and is not ${ours}; it will not be replaced`, fix: 'choose another output file, or add --overwrite to replace it' });
}
