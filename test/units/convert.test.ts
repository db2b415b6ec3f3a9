/**
 * Unit conversion factors against NIST Special Publication 811 (2008 edition), "Guide for the Use
 * of the International System of Units (SI)", Appendix B.8 (factors in alphabetical order) and
 * B.9 (factors by kind of quantity). The factors below are quoted from SP 811 from memory; SP 811
 * prints them to 7 significant digits (exact ones are marked so in SP 811 and checked tightly here).
 */
import { describe, expect, it } from 'vitest';
import { unitConverter } from '../../src/units/convert.js';

function factor(from: string, to: string): number {
  const c = unitConverter(from, to);
  if (!c.ok) throw new Error(c.reason);
  return c.factor;
}

/** |actual/expected - 1| <= rel. */
function expectRel(actual: number, expected: number, rel: number): void {
  expect(Math.abs(actual / expected - 1), `${actual} vs ${expected}`).toBeLessThanOrEqual(rel);
}

// Half a unit in the 7th significant digit, the precision SP 811 prints.
const SP811 = 5e-7;
const EXACT = 1e-12;

describe('factors of NIST SP 811 (2008), Appendix B', () => {
  it('inch to metre: 2.54 E-02 exactly (SP 811 B.8, "inch")', () => {
    expectRel(factor('in', 'm'), 2.54e-2, EXACT);
  });
  it('foot to metre: 3.048 E-01 exactly (SP 811 B.8, "foot")', () => {
    expectRel(factor('ft', 'm'), 3.048e-1, EXACT);
  });
  it('millimetre to metre: 1 E-03 (SI prefix milli, SP 811 Table 5)', () => {
    expectRel(factor('mm', 'm'), 1e-3, EXACT);
  });
  it('pound-force to newton: 4.448 222 E+00 (SP 811 B.8, "pound-force")', () => {
    expectRel(factor('lbf', 'N'), 4.448222, SP811);
  });
  it('psi to pascal: 6.894 757 E+03 (SP 811 B.8, "pound-force per square inch")', () => {
    expectRel(factor('psi', 'Pa'), 6.894757e3, SP811);
  });
  it('bar to pascal: 1.0 E+05 exactly (SP 811 B.8, "bar")', () => {
    expectRel(factor('bar', 'Pa'), 1e5, EXACT);
  });
  it('standard atmosphere to pascal: 1.013 25 E+05 exactly (SP 811 B.8, "atmosphere, standard")', () => {
    expectRel(factor('atm', 'Pa'), 1.01325e5, EXACT);
  });
  it('degree (angle) to radian: 1.745 329 E-02 (SP 811 B.8, "degree")', () => {
    expectRel(factor('deg', 'rad'), 1.745329e-2, SP811);
  });
  it('pound (avoirdupois) to kilogram: 4.535 924 E-01 (SP 811 B.8, "pound (avoirdupois)")', () => {
    expectRel(factor('lb', 'kg'), 4.535924e-1, SP811);
  });
  it('mile to metre: 1.609 344 E+03 (SP 811 B.8, "mile")', () => {
    expectRel(factor('mi', 'm'), 1.609344e3, SP811);
  });
  it('foot pound-force to joule: 1.355 818 E+00 (SP 811 B.8, "foot pound-force")', () => {
    expectRel(factor('ft*lbf', 'J'), 1.355818, SP811);
  });
  it('pound-force inch to newton metre: 1.129 848 E-01 (SP 811 B.9, "moment of force")', () => {
    expectRel(factor('lbf*in', 'N*m'), 1.129848e-1, SP811);
  });
  it('kilometre per hour to metre per second: 2.777 778 E-01 (SP 811 B.8, "kilometer per hour")', () => {
    expectRel(factor('km/h', 'm/s'), 2.777778e-1, SP811);
  });
  it('minute and hour to second: 6.0 E+01 and 3.6 E+03 exactly (SP 811 B.8)', () => {
    expectRel(factor('min', 's'), 60, EXACT);
    expectRel(factor('h', 's'), 3600, EXACT);
  });
  it('degree Fahrenheit interval to kelvin: 5.555 556 E-01 (SP 811 B.8, "degree Fahrenheit", interval)', () => {
    expectRel(factor('degF', 'K'), 5.555556e-1, SP811);
    expectRel(factor('degF', 'degC'), 5 / 9, EXACT);
  });
  it('revolution per minute to radian per second: 2*pi/60 (one revolution is 2*pi rad by definition)', () => {
    expectRel(factor('rpm', 'rad/s'), (2 * Math.PI) / 60, EXACT);
    // SP 811 B.9 prints the same factor as 1.047 198 E-01 (quoted from memory).
    expectRel(factor('rpm', 'rad/s'), 1.047198e-1, SP811);
  });
});

describe('temperatures on offset scales (SP 811 section 4.2.1.1: T/K = t/degC + 273.15; t/degC = (t/degF - 32)/1.8)', () => {
  it('degC to K', () => {
    const c = unitConverter('degC', 'K');
    if (!c.ok) throw new Error(c.reason);
    expect(c.convert(0)).toBeCloseTo(273.15, 10);
    expect(c.convert(20)).toBeCloseTo(293.15, 10);
    expect(c.convert(-273.15)).toBeCloseTo(0, 10);
  });
  it('degF to degC and K', () => {
    const c = unitConverter('degF', 'degC');
    if (!c.ok) throw new Error(c.reason);
    expect(c.convert(32)).toBeCloseTo(0, 10);
    expect(c.convert(212)).toBeCloseTo(100, 10);
    expect(c.convert(-40)).toBeCloseTo(-40, 10);
    const k = unitConverter('degF', 'K');
    if (!k.ok) throw new Error(k.reason);
    expect(k.convert(32)).toBeCloseTo(273.15, 10);
  });
});

describe('refusals', () => {
  it('refuses unknown units and different dimensions, with words', () => {
    const a = unitConverter('furlongs', 'm');
    expect(a.ok).toBe(false);
    if (!a.ok) expect(a.reason).toContain('unknown unit "furlongs"');
    const b = unitConverter('rpm', 'A');
    expect(b.ok).toBe(false);
    if (!b.ok) expect(b.reason).toContain('cannot convert rpm');
  });
});
