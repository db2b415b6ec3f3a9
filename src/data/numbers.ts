/**
 * Reading one CSV cell as a number, strictly (no hex, no "Infinity", no thousands separators). Every
 * check here runs in time linear in the cell's length (a hostile cell may be megabytes long).
 */
import { isDecimalText } from '../util/decimal.js';

/** Longer than any number worth a hint (the hints' patterns then need not look at a huge cell). */
const HINT_CHARS = 64;

/**
 * A cell's value: the number; NaN for a missing sample (an empty cell, `NaN` or `nan`); null when the
 * cell is anything else than a decimal number. A number, not an object per cell: a 1,000,000-row
 * log has millions of cells, and one small object each made reading it a third slower.
 */
export function readCell(text: string): number | null {
  if (text === '' || text === 'NaN' || text === 'nan') return Number.NaN;
  if (!isDecimalText(text)) return null;
  const value = Number(text);
  return Number.isFinite(value) ? value : null;
}

/** A hint for a common reason a cell is not a number. */
export function badCellHint(text: string): string {
  if (text.length > HINT_CHARS) return GENERAL_HINT;
  if (/^[+-]?\d+,\d+$/.test(text)) return 'it looks like a decimal comma: write decimals with a point (1.5, not 1,5)';
  if (/^[+-]?inf(inity)?$/i.test(text)) return 'infinite values are not allowed in a log';
  return GENERAL_HINT;
}

const GENERAL_HINT = 'every cell of a used column must be a decimal number (empty, NaN or nan mark a missing output sample)';
