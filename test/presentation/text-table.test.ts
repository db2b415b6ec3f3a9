/** The one text table of the terminal. Layout rules are ours (common practice, no source). */
import { describe, expect, it } from 'vitest';
import { indentedTable, textTable } from '../../src/presentation/text-table.js';

describe('text table', () => {
  it('pads every column to its widest cell, two spaces apart, with a rule under the header', () => {
    expect(textTable(['name', 'value'], [['K', '0.08'], ['Tc', '0.012']])).toBe(
      ['name  value', '----  -----', 'K     0.08', 'Tc    0.012'].join('\n'),
    );
  });

  it('right-aligns the columns asked for and trims trailing spaces', () => {
    expect(textTable(['model', 'k'], [['a', '5'], ['bb', '10']], { rightAligned: [1] })).toBe(
      ['model   k', '-----  --', 'a       5', 'bb     10'].join('\n'),
    );
  });

  it('indents the tables of check and simulate by two spaces', () => {
    expect(indentedTable(['a', 'b'], [['x', '']])).toBe(['  a  b', '  -  -', '  x'].join('\n'));
  });
});
