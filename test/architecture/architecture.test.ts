/**
 * The shape of the source tree (DEVELOPERS.md): small functions, and folders that import each
 * other one way only. Common practice, no source; the limits are the project's own rules.
 */
import { relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import { functionSpans, relativeImports, sourceFiles, SRC } from './source-tree.js';

/** The longest function allowed in src/ (the vendored integrator is a copy and keeps its shape). */
const MAX_FUNCTION_LINES = 120;
const EXEMPT = new Set(['simulation/vendor/odex.ts']);

describe('source tree', () => {
  it(`has no function longer than ${MAX_FUNCTION_LINES} lines outside the vendored integrator`, () => {
    const spans = sourceFiles().flatMap(functionSpans);
    expect(spans.length).toBeGreaterThan(300); // the walk really found the functions
    const long = spans.filter((s) => !EXEMPT.has(s.file) && s.lines > MAX_FUNCTION_LINES).map((s) => `${s.file}:${s.line} ${s.name} (${s.lines} lines)`);
    expect(long).toEqual([]);
  });

  it('has no import cycle between modules, type imports included', () => {
    const files = sourceFiles();
    const graph = new Map(files.map((f) => [f, relativeImports(f, true)]));
    const cycles = findCycles(graph).map((c) => c.map((f) => relative(SRC, f)).join(' -> '));
    expect(cycles).toEqual([]);
  });
});

/** One cycle per strongly connected component with more than one module (depth-first, Tarjan 1972). */
function findCycles(graph: Map<string, string[]>): string[][] {
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const out: string[][] = [];
  const strong = (v: string) => {
    index.set(v, counter);
    low.set(v, counter++);
    stack.push(v);
    onStack.add(v);
    for (const w of graph.get(v) ?? []) {
      if (!graph.has(w)) continue;
      if (!index.has(w)) {
        strong(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, index.get(w)!));
    }
    if (low.get(v) !== index.get(v)) return;
    const component: string[] = [];
    let w: string;
    do {
      w = stack.pop()!;
      onStack.delete(w);
      component.push(w);
    } while (w !== v);
    if (component.length > 1) out.push(component);
  };
  for (const v of graph.keys()) if (!index.has(v)) strong(v);
  return out;
}
