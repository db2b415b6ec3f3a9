#!/usr/bin/env node
/**
 * Writes the NIST StRD nonlinear regression problems as test fixtures of our own format:
 *   test/fixtures/nist/<Name>.json          data, model, starts, certified values (for the solver tests)
 *   test/fixtures/nist/models/<Name>.yaml   the same problem as a static rigcal model file
 *   test/fixtures/nist/models/<Name>.csv    its data
 * Source of every number: NIST Statistical Reference Datasets, Nonlinear Regression
 * (itl.nist.gov/div898/strd/nls), read from the parsed copy in ../shared/reference/nist-strd/index.json.
 *
 * Usage: node scripts/make-nist-fixtures.mjs [path/to/index.json]
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const SOURCE = 'NIST Statistical Reference Datasets, Nonlinear Regression (itl.nist.gov/div898/strd/nls)';
const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const indexPath = process.argv[2] ?? resolve(root, '../shared/reference/nist-strd/index.json');
const outDir = join(root, 'test/fixtures/nist');
const modelDir = join(outDir, 'models');
mkdirSync(modelDir, { recursive: true });

/** NIST's notation to our expression language: `**` is `^`, `arctan` is `atan`. */
function toOurSyntax(expr) {
  return expr.replace(/\*\*/g, '^').replace(/\barctan\b/g, 'atan').replace(/\s+/g, ' ').trim();
}

/** JSON with one key per line but each array of numbers on one line (readable diffs, small files). */
function compactJson(value, indent = '') {
  if (Array.isArray(value) && value.every((v) => typeof v === 'number')) return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map((v) => compactJson(v, indent)).join(', ')}]`;
  if (value && typeof value === 'object') {
    const inner = indent + ' ';
    const body = Object.entries(value).map(([k, v]) => `${inner}${JSON.stringify(k)}: ${compactJson(v, inner)}`);
    return `{\n${body.join(',\n')}\n${indent}}`;
  }
  return JSON.stringify(value);
}

/** Shortest text that reads back as the same double. */
const num = (x) => String(x);

const sets = JSON.parse(readFileSync(indexPath, 'utf8'));
if (!Array.isArray(sets) || sets.length !== 27) throw new Error(`expected 27 datasets in ${indexPath}`);

for (const s of sets) {
  const eq = s.expression.indexOf('=');
  const response = s.expression.slice(0, eq).trim(); // "y", or "log(y)" for Nelson
  const model = toOurSyntax(s.expression.slice(eq + 1));
  const predictors = s.nPredictors === 2 ? ['x1', 'x2'] : ['x'];
  const params = Array.from({ length: s.nParams }, (_, i) => `b${i + 1}`);
  if (s.constants && Object.keys(s.constants).some((k) => k !== 'pi' || s.constants[k] !== Math.PI)) {
    throw new Error(`${s.name}: constants other than pi = Math.PI are not handled`);
  }
  const columns = {};
  if (s.nPredictors === 2) {
    columns.x1 = s.x.map((row) => row[0]);
    columns.x2 = s.x.map((row) => row[1]);
  } else {
    columns.x = s.x;
  }
  columns.y = s.y;

  const fixture = {
    source: SOURCE,
    dataset: s.name,
    difficulty: s.difficulty,
    modelClass: s.modelClass,
    modelAsPublished: s.model,
    response,
    model,
    predictors,
    parameters: params,
    start1: s.start1,
    start2: s.start2,
    certified: s.certified,
    certifiedStdDev: s.certifiedStdDev,
    residualSumOfSquares: s.residualSumOfSquares,
    residualStdDev: s.residualStdDev,
    degreesOfFreedom: s.degreesOfFreedom,
    observations: s.nObs,
    data: columns,
    notes: s.notes ?? [],
  };
  writeFileSync(join(outDir, `${s.name}.json`), compactJson(fixture) + '\n');

  // The same problem as a static model file and CSV, for the command-line `fit`.
  const nelson = response !== 'y';
  if (nelson && response !== 'log(y)') throw new Error(`${s.name}: unexpected response ${response}`);
  const outName = nelson ? 'logy' : 'y';
  const header = [...predictors, 'y', ...(nelson ? ['logy'] : [])];
  const lines = [
    `# NIST StRD ${s.name}: data from ${SOURCE}.`,
    ...(nelson ? ['# logy = natural log of y, computed by scripts/make-nist-fixtures.mjs in double precision (the model describes log(y)).'] : []),
    header.join(','),
  ];
  for (let i = 0; i < s.nObs; i++) {
    const row = predictors.map((c) => num(columns[c][i]));
    row.push(num(s.y[i]));
    if (nelson) row.push(num(Math.log(s.y[i])));
    lines.push(row.join(','));
  }
  writeFileSync(join(modelDir, `${s.name}.csv`), lines.join('\n') + '\n');

  const yaml = [
    `# NIST StRD ${s.name} (${s.difficulty} difficulty) as a static rigcal model.`,
    `# Written by scripts/make-nist-fixtures.mjs. Source: ${SOURCE}.`,
    `# Published model: ${s.model}`,
    `# Starts: the parameters' start values are NIST start 1; NIST start 2 is ${s.start2.map(num).join(', ')}.`,
    `# Certified values: ${s.certified.map((v, i) => `${params[i]} = ${num(v)} (std. dev. ${num(s.certifiedStdDev[i])})`).join(', ')}.`,
    `# Certified residual sum of squares ${num(s.residualSumOfSquares)}, residual std. dev. ${num(s.residualStdDev)}, ${s.degreesOfFreedom} degrees of freedom.`,
    'format: 1',
    `name: nist-${s.name.toLowerCase()}`,
    'description: >',
    `  NIST StRD nonlinear regression problem ${s.name} (${s.modelClass}), ${s.nObs} observations,`,
    `  ${s.nParams} parameters. Fitting it reproduces the certified values; no noise level is given, so`,
    '  the fit estimates it, as the certified standard deviations assume.',
    'inputs:',
    ...predictors.map((c) => `  ${c}: { column: ${c} }`),
    'parameters:',
    ...params.map((b, i) => `  ${b}: { free: [-.inf, .inf], start: ${num(s.start1[i])}, scale: linear }`),
    'outputs:',
    `  ${outName}: { expr: "${model}", column: ${outName} }`,
    'experiments:',
    '  - name: nist-data',
    `    file: ${s.name}.csv`,
    '',
  ];
  writeFileSync(join(modelDir, `${s.name}.yaml`), yaml.join('\n'));
}
console.log(`wrote ${sets.length} NIST StRD fixtures to ${outDir}`);
