/**
 * Bench row: reading a long log (loadExperimentData: parse, check and convert every cell). The log
 * is written in setup into a temporary folder: 500,000 rows at 1 kHz of time, a hold input and two
 * outputs, made up on the spot (only its size matters here), with the flywheel model's columns.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadExperimentData } from '../../src/data/load-experiment.js';
import { loadModel } from '../../src/model/load/index.js';
import type { BenchCase } from '../case.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const ROWS = 500_000;

function writeLongLog(dir: string): void {
  const lines = ['# bench log, made up for its size only', 't,volts,amps,rpm'];
  for (let i = 0; i < ROWS; i++) {
    const t = i / 1000;
    lines.push(`${t.toFixed(3)},${Math.floor(i / 500) % 2 ? '12.0' : '0.0'},${(2 * Math.sin(t)).toFixed(5)},${(1000 * Math.sin(0.1 * t)).toFixed(3)}`);
  }
  writeFileSync(join(dir, 'long.csv'), lines.join('\n') + '\n');
}

export const cases: BenchCase[] = [
  {
    name: `read a ${ROWS.toLocaleString('en-US')}-row log (flywheel columns)`,
    group: 'load',
    runs: 3,
    setup() {
      const dir = mkdtempSync(join(tmpdir(), 'rigcal-bench-log-'));
      writeLongLog(dir);
      const text = readFileSync(join(root, 'models', 'flywheel.yaml'), 'utf8').replace(/file: \.\.\/demo-data\/[a-z-]+\.csv/g, 'file: long.csv');
      writeFileSync(join(dir, 'long.yaml'), text);
      const model = loadModel(join(dir, 'long.yaml'));
      const mib = (readFileSync(join(dir, 'long.csv')).length / 2 ** 20).toFixed(1);
      process.on('exit', () => rmSync(dir, { recursive: true, force: true }));
      return () => {
        const d = loadExperimentData(model, 0);
        return { note: `${d.time.length.toLocaleString('en-US')} rows, ${mib} MiB` };
      };
    },
  },
];
