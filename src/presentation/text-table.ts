/**
 * The one fixed-width text table of the terminal: a header, a rule of dashes under it, columns two
 * spaces apart, trailing spaces trimmed. Numbers may be right-aligned column by column. Every cell
 * is made printable first (names and units come from the input), which also keeps the columns
 * aligned: an escaped cell is as wide as it is shown.
 */
import { printable } from './printable.js';

export interface TableLayout {
  /** Put before every line (check and simulate indent their tables under a heading). */
  indent?: string;
  /** Indices of the columns aligned to the right (numbers); the others are aligned to the left. */
  rightAligned?: readonly number[];
}

export function textTable(rawHeader: readonly string[], rawRows: readonly (readonly string[])[], layout: TableLayout = {}): string {
  const header = rawHeader.map(printable);
  const rows = rawRows.map((r) => r.map(printable));
  const indent = layout.indent ?? '';
  const right = new Set(layout.rightAligned ?? []);
  const widths = header.map((h, j) => Math.max(h.length, ...rows.map((r) => (r[j] ?? '').length)));
  const line = (cells: readonly string[]) =>
    indent + widths.map((w, j) => (right.has(j) ? (cells[j] ?? '').padStart(w) : (cells[j] ?? '').padEnd(w))).join('  ').trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n');
}

/** The tables of `check` and `simulate`: indented by two spaces under their heading, left-aligned. */
export function indentedTable(header: readonly string[], rows: readonly (readonly string[])[]): string {
  return textTable(header, rows, { indent: '  ' });
}
