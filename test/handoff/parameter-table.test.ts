/**
 * `freeze --format json|csv`: the parameter table alone, read back by ordinary parsers with every
 * value intact (full precision) and empty/null cells where a value does not apply.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { PARAMETER_TABLE_COLUMNS, parameterTable, parameterTableCsv, parameterTableJson } from '../../src/handoff/parameter-table.js';
import { readEstimates } from '../../src/files/estimates-file.js';

const K = 0.052103847561029384;
const W = -3.141592653589793e-7;

// The estimates.yaml layout of cli-and-results.md, as `fit` writes it.
const ESTIMATES = `tool: rigcal
version: 0.1.0
model: { name: "rig, with comma", file: rig.yaml, sha256: ${'a'.repeat(64)} }
fit: { status: converged, message: done, date: 2026-11-30T10:00:00.000Z }
data:
  - { experiment: steps, role: fit, file: steps.csv, sha256: ${'b'.repeat(64)} }
parameters:
  K: { value: ${K}, unit: N*m/A, status: estimated, stdError: 0.0003, ci95: [0.0515, 0.0527], atBound: false }
  R: { value: 1.92, unit: ohm, status: fixed }
  b: { value: 0, unit: "N*m*s/rad", status: estimated, stdError: null, ci95: null, atBound: lower }
  w0@steps: { value: ${W}, unit: rad/s, status: estimated, experiment: steps, stdError: 1e-8, ci95: [-3.3e-7, -2.9e-7], atBound: false }
noise:
  speed: { sigma: 0.49, unit: rad/s, estimated: true }
`;

function estimatesFile(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'rigcal-table-'));
  const file = path.join(dir, 'estimates.yaml');
  writeFileSync(file, ESTIMATES);
  return file;
}

describe('parameter table', () => {
  const rows = parameterTable(readEstimates(estimatesFile()));

  it('has one row per parameter, per-experiment copies with their experiment', () => {
    expect(rows.map((r) => r.name)).toEqual(['K', 'R', 'b', 'w0@steps']);
    expect(rows[3]).toEqual({ name: 'w0@steps', value: W, unit: 'rad/s', stdError: 1e-8, ci95Low: -3.3e-7, ci95High: -2.9e-7, status: 'estimated', experiment: 'steps' });
    expect(rows[1]).toEqual({ name: 'R', value: 1.92, unit: 'ohm', stdError: null, ci95Low: null, ci95High: null, status: 'fixed', experiment: null });
  });

  it('round-trips through JSON exactly', () => {
    const back = JSON.parse(parameterTableJson(rows));
    expect(back).toEqual(rows);
    expect(back[0].value).toBe(K);
  });

  it('round-trips through CSV with the documented columns and full precision', () => {
    const csv = parameterTableCsv(rows);
    const records = parseCsv(csv, { columns: true }) as Record<string, string>[];
    expect(Object.keys(records[0])).toEqual([...PARAMETER_TABLE_COLUMNS]);
    expect(Number(records[0].value)).toBe(K);
    expect(Number(records[3].value)).toBe(W);
    expect(records[0].ci95Low).toBe('0.0515');
    expect(records[2]).toMatchObject({ name: 'b', stdError: '', ci95Low: '', ci95High: '', status: 'estimated', experiment: '' });
    expect(records[1]).toMatchObject({ status: 'fixed', unit: 'ohm', experiment: '' });
    // A unit with `*` and `/` needs no quoting; the header row comes first.
    expect(csv.split('\n')[0]).toBe('name,value,unit,stdError,ci95Low,ci95High,status,experiment');
  });
});
