/**
 * An edited log after the fit: `validate` compares the SHA-256 that estimates.yaml records for each
 * data file with the file's now (common practice, no source: a changed fingerprint means other data)
 * and refuses, naming the experiment, the file, both hashes and the fix; --force accepts it and
 * validation.json records both hashes. Hashes checked against node:crypto's SHA-256 of the bytes.
 */
import { appendFileSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { cli, fittedRig, sha256Of } from '../handoff/fitted-rig.js';
import { parse } from 'yaml';
import type { ValidationResult } from '../../src/validation/validation-result.js';

describe('validate with a log edited after the fit', () => {
  let dir: string;
  let before: string;
  let after: string;

  beforeAll(async () => {
    dir = await fittedRig();
    const log = path.join(dir, 'held-out.csv');
    before = sha256Of(log);
    const recorded = (parse(readFileSync(path.join(dir, 'fit', 'estimates.yaml'), 'utf8')).data as { experiment: string; sha256: string }[]).find((d) => d.experiment === 'held-out');
    expect(recorded?.sha256).toBe(before);
    // One more sample at the end: a log someone extended after the fit.
    const lines = readFileSync(log, 'utf8').trimEnd().split('\n');
    const last = lines[lines.length - 1].split(',');
    appendFileSync(log, `${Number(last[0]) + 0.01},${last.slice(1).join(',')}\n`);
    after = sha256Of(log);
  });

  it('refuses it with exit 2, naming the experiment, the file, both hashes and --force', async () => {
    const r = await cli(['validate', 'rig.yaml', '--params', 'fit/estimates.yaml', '-o', 'val'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toContain('held-out.csv');
    expect(r.err).toContain(`the data of experiment held-out changed since the fit: fit/estimates.yaml records sha256 ${before}`);
    expect(r.err).toContain(`it now has sha256 ${after}`);
    expect(r.err).toMatch(/--force/);
    expect(r.err).not.toMatch(/^\s+at /m);
    expect(r.out).toBe('');
  });

  it('accepts it with --force and records both hashes in validation.json and a warning', async () => {
    const r = await cli(['validate', 'rig.yaml', '--params', 'fit/estimates.yaml', '-o', 'val', '--force'], dir);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/warning: the data file held-out\.csv of experiment held-out is not the one the estimates were made from.*validated anyway because of --force/);
    const saved = JSON.parse(readFileSync(path.join(dir, 'val', 'validation.json'), 'utf8')) as ValidationResult;
    expect(saved.dataChanges).toEqual([{ experiment: 'held-out', file: 'held-out.csv', recordedSha256: before, currentSha256: after }]);
    expect(saved.data.find((d) => d.experiment === 'held-out')?.sha256).toBe(after);
  });
});
