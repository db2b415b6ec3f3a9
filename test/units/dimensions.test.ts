/**
 * Dimensional inference and checks (model-format.md, Units). Dimensions of derived units are those
 * of the SI brochure (BIPM, 9th edition, Table 4: N = kg*m/s^2, J = N*m, W = J/s, V = W/A,
 * ohm = V/A, H = V*s/A, Pa = N/m^2); angles count as dimensionless (rad = 1) by our spec.
 */
import { parse } from 'mathjs';
import { afterAll, describe, expect, it } from 'vitest';
import {
  agree, describeQuantity, formatSI, inferQuantity, isPlain, mismatch, quantityOf, type Quantity,
} from '../../src/units/dimensions.js';
import { cleanTempDirs, loadText, problemsOf } from '../model/load/helpers.js';

afterAll(cleanTempDirs);

function q(unit: string): Quantity {
  const r = quantityOf(unit);
  if (!r) throw new Error(`unknown unit ${unit}`);
  return r;
}

/** Infer the unit of `text` with the symbols' units from `units`; returns the quantity and the reports. */
function infer(text: string, units: Record<string, string>) {
  const reports: string[] = [];
  const result = inferQuantity(parse(text), (n) => (n in units ? quantityOf(units[n]) : undefined), (what) => reports.push(what));
  return { result, reports };
}

describe('quantities of unit strings', () => {
  it('derived units reduce to SI base dimensions', () => {
    expect(formatSI(q('N'))).toBe('kg*m/s^2');
    expect(formatSI(q('N*m/A'))).toBe('kg*m^2/(s^2*A)');
    expect(formatSI(q('ohm'))).toBe('kg*m^2/(s^3*A^2)');
    expect(formatSI(q('H'))).toBe('kg*m^2/(s^2*A^2)');
    expect(agree(q('V*s/A'), q('H')).ok).toBe(true);
    expect(agree(q('Pa'), q('N/m^2')).ok).toBe(true);
    expect(agree(q('W'), q('J/s')).ok).toBe(true);
  });

  it('rad is dimensionless; rad/s agrees with 1/s and Hz', () => {
    expect(isPlain(q('rad'))).toBe(true);
    expect(agree(q('rad/s'), q('1/s')).ok).toBe(true);
    expect(agree(q('rad/s'), q('Hz')).ok).toBe(true);
    expect(agree(q('N*m*s/rad'), q('N*m*s')).ok).toBe(true);
  });

  it('rpm is 1/s with the scale 2*pi/60 (one revolution = 2*pi rad), so it does not agree with rad/s', () => {
    const rpm = q('rpm');
    expect(formatSI({ ...rpm, scale: 1 })).toBe('1/s');
    expect(rpm.scale).toBeCloseTo((2 * Math.PI) / 60, 14);
    const g = agree(rpm, q('rad/s'));
    expect(g.ok).toBe(false);
    if (!g.ok) {
      expect(g.sameDimension).toBe(true);
      expect(g.factor).toBeCloseTo((2 * Math.PI) / 60, 14);
    }
  });

  it('deg is a plain number with the scale pi/180, not rad', () => {
    const deg = q('deg');
    expect(deg.dims.every((d) => d === 0)).toBe(true);
    expect(deg.scale).toBeCloseTo(Math.PI / 180, 15);
    expect(isPlain(deg)).toBe(false);
    expect(agree(deg, q('rad')).ok).toBe(false);
  });

  it('mm and m have the same dimension and differ by the factor 1000', () => {
    const g = agree(q('mm'), q('m'));
    expect(g).toEqual({ ok: false, sameDimension: true, factor: 0.001 });
    expect(mismatch(q('m'), q('mm'))).toContain('factor 1000');
    expect(describeQuantity(q('mm/s'))).toBe('mm/s = 0.001 m/s');
  });

  it('degC has the dimension and scale of K but is an offset scale', () => {
    expect(agree(q('degC'), q('K')).ok).toBe(true);
    expect(q('degC').offsetUnit).toBe('degC');
    expect(mismatch(q('degC'), q('K'))).toContain('offset scale');
    expect(mismatch(q('degC'), q('degC'))).toBeUndefined();
    expect(q('degF').scale).toBeCloseTo(5 / 9, 15);
    // A rate in degC/s is an ordinary rate: agrees with K/s.
    expect(q('degC/s').offsetUnit).toBeUndefined();
    expect(mismatch(q('degC/s'), q('K/s'))).toBeUndefined();
  });

  it('unknown units give no quantity', () => {
    expect(quantityOf('furlongs')).toBeUndefined();
  });
});

