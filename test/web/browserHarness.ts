/**
 * One chromium (Debian's /usr/bin/chromium, driven by playwright-core) per test file, started with
 * a fresh profile and nothing that reaches the network; tests talk to 127.0.0.1 only. Without
 * chromium the browser tests skip with a note. Screenshots for a person to look at are taken only
 * when BENCHPROOF_SHOTS names a folder (`BENCHPROOF_SHOTS=/tmp/shots npx vitest run test/web`): they
 * check nothing and cost about a fifth of the browser file's CPU time.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import type { BrowserContext, Locator, Page } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';
export const HAVE_CHROMIUM = existsSync(CHROMIUM);
/** Where screenshots land (outside the checkout), to be looked at by a person after a run; none when unset. */
export const SHOTS: string | undefined = process.env.BENCHPROOF_SHOTS || undefined;

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
  if (SHOTS) mkdirSync(SHOTS, { recursive: true });
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

/**
 * A screenshot of the page or of one element into SHOTS, after `settleMs` for a plot to finish
 * drawing. Without SHOTS nothing is taken; an element is still waited for until it is visible, as
 * its screenshot would have waited, so a test checks the same with or without pictures.
 */
export async function shot(target: Page | Locator, name: string, options: { fullPage?: boolean; settleMs?: number } = {}): Promise<void> {
  const isPage = 'goto' in target;
  if (!SHOTS) {
    if (!isPage) await target.waitFor({ state: 'visible' });
    return;
  }
  if (options.settleMs) await new Promise((r) => setTimeout(r, options.settleMs));
  const path = join(SHOTS, name);
  if (isPage) await target.screenshot({ path, fullPage: options.fullPage ?? false });
  else await target.screenshot({ path });
}
