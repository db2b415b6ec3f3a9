/**
 * `npm run bench`: times every case in bench/cases/ (median of N runs after one warm-up run) and
 * prints a table. Not a test: numbers depend on the machine; compare them on one machine.
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { BenchCase, BenchMeasure } from './case.js';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

async function loadCases(): Promise<BenchCase[]> {
  const dir = join(here, 'cases');
  const files = readdirSync(dir).filter((f) => /\.(ts|js|mjs)$/.test(f) && !f.endsWith('.d.ts')).sort();
  const all: BenchCase[] = [];
  for (const f of files) {
    const mod = (await import(pathToFileURL(join(dir, f)).href)) as { cases?: BenchCase[] };
    if (Array.isArray(mod.cases)) all.push(...mod.cases);
  }
  return all.filter((c) => !only.length || only.some((w) => c.name.includes(w) || c.group === w));
}

function pad(rows: string[][]): string {
  const widths = rows[0].map((_, i) => Math.max(...rows.map((r) => r[i].length)));
  return rows.map((r) => r.map((c, i) => (i === 0 || i === r.length - 1 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('  ').trimEnd()).join('\n');
}

const cases = await loadCases();
cases.sort((a, b) => a.group.localeCompare(b.group));
const rows: string[][] = [['case', 'median ms', 'min ms', 'runs', 'rhs evals', 'note']];
for (const c of cases) {
  try {
    const work = await c.setup();
    let measure: BenchMeasure | void = work(); // warm-up: JIT and caches
    const runs = c.runs ?? 10;
    const times: number[] = [];
    for (let k = 0; k < runs; k++) {
      const t0 = performance.now();
      measure = work();
      times.push(performance.now() - t0);
    }
    rows.push([c.name, median(times).toFixed(2), Math.min(...times).toFixed(2), String(runs), measure?.rhsEvaluations !== undefined ? String(measure.rhsEvaluations) : '-', measure?.note ?? '']);
  } catch (err) {
    rows.push([c.name, '-', '-', '0', '-', `failed: ${err instanceof Error ? err.message.split('\n')[0] : String(err)}`]);
  }
  process.stderr.write(`. ${c.name}\n`);
}
process.stdout.write(`rigcal bench (${new Date().toISOString()}, node ${process.version}, ${cases.length} cases)\n${pad(rows)}\n`);
