/**
 * One chromium (Debian's /usr/bin/chromium, driven by playwright-core) per test file, started with
 * a fresh profile and nothing that reaches the network; tests talk to 127.0.0.1 only. Without
 * chromium the browser tests skip with a note.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import type { BrowserContext, Page } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';
export const HAVE_CHROMIUM = existsSync(CHROMIUM);
/** Screenshots land here (outside the checkout), to be looked at by a person after a run. */
export const SHOTS = process.env.BENCHPROOF_SHOTS ?? join(tmpdir(), 'benchproof-web-shots');

if (!HAVE_CHROMIUM) {
  process.stderr.write(`note: ${CHROMIUM} is missing; the browser tests of the bench page are skipped (apt-get install chromium)\n`);
}

export interface TestBrowser {
  readonly context: BrowserContext;
  close(): Promise<void>;
}

export async function launchBrowser(): Promise<TestBrowser> {
  const profile = mkdtempSync(join(tmpdir(), 'benchproof-chromium-'));
  // A persistent context is how playwright takes a fresh --user-data-dir of our own.
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: { width: 1200, height: 900 },
    acceptDownloads: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  mkdirSync(SHOTS, { recursive: true });
  return {
    context,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** A page that records console errors and CSP violations, so a test can assert there were none. */
export async function watchedPage(context: BrowserContext): Promise<{ page: Page; problems: string[] }> {
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') problems.push(m.text());
  });
  page.on('pageerror', (e) => problems.push(e.message));
  return { page, problems };
}
