/**
 * The synthetic rig of test/comparison/synthetic-rig.ts, fitted and its results folder written, for
 * the tests of what happens to the hand-off when a log changes afterwards; and the SHA-256 of a file
 * by node:crypto, the independent reference those tests compare the recorded hashes with.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fitModel } from '../../src/estimation/fit/fit-model.js';
import { loadModel } from '../../src/model/load/index.js';
import { writeResults } from '../../src/reports/write-results.js';
import { modelText, writeRigData } from '../comparison/synthetic-rig.js';
import { rigcal } from '../cli/run-cli.js';

export const sha256Of = (file: string): string => createHash('sha256').update(readFileSync(file)).digest('hex');

/** A folder with the rig's logs, `rig.yaml` and its results folder `fit/`; returns the folder. */
export async function fittedRig(): Promise<string> {
  const dir = writeRigData();
  writeFileSync(path.join(dir, 'rig.yaml'), modelText({}));
  await writeResults(path.join(dir, 'fit'), fitModel(loadModel(path.join(dir, 'rig.yaml'))), { outputs: ['x'] });
  return dir;
}

/** The CLI in-process, with the names these tests read. */
export async function cli(args: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  const r = await rigcal(args, cwd);
  return { code: r.code, out: r.stdout, err: r.stderr };
}
