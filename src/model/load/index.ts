/**
 * Loading a model file: YAML -> checked `Model` (plain data). Every problem found is collected and
 * thrown as one `UserError`, so that `check` can list them all. Nothing in the file is evaluated.
 */
import { resolve } from 'node:path';
import { UserError } from '../../errors.js';
import { checkModelUnits } from '../../units/dimensions.js';
import type { Model, ParameterSpec } from '../types.js';
import { orderDefines, readDefines } from './defines.js';
import { finishExperiment, readExperiments } from './experiments.js';
import { readInputs } from './inputs.js';
import { LIMITS } from '../limits.js';
import { newLoadState } from './load-state.js';
import { finishOutputs, readOutputs } from './outputs.js';
import { applyOverrides } from './overrides.js';
import { readParameters } from './parameters.js';
import { checkDelays, checkNames, timeVaryingDefines } from './references.js';
import { readEquations, readStates } from './states.js';
import { checkUnitStrings } from './unit-strings.js';
import { readHeader, requireKey } from './header.js';
import { at, byKey, isNullish, mapEntries, parseYaml, readSourceFile } from './yaml-source.js';

export { parseOverrides } from './overrides.js';

const TOP_LEVEL_KEYS = [
  'format', 'name', 'description', 'time_unit', 'states', 'inputs', 'parameters', 'define', 'equations',
  'outputs', 'experiments', 'units',
] as const;

export interface LoadOptions {
  /** Values from `--set` (see parseOverrides): `name` or `name@experiment` -> number in the parameter's unit. */
  overrides?: Record<string, number>;
}

/** Load and check a model file. Throws one UserError listing every problem found. */
export function loadModel(file: string, options: LoadOptions = {}): Model {
  try {
    return load(file, options);
  } catch (err) {
    // Every walk is bounded by the caps in limits.ts; should a hostile file still exhaust the
    // stack, it is the file's fault and is reported as such, never as a crash.
    if (err instanceof RangeError) {
      throw new UserError({ where: { file }, what: 'the model file is nested too deeply to read', fix: 'a model file needs only a few levels of nesting' });
    }
    throw err;
  }
}

