/** Words for the samples the log reader left out as gross errors (data/gross-outliers.ts), for the fit's warnings and `check`'s notes. */
import type { ExperimentData } from '../data/types.js';
import { formatSignificant } from './numbers.js';

/** Samples the log reader left out as gross errors, named by line: one warning per experiment and output. */
export function outlierWarnings(data: readonly ExperimentData[]): string[] {
  return data.flatMap((d) => {
    const byOutput = new Map<string, typeof d.outliers>();
    for (const o of d.outliers) byOutput.set(o.output, [...(byOutput.get(o.output) ?? []), o]);
    return [...byOutput].map(([output, list]) => {
      const shown = list.slice(0, 3).map((o) => `line ${o.line}: ${formatSignificant(o.value, 6)}${o.unit ? ` ${o.unit}` : ''}`).join(', ');
      const more = list.length > 3 ? `, and ${list.length - 3} more` : '';
      const n = list.length === 1 ? '1 sample was' : `${list.length} samples were`;
      return `output ${output} in experiment ${d.experiment.name}: ${n} left out as gross errors (${shown}${more}), far off from their neighbours in ${d.experiment.fileAsWritten}; check the logger (an over-range marker?) and repair the log`;
    });
  });
}
