/**
 * The report's figures as vega-lite specifications. Data fields have fixed names of ours (t, y, k,
 * series...): user names appear only as text (titles, labels, legend entries), never as field
 * names, so no name can be read as a vega expression.
 */
import type { TopLevelSpec } from 'vega-lite';
import { formatCorrelation, HTML_MARKS } from '../../presentation/index.js';
import { decimateMinMax } from './decimate.js';

const COLOURS = {
  measured: '#9aa3b2',
  simulated: '#0b6e4f',
  residual: '#3a5a98',
  band: '#d9822b',
  zero: '#6b7280',
};

const WIDTH = 640;
const HEIGHT = 170;
/** About one pixel column per kept pair (decimate.ts). */
const COLUMNS = 800;

/** The time span of a log, so that its plots share one x axis whatever the decimation kept. */
function timeDomain(time: ArrayLike<number>): [number, number] | undefined {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < time.length; i++) {
    const t = time[i];
    if (t < lo) lo = t;
    if (t > hi) hi = t;
  }
  return hi > lo ? [lo, hi] : undefined;
}

function axisLabel(name: string, unit: string | undefined): string {
  return unit && unit !== '1' ? `${name} (${unit})` : name;
}

export interface TimePlotInput {
  title: string;
  time: ArrayLike<number>;
  timeUnit?: string;
  output: string;
  unit: string;
  measured: ArrayLike<number>;
  simulated: ArrayLike<number>;
}

export function measuredSimulatedSpec(p: TimePlotInput): TopLevelSpec {
  const values: { t: number; y: number; s: string }[] = [];
  for (const [label, series] of [['measured', p.measured], ['simulated', p.simulated]] as const) {
    const d = decimateMinMax(p.time, series, COLUMNS);
    for (let i = 0; i < d.x.length; i++) values.push({ t: d.x[i], y: d.y[i], s: label });
  }
  return {
    width: WIDTH,
    height: HEIGHT,
    title: p.title,
    data: { values },
    mark: { type: 'line', strokeWidth: 1.2, clip: true },
    encoding: {
      x: { field: 't', type: 'quantitative', title: axisLabel('time', p.timeUnit), scale: { nice: false, zero: false, domain: timeDomain(p.time) } },
      y: { field: 'y', type: 'quantitative', title: axisLabel(p.output, p.unit), scale: { zero: false } },
      color: {
        field: 's',
        type: 'nominal',
        title: null,
        scale: { domain: ['measured', 'simulated'], range: [COLOURS.measured, COLOURS.simulated] },
      },
    },
  } as TopLevelSpec;
}

export function residualSpec(p: TimePlotInput & { residual: ArrayLike<number> }): TopLevelSpec {
  const d = decimateMinMax(p.time, p.residual, COLUMNS);
  const values = d.x.map((t, i) => ({ t, y: d.y[i] }));
  return {
    width: WIDTH,
    height: 110,
    title: p.title,
    data: { values },
    layer: [
      { mark: { type: 'line', strokeWidth: 1, color: COLOURS.residual, clip: true }, encoding: {
        x: { field: 't', type: 'quantitative', title: axisLabel('time', p.timeUnit), scale: { nice: false, zero: false, domain: timeDomain(p.time) } },
        y: { field: 'y', type: 'quantitative', title: axisLabel('residual', p.unit) },
      } },
      { data: { values: [{ z: 0 }] }, mark: { type: 'rule', color: COLOURS.zero, strokeDash: [3, 3] }, encoding: { y: { field: 'z', type: 'quantitative' } } },
    ],
  } as TopLevelSpec;
}

export interface AcfPlotInput {
  title: string;
  /** Autocorrelation at lags 0..L. */
  values: readonly number[];
  lagStep: number;
  band: number;
  timeUnit?: string;
}

export function autocorrelationSpec(p: AcfPlotInput): TopLevelSpec {
  const values = p.values.slice(1).map((r, i) => ({ k: (i + 1) * p.lagStep, r, zero: 0, out: Math.abs(r) > p.band ? 'outside band' : 'inside band' }));
  return {
    width: WIDTH,
    height: 110,
    title: p.title,
    layer: [
      {
        data: { values: [{ lo: -p.band, hi: p.band }] },
        mark: { type: 'rect', color: COLOURS.band, opacity: 0.15 },
        encoding: { y: { field: 'lo', type: 'quantitative' }, y2: { field: 'hi' } },
      },
      {
        data: { values },
        mark: { type: 'rule', strokeWidth: 1.5 },
        encoding: {
          x: { field: 'k', type: 'quantitative', title: axisLabel('lag', p.timeUnit), scale: { nice: false, zero: true } },
          y: { field: 'zero', type: 'quantitative', title: 'autocorrelation' },
          y2: { field: 'r' },
          color: { field: 'out', type: 'nominal', title: null, scale: { domain: ['inside band', 'outside band'], range: [COLOURS.residual, COLOURS.band] } },
        },
      },
      { data: { values: [{ z: p.band }, { z: -p.band }] }, mark: { type: 'rule', color: COLOURS.band, strokeDash: [4, 3] }, encoding: { y: { field: 'z', type: 'quantitative' } } },
    ],
  } as TopLevelSpec;
}

export function correlationSpec(names: readonly string[], matrix: readonly (readonly (number | null)[])[]): TopLevelSpec {
  const values: { a: string; b: string; v: number | null; label: string }[] = [];
  names.forEach((a, i) =>
    names.forEach((b, j) => {
      const v = matrix[i]?.[j] ?? null;
      values.push({ a, b, v: v === null || !Number.isFinite(v) ? null : v, label: v === null || !Number.isFinite(v) ? HTML_MARKS.notANumber : formatCorrelation(v) });
    }),
  );
  const cell = Math.max(26, Math.min(56, Math.floor(420 / Math.max(1, names.length))));
  const size = cell * names.length;
  return {
    width: size,
    height: size,
    title: 'Correlation of the estimates',
    data: { values },
    encoding: {
      x: { field: 'b', type: 'nominal', sort: [...names], title: null, axis: { labelAngle: -40 } },
      y: { field: 'a', type: 'nominal', sort: [...names], title: null },
    },
    layer: [
      {
        mark: { type: 'rect', stroke: 'white', strokeWidth: 1 },
        encoding: {
          color: {
            field: 'v',
            type: 'quantitative',
            title: 'correlation',
            scale: { domain: [-1, 1], scheme: 'redblue', reverse: true },
            legend: { orient: 'right', direction: 'vertical', gradientLength: Math.max(80, size - 20) },
          },
        },
      },
      {
        mark: { type: 'text', fontSize: names.length > 10 ? 8 : 10 },
        encoding: {
          text: { field: 'label', type: 'nominal' },
          color: { condition: { test: 'datum.v !== null && abs(datum.v) > 0.7', value: 'white' }, value: '#1d2330' },
        },
      },
    ],
  } as TopLevelSpec;
}
