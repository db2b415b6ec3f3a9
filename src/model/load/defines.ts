/**
 * The `define` section: named intermediate quantities, put in dependency order (each define uses
 * only earlier ones). A cycle is a problem that names the whole cycle.
 */
import type { ProblemList } from '../../errors.js';
import { symbolsOf } from '../expression-check.js';
import type { DefineSpec } from '../types.js';
import { declare, readExpression, type LoadState } from './load-state.js';
import { LIMITS } from '../limits.js';
import { at, sectionEntries, type YNode } from './yaml-source.js';

export function readDefines(st: LoadState, node: YNode, path = 'define'): DefineSpec[] {
  const entries = sectionEntries(st.ctx, node, path, 'define', LIMITS.defines, 'defines');
  if (!entries) return [];
  const out: DefineSpec[] = [];
  for (const e of entries) {
    const ok = declare(st, e.key, 'define', e.keyNode, e.path);
    const expr = readExpression(st, e.value, e.path, `define ${e.key}`);
    if (ok && expr) out.push({ name: e.key, expr });
  }
  return out;
}

/**
 * Defines in dependency order (file order where free to choose). On a cycle, one problem per cycle
 * naming it (`a -> b -> a`); the defines on it are left out of the result.
 */
export function orderDefines(defines: readonly DefineSpec[], problems: ProblemList): DefineSpec[] {
  const byName = new Map(defines.map((d) => [d.name, d]));
  const deps = new Map(defines.map((d) => [d.name, [...symbolsOf(d.expr.node)].filter((s) => byName.has(s))]));
  const state = new Map<string, 'visiting' | 'done' | 'cyclic'>();
  const ordered: DefineSpec[] = [];
  // Iterative depth-first search: a long chain of defines must not overflow the stack.
  for (const root of defines) {
    if (state.has(root.name)) continue;
    const path: string[] = [];
    const stack: { name: string; next: number }[] = [{ name: root.name, next: 0 }];
    state.set(root.name, 'visiting');
    path.push(root.name);
    while (stack.length) {
      const top = stack[stack.length - 1];
      const ds = deps.get(top.name)!;
      if (top.next < ds.length) {
        const dep = ds[top.next++];
        const s = state.get(dep);
        if (s === undefined) {
          state.set(dep, 'visiting');
          path.push(dep);
          stack.push({ name: dep, next: 0 });
        } else if (s === 'visiting') {
          const cycle = [...path.slice(path.indexOf(dep)), dep];
          for (const n of cycle) state.set(n, 'cyclic');
          const d = byName.get(dep)!;
          problems.add(d.expr.where, `the defines form a cycle: ${cycle.join(' -> ')}`, 'a define may use only defines that do not depend on it; break the cycle');
        }
        continue;
      }
      stack.pop();
      path.pop();
      if (state.get(top.name) === 'visiting') {
        const blocked = ds.some((d) => state.get(d) === 'cyclic');
        state.set(top.name, blocked ? 'cyclic' : 'done');
        if (!blocked) ordered.push(byName.get(top.name)!);
      }
    }
  }
  return ordered;
}
