#!/usr/bin/env node
/** The `rigcal` executable: a thin layer over runCli. */
import { endQuietlyWhenReaderCloses } from './closed-output.js';
import { runCli } from './run.js';

endQuietlyWhenReaderCloses(process.stdout);
endQuietlyWhenReaderCloses(process.stderr);

const code = await runCli(process.argv.slice(2), {
  stdout: (s) => process.stdout.write(s),
  stderr: (s) => process.stderr.write(s),
  stderrIsTTY: Boolean(process.stderr.isTTY),
  cwd: process.cwd(),
});
process.exitCode = code;
