/**
 * Which parameters, or combinations of them, the data determine: from the singular values of the
 * column-scaled Jacobian at the optimum (see solver/scaled-svd.ts for the thresholds and why).
 *
 * For each singular value below SINGULAR_THRESHOLD times the largest, the right singular vector is
 * a direction along which the fit does not change. It is reported in words: the parameters with a
 * component of at least NULL_COMPONENT, and for two of them the combination that IS determined:
 * - moving the two by equal relative amounts (direction (+1,+1) in (ln a, ln b)) leaves only a/b;
 * - opposite relative amounts ((+1,-1) in logs) leave only the product a*b;
 * - in linear coordinates, equal absolute amounts leave only a - b, opposite ones only a + b, other
 *   proportions a linear combination such as a + 2*b;
 * - in log coordinates, other proportions leave a power law, e.g. a*b^2.
 * A direction is local: where a ratio (or product) and a sum (or difference) both hold near the
 * estimates (a/b and a - b when a = b), both are given; a general linear combination is offered
 * only when no ratio or product fits, since those are what physical models usually hide.
 * Relative changes are d theta for log-scaled entries and d theta / value for linear ones.
 * Pairs of determined parameters with |correlation| > 0.95 are flagged with a sentence (common
 * practice, no source: a correlation that close to 1 means the data hardly separate the two).
 */
import { formatDecimals } from '../presentation/numbers.js';
import type { IdentifiabilityProblem } from './fit/fit-result.js';
import { toRowMajor } from './solver/row-major.js';
import { meaningfulChanges, NULL_COMPONENT, scaledSvd, SINGULAR_THRESHOLD } from './solver/scaled-svd.js';
import type { JacobianInput } from './solver/types.js';

/** |correlation| above this is flagged (common practice, no source). */
const CORRELATION_FLAG = 0.95;

/** Two relative (or absolute) changes count as equal or opposite when their ratio is within 10 % of +-1. */
const RATIO_MATCH = 0.1;

export interface IdentifiabilityInput {
  /** Weighted Jacobian at the optimum, optimiser coordinates (rows: residuals). */
  jacobian: JacobianInput;
  /** Number of residuals (rows); needed when the Jacobian is a flat row-major array. */
  observations: number;
  names: readonly string[];
  /** The optimum in the optimiser's coordinates. */
  theta: readonly number[];
  scales?: readonly ('log' | 'linear')[];
  /** Correlation matrix (names in the same order), e.g. from computeUncertainty; null entries skipped. */
  correlation?: readonly (readonly (number | null)[])[];
  singularThreshold?: number;
}

export interface IdentifiabilityResult {
  /** Largest over smallest singular value of the column-scaled Jacobian; null when the smallest is zero. */
  conditionNumber: number | null;
  singularValues: number[];
  problems: IdentifiabilityProblem[];
  /** Sentences for the fit's warnings (problems and strong correlations). */
  warnings: string[];
}

