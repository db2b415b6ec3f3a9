/**
 * Faults of the machine and interrupted runs (src/files/interrupted-writes.ts, writable.ts): what a
 * killed write leaves beside a results folder is restored or cleaned by the next run or reader, a
 * folder that cannot be written is refused before the fit, and a write that fails says where and why
 * and keeps the estimates in its message. Common practice, no source: the project's own rules
 * (results are written whole or not at all; nothing the user gave is lost).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { rigcal, scratchDir } from '../cli/run-cli.js';
import { UserError } from '../../src/errors.js';
import { repairInterruptedWrite } from '../../src/files/interrupted-writes.js';
import { FIT_FOLDER, writeResultsFolder } from '../../src/files/results-folder.js';
import { runFit } from '../../src/verbs/fit.js';
import { writeThermalRig } from '../estimation/helpers/rigs.js';

const { dir, cleanup } = scratchDir('faults');
afterAll(cleanup);
const model = writeThermalRig(dir);

/** The id of a process that has ended (a finished child's). */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', '0']);
  return child.pid!;
}

const hidden = (folder: string) => readdirSync(join(folder, '..')).filter((n) => n.startsWith(`.${folder.split('/').pop()}.`));

describe('an interrupted write of a results folder', () => {
  it('killed between its two renames: the next fit puts the previous folder back, then replaces it, and leaves nothing hidden', async () => {
    const out = join(dir, 'between');
    expect((await rigcal(['fit', model, '-o', out, '--quiet'], dir)).code).toBe(0);
    const before = readFileSync(join(out, 'fit.json'), 'utf8');
    // The state a kill leaves between "old folder moved aside" and "new folder moved in".
    const pid = deadPid();
    renameSync(out, join(dir, `.between.old-${pid}-0123abcd`));
    mkdirSync(join(dir, `.between.tmp-${pid}-89abcdef`));
    writeFileSync(join(dir, `.between.tmp-${pid}-89abcdef`, 'fit.json'), '{"tool": "rig');
    expect(existsSync(out)).toBe(false);

    const repaired = repairInterruptedWrite(out);
    expect(repaired.restored).toBe(join(dir, `.between.old-${pid}-0123abcd`));
    expect(readFileSync(join(out, 'fit.json'), 'utf8')).toBe(before);
    expect(hidden(out)).toEqual([]);

    // Once more, and this time the next fit repairs it by itself and writes its own results.
    renameSync(out, join(dir, `.between.old-${pid}-0123abcd`));
    expect((await rigcal(['fit', model, '-o', out, '--quiet'], dir)).code).toBe(0);
    expect(JSON.parse(readFileSync(join(out, 'fit.json'), 'utf8')).tool).toBe('rigcal');
    expect(hidden(out)).toEqual([]);
  });

  it('`rigcal report` on a folder whose write was interrupted restores it and writes the report', async () => {
    const out = join(dir, 'reader');
    expect((await rigcal(['fit', model, '-o', out, '--quiet'], dir)).code).toBe(0);
    renameSync(out, join(dir, `.reader.old-${deadPid()}-00ff00ff`));
    const run = await rigcal(['report', out], dir);
    expect(run.code, run.stderr).toBe(0);
    expect(existsSync(join(out, 'report.html'))).toBe(true);
    expect(hidden(out)).toEqual([]);
  });

  it('leaves alone what a process that still runs is writing', () => {
    const target = join(dir, 'busy');
    mkdirSync(target);
    const live = join(dir, `.busy.tmp-${process.ppid}-abcdef01`);
    mkdirSync(live);
    expect(repairInterruptedWrite(target).removed).toEqual([]);
    expect(existsSync(live)).toBe(true);
    rmSync(live, { recursive: true });
  });
});

describe('a folder that cannot be written', () => {
  it('is refused before the fit, naming the folder and the reason (exit 2)', async () => {
    writeFileSync(join(dir, 'plain-file'), 'not a folder');
    const run = await rigcal(['fit', model, '-o', join(dir, 'plain-file', 'results'), '--quiet'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/cannot write the results folder .*plain-file.*a part of the path is a file, not a folder \(ENOTDIR\)/);
    expect(run.stderr).not.toMatch(/ at .*\.ts:\d+/); // no stack trace
  });

  it('failing during the write (a full disk) leaves the old folder as it was and says where and why', () => {
    const out = join(dir, 'full');
    mkdirSync(out);
    writeFileSync(join(out, 'fit.json'), JSON.stringify({ tool: 'rigcal' }));
    const full = () => {
      throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
    };
    let caught: unknown;
    try {
      writeResultsFolder(out, { 'fit.json': '{"tool":"rigcal","new":true}', 'residuals.csv': full }, FIT_FOLDER);
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(UserError);
    expect((caught as UserError).message).toMatch(/could not write the results folder: no space left on the device \(ENOSPC\); nothing was written/);
    expect(JSON.parse(readFileSync(join(out, 'fit.json'), 'utf8'))).toEqual({ tool: 'rigcal' });
    expect(hidden(out)).toEqual([]);
  });

  it('becoming unwritable while the fit runs: the error keeps the estimates, so the work is not lost', async () => {
    const parent = join(dir, 'vanishing');
    mkdirSync(parent);
    let broken = false;
    const onProgress = () => {
      if (broken) return;
      broken = true;
      rmSync(parent, { recursive: true });
      writeFileSync(parent, 'a file where the folder was');
    };
    await expect(runFit({ modelFile: model, cwd: dir, output: join(parent, 'out'), onProgress, renderHtml: false })).rejects.toThrow(
      /the fit finished \(converged, \d+ iterations\) but could not write the results folder: .*\(E[A-Z]+\); nothing was written.*the estimates were C = [\d.e+-]+ J\/K, R = /s,
    );
  });
});
