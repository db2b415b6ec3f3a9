/**
 * One row of `npm run bench`. Each file in bench/cases/ exports `cases: BenchCase[]`; the runner
 * imports them all, so adding a row (fits, reports...) means adding a file there.
 */
export interface BenchMeasure {
  /** Right-hand-side evaluations in one run, when the case knows them. */
  rhsEvaluations?: number;
  /** Anything else worth a column, in words (e.g. "9 iterations"). */
  note?: string;
}

export interface BenchCase {
  /** Row label, e.g. "simulate flywheel (3 experiments)". */
  name: string;
  /** Sorts the table: rows of one group stay together (e.g. "simulate", "fit", "report"). */
  group: string;
  /** Runs timed (median reported); default 10. Slow cases should ask for fewer. */
  runs?: number;
  /** Untimed preparation (load, compile, read data); returns the work to time. */
  setup(): Promise<() => BenchMeasure | void> | (() => BenchMeasure | void);
}
