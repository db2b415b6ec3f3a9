/**
 * The results folder of `fit`: estimates.yaml, fit.json, residuals.csv and (when the HTML renderer
 * is part of the build) report.html, written as a whole through a temporary sibling folder and a
 * rename. A folder that is not a results folder of ours is never replaced.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import { UserError } from '../errors.js';
import type { CompletedFit } from '../estimation/fit/fit-result.js';
import { writeFolderAtomic, type FolderEntry } from '../util/atomic-write.js';
import { renderEstimatesYaml } from './estimates-yaml.js';
import { renderFitJson } from './fit-json.js';
import { renderResidualsCsv } from './residuals-csv.js';

/** Files a results folder of ours may hold; anything else means the folder is someone else's. */
export const RESULT_FILES = ['estimates.yaml', 'fit.json', 'residuals.csv', 'report.html'] as const;

export type HtmlRenderer = (outcome: CompletedFit) => string | Promise<string>;

/**
 * report.html from the in-memory results, by the report renderer. Loaded on first use: the renderer
 * brings vega and vega-lite (about 0.6 s of module loading), which a program that only writes the
 * other files, or fails before writing, should not pay for.
 */
export const reportRenderer: HtmlRenderer = async (outcome) => {
  const { renderFitReport } = await import('./html/render-fit-report.js');
  return renderFitReport(outcome.result, outcome.residuals);
};

export interface WriteResultsOptions {
  /** Every output of the model in model order (residuals.csv columns). */
  outputs: readonly string[];
  /** Renders report.html from the in-memory results; omitted: no report.html. */
  renderHtml?: HtmlRenderer;
  /** Test hook: extra entries (e.g. one that throws, to check that nothing half-written remains). */
  extraFiles?: Record<string, FolderEntry>;
}

/** Default results folder: `./<model name>-fit/` below `cwd`. */
export function defaultResultsFolder(cwd: string, modelName: string): string {
  // The loader already restricts names; checked again because this one becomes a path.
  if (!modelName || /[\\/\0]/.test(modelName) || modelName.startsWith('.')) {
    throw new UserError({ where: { key: 'name' }, what: `the model name "${modelName}" cannot name a results folder`, fix: 'use letters, digits, - and _ in the model name, or give the folder with -o' });
  }
  return resolve(cwd, `${modelName}-fit`);
}

/** Throws a UserError when `folder` exists and is not a results folder of ours. */
export function assertReplaceable(folder: string): void {
  if (!existsSync(folder)) return;
  const fix = 'choose another folder with -o, or move that folder away';
  if (!statSync(folder).isDirectory()) {
    throw new UserError({ where: { file: folder }, what: 'the results path exists and is not a folder', fix });
  }
  const entries = readdirSync(folder);
  let ours = false;
  if (entries.includes('fit.json')) {
    try {
      ours = (JSON.parse(readFileSync(resolve(folder, 'fit.json'), 'utf8')) as { tool?: unknown }).tool === 'rigcal';
    } catch {
      ours = false;
    }
  }
  if (!ours) {
    throw new UserError({ where: { file: folder }, what: 'this folder exists and is not a results folder of rigcal (no fit.json of ours inside); it will not be replaced', fix });
  }
  // Leftovers of an interrupted atomic write of one of our files (".fit.json.tmp-...") are ours too.
  const ourTemp = (e: string) => RESULT_FILES.some((f) => e.startsWith(`.${f}.tmp-`));
  const foreign = entries.filter((e) => !(RESULT_FILES as readonly string[]).includes(e) && !ourTemp(e));
  if (foreign.length) {
    throw new UserError({ where: { file: folder }, what: `the previous results folder holds files rigcal did not write (${foreign.slice(0, 5).join(', ')}${foreign.length > 5 ? ', ...' : ''}); replacing it would delete them`, fix });
  }
}

/** Write the results folder; returns its absolute path. */
export async function writeResults(folder: string, outcome: CompletedFit, options: WriteResultsOptions): Promise<string> {
  const target = resolve(folder);
  assertReplaceable(target);
  const files: Record<string, FolderEntry> = {
    'estimates.yaml': () => renderEstimatesYaml(outcome.result),
    'fit.json': () => renderFitJson(outcome.result),
    'residuals.csv': () => renderResidualsCsv(outcome.residuals, options.outputs),
  };
  // The report renders asynchronously (plots); everything else is built while the folder is written.
  if (options.renderHtml) files['report.html'] = await options.renderHtml(outcome);
  Object.assign(files, options.extraFiles ?? {});
  writeFolderAtomic(target, files, () => true);
  return target;
}
