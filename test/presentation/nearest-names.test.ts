/** "Did you mean": edit distance and the choice of nearest names. */
import { describe, expect, it } from 'vitest';
import { editDistance, isLikelyTypo, nearest, nearestNames, suggestion } from '../../src/presentation/nearest-names.js';

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

describe('nearest names for lists of what exists', () => {
  it('lists the nearest names even when none is close, by the same rule as the suggestions', () => {
    expect(nearestNames('volt_cmd', ['t', 'volts_cmd', 'amps', 'speed'])[0]).toBe('volts_cmd');
    expect(nearestNames('k', ['K', 'c', 'm'])[0]).toBe('K'); // a case-insensitive match ranks first
    expect(nearestNames('zzzz', ['states', 'inputs', 'outputs', 'define'])).toHaveLength(3);
    expect(nearestNames('x', [])).toEqual([]);
  });

  it('takes an absent optional name for a typo only when very close, case ignored', () => {
    expect(isLikelyTypo('curent', 'current')).toBe(true);
    expect(isLikelyTypo('Speed', 'speed')).toBe(true);
    expect(isLikelyTypo('amps', 'temp')).toBe(false); // two edits in four characters: not a typo
    expect(isLikelyTypo('amps', 'apms')).toBe(true); // one transposition
  });
});
