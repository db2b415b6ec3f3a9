/**
 * "A model file runs nothing", checked around every test of a file that calls `guardRunsNothing()`
 * at its top level: the mathjs object the library really uses (src/util/mathjs.ts) has evaluate and
 * compile replaced by throwing spies and its node methods watched; a setter trap on globalThis
 * catches any assignment to `rigcalPwned`; Object.prototype must stay clean.
 */
import { afterAll, afterEach, beforeAll, expect, vi } from 'vitest';
import { mathjs } from '../../src/util/mathjs.js';

export function guardRunsNothing(): void {
  const evaluate = vi.spyOn(mathjs, 'evaluate').mockImplementation(() => {
    throw new Error('mathjs evaluate must never run on model text');
  });
  const compile = vi.spyOn(mathjs, 'compile').mockImplementation(() => {
    throw new Error('mathjs compile must never run on model text');
  });
  const nodeCompile = vi.spyOn(mathjs.Node.prototype, 'compile');
  const nodeEvaluate = vi.spyOn(mathjs.Node.prototype, 'evaluate');
  const pwned = vi.fn();
  beforeAll(() => {
    Object.defineProperty(globalThis, 'rigcalPwned', { set: pwned, get: () => undefined, configurable: true });
  });
  afterAll(() => {
    delete (globalThis as Record<string, unknown>).rigcalPwned;
  });
  afterEach(() => {
    expect(evaluate).not.toHaveBeenCalled();
    expect(compile).not.toHaveBeenCalled();
    expect(nodeCompile).not.toHaveBeenCalled();
    expect(nodeEvaluate).not.toHaveBeenCalled();
    expect(pwned).not.toHaveBeenCalled();
    expect(({} as Record<string, unknown>).fixed).toBeUndefined();
  });
}
