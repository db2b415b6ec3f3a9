/** "Did you mean": edit distance and the choice of nearest names. */
import { describe, expect, it } from 'vitest';
import { editDistance, nearest, suggestion } from '../../src/presentation/nearest-names.js';

describe('edit distance (optimal string alignment)', () => {
  it.each([
    ['', '', 0], ['a', '', 1], ['', 'abc', 3],
    ['kitten', 'sitting', 3], // the textbook Levenshtein example
    ['equation', 'equations', 1],
    ['fxied', 'fixed', 1], // one adjacent transposition
    ['ab', 'ba', 1],
    ['abc', 'abc', 0],
  ] as const)('%s / %s = %i', (a, b, d) => {
    expect(editDistance(a, b)).toBe(d);
    expect(editDistance(b, a)).toBe(d);
  });
});

describe('nearest names', () => {
  it('ranks a shared beginning first and leaves far words out', () => {
    expect(nearest('sinn', ['sin', 'sinh', 'sign', 'exp', 'hypot'])[0]).toBe('sin');
    expect(nearest('equation', ['format', 'equations', 'outputs'])).toEqual(['equations']);
    expect(nearest('zzzz', ['states', 'inputs'])).toEqual([]);
    expect(nearest('Kt', ['kt', 'K'])).toContain('kt');
  });

  it('suggestion lists what exists when nothing is near', () => {
    expect(suggestion('zzzz', ['a1', 'b2'], 'parameters')).toBe('known parameters: "a1", "b2"');
    expect(suggestion('x', [], 'experiments')).toBe('there are no experiments to choose from');
    expect(suggestion('fxied', ['fixed', 'free'])).toBe('did you mean "fixed"?');
  });
});
