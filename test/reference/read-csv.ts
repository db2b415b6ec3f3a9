/** Reads the CSV that `rigcal simulate` writes into columns, grouped by experiment. */
import { readFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';

export type Columns = Record<string, number[]>;

export function readSimulationCsv(file: string): { header: string[]; byExperiment: Map<string, Columns> } {
  const rows = parse(readFileSync(file, 'utf8'), { skip_empty_lines: true }) as string[][];
  const header = rows[0];
  const byExperiment = new Map<string, Columns>();
  for (const row of rows.slice(1)) {
    const name = row[0];
    let cols = byExperiment.get(name);
    if (!cols) {
      cols = Object.fromEntries(header.slice(1).map((h) => [h, [] as number[]]));
      byExperiment.set(name, cols);
    }
    header.slice(1).forEach((h, i) => cols![h].push(row[i + 1] === '' ? NaN : Number(row[i + 1])));
  }
  return { header, byExperiment };
}