function load(file: string, options: LoadOptions): Model {
  const absolute = resolve(file);
  const source = readSourceFile(file, absolute);
  const ctx = parseYaml(file, source.text);
  const { problems } = ctx;
  const st = newLoadState(ctx);
  const rootWhere = at(ctx, ctx.doc.contents ?? undefined);

  if (isNullish(ctx, ctx.doc.contents)) {
    throw new UserError({ where: { file }, what: 'the model file is empty', fix: 'start from an example model: format: 1, name, states, parameters, equations, outputs, experiments' });
  }
  const top = mapEntries(ctx, ctx.doc.contents, '', 'the model file', TOP_LEVEL_KEYS);
  if (!top) problems.throwIfAny();
  const k = byKey(top!);

  const { name, description, timeUnit, units } = readHeader(ctx, k, rootWhere);

  // Declarations, in the order that gives the clearest messages about clashes.
  const nullable = (key: string) => (k.has(key) && !isNullish(ctx, k.get(key)!.value) ? k.get(key)!.value : undefined);
  const states = nullable('states') !== undefined ? readStates(st, nullable('states')) : [];
  const inputs = nullable('inputs') !== undefined ? readInputs(st, nullable('inputs')) : [];
  requireKey(ctx, k, rootWhere, 'parameters', 'add a parameters section: name: { fixed: value } or name: { free: [min, max] }');
  let parameters: ParameterSpec[] = nullable('parameters') !== undefined ? readParameters(st, nullable('parameters')) : [];
  const defines = nullable('define') !== undefined ? readDefines(st, nullable('define')) : [];
  const stateNames = new Set(states.map((s) => s.name));
  const declaredStates = [...st.declared].filter(([, d]) => d.kind === 'state').map(([n]) => n);

  const hasStates = k.has('states') && declaredStates.length > 0;
  const isStatic = !hasStates;
  let equations: Model['equations'] = [];
  if (hasStates) {
    if (nullable('equations') === undefined) {
      problems.add({ ...rootWhere, key: 'equations' }, 'the model has states but no equations', 'add an equations section with d(state)/dt for every state');
    } else {
      equations = readEquations(st, nullable('equations'), states, new Set(declaredStates));
    }
  } else if (k.has('equations') && !isNullish(ctx, k.get('equations')!.value)) {
    problems.add(at(ctx, k.get('equations')!.keyNode, 'equations'), 'there are equations but no states',
      'declare each state under states: { unit, initial }, or remove equations for a static model');
  }
  const outputDrafts = nullable('outputs') !== undefined ? readOutputs(st, nullable('outputs')) : [];
  const experimentDrafts = nullable('experiments') !== undefined ? readExperiments(st, nullable('experiments'), absolute) : [];

  // Everything that needs the whole namespace.
  const symbolUnits = new Map<string, string>([...states, ...inputs].map((s) => [s.name, s.unit]));
  const outputs = finishOutputs(st, outputDrafts, symbolUnits);
  const ordered = orderDefines(defines, problems);
  const varying = timeVaryingDefines(st, ordered);
  const nameOpts = { isStatic, varying };
  for (const d of defines) checkNames(st, d.expr, `define ${d.name}`, 'dynamic', nameOpts);
  for (const eq of equations) checkNames(st, eq.expr, `the equation for ${eq.state}`, 'dynamic', nameOpts);
  for (const o of outputs) checkNames(st, o.expr, `output ${o.name}`, 'dynamic', nameOpts);
  for (const s of states) checkNames(st, s.initial, `the initial value of ${s.name}`, 'initial', nameOpts);
  checkDelays(st, inputs, parameters.map((p) => p.name));
  if (isStatic) {
    for (const i of inputs) {
      if (i.delay !== undefined) problems.add({ ...i.where, key: `inputs.${i.name}.delay` }, `input ${i.name} has a delay, but the model is static (no time)`, 'remove delay');
    }
  }
  for (const p of parameters) {
    const delayed = inputs.some((i) => i.delay === p.name);
    const low = p.kind === 'fixed' ? p.value : p.min;
    if (delayed && low < 0) problems.add(p.where, `parameter ${p.name} is a delay, so it cannot be negative (${p.kind === 'fixed' ? 'value' : 'lower bound'} ${low})`, 'a delay shifts an input later in time; give values >= 0');
  }

  const fixedNames = new Set(parameters.filter((p) => p.kind === 'fixed').map((p) => p.name));
  const freeNames = new Set(parameters.filter((p) => p.kind === 'free').map((p) => p.name));
  const experiments = experimentDrafts.map((d) => {
    const ex = finishExperiment(st, d, {
      fixed: fixedNames, free: freeNames, states: [...stateNames], isStatic, declared: st.declared,
      columnOwners: [...inputs.map((i) => i.name), ...outputs.map((o) => o.name)],
    });
    for (const [state, init] of Object.entries(ex.initial)) {
      checkNames(st, init, `the initial value of ${state} in experiment ${ex.name}`, 'initial', nameOpts);
    }
    return d.usable ? ex : undefined;
  }).filter((ex) => ex !== undefined);

  const overrides = { ...(options.overrides ?? {}) };
  const otherNames = new Map([...st.declared].filter(([, d]) => d.kind !== 'parameter').map(([n, d]) => [n, d.kind]));
  const loaded = new Set(parameters.map((p) => p.name));
  const brokenParameters = new Set([...st.declared].filter(([n, d]) => d.kind === 'parameter' && !loaded.has(n)).map(([n]) => n));
  parameters = applyOverrides(overrides, parameters, experiments, otherNames, problems, brokenParameters);

  checkUnitStrings(st, units === 'check');

  const model: Model = {
    file: absolute,
    fileAsGiven: file,
    sha256: source.sha256,
    format: 1,
    name,
    description,
    timeUnit,
    isStatic,
    states,
    inputs,
    parameters,
    defines: ordered,
    equations,
    outputs,
    experiments,
    units,
    overrides,
  };
  // Symbols that are undeclared or carry an unknown unit are skipped by the unit check, so a broken
  // name is reported once (above), not again as a unit problem.
  model.unitCheck = checkModelUnits(model, problems, { skip: st.badNames });
  const extra = problems.items.length - LIMITS.problemsShown;
  if (extra > 0) {
    problems.items.splice(LIMITS.problemsShown);
    problems.add({ file }, `... and ${extra} more problems`, 'mend the problems above first; the rest may be consequences of them');
  }
  problems.throwIfAny();
  return model;
}
