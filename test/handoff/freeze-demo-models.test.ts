/**
 * `freeze` on every demo model of the project (models/*.yaml): the frozen text loads, every free
 * parameter became fixed at the value given, and everything freeze does not own (states, inputs,
 * define, equations, outputs, the other keys of each experiment) reads back exactly as in the user's
 * file. Estimates are made up here (start values shifted): only the rewrite is under test.
 */
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { freezeModelText } from '../../src/handoff/freeze-document.js';
import { loadModel } from '../../src/model/load/index.js';
import type { Model } from '../../src/model/types.js';
import type { EstimatesFile } from '../../src/files/estimates-file.js';

const MODELS = path.resolve(__dirname, '../../models');
const files = readdirSync(MODELS).filter((f) => f.endsWith('.yaml'));

function madeUpEstimates(model: Model): EstimatesFile {
  const parameters: EstimatesFile['parameters'] = {};
  model.parameters.forEach((p, i) => {
    if (p.kind === 'fixed') {
      parameters[p.name] = { value: p.value, unit: p.unit, status: 'fixed' };
      return;
    }
    // A value strictly inside the bounds and different from the start, with many digits.
    const value = (v: number) => (Number.isFinite(p.min) && Number.isFinite(p.max) ? p.min + (p.max - p.min) * (0.3 + 0.01 * i + Math.PI * 1e-6) : v + 1 / 3);
    const entry = (v: number, experiment?: string) => ({ value: v, unit: p.unit, status: 'estimated' as const, stdError: Math.abs(v) * 0.01, ci95: [v * 0.98, v * 1.02] as [number, number], atBound: false as const, ...(experiment ? { experiment } : {}) });
    if (p.perExperiment) {
      model.experiments.filter((e) => e.role === 'fit').forEach((e, k) => (parameters[`${p.name}@${e.name}`] = entry(value(p.start) + k * 1e-7, e.name)));
    } else parameters[p.name] = entry(value(p.start));
  });
  return {
    file: 'estimates.yaml',
    version: '0.1.0',
    model: { name: model.name, file: path.basename(model.file), sha256: model.sha256 },
    fit: { status: 'converged', message: 'made up for the test', date: '2026-12-01T00:00:00.000Z' },
    data: [],
    values: Object.fromEntries(Object.entries(parameters).map(([k, v]) => [k, v.value])),
    parameters,
    noise: {},
  };
}

describe.each(files)('freeze of models/%s', (file) => {
  it('loads, fixes every free parameter and leaves the rest of the file as the user wrote it', () => {
    const modelFile = path.join(MODELS, file);
    const source = readFileSync(modelFile, 'utf8');
    const model = loadModel(modelFile);
    const estimates = madeUpEstimates(model);
    const outDir = mkdtempSync(path.join(tmpdir(), 'rigcal-freeze-demo-'));
    const { text, edited } = freezeModelText(source, model, estimates, { outputDir: outDir, estimatesLabel: 'estimates.yaml', estimatesSha256: '0'.repeat(64), date: '2026-12-01T00:00:00.000Z', toolVersion: '0.1.0' });
    const out = path.join(outDir, file);
    writeFileSync(out, text);
    const frozen = loadModel(out);

    expect(frozen.parameters.filter((p) => p.kind === 'free')).toEqual([]);
    for (const p of model.parameters) {
      const q = frozen.parameters.find((x) => x.name === p.name)!;
      expect(q.kind).toBe('fixed');
      expect(q.unit).toBe(p.unit);
      if (p.kind === 'free' && !p.perExperiment) expect(q.kind === 'fixed' && q.value).toBe(estimates.parameters[p.name].value);
      if (p.kind === 'free' && p.perExperiment) {
        for (const e of frozen.experiments.filter((x) => x.role === 'fit')) expect(e.set[p.name]).toBe(estimates.parameters[`${p.name}@${e.name}`].value);
      }
    }
    // Same data files reached from the new folder.
    expect(frozen.experiments.map((e) => e.file)).toEqual(model.experiments.map((e) => e.file));

    const a = parse(source) as Record<string, any>;
    const b = parse(text) as Record<string, any>;
    for (const key of Object.keys(a)) {
      if (key === 'parameters' || key === 'experiments') continue;
      expect(b[key], key).toEqual(a[key]);
    }
    // Fixed parameters written as the user wrote them.
    for (const [name, spec] of Object.entries(a.parameters as Record<string, any>)) {
      if (typeof spec !== 'object' || spec === null || 'fixed' in spec) expect(b.parameters[name], name).toEqual(spec);
    }
    // Experiments: only `file` and `set` may change.
    (a.experiments as Record<string, any>[]).forEach((e, i) => {
      const { file: _f1, set: _s1, ...restA } = e;
      const { file: _f2, set: _s2, ...restB } = b.experiments[i];
      expect(restB).toEqual(restA);
    });
    // Edited in the user's bytes: every line freeze does not own is there verbatim (comments,
    // alignment, wrapping of descriptions).
    expect(edited).toBe('source');
    const owned = new Set(model.parameters.filter((p) => p.kind === 'free').map((p) => p.name));
    const outLines = new Set(text.split('\n'));
    let inFree = false;
    for (const line of source.split('\n')) {
      const key = /^ {2}([A-Za-z][A-Za-z0-9_]*):/.exec(line)?.[1];
      if (key !== undefined || /^\S/.test(line)) inFree = key !== undefined && owned.has(key);
      if (inFree || /^\s*(file|set):/.test(line)) continue;
      expect(outLines.has(line), line).toBe(true);
    }
  });
});
