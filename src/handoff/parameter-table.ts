/**
 * The parameter table alone (`freeze --format json|csv`), for a simulation team that wants numbers
 * rather than a model file: one row per parameter (per-experiment copies as `name@experiment`).
 * Values keep full precision (JavaScript's shortest round-trip form).
 */
import { renderCsv } from '../files/csv.js';
import type { EstimatesFile } from '../files/estimates-file.js';
import { toJson } from '../files/json.js';

export interface ParameterTableRow {
  name: string;
  value: number;
  unit: string;
  /** null when not determined by the data; absent (null in CSV terms: empty) for fixed parameters. */
  stdError: number | null;
  ci95Low: number | null;
  ci95High: number | null;
  status: 'estimated' | 'fixed';
  /** The experiment of a per-experiment copy, else null. */
  experiment: string | null;
}

export const PARAMETER_TABLE_COLUMNS = ['name', 'value', 'unit', 'stdError', 'ci95Low', 'ci95High', 'status', 'experiment'] as const;

export function parameterTable(estimates: EstimatesFile): ParameterTableRow[] {
  return Object.entries(estimates.parameters).map(([name, e]) => ({
    name,
    value: e.value,
    unit: e.unit,
    stdError: e.stdError ?? null,
    ci95Low: e.ci95 ? e.ci95[0] : null,
    ci95High: e.ci95 ? e.ci95[1] : null,
    status: e.status,
    experiment: e.experiment ?? null,
  }));
}

export function parameterTableJson(rows: readonly ParameterTableRow[]): string {
  return toJson(rows);
}

/** CSV with a header row; empty cells where a value does not apply or is not determined. */
export function parameterTableCsv(rows: readonly ParameterTableRow[]): string {
  return renderCsv(
    PARAMETER_TABLE_COLUMNS,
    // String(v), not the CSV writer's number cell: an infinite standard error stays visible.
    rows.map((r) => PARAMETER_TABLE_COLUMNS.map((c) => {
      const v = r[c];
      return v === null ? '' : typeof v === 'number' ? String(v) : v;
    })),
  );
}
