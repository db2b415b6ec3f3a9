import { describe, expect, it } from 'vitest';
import { decimateMinMax } from '../../../src/reports/html/decimate.js';

describe('decimateMinMax', () => {
  it('keeps each column envelope exactly, in time order, at most two points per column', () => {
    const n = 100_000;
    const time = Float64Array.from({ length: n }, (_, i) => i * 1e-3);
    const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i / 500) + ((i * 7919) % 101) / 100);
    const d = decimateMinMax(time, y, 400);
    expect(d.x.length).toBeLessThanOrEqual(800);
    expect(d.x.length).toBeGreaterThan(700);
    for (let i = 1; i < d.x.length; i++) expect(d.x[i]).toBeGreaterThan(d.x[i - 1]);
    // Brute-force envelope per column compared with what was kept.
    const span = time[n - 1] - time[0];
    const lo = new Array(400).fill(Infinity);
    const hi = new Array(400).fill(-Infinity);
    for (let i = 0; i < n; i++) {
      const c = Math.min(399, Math.floor(((time[i] - time[0]) / span) * 400));
      lo[c] = Math.min(lo[c], y[i]);
      hi[c] = Math.max(hi[c], y[i]);
    }
    const keptLo = new Array(400).fill(Infinity);
    const keptHi = new Array(400).fill(-Infinity);
    d.x.forEach((t, i) => {
      const c = Math.min(399, Math.floor(((t - time[0]) / span) * 400));
      keptLo[c] = Math.min(keptLo[c], d.y[i]);
      keptHi[c] = Math.max(keptHi[c], d.y[i]);
    });
    expect(keptLo).toEqual(lo);
    expect(keptHi).toEqual(hi);
  });

  it('returns short logs whole and leaves missing samples out', () => {
    const d = decimateMinMax([0, 1, 2, 3], [1, NaN, 3, 4], 800);
    expect(d).toEqual({ x: [0, 2, 3], y: [1, 3, 4] });
  });
});