function listNames(names: string[]): string {
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

function near(x: number, target: number): boolean {
  return Number.isFinite(x) && Math.abs(x - target) <= RATIO_MATCH;
}

/** a^1 * b^e as text. */
function powerLaw(a: string, b: string, e: number): string {
  if (near(e, 1)) return `${a}*${b}`;
  if (near(e, -1)) return `${a}/${b}`;
  const m = Number(Math.abs(e).toPrecision(2));
  return e < 0 ? `${a}/${b}^${m}` : `${a}*${b}^${m}`;
}

/** The sentence for a two-parameter weak direction. */
function describePair(a: string, b: string, rel: [number, number] | null, abs: [number, number] | null): string {
  const relRatio = rel ? rel[0] / rel[1] : Number.NaN;
  const absRatio = abs ? abs[0] / abs[1] : Number.NaN;
  const ratioKind = near(relRatio, 1) ? 'ratio' : near(relRatio, -1) ? 'product' : null;
  const sumKind = near(absRatio, 1) ? 'difference' : near(absRatio, -1) ? 'sum' : null;
  const together = (rel ? relRatio : absRatio) > 0;
  const head = together ? `${a} and ${b} move together` : `${a} and ${b} move in opposite directions`;
  const combos: string[] = [];
  if (ratioKind === 'ratio') combos.push(`the ratio ${a}/${b}`);
  if (ratioKind === 'product') combos.push(`the product ${a}*${b}`);
  if (sumKind === 'difference') combos.push(`the difference ${a} - ${b}`);
  if (sumKind === 'sum') combos.push(`the sum ${a} + ${b}`);
  if (combos.length === 0 && abs && Number.isFinite(absRatio) && absRatio !== 0) {
    // Linear coordinates, unequal amounts: invariant a - (da/db) b.
    const c = Number((-absRatio).toPrecision(2));
    combos.push(`${a} ${c < 0 ? '-' : '+'} ${Math.abs(c)}*${b}`);
  }
  if (combos.length === 0 && rel && Number.isFinite(relRatio) && relRatio !== 0) {
    // Invariant along (ra, rb) in logs: ln a - (ra/rb) ln b, i.e. a * b^(-ra/rb).
    combos.push(powerLaw(a, b, -relRatio));
  }
  if (combos.length === 0) {
    return `${head}: these data determine only one combination of ${a} and ${b}, not each of them`;
  }
  const what = combos.length === 2 ? `${combos[0]} (equivalently, near these values, ${combos[1]})` : combos[0];
  return `${head}: only ${what} is determined by these data`;
}

/**
 * Three or more parameters whose relative changes are equal or opposite (the usual case: a model
 * that contains them only through ratios or products with one of them, e.g. k/m and c/m). Null
 * when the proportions are anything else.
 */
function describeGroup(names: string[], relative: number[]): string | null {
  const r0 = relative[0]!;
  if (!Number.isFinite(r0) || r0 === 0) return null;
  const combos: string[] = [];
  const kinds = new Set<string>();
  for (let m = 1; m < names.length; m++) {
    const q = relative[m]! / r0;
    if (near(q, 1)) {
      combos.push(`${names[m]}/${names[0]}`);
      kinds.add('ratios');
    } else if (near(q, -1)) {
      combos.push(`${names[m]}*${names[0]}`);
      kinds.add('products');
    } else return null;
  }
  const what = kinds.size === 1 ? `the ${[...kinds][0]} ${listNames(combos)} are` : `${listNames(combos)} are`;
  return `${listNames(names)} move together: only ${what} determined by these data, not each parameter`;
}

export function analyseIdentifiability(input: IdentifiabilityInput): IdentifiabilityResult {
  const p = input.theta.length;
  const J = toRowMajor(input.jacobian, input.observations, p);
  const scales = input.scales ?? new Array<'log' | 'linear'>(p).fill('linear');
  const svd = scaledSvd(J, input.singularThreshold ?? SINGULAR_THRESHOLD, meaningfulChanges(input.theta, scales));
  const sv = svd.singularValues;
  const smax = sv[0] ?? 0;
  const smin = sv[sv.length - 1] ?? 0;
  const conditionNumber = p === 0 ? null : smin > 0 ? smax / smin : null;

  const problems: IdentifiabilityProblem[] = [];
  const warnings: string[] = [];
  sv.forEach((s, k) => {
    if (svd.determined[k]) return;
    const idx: number[] = [];
    for (let i = 0; i < p; i++) if (Math.abs(svd.v.get(i, k)) >= NULL_COMPONENT) idx.push(i);
    if (idx.length === 0) return;
    const names = idx.map((i) => input.names[i] ?? `theta${i}`);
    // Direction in the optimiser's coordinates, then as relative and as absolute changes.
    const dTheta = idx.map((i) => svd.v.get(i, k) / svd.columnScale[i]!);
    const value = idx.map((i) => (scales[i] === 'log' ? Math.exp(input.theta[i]!) : input.theta[i]!));
    const relative = idx.map((i, m) => (scales[i] === 'log' ? dTheta[m]! : value[m] !== 0 ? dTheta[m]! / value[m]! : Number.NaN));
    const absolute = idx.map((i, m) => (scales[i] === 'log' ? dTheta[m]! * value[m]! : dTheta[m]!));
    let message: string;
    if (idx.length === 1) {
      message = `${names[0]} has no influence on the fit at these values: these data do not determine it (where the model can depend on it, the fit may sit on a plateau: try several starts, --starts N)`;
    } else if (idx.length === 2) {
      const rel = relative.every(Number.isFinite) ? ([relative[0]!, relative[1]!] as [number, number]) : null;
      const allLinear = idx.every((i) => scales[i] !== 'log');
      message = describePair(names[0]!, names[1]!, rel, allLinear ? [absolute[0]!, absolute[1]!] : null);
    } else if (describeGroup(names, relative) !== null) {
      message = describeGroup(names, relative)!;
    } else {
      const largest = Math.max(...relative.map((r) => (Number.isFinite(r) ? Math.abs(r) : 0)));
      const parts = idx.map((_, m) => {
        const r = relative[m]!;
        return Number.isFinite(r) && largest > 0 ? `${r >= 0 ? '+' : '-'}${formatDecimals(Math.abs(r / largest), 2)} ${names[m]}` : `${names[m]}`;
      });
      message =
        `${listNames(names)} are not determined separately by these data: changing them together ` +
        `(relative changes in the proportions ${parts.join(', ')}) leaves the fit unchanged`;
    }
    problems.push({ parameters: names, direction: idx.map((i) => svd.v.get(i, k)), singularValue: s / (smax || 1), message });
    warnings.push(message);
  });

  if (input.correlation) {
    for (let a = 0; a < p; a++) {
      for (let b = a + 1; b < p; b++) {
        const r = input.correlation[a]?.[b];
        if (r === null || r === undefined || !(Math.abs(r) > CORRELATION_FLAG)) continue;
        const na = input.names[a] ?? `theta${a}`;
        const nb = input.names[b] ?? `theta${b}`;
        const how = r > 0 ? 'their estimates err in the same direction' : 'their estimates err in opposite directions';
        warnings.push(
          `${na} and ${nb} are strongly correlated (correlation ${formatDecimals(r, 3)}): ${how}, and these data hardly separate them; ` +
            'an experiment that excites them differently, or fixing one from a measurement, would help',
        );
      }
    }
  }
  return { conditionNumber, singularValues: sv, problems, warnings };
}
