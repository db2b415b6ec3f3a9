/**
 * Text from the input (a model file or a log is untrusted) on its way to the terminal: names,
 * descriptions, units with `units: off`, column names, file paths. Every renderer passes such text
 * through `printable` (one line, one table cell) or its whole output through `printableLines`, so
 * that an escape sequence in a file (clear-screen, hidden text, an OSC 52 clipboard write, a bidi
 * override) is shown as `\u001b`... and never acted on. The characters are those of util/printable
 * (the one list, shared with the error messages).
 */
import { escapeAllControls, escapeControls } from '../util/printable.js';

/** Text for one line or one table cell: every control character escaped, line feed and tab too. */
export function printable(text: string): string {
  return escapeAllControls(text);
}

/** A whole rendered text: control characters escaped, its own line feeds kept. */
export function printableLines(text: string): string {
  return escapeControls(text).replace(/\t/g, '\\u0009');
}
