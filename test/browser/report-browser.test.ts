/// <reference lib="dom" />
/**
 * Opens a demo report.html in a real browser (Chromium from Debian, driven by playwright-core) with
 * the network blocked, and checks what a reader would see: no console error, no failed or outgoing
 * request, every figure drawn with a size. Saves a screenshot to test-artifacts/ for a human look.
 * Without /usr/bin/chromium the test is skipped with a message; with RIGCAL_REQUIRE_BROWSER=1 (set by
 * .ci/run once it has installed Chromium) a missing browser is a failure.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { renderFitReport } from '../../src/reports/html/index.js';
import { demoResults } from '../helpers/demo-results.js';

const CHROMIUM = '/usr/bin/chromium';
const ARTIFACTS = resolve(import.meta.dirname, '../../test-artifacts');

describe('report.html in a browser', () => {
  it('renders offline with no errors and every figure drawn', async (ctx) => {
    if (!existsSync(CHROMIUM)) {
      if (process.env.RIGCAL_REQUIRE_BROWSER === '1') throw new Error(`${CHROMIUM} is missing; .ci/run should have installed it (apt-get install -y chromium)`);
      ctx.skip(`Chromium not installed at ${CHROMIUM}: run \`apt-get update && apt-get install -y chromium\` (as root) to run this test`);
    }
    mkdirSync(ARTIFACTS, { recursive: true });
    const { fit, series } = demoResults({ samples: 5000 });
    const page = await renderFitReport(fit, series);
    const file = join(ARTIFACTS, 'demo-report.html');
    writeFileSync(file, page);

    const profile = mkdtempSync(join(tmpdir(), 'rigcal-chromium-'));
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      viewport: { width: 1100, height: 900 },
      offline: true,
    });
    try {
      const blocked: string[] = [];
      await context.route('**/*', (route) => {
        const url = route.request().url();
        if (url.startsWith('file:')) return route.continue();
        blocked.push(url);
        return route.abort();
      });
      const tab = context.pages()[0] ?? (await context.newPage());
      const consoleErrors: string[] = [];
      const failed: string[] = [];
      tab.on('console', (m) => {
        if (m.type() === 'error') consoleErrors.push(m.text());
      });
      tab.on('pageerror', (e) => consoleErrors.push(e.message));
      tab.on('requestfailed', (r) => failed.push(r.url()));
      await tab.goto(pathToFileURL(file).href, { waitUntil: 'load' });

      const figures = await tab.evaluate(() =>
        Array.from(document.querySelectorAll('svg')).map((s) => {
          const r = s.getBoundingClientRect();
          return { width: r.width, height: r.height, marks: s.querySelectorAll('path, line, rect, text').length };
        }),
      );
      const scripts = await tab.evaluate(() => document.querySelectorAll('script').length);
      await tab.screenshot({ path: join(ARTIFACTS, 'report-browser.png'), fullPage: true });

      expect(blocked).toEqual([]);
      expect(failed).toEqual([]);
      expect(consoleErrors).toEqual([]);
      expect(scripts).toBe(0);
      // One heat map plus three figures per output (2 experiments x 2 outputs).
      expect(figures.length).toBe(13);
      for (const f of figures) {
        expect(f.width).toBeGreaterThan(100);
        expect(f.height).toBeGreaterThan(50);
        expect(f.marks).toBeGreaterThan(10);
      }
    } finally {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    }
  }, 180_000);
});
