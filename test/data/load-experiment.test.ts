/** Reading experiment logs: separators, comments, units, windows and the errors users see. */
import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { loadExperimentData } from '../../src/data/load-experiment.js';
import { readCsv } from '../../src/data/csv-table.js';
import { csvFile, dataModel } from './data-model.js';

function userError(fn: () => unknown): UserError {
  try {
    fn();
  } catch (e) {
    if (e instanceof UserError) return e;
    throw e;
  }
  throw new Error('expected a UserError');
}

describe('loadExperimentData', () => {
  it('reads a comma file with comments, blank lines and padded cells', () => {
    const file = csvFile('basic.csv', '# rig log (scenario of our own)\nt, volts ,y\n0, 1.5, 0.1\n\n# note\n0.5,2,0.2\n1.0,2.5,0.3\n');
    const m = dataModel({ inputs: [{ name: 'V', column: 'volts' }], outputs: [{ name: 'y' }], experiment: { file } });
    const d = loadExperimentData(m, 0);
    expect(Array.from(d.time)).toEqual([0, 0.5, 1]);
    expect(Array.from(d.inputs[0])).toEqual([1.5, 2, 2.5]);
    expect(Array.from(d.outputs[0]!)).toEqual([0.1, 0.2, 0.3]);
    expect(Array.from(d.lines)).toEqual([3, 6, 7]);
    expect(d.start).toBe(0);
    expect(d.missing).toEqual([0]);
    expect(d.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('SHA-256 of the file bytes: FIPS 180-2 test vector "abc"', () => {
    // FIPS 180-2, appendix B.1: SHA-256("abc")
    const file = csvFile('abc.csv', 'abc');
    const info = readCsv(file, 'abc.csv', { header: () => {}, row: () => {} });
    expect(info.sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('detects semicolon and tab separators from the header line', () => {
    for (const [name, sep] of [['semi.csv', ';'], ['tab.tsv', '\t']] as const) {
      const file = csvFile(name, ['time', 'u', 'y'].join(sep) + '\n' + ['0', '1', '2'].join(sep) + '\n' + ['1', '3', '4'].join(sep) + '\n');
      const m = dataModel({ inputs: [{ name: 'u' }], outputs: [{ name: 'y' }], experiment: { file } });
      const d = loadExperimentData(m, 0);
      expect(Array.from(d.time)).toEqual([0, 1]);
      expect(Array.from(d.inputs[0])).toEqual([1, 3]);
      expect(Array.from(d.outputs[0]!)).toEqual([2, 4]);
    }
  });

  it('time that does not increase names the first bad line', () => {
    const file = csvFile('order.csv', '# header follows\nt,u\n0,1\n1,1\n# comment\n1,2\n3,1\n');
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file } }), 0));
    expect(e.problems[0].where.line).toBe(6);
    expect(e.message).toMatch(/time does not increase: 1 s follows 1 s \(line 4\)/);
    expect(e.message).toContain('order.csv');
  });

  it('a non-numeric cell names the line and the column; a decimal comma gets a hint', () => {
    const file = csvFile('bad.csv', 't,u,y\n0,1,2\n1,abc,2\n');
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], outputs: [{ name: 'y' }], experiment: { file } }), 0));
    expect(e.problems[0].where.line).toBe(3);
    expect(e.message).toMatch(/column "u" has "abc"/);
    const file2 = csvFile('comma.csv', 't;u\n0;1,5\n');
    const e2 = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file: file2 } }), 0));
    expect(e2.message).toMatch(/decimal comma/);
  });

  it('missing output samples (empty, NaN, nan) are kept as NaN and counted; missing inputs are errors', () => {
    const file = csvFile('missing.csv', 't,u,y,z\n0,1,,5\n1,1,NaN,6\n2,1,nan,7\n3,1,4,\n');
    const m = dataModel({ inputs: [{ name: 'u' }], outputs: [{ name: 'y' }, { name: 'z', column: 'z' }], experiment: { file } });
    const d = loadExperimentData(m, 0);
    expect(d.missing).toEqual([3, 1]);
    expect(Number.isNaN(d.outputs[0]![0])).toBe(true);
    expect(d.outputs[0]![3]).toBe(4);
    const file2 = csvFile('missing-input.csv', 't,u\n0,1\n1,\n');
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file: file2 } }), 0));
    expect(e.problems[0].where.line).toBe(3);
    expect(e.message).toMatch(/input column "u" \(input u\) has a missing value/);
    const file3 = csvFile('missing-time.csv', 't,u\n0,1\nNaN,1\n');
    const e3 = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file: file3 } }), 0));
    expect(e3.problems[0].where.line).toBe(3);
  });

  it('window keeps the rows inside; start defaults to the first kept time, may be earlier, not later', () => {
    const file = csvFile('window.csv', 't,u\n0,0\n1,1\n2,2\n3,3\n4,4\n');
    const m = dataModel({ inputs: [{ name: 'u' }], experiment: { file, window: [1, 3] } });
    const d = loadExperimentData(m, 0);
    expect(Array.from(d.time)).toEqual([1, 2, 3]);
    expect(Array.from(d.inputs[0])).toEqual([1, 2, 3]);
    expect(d.start).toBe(1);
    expect(loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file, window: [1, 3], start: 0.5 } }), 0).start).toBe(0.5);
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file, window: [1, 3], start: 1.5 } }), 0));
    expect(e.message).toMatch(/start 1.5 s is after the first sample at 1 s/);
    const e2 = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file, window: [10, 20] } }), 0));
    expect(e2.message).toMatch(/no rows inside the window \[10, 20\] s; the file's times run from 0 to 4 s/);
  });

  it('time in ms converted into the model time unit s, with the factor back', () => {
    // NIST SP 811: 1 ms = 1e-3 s
    const file = csvFile('ms.csv', 'time_ms,u\n0,1\n250,1\n500,1\n');
    const m = dataModel({ inputs: [{ name: 'u' }], experiment: { file, time: 'time_ms', timeUnit: 'ms', window: [250, 500], start: 100 } });
    const d = loadExperimentData(m, 0);
    expect(Array.from(d.time)).toEqual([0.25, 0.5]);
    expect(d.start).toBeCloseTo(0.1, 15);
    expect(d.timeToColumnUnit).toBeCloseTo(1000, 9);
  });

  it('degC column into K and rpm column into rad/s', () => {
    // NIST SP 811, sec. 4.2.1.1: T/K = t/degC + 273.15; revolution = 2 pi rad, so 60 r/min = 2 pi rad/s
    const file = csvFile('units.csv', 't,temp_c,speed_rpm\n0,20,60\n1,-273.15,3000\n');
    const m = dataModel({
      inputs: [{ name: 'T', unit: 'K', column: 'temp_c', columnUnit: 'degC' }],
      outputs: [{ name: 'w', unit: 'rad/s', column: 'speed_rpm', columnUnit: 'rpm' }],
      experiment: { file },
    });
    const d = loadExperimentData(m, 0);
    expect(d.inputs[0][0]).toBeCloseTo(293.15, 12);
    expect(d.inputs[0][1]).toBeCloseTo(0, 12);
    expect(d.outputs[0]![0]).toBeCloseTo(2 * Math.PI, 12);
    expect(d.outputs[0]![1]).toBeCloseTo(100 * Math.PI, 10);
  });

  it('a column unit of the wrong kind names the model key', () => {
    const file = csvFile('wrongunit.csv', 't,u\n0,1\n');
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u', unit: 'V', columnUnit: 'm' }], experiment: { file } }), 0));
    expect(e.problems[0].where.key).toBe('inputs.u.column_unit');
  });

  it('a missing input column lists the nearest column names; renames with columns work', () => {
    const file = csvFile('names.csv', 't,volts_cmd,amps,speed\n0,1,2,3\n');
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'V', column: 'volt_cmd' }], experiment: { file } }), 0));
    expect(e.message).toMatch(/the column "volt_cmd" of input V is not in the file; nearest columns: "volts_cmd"/);
    const d = loadExperimentData(dataModel({ inputs: [{ name: 'V', column: 'volt_cmd' }], experiment: { file, columns: { V: 'volts_cmd' } } }), 0);
    expect(d.inputs[0][0]).toBe(1);
  });

  it('an output not logged is null, but one that looks like a typo of an unused column is an error', () => {
    const file = csvFile('outputs.csv', 't,u,current\n0,1,2\n');
    const d = loadExperimentData(dataModel({ inputs: [{ name: 'u' }], outputs: [{ name: 'current' }, { name: 'speed' }], experiment: { file } }), 0);
    expect(d.outputs[1]).toBeNull();
    expect(d.missing).toEqual([0, 0]);
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], outputs: [{ name: 'curent' }] , experiment: { file } }), 0));
    expect(e.message).toMatch(/"curent" of output curent is not in the file; nearest columns: "current"/);
  });

  it('rows with the wrong number of fields and repeated header names are errors', () => {
    const file = csvFile('fields.csv', 't,u\n0,1\n1\n');
    expect(userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file } }), 0)).message).toMatch(/this row has 1 fields, the header \(line 1\) has 2/);
    const file2 = csvFile('dup.csv', 't,u,u\n0,1,1\n');
    expect(userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file: file2 } }), 0)).message).toMatch(/column "u" appears twice/);
  });

  it('no time column: an error for dynamic models, row numbers for static ones (rows in any order)', () => {
    const file = csvFile('static.csv', 'speed,torque\n3,0.5\n1,0.2\n2,0.3\n');
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'speed' }], experiment: { file } }), 0));
    expect(e.message).toMatch(/no time column: neither "t" nor "time"/);
    const d = loadExperimentData(dataModel({ isStatic: true, inputs: [{ name: 'speed' }], outputs: [{ name: 'torque' }], experiment: { file } }), 0);
    expect(Array.from(d.time)).toEqual([0, 1, 2]);
    expect(Array.from(d.inputs[0])).toEqual([3, 1, 2]);
  });

  it('a file that cannot be read is a UserError naming it', () => {
    const e = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file: '/nonexistent/log.csv' } }), 0));
    expect(e.message).toMatch(/log\.csv.*cannot read the data file: ENOENT/);
  });
});

