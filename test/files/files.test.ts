/**
 * The one home of files in and out (src/files): the CSV writer's quoting, the rule that an output is
 * never an input, and the one policy for estimates of another model version.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { renderCsv } from '../../src/files/csv.js';
import { checkDataVersions, checkModelVersion, readEstimates, type EstimatesFile } from '../../src/files/estimates-file.js';
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

describe('whether the data files are those the estimates were made from (common practice, no source: same SHA-256 of each log)', () => {
  const dir = mkdtempSync(join(tmpdir(), 'rigcal-data-version-'));
  const log = join(dir, 'log.csv');
  writeFileSync(log, 't,y\n0,1\n1,2\n');
  // SHA-256 of the bytes above, computed independently (sha256sum of the same 16 bytes).
  const recorded = createHash('sha256').update('t,y\n0,1\n1,2\n').digest('hex');
  const model = { experiments: [{ name: 'run', file: log, fileAsWritten: 'log.csv' }] } as unknown as Model;
  const estimates = (sha256: string) => ({ data: [{ experiment: 'run', role: 'fit', file: 'log.csv', sha256 }] }) as EstimatesFile;

  it('accepts the log as it was', () => {
    expect(checkDataVersions(estimates(recorded), model, { estimatesLabel: 'est.yaml' })).toEqual([]);
  });

  it('refuses an edited log naming experiment, file, both hashes and the fix; --force returns both hashes', () => {
    writeFileSync(log, 't,y\n0,1\n1,2.5\n');
    const now = createHash('sha256').update('t,y\n0,1\n1,2.5\n').digest('hex');
    expect(() => checkDataVersions(estimates(recorded), model, { estimatesLabel: 'est.yaml' })).toThrow(UserError);
    try {
      checkDataVersions(estimates(recorded), model, { estimatesLabel: 'est.yaml' });
    } catch (err) {
      const [p] = (err as UserError).problems;
      expect(p.where.file).toBe('log.csv');
      expect(p.what).toContain(`experiment run changed since the fit: est.yaml records sha256 ${recorded}`);
      expect(p.what).toContain(`it now has sha256 ${now}`);
      expect(p.fix).toMatch(/--force/);
    }
    expect(checkDataVersions(estimates(recorded), model, { estimatesLabel: 'est.yaml', force: true })).toMatchObject([{ experiment: 'run', file: 'log.csv', recorded, current: now }]);
  });
});

describe('an estimates file that is no estimates file', () => {
  const dir = mkdtempSync(join(tmpdir(), 'rigcal-estimates-'));

  it('refuses a YAML alias bomb with a located UserError instead of expanding it', () => {
    const file = join(dir, 'bomb.yaml');
    // Nine-fold nested aliases (the "billion laughs" shape): 9^5 strings if expanded.
    const levels = ['a: &a ["x","x","x","x","x","x","x","x","x"]'];
    for (const [prev, next] of [['a', 'b'], ['b', 'c'], ['c', 'd'], ['d', 'e']]) levels.push(`${next}: &${next} [${Array(9).fill(`*${prev}`).join(',')}]`);
    writeFileSync(file, `tool: rigcal\n${levels.join('\n')}\nparameters: { K: { value: 1 } }\n`);
    expect(() => readEstimates(file)).toThrow(UserError);
    expect(() => readEstimates(file)).toThrow(/aliases .* expand to far more data/);
    try {
      readEstimates(file);
    } catch (err) {
      expect((err as UserError).problems[0].where.file).toBe(file);
    }
  });

  it('refuses a file of two YAML documents, saying so', () => {
    const file = join(dir, 'two.yaml');
    writeFileSync(file, 'tool: rigcal\nparameters: { K: { value: 1 } }\n---\ntool: rigcal\n');
    expect(() => readEstimates(file)).toThrow(UserError);
    try {
      readEstimates(file);
    } catch (err) {
      const [p] = (err as UserError).problems;
      expect(p.where).toMatchObject({ file, line: 3 });
      expect(p.what).toMatch(/more than one YAML document/);
    }
  });
});
