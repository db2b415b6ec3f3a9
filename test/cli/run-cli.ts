/** Runs the CLI in-process, capturing standard output and error, for the command tests. */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../../src/cli/run.js';

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

/** `stderrIsTTY`: run as if standard error were a terminal (progress is shown only then). */
export async function rigcal(args: string[], cwd = process.cwd(), stderrIsTTY = false): Promise<CliRun> {
  let stdout = '';
  let stderr = '';
  const code = await runCli(args, {
    stdout: (s) => void (stdout += s),
    stderr: (s) => void (stderr += s),
    stderrIsTTY,
    cwd,
  });
  return { code, stdout, stderr };
}

/** A fresh temporary folder, removed by the returned cleanup. */
export function scratchDir(tag: string): { dir: string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), `rigcal-${tag}-`));
  return { dir, cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}
