/** Writes the demo CSV files: a comment line saying where they come from, a header, the rows. */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';

export interface Column {
  name: string;
  values: Float64Array;
  /** Significant digits written; undefined: full round-trip precision. NaN is written as an empty cell. */
  digits?: number;
}

export function writeCsv(path: string, comment: string[], columns: Column[]): void {
  const n = columns[0].values.length;
  const lines = comment.map((c) => `# ${c}`);
  lines.push(columns.map((c) => c.name).join(','));
  for (let k = 0; k < n; k++) {
    lines.push(columns.map((c) => format(c.values[k], c.digits)).join(','));
  }
  mkdirSync(dirname(path), { recursive: true });
  writeFileSync(path, lines.join('\n') + '\n');
}

function format(v: number, digits?: number): string {
  if (Number.isNaN(v)) return '';
  if (digits === undefined || v === 0) return String(v);
  return String(Number(v.toPrecision(digits)));
}
