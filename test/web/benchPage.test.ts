/**
 * The bench page in a real browser (Debian's chromium through playwright-core): the whole job from
 * the page alone. Drops reach the board without a reload, a bad file shows check's own message, a
 * capture landing in the watched folder appears live, a zoomed plot shows the record's own min/max
 * per column (the definition of min/max decimation; common practice, no source), the print view
 * drops the controls, and the keyboard alone reaches every control. Screenshots go to SHOTS when it is
 * set (browserHarness.ts).
 */
import { copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { runCli } from '../helpers/cliHarness.js';
import { STATEMENT_WORDS } from '../../src/types/index.js';
import type { Statement } from '../../src/types/index.js';
import { startInsideWatch } from '../../src/server/watchInside.js';
import type { InsideWatch } from '../../src/server/watchInside.js';
import { SPEC, startTestServer } from '../server/serverHarness.js';
import type { TestServer } from '../server/serverHarness.js';
import { HAVE_CHROMIUM, launchBrowser, shot, watchedPage } from './browserHarness.js';
import type { TestBrowser } from './browserHarness.js';

const samples = (unit: string): string[] => ['low', 'mid', 'high'].map((c) => join(process.cwd(), `samples/captures/${unit}_${c}.csv`));

describe.skipIf(!HAVE_CHROMIUM)('the bench page in a browser', () => {
  let t: TestServer;
  let b: TestBrowser;
  let page: Page;
  let problems: string[];
  let watchDir: string;
  let watch: InsideWatch;

  beforeAll(async () => {
    t = await startTestServer();
    watchDir = mkdtempSync(join(tmpdir(), 'benchproof-watched-'));
    watch = startInsideWatch(t.server.setup.ctx, watchDir, SPEC, t.server.setup.flags, t.server.setup.hub, 200);
    b = await launchBrowser();
    ({ page, problems } = await watchedPage(b.context));
    await page.goto(`${t.base}/`);
    await page.waitForSelector('#live[data-live="on"]');
    await page.evaluate('window.sameLoad = true');
  });
  afterAll(async () => {
    await b?.close();
    await watch?.stop();
    await t?.stop();
    rmSync(watchDir, { recursive: true, force: true });
  });

  it('shows a dropped good unit reaching PASS on the board without a reload', async () => {
    await page.setInputFiles('#pick-files', samples('FK-0101'));
    const row = page.locator('tr[data-unit="FK-0101"]');
    await row.waitFor();
    // The board shows the statement `check` decides for the same three files (PASS for this good unit).
    const cli = await runCli(['check', ...samples('FK-0101'), '--spec', SPEC, '--json', '--no-store']);
    const statement = JSON.parse(cli.stdout).units[0].statement as Statement;
    expect(await row.getAttribute('data-statement')).toBe(statement);
    expect(await row.locator('.state').textContent()).toBe(STATEMENT_WORDS[statement]);
    await page.locator('.drop-entry[data-result="stored"]').first().waitFor();
    expect(await page.evaluate('window.sameLoad')).toBe(true);
    await shot(page, 'board-after-drop.png', { fullPage: true });
  });

  it('shows a bad dropped file with the message check prints', async () => {
    const bad = join(mkdtempSync(join(tmpdir(), 'benchproof-badfile-')), 'FK-0109_mid.csv');
    writeFileSync(bad, 'Time (s),CH1 (V)\n0,1\n0,2\n0,3\n');
    await page.setInputFiles('#pick-files', bad);
    const error = page.locator('.drop-entry[data-result="error"] pre.error').first();
    await error.waitFor();
    const text = (await error.textContent()) ?? '';
    expect(text).toMatch(/^FK-0109_mid\.csv:\d+: /);
    expect(text).toContain('\n  expected: ');
    expect(text).toContain('\n  fix: ');
    await shot(page, 'board-bad-file.png', { fullPage: true });
  });

  it('shows a capture landing in the watched folder live', async () => {
    for (const f of samples('FK-0102')) copyFileSync(f, join(watchDir, f.split('/').pop()!));
    await page.locator('tr[data-unit="FK-0102"]').waitFor({ timeout: 20_000 });
    await page.locator('.drop-entry.watched').first().waitFor();
    expect(await page.evaluate('window.sameLoad')).toBe(true);
  });

  it('shows a unit waiting for conditions as INCOMPLETE, completes it from its open attempt, and compares two attempts', async () => {
    const [low, mid, high] = samples('FK-0103');
    await page.setInputFiles('#pick-files', mid);
    const row = page.locator('tr[data-unit="FK-0103"]');
    await row.waitFor();
    expect(await row.locator('.state').textContent()).toBe('INCOMPLETE');
    expect(await row.locator('.waiting').textContent()).toContain('low');
    // The other two conditions later: checked together with the open attempt's capture, as check does.
    await page.setInputFiles('#pick-files', [low, high]);
    await expect.poll(() => row.locator('.state').textContent(), { timeout: 20_000 }).not.toBe('INCOMPLETE');
    const cli = await runCli(['check', low, mid, high, '--spec', SPEC, '--json', '--no-store']);
    expect(await row.getAttribute('data-statement')).toBe(JSON.parse(cli.stdout).units[0].statement);
    // A note starts a new attempt; the unit page then compares the two.
    await page.fill('#drop-note', 'R7 retrimmed');
    await page.setInputFiles('#pick-files', [low, mid, high]);
    await page.locator('.drop-entry[data-result="stored"]').first().waitFor();
    await page.goto(`${t.base}/#/unit/FK-0103`);
    await page.locator('#compare').click();
    const frame = page.frameLocator('iframe.compare');
    await frame.locator('h1').first().waitFor();
    expect(await frame.locator('body').textContent()).toContain('R7 retrimmed');
    await shot(page.locator('section.attempts'), 'unit-attempts-compare.png');
    await page.goto(`${t.base}/#/`);
    await page.locator('tr[data-unit]').first().waitFor();
  });

  it('zooms a waveform and shows the min and max of the record in each column', async () => {
    await page.click('a[href="#/unit/FK-0101"]');
    const fig = page.locator('figure.plot[data-kind="wave"]').first();
    await fig.and(page.locator('[data-from]')).waitFor();
    const before = { from: Number(await fig.getAttribute('data-from')), to: Number(await fig.getAttribute('data-to')) };
    const answer = page.waitForResponse((r) => r.url().includes('/api/plot/wave') && r.url().includes('from='));
    await fig.getByRole('button', { name: /^Zoom in/ }).click();
    const plot = (await (await answer).json()) as { min: number[]; max: number[]; first: number; end: number; step: number };
    await expect.poll(async () => Number(await fig.getAttribute('data-from'))).not.toBe(before.from);
    const after = { from: Number(await fig.getAttribute('data-from')), to: Number(await fig.getAttribute('data-to')) };
    expect(after.to - after.from).toBeLessThan(before.to - before.from);
    const url = new URL((await answer).url());
    // The first capture of the run is plotted first; find which file it is by its SHA-256.
    const { createHash } = await import('node:crypto');
    const sha = url.searchParams.get('sha');
    const path = samples('FK-0101').find((p) => createHash('sha256').update(readFileSync(p)).digest('hex') === sha)!;
    const channel = url.searchParams.get('channel')!;
    const lines = readFileSync(path, 'utf8').trim().split('\n');
    const col = lines[0].split(',').findIndex((h) => h.startsWith(channel));
    const values = lines.slice(1).map((l) => Number(l.split(',')[col]));
    for (let c = 0; c < plot.min.length; c++) {
      const slice = values.slice(plot.first + c * plot.step, Math.min(plot.end, plot.first + (c + 1) * plot.step));
      expect(plot.min[c]).toBe(Math.min(...slice));
      expect(plot.max[c]).toBe(Math.max(...slice));
    }
    await shot(fig, 'unit-plot-zoomed.png', { settleMs: 300 });
    // Back to the whole record, then drag across its first sixth: the view becomes that span.
    await fig.getByRole('button', { name: /^Show the whole record/ }).click();
    await expect.poll(async () => Number(await fig.getAttribute('data-from'))).toBe(before.from);
    const box = (await fig.locator('.u-over').boundingBox())!;
    await page.mouse.move(box.x + 2, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 6, box.y + box.height / 2, { steps: 5 });
    await page.mouse.up();
    await expect.poll(async () => Number(await fig.getAttribute('data-to'))).toBeLessThan(before.from + (before.to - before.from) / 5);
    await shot(fig, 'unit-plot-drag-zoom.png', { settleMs: 300 });
    await shot(page, 'unit-top.png');
    await shot(page, 'unit-whole.png', { fullPage: true });
  });

  it('prints the unit page as its record, without the page controls', async () => {
    await page.emulateMedia({ media: 'print' });
    expect(await page.locator('header.top').isVisible()).toBe(false);
    expect(await page.locator('.plot-controls').first().isVisible()).toBe(false);
    expect(await page.locator('iframe.record').isVisible()).toBe(true);
    // The record carries the unit's state and attempts itself: the page's own header is not printed twice.
    expect(await page.locator('.unit-head h1').isVisible()).toBe(false);
    const frame = page.frameLocator('iframe.record');
    expect(await frame.locator('h1').first().textContent()).toContain('FK-0101');
    await shot(page, 'unit-print.png', { fullPage: true });
    await page.emulateMedia({ media: 'screen' });
  });

  it('reaches every control of the board with the keyboard alone', async () => {
    await page.goto(`${t.base}/#/`);
    await page.locator('tr[data-unit]').first().waitFor();
    const controls = await page.$$eval('a[href], button, input:not(.sr-only), select, label[tabindex="0"], [tabindex="0"]', (els) => els.filter((e) => (e as unknown as { offsetParent: unknown }).offsetParent !== null).map((e) => e.outerHTML.slice(0, 80)));
    const reached = new Set<string>();
    for (let i = 0; i < controls.length + 10; i++) {
      await page.keyboard.press('Tab');
      reached.add(String(await page.evaluate("document.activeElement ? document.activeElement.outerHTML.slice(0, 80) : ''")));
    }
    expect(controls.filter((c) => !reached.has(c))).toEqual([]);
    // "/" jumps to the filter, and typing filters the board.
    await page.keyboard.press('Escape');
    await page.locator('body').press('/');
    await page.keyboard.type('0102');
    await expect.poll(() => page.locator('tr[data-unit]').count()).toBe(1);
    expect(await page.locator('tr[data-unit]').getAttribute('data-unit')).toBe('FK-0102');
  });

  it('reaches every control of the unit page with the keyboard, and zooms a focused plot with its keys', async () => {
    await page.goto(`${t.base}/#/unit/FK-0101`);
    const fig = page.locator('figure.plot[data-kind="wave"]').first();
    await fig.and(page.locator('[data-from]')).waitFor();
    const controls = await page.$$eval('a[href], button, input, select, summary, [tabindex="0"]', (els) => els.filter((e) => (e as unknown as { offsetParent: unknown }).offsetParent !== null).map((e) => e.outerHTML.slice(0, 80)));
    const reached = new Set<string>();
    for (let i = 0; i < controls.length + 10; i++) {
      await page.keyboard.press('Tab');
      reached.add(String(await page.evaluate("document.activeElement ? document.activeElement.outerHTML.slice(0, 80) : ''")));
    }
    expect(controls.filter((c) => !reached.has(c))).toEqual([]);
    const from = await fig.getAttribute('data-from');
    await fig.focus();
    await page.keyboard.press('+');
    await expect.poll(() => fig.getAttribute('data-from')).not.toBe(from);
  });

  it('shows the batch page with its downloads, and the spec page validated', async () => {
    await page.goto(`${t.base}/#/batch`);
    const frame = page.frameLocator('iframe.record');
    await frame.locator('h1').first().waitFor();
    expect(await page.locator('#batch-csv').getAttribute('href')).toMatch(/^\/download\/batch\.csv/);
    const csv = await (await page.request.get(`${t.base}${await page.locator('#batch-csv').getAttribute('href')}`)).text();
    expect(csv.split('\n')[0]).toContain('unit');
    await shot(page, 'batch.png', { fullPage: true });
    await page.goto(`${t.base}/#/spec`);
    await page.locator('#spec-summary').waitFor();
    expect(await page.locator('#spec-summary').textContent()).toContain('valid: FH-210 Kestrel VCO');
    await shot(page, 'spec.png', { fullPage: true });
  });

  it('ran without a console error or a Content-Security-Policy violation', () => {
    // The refused bad file of the test above is the one error status expected.
    expect(problems.filter((p) => !p.includes('status of 422'))).toEqual([]);
  });
});
