/**
 * Text from the user's files shown in messages: a cell or a column name may be a megabyte long or
 * carry control characters (a terminal escape sequence in a hostile log would otherwise reach the
 * user's terminal as a command). Control characters are written as \u escapes, and long text is cut
 * with its length said.
 */

/**
 * C0 and C1 control characters except tab and line feed, DEL, and the invisible characters that
 * reorder or hide text on a terminal: the bidirectional marks, embeddings, overrides and isolates
 * (U+061C, U+200E, U+200F, U+202A-U+202E, U+2066-U+2069; Unicode UAX #9) and the line and paragraph
 * separators (U+2028, U+2029), which some terminals take as a line break.
 */
const CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028-\u202e\u2066-\u2069]/g;

const escapeOne = (c: string) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`;

export function escapeControls(text: string): string {
  return text.replace(CONTROL, escapeOne);
}

/** Every control character escaped, tab and line feed too: text for one line or one table cell. */
export function escapeAllControls(text: string): string {
  return escapeControls(text).replace(/[\t\n]/g, escapeOne);
}

/** `text` fit for a one-line message: no control characters, at most `max` characters shown. */
export function shownText(text: string, max = 80): string {
  const clean = escapeControls(text).replace(/[\t\n]/g, ' ');
  return clean.length <= max ? clean : `${clean.slice(0, max)}... (${text.length.toLocaleString('en-US')} characters)`;
}
