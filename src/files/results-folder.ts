/**
 * Results folders (`fit`'s and `validate`'s): where they go by default, the guard that never
 * replaces a folder that is not ours, and the atomic write of a whole folder (built as a temporary
 * sibling, then swapped into place).
 */
import { existsSync, mkdirSync, readFileSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { UserError } from '../errors.js';
import { tempName } from './atomic-file.js';
import { repairInterruptedWrite } from './interrupted-writes.js';
import { assertCanWrite, isFileError, writeFailure } from './writable.js';

/** What makes a folder a results folder of ours: its marker file and the files it may hold. */
export interface ResultsFolderKind {
  /** In messages: "a results folder", "a validation folder". */
  label: string;
  /** The default folder is `./<model name><suffix>/`. */
  suffix: string;
  /** The JSON file whose content says the folder is ours. */
  marker: string;
  isOurs(markerJson: Record<string, unknown>): boolean;
  /** Every file a folder of this kind may hold; anything else means the folder is someone else's. */
  files: readonly string[];
}

export const FIT_FOLDER: ResultsFolderKind = {
  label: 'results',
  suffix: '-fit',
  marker: 'fit.json',
  isOurs: (json) => json.tool === 'rigcal',
  files: ['estimates.yaml', 'fit.json', 'residuals.csv', 'report.html'],
};

export const VALIDATION_FOLDER: ResultsFolderKind = {
  label: 'validation',
  suffix: '-validate',
  marker: 'validation.json',
  isOurs: (json) => json.tool === 'rigcal' && json.kind === 'validation',
  files: ['validation.json', 'residuals.csv', 'report.html'],
};

/** Default results folder: `./<model name>-fit/` (or the kind's suffix) below `cwd`. */
export function defaultResultsFolder(cwd: string, modelName: string, kind: ResultsFolderKind = FIT_FOLDER): string {
  // The loader already restricts names; checked again because this one becomes a path.
  if (!modelName || /[\\/\0]/.test(modelName) || modelName.startsWith('.')) {
    throw new UserError({ where: { key: 'name' }, what: `the model name "${modelName}" cannot name a results folder`, fix: 'use letters, digits, - and _ in the model name, or give the folder with -o' });
  }
  return resolve(cwd, `${modelName}${kind.suffix}`);
}

const WRITE_FIX = 'choose a writable folder with -o, or free space or fix the permissions there';

/**
 * The folder to write: `-o` (relative to `cwd`) or the default. Before any work: what an interrupted
 * earlier write left there is repaired, and the folder is refused if it is not ours or cannot be written.
 */
export function chooseResultsFolder(cwd: string, output: string | undefined, modelName: string, kind: ResultsFolderKind): string {
  const folder = output ? resolve(cwd, output) : defaultResultsFolder(cwd, modelName, kind);
  repairInterruptedWrite(folder);
  assertReplaceable(folder, kind);
  assertCanWrite(folder, `${kind.label} folder`, WRITE_FIX);
  return folder;
}

/** Throws a UserError when `folder` exists and is not a results folder of ours of this kind. */
export function assertReplaceable(folder: string, kind: ResultsFolderKind = FIT_FOLDER): void {
  if (!existsSync(folder)) return;
  const fix = 'choose another folder with -o, or move that folder away';
  if (!statSync(folder).isDirectory()) {
    throw new UserError({ where: { file: folder }, what: 'the results path exists and is not a folder', fix });
  }
  const entries = readdirSync(folder);
  if (!markedOurs(folder, entries, kind)) {
    throw new UserError({ where: { file: folder }, what: `this folder exists and is not a ${kind.label} folder of rigcal (no ${kind.marker} of ours inside); it will not be replaced`, fix });
  }
  // Leftovers of an interrupted atomic write of one of our files (".fit.json.tmp-...") are ours too.
  const ourTemp = (e: string) => kind.files.some((f) => e.startsWith(`.${f}.tmp-`));
  const foreign = entries.filter((e) => !kind.files.includes(e) && !ourTemp(e));
  if (foreign.length) {
    throw new UserError({ where: { file: folder }, what: `the previous ${kind.label} folder holds files rigcal did not write (${foreign.slice(0, 5).join(', ')}${foreign.length > 5 ? ', ...' : ''}); replacing it would delete them`, fix });
  }
}

function markedOurs(folder: string, entries: readonly string[], kind: ResultsFolderKind): boolean {
  if (!entries.includes(kind.marker)) return false;
  try {
    const json = JSON.parse(readFileSync(join(folder, kind.marker), 'utf8')) as unknown;
    return typeof json === 'object' && json !== null && kind.isOurs(json as Record<string, unknown>);
  } catch {
    return false;
  }
}

/** A file of a folder: its content, or a function producing it (called while the folder is built). */
export type FolderEntry = string | Uint8Array | (() => string | Uint8Array);

/**
 * Repair and guard, then write the whole folder at once; returns its absolute path. A fault of the
 * machine (full disk, read-only, no permission) is a user error that names the folder and the reason.
 */
export function writeResultsFolder(folder: string, files: Record<string, FolderEntry>, kind: ResultsFolderKind): string {
  const target = resolve(folder);
  repairInterruptedWrite(target);
  assertReplaceable(target, kind);
  try {
    writeFolderAtomic(target, files);
  } catch (err) {
    if (isFileError(err)) throw writeFailure(target, `${kind.label} folder`, err, WRITE_FIX);
    throw err;
  }
  return target;
}

/**
 * Write a whole folder at once: build it as a temporary sibling, then swap it into place; an existing
 * folder is replaced as a whole (the caller has guarded it). On any error the temporary copy goes
 * and the old folder stays as it was.
 */
function writeFolderAtomic(folder: string, files: Record<string, FolderEntry>): void {
  const target = resolve(folder);
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
