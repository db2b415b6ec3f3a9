/**
 * `freeze` after a fit log was edited: refused (exit 2) with both hashes, since the hand-off would
 * state a hash the data no longer have; with --force the frozen file's comments state both.
 * Common practice, no source: a changed SHA-256 of a file means other bytes. Hashes from node:crypto.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { cli, fittedRig, sha256Of } from './fitted-rig.js';

describe('freeze with a fit log edited after the fit', () => {
  let dir: string;
  let before: string;
  let after: string;

  beforeAll(async () => {
    dir = await fittedRig();
    const log = path.join(dir, 'shake.csv');
    before = sha256Of(log);
    // One measured value changed by hand (the second data row, last column).
    const lines = readFileSync(log, 'utf8').split('\n');
    const cells = lines[2].split(',');
    cells[cells.length - 1] = String(Number(cells[cells.length - 1]) + 0.001);
    lines[2] = cells.join(',');
    writeFileSync(log, lines.join('\n'));
    after = sha256Of(log);
  });

  it('refuses it, naming the experiment, the file and both hashes, and writes nothing', async () => {
    const r = await cli(['freeze', 'rig.yaml', '--params', 'fit/estimates.yaml', '-o', 'calibrated.yaml'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toContain('shake.csv');
    expect(r.err).toContain(`the data of experiment shake changed since the fit: fit/estimates.yaml records sha256 ${before}`);
    expect(r.err).toContain(`it now has sha256 ${after}`);
    expect(r.err).toMatch(/--force/);
    expect(existsSync(path.join(dir, 'calibrated.yaml'))).toBe(false);
  });

  it('with --force, the frozen file states the recorded and the current hash', async () => {
    const r = await cli(['freeze', 'rig.yaml', '--params', 'fit/estimates.yaml', '-o', 'calibrated.yaml', '--force'], dir);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/warning: the data file shake\.csv of experiment shake is not the one the estimates were made from/);
    const text = readFileSync(path.join(dir, 'calibrated.yaml'), 'utf8');
    expect(text).toContain(`shake (fit): shake.csv, sha256 ${before} when fitted; CHANGED since: the file now has sha256 ${after} (frozen anyway with --force)`);
    // The untouched logs keep their one hash.
    expect(text).toContain(`bump (fit): bump.csv, sha256 ${sha256Of(path.join(dir, 'bump.csv'))}\n`);
  });
});
