/**
 * Progress of a fit (src/cli/progress.ts): phase, start k of N, iteration, best cost and elapsed time;
 * a rewritten line on a terminal, plain lines elsewhere once the fit takes long, nothing for a short
 * fit off a terminal. Common practice, no source.
 */
import { describe, expect, it } from 'vitest';
import { progressDisplay } from '../../src/cli/progress.js';
import type { FitProgress } from '../../src/estimation/fit/fit-options.js';
import { rigcal } from './run-cli.js';

function fakeIo(tty: boolean) {
  let err = '';
  return { io: { stdout: () => {}, stderr: (s: string) => void (err += s), stderrIsTTY: tty, cwd: '.' }, err: () => err };
}

const step = (over: Partial<FitProgress>): FitProgress => ({ phase: 'fit', start: 1, starts: 8, iteration: 1, cost: 100, step: 0.1, ...over });

describe('progress display', () => {
  it('off a terminal: nothing for the first seconds, then plain lines with phase, start k of N, best cost and time', () => {
    const { io, err } = fakeIo(false);
    let t = 0;
    const p = progressDisplay(io, () => t);
    p.onProgress(step({ start: 1, cost: 50 }));
    t = 1;
    p.onProgress(step({ start: 2, cost: 80 }));
    expect(err()).toBe('');
    t = 6;
    p.onProgress(step({ start: 3, iteration: 4, cost: 70 }));
    expect(err()).toBe('rigcal: fit: start 3 of 8, iteration 4, best cost 50, 6 s\n');
    t = 7;
    p.onProgress(step({ start: 3, iteration: 5, cost: 60 }));
    expect(err().split('\n')).toHaveLength(2); // no new line within 10 s of the last one
    t = 8;
    p.onProgress(step({ phase: 'noise refit', message: 'refit 2 with the estimated noise levels', start: 1, starts: 1, cost: 900 }));
    expect(err()).toContain('rigcal: refit 2 with the estimated noise levels: start 1 of 1, iteration 1, best cost 900, 8 s\n');
    p.finish();
    expect(err().endsWith('\n')).toBe(true);
  });

  it('on a terminal: one line rewritten in place, closed at the end', () => {
    const { io, err } = fakeIo(true);
    let t = 0;
    const p = progressDisplay(io, () => t);
    t = 0.5;
    p.onProgress(step({ phase: 'search of starts', start: 2, cost: 12345.678 }));
    p.onProgress(step({ phase: 'search of starts', start: 3, cost: 20000 }));
    p.finish();
    expect(err()).toBe('\rsearch of starts: start 2 of 8, iteration 1, best cost 12345.7, 0.5 s\rsearch of starts: start 3 of 8, iteration 1, best cost 12345.7, 0.5 s\n');
  });

  it('a fit with --starts 3 on a terminal shows start k of 3', async () => {
    const run = await rigcal(['fit', 'models/heated-block.yaml', '--starts', '3', '-o', '/tmp/rigcal-progress-test-fit'], process.cwd(), true);
    expect(run.code).toBe(0);
    expect(run.stderr).toMatch(/\rfit: start 3 of 3, iteration \d+, best cost [\d.e+-]+, [\d.]+ s/);
  });
});
