/** `rigcal report DIR`: rebuild report.html in a results folder of `fit` from its fit.json and residuals.csv. */
import type { Command } from 'commander';
import { printable } from '../../presentation/printable.js';
import { formatDuration, formatFileSize } from '../../presentation/numbers.js';
import type { CommandContext } from '../io.js';
import { mannerOptions } from '../options.js';

export function register(program: Command, ctx: CommandContext): void {
  const command = program
    .command('report')
    .description('rebuild report.html in a results folder of `fit` (one self-contained page that opens offline)')
    .argument('<dir>', 'the results folder that `rigcal fit` wrote');
  mannerOptions(command, 'print what was written as JSON: {"file", "bytes", "seconds"}')
    .addHelpText('after', [
      '',
      'Reads DIR/fit.json and DIR/residuals.csv and writes DIR/report.html (through a temporary file',
      'and a rename). The page has no scripts and fetches nothing: open it in any browser or print it.',
      '',
      'Example:',
      '  rigcal report flywheel-fit',
    ].join('\n'))
    .action(ctx.action(async (dirArg: string, opts: { json?: boolean }) => {
      const [{ runReport }, { toJson }] = await Promise.all([import('../../verbs/report.js'), import('../../files/json.js')]); // loaded when the command runs
      const written = await runReport({ folder: dirArg, cwd: ctx.io.cwd });
      if (opts.json) ctx.io.stdout(toJson(written));
      else ctx.io.stdout(`wrote ${printable(written.file)} (${formatFileSize(written.bytes)} in ${formatDuration(written.seconds)})\n`);
      return 0;
    }));
}
