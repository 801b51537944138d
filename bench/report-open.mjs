// How long the HTML report of a full day at 1 Hz takes to open in chromium (headless, Debian's
// /usr/bin/chromium through playwright-core): navigation start to the first frame after the load event,
// median of several openings in fresh pages of one browser. The day is the core's synthetic session
// (86,400 epochs, 10 satellites per epoch: 864,000 residual rows), built into a page by the core builder.
import { existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { loadCore } from './load-core.mjs';

const CHROMIUM = '/usr/bin/chromium';
const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export async function benchReportOpen(runs = 7) {
  if (!existsSync(CHROMIUM)) return { skipped: `${CHROMIUM} not found (apt-get install chromium)` };
  const { chromium } = await import('playwright-core');
  const core = await loadCore();
  const tb = performance.now();
  const data = core.syntheticSessionReportData(86_400, 10, 1);
  const html = core.buildSessionReportHtml(data);
  const buildMs = performance.now() - tb;
  const dir = mkdtempSync(join(tmpdir(), 'rd-bench-report-'));
  const file = join(dir, 'report.html');
  writeFileSync(file, html);
  const bytes = statSync(file).size;
  const ctx = await chromium.launchPersistentContext(join(dir, 'profile'), { executablePath: CHROMIUM, headless: true, args: ARGS, viewport: { width: 1100, height: 900 } });
  const times = [];
  try {
    for (let i = 0; i <= runs; i++) {
      const page = await ctx.newPage();
      await page.goto(pathToFileURL(file).href, { waitUntil: 'load' });
      // Navigation start (time origin) to the first animation frame after load: parsed, laid out, painted.
      const ms = await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(() => r(performance.now())))));
      if (i > 0) times.push(ms); // the first opening warms the browser's caches
      await page.close();
    }
  } finally {
    await ctx.close();
    rmSync(dir, { recursive: true, force: true });
  }
  times.sort((a, b) => a - b);
  return { bytes, buildMs, openMs: times[Math.floor(times.length / 2)], minMs: times[0], maxMs: times[times.length - 1], runs: times.length };
}
