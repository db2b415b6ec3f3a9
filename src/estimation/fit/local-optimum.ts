/**
 * A fit from one start that ends with parameters on their bounds while the residuals of a fit output
 * are not white may have stopped in a local optimum: a lightly damped resonance, for one, has a
 * "rigid" solution that a start on the wrong side of it slides into. Said in words, with the way to
 * look further; estimates on a bound with white residuals (a true value at the bound) say nothing.
 */
import type { OutputResult, ParameterResult } from './fit-result.js';

export interface LocalOptimumHint {
  /** What was found, in words. */
  finding: string;
  /** The finding with the way to look further, as the fit's warning. */
  warning: string;
}

export function localOptimumHint(multistart: boolean, parameters: readonly ParameterResult[], outputs: readonly OutputResult[]): LocalOptimumHint | undefined {
  if (multistart) return undefined;
  const onBound = parameters.filter((p) => p.atBound);
  const notWhite = outputs.filter((o) => o.role === 'fit' && o.whiteness && !o.whiteness.white);
  if (onBound.length === 0 || notWhite.length === 0) return undefined;
  const names = onBound.map((p) => `${p.name} (${p.atBound})`).join(', ');
  const series = notWhite.map((o) => `${o.output} in ${o.experiment}`).join(', ');
  const finding =
    `from the model's start values ${names} ended on ${onBound.length === 1 ? 'its bound' : 'their bounds'} while the residuals of ${series} ` +
    `were not white: the fit may have stopped in a local optimum rather than at the best fit`;
  return { finding, warning: `${finding}; try several starts spread over the bounds (--starts 8)` };
}
