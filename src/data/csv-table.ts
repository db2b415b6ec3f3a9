/**
 * Reading a delimited text log through csv-parse: header row, `#` comment lines, comma, semicolon
 * or tab detected from the header line, cells trimmed. Rows are handed to the caller one by one
 * (nothing is kept here), so memory grows with the columns the caller keeps, not with the text.
 */
import { createHash } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { UserError } from '../errors.js';
import { MAX_DATA_FILE_BYTES, MAX_DATA_ROWS } from './limits.js';

export type Delimiter = ',' | ';' | '\t';

export interface CsvReadHandlers {
  /** Called once with the header cells and the header's 1-based line number. */
  header(names: string[], line: number): void;
  /** Called for every data row with its cells and 1-based line number. */
  row(cells: string[], line: number): void;
}

export interface CsvReadInfo {
  sha256: string;
  delimiter: Delimiter;
  bytes: number;
  rows: number;
}

function isRegularFile(path: string): boolean {
  try {
    return statSync(path).isFile();
  } catch {
    return false;
  }
}

function mib(bytes: number): string {
  return `${(bytes / (1024 * 1024)).toFixed(1)} MiB`;
}

/** The first line that is neither empty nor a `#` comment. */
function headerLine(text: string): string {
  for (const line of text.split(/\r?\n/, 1000)) {
    const s = line.trim();
    if (s !== '' && !s.startsWith('#')) return line;
  }
  return '';
}

/** The separator that occurs most often in the header line (ties: comma, then semicolon, then tab). */
export function detectDelimiter(header: string): Delimiter {
  const counts: [Delimiter, number][] = [',', ';', '\t'].map((d) => [d as Delimiter, header.split(d).length - 1]);
  let best = counts[0];
  for (const c of counts) if (c[1] > best[1]) best = c;
  return best[0];
}

/**
 * Read `path` (shown to the user as `shown`) and stream its rows to `handlers`. Throws UserError for
 * unreadable, oversized or malformed files; errors raised by the handlers pass through.
 */
export function readCsv(
  path: string,
  shown: string,
  handlers: CsvReadHandlers,
  limits: { maxBytes: number; maxRows: number } = { maxBytes: MAX_DATA_FILE_BYTES, maxRows: MAX_DATA_ROWS },
): CsvReadInfo {
  const { maxBytes, maxRows } = limits;
  let size: number;
  try {
    size = statSync(path).size;
  } catch (err) {
    throw new UserError({
      where: { file: shown },
      what: `cannot read the data file: ${(err as NodeJS.ErrnoException).code ?? String(err)}`,
      fix: 'check the `file` path of the experiment; it is relative to the model file',
    });
  }
  if (!isRegularFile(path)) {
    // A folder, a device such as /dev/zero or a pipe: reading it would fail or never end.
    throw new UserError({
      where: { file: shown },
      what: 'the data file is not a regular file (a folder, a device or a pipe)',
      fix: 'point the experiment\'s `file` at a CSV log; it is relative to the model file',
    });
  }
  if (size > maxBytes) {
    throw new UserError({
      where: { file: shown },
      what: `the data file is ${mib(size)}, more than the ${mib(maxBytes)} rigcal reads into memory`,
      fix: 'decimate the log or split it into several experiments (each a file of its own)',
    });
  }
  const bytes = readFileSync(path);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  // Only the start of the text is decoded for the header (the parser reads the Buffer itself).
  const head = bytes.subarray(0, Math.min(bytes.length, 1 << 16)).toString('utf8').replace(/^\uFEFF/, '');
  const first = headerLine(head);
  if (first === '') {
    throw new UserError({ where: { file: shown }, what: 'the data file has no header row', fix: 'the first line that is not a # comment must name the columns' });
  }
  const delimiter = detectDelimiter(first);
  let rows = 0;
  let sawHeader = false;
  try {
    parse(bytes, {
      bom: true,
      delimiter,
      comment: '#',
      comment_no_infix: true,
      trim: true,
      skip_empty_lines: true,
      relax_column_count: true,
      on_record: (record: string[], ctx: { lines: number }) => {
        if (!sawHeader) {
          sawHeader = true;
          handlers.header(record, ctx.lines);
        } else {
          rows++;
          if (rows > maxRows) {
            throw new UserError({
              where: { file: shown, line: ctx.lines },
              what: `the data file has more than ${maxRows.toLocaleString('en-US')} data rows, the most rigcal reads`,
              fix: 'decimate the log or split it into several experiments',
            });
          }
          handlers.row(record, ctx.lines);
        }
        return null; // keep nothing: the handlers store what they need
      },
    });
  } catch (err) {
    if (err instanceof UserError) throw err;
    const e = err as Error & { lines?: number; code?: string };
    // csv-parse wraps errors thrown by on_record; unwrap ours.
    const cause = (e as { cause?: unknown }).cause;
    if (cause instanceof UserError) throw cause;
    throw new UserError({
      where: { file: shown, line: e.lines },
      what: `the data file is not valid CSV: ${e.message}`,
      fix: 'check quotes and separators on that line',
    });
  }
  if (!sawHeader) {
    throw new UserError({ where: { file: shown }, what: 'the data file has no header row', fix: 'the first line that is not a # comment must name the columns' });
  }
  return { sha256, delimiter, bytes: size, rows };
}
