/**
 * Whole-number options have a sane range (src/cli/options.ts INTEGER_RANGES): a value far outside it
 * is refused at once, naming the option and the limit, before any work (it used to run 40 s and die
 * of an out-of-memory abort for --starts 1000000000). Common practice, no source.
 */
import { describe, expect, it } from 'vitest';
import { INTEGER_RANGES } from '../../src/cli/options.js';
import { rigcal } from './run-cli.js';

describe('ranges of the numeric options', () => {
  for (const command of ['fit', 'rank']) {
    for (const [option, [min, max]] of Object.entries(INTEGER_RANGES)) {
      it(`${command} ${option} ${max + 1} and ${min - 1} are refused at once (exit 2)`, async () => {
        const t0 = performance.now();
        const over = await rigcal([command, 'models/flywheel.yaml', option, String(max + 1), '--quiet']);
        expect(over.code).toBe(2);
        expect(over.stderr).toContain(`${option} ${max + 1} is more than ${max.toLocaleString('en-US')}, the most rigcal accepts`);
        const under = await rigcal([command, 'models/flywheel.yaml', option, String(min - 1), '--quiet']);
        expect(under.code).toBe(2);
        expect(under.stderr).toContain(`${option} must be an integer of at least ${min}`);
        expect(performance.now() - t0).toBeLessThan(5000);
      });
    }
  }
  it('--starts 1000000000 is refused in well under a second', async () => {
    const t0 = performance.now();
    const run = await rigcal(['fit', 'models/flywheel.yaml', '--starts', '1000000000']);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/--starts 1000000000 is more than 1,000/);
    expect(performance.now() - t0).toBeLessThan(1000);
  });
});
