/**
 * A real browser for tests: Debian's chromium driven by playwright-core, headless, with a fresh profile
 * and every background network feature off. Tests using it are skipped with a one-line reason when
 * /usr/bin/chromium is missing (CI installs it: .ci/run).
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';
export const HAS_CHROMIUM = existsSync(CHROMIUM);
export const CHROMIUM_SKIP_REASON = `${CHROMIUM} not found (apt-get install chromium): browser tests skipped`;

export const CHROMIUM_ARGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
  '--disable-component-update', '--disable-sync',
];

export interface OpenedPage {
  readonly page: Page;
  /** Console messages of type error and uncaught page errors. */
  readonly errors: string[];
  /** Every URL the page asked for (requests not the file itself or a data: URI are aborted). */
  readonly requests: string[];
  close(): Promise<void>;
}

/** Opens a local HTML file; any request other than the file itself or a data: URI is recorded and aborted. */
export async function openFile(path: string, viewport = { width: 1100, height: 900 }): Promise<OpenedPage> {
  const profile = mkdtempSync(join(tmpdir(), 'rd-chromium-'));
  const ctx: BrowserContext = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM, headless: true, args: CHROMIUM_ARGS, viewport });
  const url = pathToFileURL(path).href;
  const errors: string[] = [];
  const requests: string[] = [];
  await ctx.route('**/*', async (route) => {
    const u = route.request().url();
    requests.push(u);
    if (u === url || u.startsWith('data:')) await route.continue();
    else await route.abort();
  });
  const page = await ctx.newPage();
  page.on('request', (r) => { if (r.url().startsWith('data:')) requests.push(r.url()); });
  page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
  page.on('pageerror', (e) => errors.push(e.message));
  await page.goto(url, { waitUntil: 'load' });
  return {
    page, errors, requests,
    close: async () => { await ctx.close(); rmSync(profile, { recursive: true, force: true }); },
  };
}
