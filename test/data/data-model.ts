/** A Model built by hand for data-reading tests (no model file needed), and temp CSV files. */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'mathjs';
import type { ExperimentSpec, InputSpec, Model, OutputSpec } from '../../src/model/types.js';

const expr = (text: string) => ({ text, node: parse(text), where: {} });

export interface DataModelSpec {
  isStatic?: boolean;
  timeUnit?: string;
  inputs?: Partial<InputSpec>[];
  outputs?: Partial<OutputSpec>[];
  experiment: Partial<ExperimentSpec> & { file: string };
}

export function dataModel(spec: DataModelSpec): Model {
  return {
    file: '/tmp/data-test.yaml',
    fileAsGiven: 'data-test.yaml',
    sha256: '0'.repeat(64),
    format: 1,
    name: 'data-test',
    description: '',
    timeUnit: spec.timeUnit ?? 's',
    isStatic: spec.isStatic ?? false,
    states: spec.isStatic ? [] : [{ name: 'x', unit: '', initial: expr('0'), where: {} }],
    inputs: (spec.inputs ?? []).map((i) => ({ name: 'u', unit: '', column: i.name ?? 'u', interpolate: 'linear' as const, where: {}, ...i })),
    parameters: [],
    defines: [],
    equations: spec.isStatic ? [] : [{ state: 'x', expr: expr('0') }],
    outputs: (spec.outputs ?? []).map((o) => ({ name: 'y', expr: expr('x'), unit: '', column: o.name ?? 'y', where: {}, ...o })),
    experiments: [
      {
        name: 'e1',
        fileAsWritten: spec.experiment.file,
        timeUnit: 's',
        role: 'fit',
        set: {},
        initial: {},
        columns: {},
        where: {},
        ...spec.experiment,
      },
    ],
    units: 'check',
    overrides: {},
  };
}

let dir: string | undefined;
/** Write `text` to a fresh file in a temp folder and return its absolute path. */
export function csvFile(name: string, text: string): string {
  dir ??= mkdtempSync(join(tmpdir(), 'rigcal-data-'));
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}
