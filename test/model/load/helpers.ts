/** Test helpers: write a model text to a fresh temporary folder and load it. */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect } from 'vitest';
import { UserError, type Problem } from '../../../src/errors.js';
import { loadModel, type LoadOptions } from '../../../src/model/load/index.js';
import type { Model } from '../../../src/model/types.js';

const dirs: string[] = [];

export function tempDir(): string {
  const d = mkdtempSync(join(tmpdir(), 'rigcal-load-'));
  dirs.push(d);
  return d;
}

export function cleanTempDirs(): void {
  for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
}

export function writeModel(text: string | Buffer, dir = tempDir(), name = 'model.yaml'): string {
  const file = join(dir, name);
  writeFileSync(file, text);
  return file;
}

export function loadText(text: string, options?: LoadOptions): Model {
  return loadModel(writeModel(text), options);
}

/** Load and return the UserError's problems; fails the test when loading succeeds or throws otherwise. */
export function problemsOf(text: string | Buffer, options?: LoadOptions, dir?: string): { problems: Problem[]; message: string; file: string } {
  const file = writeModel(text, dir);
  try {
    loadModel(file, options);
  } catch (err) {
    expect(err).toBeInstanceOf(UserError);
    const u = err as UserError;
    // Never a stack trace in what the user sees.
    expect(u.message).not.toMatch(/\n\s+at .*:\d+:\d+/);
    return { problems: u.problems, message: u.message, file };
  }
  throw new Error('expected a UserError, but the model loaded');
}

/** A spring-mass model of our own (no data needed to load). Line numbers are used by the tests. */
export const SPRING = `format: 1
name: spring-mass
states:
  x: { unit: m, initial: x0 }
  v: { unit: m/s }
inputs:
  F: { unit: N, column: force }
parameters:
  m: { fixed: 2.5, unit: kg }
  k: { free: [10, 1000], unit: N/m }
  c: { free: [0, 5], unit: N*s/m }
  x0: { free: [-0.01, 0.01], start: 0, unit: m, per_experiment: true }
equations:
  x: v
  v: (F - k*x - c*v) / m
outputs:
  pos: { expr: x, unit: m, column: position }
experiments:
  - name: steps
    file: steps.csv
`;

/** SPRING with one exact text replaced (the text must occur). */
export function spring(find: string, replace: string): string {
  if (!SPRING.includes(find)) throw new Error(`test setup: "${find}" is not in SPRING`);
  return SPRING.replace(find, replace);
}