describe('readCsv', () => {
  it('refuses files over the size and row caps with a clear message', () => {
    const file = csvFile('cap.csv', 't,u\n0,1\n1,1\n2,1\n');
    const noop = { header: () => {}, row: () => {} };
    expect(() => readCsv(file, 'cap.csv', noop, { maxBytes: 10, maxRows: 100 })).toThrow(/the data file is 16 bytes, more than the 10 bytes rigcal reads into memory/);
    const e = userError(() => readCsv(file, 'cap.csv', noop, { maxBytes: 1e6, maxRows: 2 }));
    expect(e.message).toMatch(/more than 2 data rows/);
    expect(e.problems[0].where.line).toBe(4);
  });

  it('numbers lines as a reader of the file counts them: CRLF, comments, blank and space-only lines, quoted line breaks', () => {
    const text = '# log\r\nt,note\r\n0,a\r\n   \r\n\r\n# mid\r\n1,"two\r\nlines"\r\n2,b\r\n';
    const file = csvFile('lines.csv', text);
    const seen: [string, number][] = [];
    readCsv(file, 'lines.csv', { header: (h, line) => seen.push([h.join('|'), line]), row: (r, line) => seen.push([r.join('|'), line]) });
    // A record with a quoted line break is numbered by the line it ends on.
    expect(seen).toEqual([['t|note', 2], ['0|a', 3], ['1|two\r\nlines', 8], ['2|b', 9]]);
    const cr = csvFile('cr.csv', '# old Mac line ends\rt,u\r0,1\r1,x\r');
    const bad = userError(() => loadExperimentData(dataModel({ inputs: [{ name: 'u' }], experiment: { file: cr } }), 0));
    expect(bad.problems[0].where.line).toBe(4);
    const open = csvFile('open.csv', 't,u\n0,1\n1,"2\n');
    const e = userError(() => readCsv(open, 'open.csv', { header: () => {}, row: () => {} }));
    expect(e.problems[0].where.line).toBe(3);
    expect(e.message).toMatch(/not valid CSV/);
  });

  it('reads CRLF line ends and a byte-order mark', () => {
    const file = csvFile('crlf.csv', '\uFEFFt;u\r\n0;1\r\n1;2\r\n');
    const rows: string[][] = [];
    let header: string[] = [];
    const info = readCsv(file, 'crlf.csv', { header: (h) => (header = h), row: (r) => rows.push(r) });
    expect(header).toEqual(['t', 'u']);
    expect(rows).toEqual([['0', '1'], ['1', '2']]);
    expect(info.delimiter).toBe(';');
  });
});