describe('inference over expressions', () => {
  const units = { x: 'm', y: 'm', v: 'm/s', F: 'N', m: 'kg', k: 'N/m', tau: 's', t: 's', T: 'degC', Ta: 'degC', th: 'deg', w: 'rad/s', n: '' };

  it('products and quotients combine units; the composed text is kept for messages', () => {
    const { result, reports } = infer('(F - k*x) / m', units);
    expect(reports).toEqual([]);
    expect(result!.text).toBe('N/kg');
    expect(agree(result!, q('m/s^2')).ok).toBe(true);
  });

  it('sqrt halves exponents; constant powers multiply them', () => {
    const a = infer('sqrt(k/m)', units).result!;
    expect(agree(a, q('1/s')).ok).toBe(true);
    expect(agree(infer('x^2', units).result!, q('m^2')).ok).toBe(true);
    expect(agree(infer('pow(x, 3)', units).result!, q('m^3')).ok).toBe(true);
    expect(agree(infer('(x^2)^(1/2)', units).result!, q('m')).ok).toBe(true);
    expect(agree(infer('x^-1', units).result!, q('1/m')).ok).toBe(true);
  });

  it('a unit-carrying base needs a constant exponent', () => {
    const { result, reports } = infer('x^n', units);
    expect(result).toBeUndefined();
    expect(reports[0]).toContain('constant power');
  });

  it('function arguments must be plain numbers', () => {
    expect(infer('exp(-t/tau)', units).reports).toEqual([]);
    expect(infer('exp(t)', units).reports[0]).toContain('argument of exp');
    expect(infer('log10(x/y)', units).reports).toEqual([]);
    expect(infer('tanh(v)', units).reports[0]).toContain('argument of tanh');
    // An angle in degrees is not a plain number: sin would read it as radians.
    expect(infer('sin(th)', units).reports[0]).toMatch(/argument of sin.*deg/);
    expect(infer('sin(w*t)', units).reports).toEqual([]);
  });

  it('sides of + - and comparisons, branches of ?:, arguments of min/max/hypot/atan2 must agree', () => {
    expect(infer('x + v', units).reports[0]).toContain('both sides of "+"');
    expect(infer('x - y', units).reports).toEqual([]);
    expect(infer('x < v', units).reports[0]).toContain('both sides of "<"');
    expect(infer('x > 0 ? x : v', units).reports[0]).toContain('branches');
    expect(infer('max(x, v)', units).reports[0]).toContain('arguments of max');
    expect(infer('hypot(x, y)', units).result!.text).toBe('m');
    expect(isPlain(infer('atan2(y, x)', units).result!)).toBe(true);
  });

  it('the literal 0 agrees with any unit; other bare numbers are dimensionless', () => {
    expect(infer('max(F, 0)', units).reports).toEqual([]);
    expect(infer('v > 0 ? F : 0', units).reports).toEqual([]);
    expect(agree(infer('v > 0 ? F : 0', units).result!, q('N')).ok).toBe(true);
    expect(infer('F + 1', units).reports[0]).toContain('both sides of "+"');
  });

  it('abs keeps the unit, sign drops it', () => {
    expect(infer('abs(v)', units).result!.text).toBe('m/s');
    expect(isPlain(infer('sign(v)', units).result!)).toBe(true);
  });

  it('a difference of two offset temperatures is an ordinary temperature difference', () => {
    expect(infer('T - Ta', units).result!.offsetUnit).toBeUndefined();
    expect(infer('T', units).result!.offsetUnit).toBe('degC');
  });

  it('unknown symbols make the unit unknown without a report', () => {
    expect(infer('zz * x', units)).toEqual({ result: undefined, reports: [] });
  });
});

