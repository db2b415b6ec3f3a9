/**
 * The one home of files in and out (src/files): the CSV writer's quoting, the rule that an output is
 * never an input, and the one policy for estimates of another model version.
 */
import { mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { renderCsv } from '../../src/files/csv.js';
import { checkModelVersion, type EstimatesFile } from '../../src/files/estimates-file.js';
import { outputFileProblem } from '../../src/files/input-guard.js';
import type { Model } from '../../src/model/types.js';

const dir = mkdtempSync(join(tmpdir(), 'rigcal-files-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('the CSV writer', () => {
  it('quotes a field only when it holds a comma, a quote or a line break, doubling quotes (RFC 4180, section 2, rules 6 and 7)', () => {
    const text = renderCsv(['name', 'value'], [['plain', 1.5], ['a,b', NaN], ['say "hi"', -0.25], ['two\nlines', Infinity], ['cr\ronly', 3]]);
    expect(text.split('\n')[1]).toBe('plain,1.5');
    expect(text).toContain('"a,b",\n');
    expect(text).toContain('"say ""hi""",-0.25\n');
    // An independent reader gets every field back; non-finite numbers are empty cells.
    const rows = parse(text, { columns: true }) as Record<string, string>[];
    expect(rows.map((r) => r.name)).toEqual(['plain', 'a,b', 'say "hi"', 'two\nlines', 'cr\ronly']);
    expect(rows.map((r) => r.value)).toEqual(['1.5', '', '-0.25', '', '3']);
  });
});

describe('an output is never an input (real paths compared)', () => {
  const model = join(dir, 'm.yaml');
  writeFileSync(model, 'x');
  symlinkSync(model, join(dir, 'link.yaml'));
  const inputs = [{ file: model, what: 'the model file itself' }];
  const at = (file: string) => ({ file, where: { key: '-o' }, example: '-o out.csv' });

  it('catches the input through a link and through ../', () => {
    expect(outputFileProblem(at(join(dir, 'link.yaml')), inputs)?.what).toMatch(/the model file itself; rigcal never overwrites/);
    expect(outputFileProblem(at(join(dir, 'sub', '..', 'm.yaml')), inputs)?.what).toMatch(/never overwrites/);
  });

  it('refuses a folder and lets a new file through', () => {
    expect(outputFileProblem(at(dir), inputs)?.what).toMatch(/is a folder/);
    expect(outputFileProblem(at(join(dir, 'new.csv')), inputs)).toBeUndefined();
  });
});

describe('whether estimates belong to this model version (common practice, no source: same SHA-256 of the model file)', () => {
  const model = { sha256: 'a'.repeat(64) } as Model;
  const estimates = (sha256: string) => ({ model: { name: 'm', file: 'm.yaml', sha256 } }) as EstimatesFile;
  const labels = { estimatesLabel: 'est.yaml', modelLabel: 'm.yaml' };

  it('accepts the same hash without a word', () => {
    expect(checkModelVersion(estimates('a'.repeat(64)), model, labels)).toBeUndefined();
  });

  it('refuses another, a missing or a malformed hash unless forced, and names the fix', () => {
    for (const sha of ['b'.repeat(64), '', 'abc\ninjected: 1']) {
      expect(() => checkModelVersion(estimates(sha), model, labels)).toThrow(UserError);
      expect(() => checkModelVersion(estimates(sha), model, labels)).toThrow(/another version of the model.*--force/s);
    }
  });

  it('when forced, reports the mismatch with the recorded hash shown safely', () => {
    expect(checkModelVersion(estimates('b'.repeat(64)), model, { ...labels, force: true })).toMatchObject({ estimates: 'b'.repeat(64), model: 'a'.repeat(64) });
    expect(checkModelVersion(estimates(''), model, { ...labels, force: true })?.estimates).toBe('(none recorded)');
    const odd = checkModelVersion(estimates('abc\ninjected: 1'), model, { ...labels, force: true });
    expect(odd?.estimates).toBe('(not a SHA-256)');
    expect(odd?.warning).not.toMatch(/\n/);
    expect(odd?.warning).toMatch(/different version of m\.yaml/);
  });
});
