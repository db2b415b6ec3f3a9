/**
 * What an interrupted write leaves behind, and its repair. A write (atomic-file.ts, results-folder.ts)
 * builds `.<name>.tmp-<pid>-<hex>` beside its target and, when the target folder exists, moves the old
 * one to `.<name>.old-<pid>-<hex>` just before the new one takes its place. A process killed or
 * interrupted in between leaves these hidden siblings behind, and one killed between the two renames
 * leaves the target missing with the previous results only under the hidden name.
 *
 * The repair runs before every write of a target and before a results folder is read: leftovers of
 * processes that no longer run are removed, and when the target is missing and a previous copy is
 * there, that copy is put back (the state before the interrupted run; that run's own files may be
 * incomplete). Leftovers of a process still running (another rigcal writing now) are left alone.
 */
import { existsSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';

export interface Repair {
  /** The previous copy put back in place of a missing target, if any. */
  restored?: string;
  /** Leftovers removed. */
  removed: string[];
}

interface Leftover {
  path: string;
  kind: 'tmp' | 'old';
  pid: number;
}

/** Restore or clean what interrupted writes of `target` left beside it. */
export function repairInterruptedWrite(target: string): Repair {
  const abs = resolve(target);
  const leftovers = leftoversOf(abs).filter((l) => !isRunning(l.pid));
  const repair: Repair = { removed: [] };
  if (!existsSync(abs)) {
    const previous = leftovers.filter((l) => l.kind === 'old').sort((a, b) => mtime(b.path) - mtime(a.path))[0];
    if (previous) {
      renameSync(previous.path, abs);
      repair.restored = previous.path;
    }
  }
  for (const l of leftovers) {
    if (l.path === repair.restored) continue;
    rmSync(l.path, { recursive: true, force: true });
    repair.removed.push(l.path);
  }
  return repair;
}

/** The hidden siblings `.name.tmp-<pid>-<hex>` and `.name.old-<pid>-<hex>` of a target. */
function leftoversOf(target: string): Leftover[] {
  const dir = dirname(target);
  const prefix = `.${basename(target)}.`;
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return [];
  }
  const out: Leftover[] = [];
  for (const name of names) {
    if (!name.startsWith(prefix)) continue;
    // A fixed pattern on the part after the prefix: short, no nested repetition (linear time).
    const m = /^(tmp|old)-(\d{1,10})-[0-9a-f]{8}$/.exec(name.slice(prefix.length));
    if (m) out.push({ path: join(dir, name), kind: m[1] as 'tmp' | 'old', pid: Number(m[2]) });
  }
  return out;
}

/** Whether a process with this id runs now (ours counts as running: a write of ours may be under way). */
function isRunning(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function mtime(path: string): number {
  try {
    return statSync(path).mtimeMs;
  } catch {
    return 0;
  }
}