describe('the model-level check', () => {
  const rig = (jUnit: string, wUnit = 'rad/s') => `format: 1
name: disc
states:
  w: { unit: ${wUnit} }
inputs:
  tau: { unit: N*m }
parameters:
  J: { free: [1e-4, 1e-2], unit: ${jUnit} }
equations:
  w: tau / J
outputs:
  speed: { expr: w, unit: ${wUnit} }
`;

  it('accepts tau/J for a speed in rad/s', () => {
    expect(loadText(rig('kg*m^2')).unitCheck).toBe('checked');
  });

  it('names the equation and shows both units, as the spec\'s message does', () => {
    const { problems } = problemsOf(rig('kg*m'));
    expect(problems).toHaveLength(1);
    expect(problems[0].what).toContain('equation for w: right side is N*m/(kg*m) = m/s^2, expected rad/s / s = 1/s^2');
    expect(problems[0].where).toMatchObject({ key: 'equations.w', line: 10, column: 6 });
  });

  it('a state in rpm needs the equation in rpm/s: the factor is named', () => {
    const { problems } = problemsOf(rig('kg*m^2', 'rpm'));
    expect(problems[0].what).toContain('right side is N*m/(kg*m^2) = 1/s^2, expected rpm / s = 0.10472 1/s^2');
    expect(problems[0].what).toContain('factor 9.5493');
  });

  it('an output in K from a state in degC is refused; a difference in degC is accepted', () => {
    const thermal = (outExpr: string, outUnit: string) => `format: 1
name: block
states:
  T: { unit: degC, initial: Ta }
parameters:
  Ta: { fixed: 20, unit: degC }
  tc: { free: [10, 1000], unit: s }
equations:
  T: (Ta - T) / tc
outputs:
  y: { expr: ${outExpr}, unit: ${outUnit} }
`;
    expect(problemsOf(thermal('T', 'K')).problems[0].what).toContain('offset scale');
    expect(loadText(thermal('T - Ta', 'K')).unitCheck).toBe('checked');
    expect(loadText(thermal('T', 'degC')).unitCheck).toBe('checked');
  });

  it('initial values need the state\'s unit and a delay parameter the time unit', () => {
    const m = `format: 1
name: delayed
states:
  x: { unit: m, initial: x0 }
inputs:
  u: { unit: m/s, delay: d }
parameters:
  x0: { fixed: 1, unit: mm }
  d: { free: [0, 1], unit: ms }
equations:
  x: u
`;
    const { problems } = problemsOf(m);
    const whats = problems.map((p) => p.what).join('\n');
    expect(whats).toContain('initial value of x is mm = 0.001 m, expected m');
    expect(whats).toContain('the delay of input u is parameter d with unit ms = 0.001 s, expected the time unit s');
  });

  it('a value that is only a number is in the unit of its place', () => {
    const m = loadText(`format: 1
name: numbers
states:
  T: { unit: degC, initial: 20 }
  x: { unit: mm, initial: -1.5 }
parameters:
  r: { fixed: 2, unit: degC/s }
equations:
  T: r
  x: 3
outputs:
  y: { expr: 5, unit: N }
experiments:
  - name: a
    file: a.csv
    initial: { T: 25 }
`);
    expect(m.unitCheck).toBe('checked');
    // Inside an expression a bare number stays dimensionless.
    expect(problemsOf(`format: 1\nname: n\nstates:\n  x: { unit: m, initial: 2*1.5 + x0 }\nparameters:\n  x0: { fixed: 0, unit: m }\nequations:\n  x: 0\n`).problems[0].what)
      .toContain('both sides of "+"');
  });

  it('time t has the model\'s time_unit', () => {
    const m = (tu: string) => `format: 1
name: ramp
time_unit: ${tu}
states:
  x: { unit: m }
parameters:
  a: { fixed: 1, unit: m/s^2 }
equations:
  x: a*t
`;
    expect(loadText(m('s')).unitCheck).toBe('checked');
    expect(problemsOf(m('min')).problems[0].what).toContain('equation for x');
  });
});

describe('composed unit text is bounded', () => {
  it('a product squared 40 times keeps a short text with the right dimension (exponent 2^40)', async () => {
    const { parse } = await import('../../src/util/mathjs.js');
    const { inferQuantity, quantityOf } = await import('../../src/units/dimensions.js');
    const m = quantityOf('m')!;
    let q = m;
    for (let i = 0; i < 40; i++) q = inferQuantity(parse('a*a'), () => q, () => undefined)!;
    expect(q.text.length).toBeLessThan(300);
    expect(q.dims[m.dims.findIndex((p) => p === 1)]).toBe(2 ** 40);
    expect(q.text).toMatch(/^m\^\d+(\*m\^\d+)*$/);
  });
});
