/**
 * The decimal rule of a log's cell, read by a hand scan in linear time. Checked against the
 * grammar it replaces, the regular expression /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/ (the
 * decimal literal of JSON, RFC 8259 section 6, loosened to allow a leading +, a leading point and a
 * trailing point), on every string of up to 5 characters from the characters that matter, and for
 * time on megabyte cells (linear scan: common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { readCell } from '../../src/data/numbers.js';
import { isDecimalText } from '../../src/util/decimal.js';

const GRAMMAR = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

function* strings(alphabet: string, maxLength: number): Generator<string> {
  let level = [''];
  yield '';
  for (let n = 1; n <= maxLength; n++) {
    const next: string[] = [];
    for (const s of level) for (const c of alphabet) next.push(s + c);
    yield* next;
    level = next;
  }
}

describe('isDecimalText', () => {
  it('agrees with the decimal grammar on every string of up to 5 characters of "07.eE+-x "', () => {
    let n = 0;
    for (const s of strings('07.eE+-x ', 5)) {
      expect(isDecimalText(s), JSON.stringify(s)).toBe(GRAMMAR.test(s));
      n++;
    }
    expect(n).toBe(66430); // 1 + 9 + 9^2 + ... + 9^5: the walk really covered them
  });

  it('reads a 400 kB cell in linear time, whatever follows the digits', () => {
    const digits = '7'.repeat(400_000);
    for (const cell of [`${digits}x`, `${digits}.${digits}e`, `-.${digits}e+`, `${digits},5`]) {
      const t = performance.now();
      expect(readCell(cell)).toBeNull();
      expect(performance.now() - t).toBeLessThan(200);
    }
    // 400,000 digits are a decimal, whose value is not finite: not a number for a log either.
    expect(readCell(digits)).toBeNull();
    expect(readCell(`0.${digits}`)).toBeCloseTo(0.7777777, 6);
  });
});
