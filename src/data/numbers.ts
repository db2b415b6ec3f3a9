/** Reading one CSV cell as a number, strictly (no hex, no "Infinity", no thousands separators). */

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

export type Cell =
  | { kind: 'number'; value: number }
  | { kind: 'missing' }
  | { kind: 'bad' };

/** Empty cells, `NaN` and `nan` mark a missing sample; anything else must be a decimal number. */
export function readCell(text: string): Cell {
  if (text === '' || text === 'NaN' || text === 'nan') return { kind: 'missing' };
  if (!DECIMAL.test(text)) return { kind: 'bad' };
  const value = Number(text);
  return Number.isFinite(value) ? { kind: 'number', value } : { kind: 'bad' };
}

/** A hint for a common reason a cell is not a number. */
export function badCellHint(text: string): string {
  if (/^[+-]?\d+,\d+$/.test(text)) return 'it looks like a decimal comma: write decimals with a point (1.5, not 1,5)';
  if (/^[+-]?inf(inity)?$/i.test(text)) return 'infinite values are not allowed in a log';
  return 'every cell of a used column must be a decimal number (empty, NaN or nan mark a missing output sample)';
}
