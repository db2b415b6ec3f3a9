/**
 * Text from the user's files shown in messages: a cell or a column name may be a megabyte long or
 * carry control characters (a terminal escape sequence in a hostile log would otherwise reach the
 * user's terminal as a command). Control characters are written as \u escapes, and long text is cut
 * with its length said.
 */

/** C0 and C1 control characters except tab and line feed, and DEL. */
const CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/g;

export function escapeControls(text: string): string {
  return text.replace(CONTROL, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/** `text` fit for a one-line message: no control characters, at most `max` characters shown. */
export function shownText(text: string, max = 80): string {
  const clean = escapeControls(text).replace(/[\t\n]/g, ' ');
  return clean.length <= max ? clean : `${clean.slice(0, max)}... (${text.length.toLocaleString('en-US')} characters)`;
}
