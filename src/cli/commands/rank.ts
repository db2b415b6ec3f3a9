/** The `rank` command: fit candidate models of one rig on the same data and rank them. */
import type { Command } from 'commander';
import { integerOption, mannerOptions } from '../options.js';
import type { CommandContext } from '../io.js';

interface RankCliOptions {
  nested?: boolean;
  json?: boolean;
  starts?: string;
  seed?: string;
  maxIterations?: string;
  quiet?: boolean;
}

export function register(program: Command, ctx: CommandContext): void {
  const command = program
    .command('rank')
    .description('fit candidate models of the same rig on the same experiments and rank them by AICc')
    .argument('<models...>', 'two or more model files that use the same data files and outputs')
    .option('--nested', 'also run likelihood-ratio tests between candidates ordered by free parameters (each smaller one must be a special case of the next)')
    .option('--starts <n>', 'starts per fit spread over the bounds (seeded)')
    .option('--seed <s>', 'seed of the starts')
    .option('--max-iterations <n>', 'iteration limit per fit');
  mannerOptions(command, 'print the ranking as JSON instead of the table')
    .addHelpText(
      'after',
      `
Example:
  rigcal rank models/flywheel.yaml models/flywheel-no-coulomb.yaml --nested

The objective is -2 log L of Gaussian noise with each model's maximum-likelihood noise level per output
(where the noise is estimated), so that models with different residual levels are compared fairly;
AICc and BIC count the free parameters plus the estimated noise levels.`,
    )
    .action(
      ctx.action(async (files: string[], opts: RankCliOptions) => {
        // Loaded when the command runs: start-up (and every other command) does without them.
        const [{ runRank }, { rankJson, rankText }, { toJson }] = await Promise.all([import('../../verbs/rank.js'), import('../../comparison/rank-report.js'), import('../../files/json.js')]);
        const starts = integerOption(opts.starts, '--starts');
        const seed = integerOption(opts.seed, '--seed');
        const maxIterations = integerOption(opts.maxIterations, '--max-iterations');
        const showProgress = ctx.io.stderrIsTTY; // false with --quiet (runCli)
        const outcome = runRank({
          modelFiles: files,
          nested: opts.nested,
          starts,
          seed,
          maxIterations,
          cwd: ctx.io.cwd,
          onModel: showProgress ? (name, i, n) => ctx.io.stderr(`fitting ${name} (${i + 1} of ${n})\n`) : undefined,
        });
        ctx.io.stdout(opts.json ? toJson(rankJson(outcome)) : rankText(outcome));
        // 1 when a candidate could not be fitted; else 3 when one stopped before converging (the text names it).
        if (outcome.failures.length) return 1;
        return outcome.models.some((m) => m.status === 'stopped') ? 3 : 0;
      }),
    );
}
