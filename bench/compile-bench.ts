/**
 * Speed of generated model code: nanoseconds per call of the right-hand side and the sensitivity
 * right-hand side, against a hand-written equivalent and mathjs's own compiled evaluation of the
 * same trees.
 * Run: npx tsx bench/compile-bench.ts   (not a test; numbers depend on the machine and its load)
 *
 * Models: the flywheel rig of the model-format example (a scenario of our own, values from the
 * spec) and a 4-state linear two-mass model of our own.
 */
import { cpus, loadavg } from 'node:os';
import { pathToFileURL } from 'node:url';
import { compileModel } from '../src/model/compile/index.js';
import { flywheel, linearModel } from '../test/model/compile/helpers.js';

export interface BenchRow {
  model: string;
  what: string;
  nsPerCall: number;
}

type Vec = Float64Array;
type Loop = (f: (...args: never[]) => void, args: unknown[], calls: number) => number;

/**
 * A fresh timing loop for every case. One shared loop calling different functions would be
 * polymorphic and measure the dispatch, not the generated code; a loop built per case by
 * `new Function` (fixed text of ours) has its own type feedback.
 */
function freshLoop(arity: number): Loop {
  const args = Array.from({ length: arity - 1 }, (_, k) => `a${k + 1}`);
  return new Function(
    'f',
    'args',
    'calls',
    `const [${args.join(',')}] = args; const x = a1; let sink = 0;
     for (let i = 0; i < calls; i++) { x[0] = i * 1e-9; f(i * 1e-6, ${args.join(',')}); sink += a${arity - 1}[0]; }
     return sink;`,
  ) as Loop;
}

function nsPerCall(arity: number, f: (...args: never[]) => void, args: unknown[], calls: number): number {
  const loop = freshLoop(arity);
  let best = Infinity;
  for (let rep = 0; rep < 7; rep++) {
    // CPU time of this process, not wall time: on a shared machine the wall clock also counts the
    // time other processes hold the core.
    const start = process.cpuUsage();
    loop(f, args, calls);
    const used = process.cpuUsage(start);
    best = Math.min(best, ((used.user + used.system) * 1000) / calls);
  }
  return best;
}

/** The linear model's right-hand side written by hand, as the speed to aim for. */
function handLinear(_t: number, x: Vec, u: Vec, p: Vec, dx: Vec): void {
  const x1 = x[0]!, v1 = x[1]!, x2 = x[2]!, v2 = x[3]!;
  const spring = p[3]! * (x2 - x1);
  const damper = p[5]! * (v2 - v1);
  dx[0] = v1;
  dx[1] = (u[0]! - p[2]! * x1 - p[4]! * v1 + spring + damper) / p[0]!;
  dx[2] = v2;
  dx[3] = (-spring - damper) / p[1]!;
}

/** The flywheel right-hand side written by hand (slots as in the model: R J L K b Tc ws w0). */
function handFlywheel(_t: number, x: Vec, u: Vec, p: Vec, dx: Vec): void {
  const i = x[0]!, w = x[1]!;
  const friction = p[4]! * w + p[5]! * Math.tanh(w / p[6]!);
  dx[0] = (u[0]! - p[0]! * i - p[3]! * w) / p[2]!;
  dx[1] = (p[3]! * i - friction) / p[1]!;
}

/** A call that does almost nothing: the cost of the timing loop and the call itself. */
function nearlyEmpty(_t: number, x: Vec, _u: Vec, _p: Vec, dx: Vec): void {
  dx[0] = x[0]!;
}

export function runCompileBench(calls = 5_000_000): BenchRow[] {
  const rows: BenchRow[] = [];
  {
    const v = new Float64Array(4);
    rows.push({ model: '-', what: 'loop and call overhead (near-empty body)', nsPerCall: nsPerCall(5, nearlyEmpty, [v, v, v, v], calls) });
  }
  for (const [name, model] of [
    ['flywheel (2 states, friction define)', flywheel()],
    ['linear (4 states)', linearModel()],
  ] as const) {
    const cm = compileModel(model);
    const n = cm.nStates;
    const x = new Float64Array(n).fill(0.3);
    const u = new Float64Array(cm.nInputs).fill(12);
    const p = cm.defaultParams();
    const dx = new Float64Array(n);
    rows.push({ model: name, what: 'rhs, generated', nsPerCall: nsPerCall(5, cm.rhs, [x, u, p, dx], calls) });
    const hand = name.startsWith('linear') ? handLinear : handFlywheel;
    rows.push({ model: name, what: 'rhs, hand-written equivalent', nsPerCall: nsPerCall(5, hand, [x, u, p, dx], calls) });
    const free = model.parameters.flatMap((q, k) => (q.kind === 'free' ? [k] : []));
    const slots = free.length ? free : model.parameters.map((_, k) => k);
    const sys = cm.sensitivity(slots);
    const z = new Float64Array(n * (1 + slots.length)).fill(0.1);
    const dz = new Float64Array(z.length);
    const udot = new Float64Array(cm.nInputs);
    rows.push({
      model: name,
      what: `sensitivity rhs, generated (q = ${slots.length})`,
      nsPerCall: nsPerCall(6, sys.rhs, [z, u, udot, p, dz], Math.ceil(calls / 4)),
    });
    // mathjs's own compiled evaluation of the same equation trees, for scale.
    const compiled = model.equations.map((e) => e.expr.node.compile());
    const defines = model.defines.map((d) => ({ name: d.name, code: d.expr.node.compile() }));
    const scope = new Map<string, number>();
    const viaMathjs = (t: number, xs: Vec, us: Vec, ps: Vec, out: Vec) => {
      model.states.forEach((s, k) => scope.set(s.name, xs[k]!));
      model.inputs.forEach((s, k) => scope.set(s.name, us[k]!));
      model.parameters.forEach((s, k) => scope.set(s.name, ps[k]!));
      scope.set('t', t);
      for (const d of defines) scope.set(d.name, d.code.evaluate(scope) as number);
      compiled.forEach((c, k) => (out[k] = c.evaluate(scope) as number));
    };
    rows.push({ model: name, what: 'rhs, mathjs compile().evaluate', nsPerCall: nsPerCall(5, viaMathjs, [x, u, p, dx], Math.ceil(calls / 200)) });
  }
  return rows;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  console.log(`load average ${loadavg().map((l) => l.toFixed(1)).join(' ')} on ${cpus().length} cores (ns of CPU time per call; still inflated under load)`);
  for (const r of runCompileBench()) console.log(`${r.model.padEnd(38)} ${r.what.padEnd(40)} ${r.nsPerCall.toFixed(1).padStart(8)} ns/call`);
}
