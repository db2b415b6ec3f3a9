/**
 * Progress of a fit on standard error: the phase (fit, noise refit, search of starts), the start k
 * of N, the iteration, the best cost so far and the time since the command began. On a terminal one
 * line is rewritten in place; elsewhere (a log, CI, a run under `timeout`) plain lines, the first
 * after FIRST_LINE_AFTER seconds and then one every LINE_EVERY seconds or at each new phase, so that
 * a short fit writes nothing and a long one leaves a trace. Silent with --quiet (runCli).
 */
import type { FitProgress } from '../estimation/fit/fit-options.js';
import { formatNumber } from '../presentation/numbers.js';
import type { CliIO } from './io.js';

const FIRST_LINE_AFTER = 5;
const LINE_EVERY = 10;

export interface ProgressDisplay {
  onProgress: (p: FitProgress) => void;
  /** Ends the display (the terminal line is closed with a line break). */
  finish(): void;
}

export function progressDisplay(io: CliIO, now: () => number = () => performance.now() / 1000): ProgressDisplay {
  const t0 = now();
  let best = Infinity;
  let phaseKey = '';
  let lastPrinted = -Infinity;
  let lastLength = 0;
  const onProgress = (p: FitProgress) => {
    const key = `${p.phase}:${p.message ?? ''}`;
    const newPhase = key !== phaseKey;
    if (newPhase && p.phase !== 'fit') best = Infinity; // another weighting: costs no longer compare
    phaseKey = key;
    best = Math.min(best, p.cost);
    const elapsed = now() - t0;
    const line = `${p.message ?? p.phase}: start ${p.start} of ${p.starts}, iteration ${p.iteration}, best cost ${formatNumber(best, 6)}, ${formatNumber(elapsed, 3)} s`;
    if (io.stderrIsTTY) {
      io.stderr(`\r${line.padEnd(lastLength)}`);
      lastLength = line.length;
    } else if (elapsed >= FIRST_LINE_AFTER && (newPhase || elapsed - lastPrinted >= LINE_EVERY)) {
      io.stderr(`rigcal: ${line}\n`);
      lastPrinted = elapsed;
    }
  };
  return { onProgress, finish: () => void (io.stderrIsTTY && lastLength && io.stderr('\n')) };
}
