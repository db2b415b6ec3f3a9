/**
 * Text from the input on its way to the terminal: the control functions of ECMA-48 (C0, C1, ESC
 * sequences), DEL, and the bidirectional formatting characters of Unicode UAX #9 are shown as \u
 * escapes; ordinary text, including non-ASCII letters, is kept.
 */
import { describe, expect, it } from 'vitest';
import { printable, printableLines, textTable } from '../../src/presentation/index.js';

describe('printable', () => {
  it.each([
    ['ESC (ECMA-48 C0)', '\u001b[2J', '\\u001b[2J'],
    ['BEL', 'a\u0007', 'a\\u0007'],
    ['OSC 52 (xterm clipboard write)', '\u001b]52;c;eA==\u0007', '\\u001b]52;c;eA==\\u0007'],
    ['DEL', '\u007f', '\\u007f'],
    ['C1 CSI U+009B (ECMA-48 C1)', '\u009b31m', '\\u009b31m'],
    ['C1 U+0080 and U+009F', '\u0080\u009f', '\\u0080\\u009f'],
    ['right-to-left override U+202E (UAX #9)', 'a\u202eb', 'a\\u202eb'],
    ['isolates U+2066..U+2069 (UAX #9)', '\u2066\u2069', '\\u2066\\u2069'],
    ['line separator U+2028', '\u2028', '\\u2028'],
    ['line feed and tab in one cell', 'a\nb\tc', 'a\\u000ab\\u0009c'],
  ])('%s', (_what, text, shown) => expect(printable(text)).toBe(shown));

  it('keeps ordinary text, non-ASCII letters and units as they are', () => {
    expect(printable('Drehzahl µm/s² °C – Ω')).toBe('Drehzahl µm/s² °C – Ω');
  });

  it('printableLines keeps the line feeds of a rendered text and escapes the rest', () => {
    expect(printableLines('a\u001b[2J\nb\r\n')).toBe('a\\u001b[2J\nb\\u000d\n');
  });

  it('the text table escapes every cell and aligns on the shown width', () => {
    const t = textTable(['name', 'unit'], [['k', 'N\u001b[8m'], ['long_name', 'm']]);
    expect(t).toBe(['name       unit', '---------  ----------', 'k          N\\u001b[8m', 'long_name  m'].join('\n'));
  });
});
