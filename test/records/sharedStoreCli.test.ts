/**
 * Several benches, one record, through the command line against a throwaway PostgreSQL cluster:
 * `store copy` of a bench store made as `npm run demo` makes it (the shipped samples, the demo's
 * commands) reproduces the same `record` and `batch` output byte for byte apart from the store
 * location line; two data folders on one shared store see each other's units; a bench cut off from
 * the server keeps checking into its outbox and `sync` stores each run exactly once. The expected
 * outputs come from the embedded store (SQLite), an engine independent of the one under test.
 * Skips with a note without the PostgreSQL server binaries.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { isSkipped, startPgCluster } from '../helpers/pgCluster.js';
import type { PgCluster } from '../helpers/pgCluster.js';
import { removeTempDir } from './helpers/tempData.js';
import { maskStoreUrl } from '../../src/cli/dataOptions.js';
import { openPgStore, openStore, shownStore } from '../../src/records/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { tempFolder } from '../helpers/tempFolders.js';

const started = startPgCluster();
const skip = isSkipped(started) ? started.skip : undefined;
if (skip) console.warn(`note: shared-store command tests skipped: ${skip}`);
const made: string[] = [];
afterAll(() => {
  if (!isSkipped(started)) started.stop();
  for (const d of made) removeTempDir(d);
});

const spec = 'samples/fh210-spec.yaml';
const files = (serial: string): string[] => ['low', 'mid', 'high'].map((c) => `samples/captures/${serial}_${c}.csv`);
const calibration = (set: string): string[] => readdirSync(join('samples', 'calibration', set)).sort().map((f) => `samples/calibration/${set}/${f}`);
const folder = (): string => {
  const d = tempFolder('benchproof-shared-');
  made.push(d);
  return join(d, 'benchproof-data');
};

/** The demo's storing steps (scripts/demo.js, steps 3–8) into `data`. */
async function demoStore(data: string): Promise<void> {
  const env = { BENCHPROOF_DATA: data, BENCHPROOF_STORE: '' };
  for (const u of ['FK-0101', 'FK-0104', 'FK-0102', 'FK-0103', 'FK-0105', 'FK-0106']) {
    const r = await runCli(['check', ...files(u), '--spec', spec, '--operator', 'demo', ...(u === 'FK-0101' || u === 'FK-0104' ? [] : ['--summary'])], { env });
    expect(r.code, r.stderr).toBeLessThan(2);
  }
  for (const [set, label] of [['before', 'as built'], ['after', 'after scale and offset trims']]) {
    const r = await runCli(['calibrate', '--spec', spec, '--unit', 'FK-0104', '--operator', 'demo', '--iteration', label, ...calibration(set)], { env });
    expect(r.code, r.stderr).toBeLessThan(2);
  }
}

/** An output with the store location line (the one naming the data folder or store) left out, and JSON's location and time. */
function withoutLocation(text: string, where: string): string {
  // The location as each format writes it: plain, HTML-escaped, Markdown-escaped (src/report/escapeText.ts).
  const forms = [where, where.replace(/&/g, '&amp;'), where.replace(/[\\`*_[\]<>|~&]/g, '\\$&')];
  const lines = text.split('\n').filter((l) => !forms.some((f) => l.includes(f)));
  const joined = lines.join('\n');
  return joined.replace(/"generatedAt": "[^"]+"/g, '"generatedAt": "…"').replace(/"dataDir": "[^"]+"/g, '"dataDir": "…"');
}

describe.skipIf(skip !== undefined)('the shared store through the command line', () => {
  const cluster = started as PgCluster;

  it('store copy of the demo store reproduces record and batch byte for byte apart from the store line, and a second copy adds nothing', async () => {
    const bench = folder();
    await demoStore(bench);
    const url = cluster.createDatabase('copydemo');
    const copy = await runCli(['store', 'copy', '--from', bench, '--to', url, '--json'], { env: { BENCHPROOF_STORE: '' } });
    expect(copy.code, copy.stderr).toBe(0);
    const first = JSON.parse(copy.stdout);
    expect([first.runs.copied, first.iterations.copied, first.runs.present]).toEqual([6, 2, 0]);
    const again = JSON.parse((await runCli(['store', 'copy', '--from', bench, '--to', url, '--json'], { env: { BENCHPROOF_STORE: '' } })).stdout);
    expect([again.runs.copied, again.iterations.copied, again.runs.present, again.iterations.present, again.chainHead]).toEqual([0, 0, 6, 2, first.chainHead]);
    const elsewhere = folder();
    const views: string[][] = [['record', 'FK-0104', '--format', 'html'], ['record', 'FK-0103', '--format', 'md'], ['record', 'FK-0104', '--json'], ['batch', '--format', 'md'], ['batch', '--format', 'html'], ['batch', '--json']];
    for (const view of views) {
      const local = await runCli(view, { env: { BENCHPROOF_DATA: bench, BENCHPROOF_STORE: '' } });
      const shared = await runCli([...view, '--store', url], { env: { BENCHPROOF_DATA: elsewhere } });
      expect([local.code, shared.code], shared.stderr).toEqual([0, 0]);
      expect(shared.stdout.replace(/&amp;/g, '&').replace(/\\(.)/g, '$1')).toContain(shownStore(url));
      expect(withoutLocation(shared.stdout, shownStore(url)), view.join(' ')).toBe(withoutLocation(local.stdout, bench));
    }
    // units --json adds what waits on this bench when a shared store is set; the units are the same.
    const unitsLocal = JSON.parse((await runCli(['units', '--json'], { env: { BENCHPROOF_DATA: bench, BENCHPROOF_STORE: '' } })).stdout);
    const unitsShared = JSON.parse((await runCli(['units', '--json', '--store', url], { env: { BENCHPROOF_DATA: elsewhere } })).stdout);
    expect([unitsShared.units, unitsShared.unsent]).toEqual([unitsLocal.units, []]);
  });

  it('two data folders on one shared store see each other\'s units at once, and one batch covers both', async () => {
    const url = cluster.createDatabase('twobench');
    const [a, b] = [folder(), folder()];
    expect((await runCli(['check', ...files('FK-0101'), '--spec', spec, '--operator', 'bench A'], { env: { BENCHPROOF_DATA: a, BENCHPROOF_STORE: url } })).code).toBe(0);
    expect((await runCli(['check', ...files('FK-0104'), '--spec', spec, '--operator', 'bench B', '--summary'], { env: { BENCHPROOF_DATA: b, BENCHPROOF_STORE: url } })).code).toBe(1);
    for (const data of [a, b]) {
      const units = JSON.parse((await runCli(['units', '--json'], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: url } })).stdout);
      expect(units.units.map((u: { unit: string; status: string }) => [u.unit, u.status])).toEqual([['FK-0101', 'pass'], ['FK-0104', 'fail']]);
      expect(units.unsent).toEqual([]);
    }
    const batch = JSON.parse((await runCli(['batch', '--json'], { env: { BENCHPROOF_DATA: a, BENCHPROOF_STORE: url } })).stdout);
    expect(batch.specs[0].units.map((u: { unit: string }) => u.unit)).toEqual(['FK-0101', 'FK-0104']);
  });

  it('a bench cut off from the server keeps checking into its outbox, units names what waits, and sync stores each run exactly once', async () => {
    const url = cluster.createDatabase('outbox');
    // The same database behind a socket folder where no server listens: the network cut.
    const cut = url.replace(/host=[^&]+/, `host=${encodeURIComponent(join(tmpdir(), 'no-such-server'))}`);
    const data = folder();
    const offline = await runCli(['check', ...files('FK-0102'), '--spec', spec], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: cut } });
    expect(offline.code, offline.stderr).toBe(0);
    expect(offline.stderr).toContain('did not answer');
    expect(offline.stderr).toContain('waiting to be sent');
    const units = await runCli(['units', '--json'], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: cut } });
    expect(units.code).toBe(2);
    expect(JSON.parse(units.stderr).error).toMatchObject({ code: 'store.unreachable' });
    expect(units.stderr).toContain('1 run(s) wait on this bench to be sent: FK-0102 (run #1)');
    const sync = await runCli(['sync', '--json'], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: url } });
    expect(sync.code, sync.stderr).toBe(0);
    expect(JSON.parse(sync.stdout)).toMatchObject({ sent: 1, waiting: 0 });
    const twice = await runCli(['sync', '--json'], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: url } });
    expect(JSON.parse(twice.stdout)).toMatchObject({ sent: 0, waiting: 0 });
    const listed = JSON.parse((await runCli(['units', '--json'], { env: { BENCHPROOF_DATA: folder(), BENCHPROOF_STORE: url } })).stdout);
    expect(listed.units.map((u: { unit: string; runs: number }) => [u.unit, u.runs])).toEqual([['FK-0102', 1]]);
    expect(cluster.psql("SELECT COUNT(*), COUNT(origin_uid), COUNT(origin_digest) FROM runs", 'outbox')).toBe('1|1|1\n');
  });

  it('a push cut off after the server stored a run but before the bench marked it sent stores it once when repeated', async () => {
    const url = cluster.createDatabase('halfsent');
    const data = folder();
    // The bench stored two runs in its outbox (the server out of reach) …
    const local = openStore(data);
    local.saveRun(kestrelRun({ unit: 'FK-0201', startedAt: '2026-03-02T09:00:00.000Z' }), { uid: 'bench-x:1', outbox: true });
    local.saveRun(kestrelRun({ unit: 'FK-0202', startedAt: '2026-03-02T09:10:00.000Z' }), { uid: 'bench-x:2', outbox: true });
    const waiting = local.unsent();
    local.close();
    expect(waiting.map((w) => [w.unit, w.uid])).toEqual([['FK-0201', 'bench-x:1'], ['FK-0202', 'bench-x:2']]);
    // … and the first push reached the server's commit, then the bench lost power before its mark.
    const shared = openPgStore(url, { cacheDir: data });
    shared.saveRun(kestrelRun({ unit: 'FK-0201', startedAt: '2026-03-02T09:00:00.000Z' }), { uid: 'bench-x:1' });
    shared.close();
    const sync = await runCli(['sync', '--json'], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: url } });
    expect(sync.code, sync.stderr).toBe(0);
    expect(JSON.parse(sync.stdout)).toMatchObject({ sent: 2, waiting: 0 });
    expect(cluster.psql('SELECT unit, origin_uid FROM runs ORDER BY id', 'halfsent')).toBe('FK-0201|bench-x:1\nFK-0202|bench-x:2\n');
  });

  it('never prints the password of the store: not in notices, errors or JSON', async () => {
    const url = cluster.createDatabase('secret').replace('postgres@', 'postgres:s3cret-word@');
    const data = folder();
    const runs = [
      await runCli(['check', ...files('FK-0101'), '--spec', spec], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: url } }),
      await runCli(['units', '--json'], { env: { BENCHPROOF_DATA: data, BENCHPROOF_STORE: url } }),
      await runCli(['units', '--json', '--store', url.replace(/host=[^&]+/, 'host=%2Fnowhere')], { env: { BENCHPROOF_DATA: data } }),
      await runCli(['units', '--json', '--store', 'mysql://root:s3cret-word@db/x'], { env: { BENCHPROOF_DATA: data } }),
    ];
    expect(runs.map((r) => r.code)).toEqual([0, 0, 2, 2]);
    for (const r of runs) expect(r.stdout + r.stderr).not.toContain('s3cret-word');
    expect([JSON.parse(runs[2].stderr).error.code, JSON.parse(runs[3].stderr).error.code]).toEqual(['store.unreachable', 'store.bad-address']);
  });
});

describe('the shared store address as printed', () => {
  it('drops the password and password parameters, the same way at the command line and in the records stage', () => {
    for (const url of ['postgres://bench:pw@records.local:5433/benchproof?sslmode=verify-full', 'postgresql://bench@h/db?password=pw&sslpassword=x', 'postgres://u@/db?host=%2Fvar%2Frun%2Fpostgresql']) {
      expect(maskStoreUrl(url)).toBe(shownStore(url));
      expect(maskStoreUrl(url)).not.toMatch(/pw|=x/);
    }
    expect(maskStoreUrl('postgres://bench:pw@records.local:5433/benchproof?sslmode=verify-full')).toBe('postgres://bench@records.local:5433/benchproof?sslmode=verify-full');
  });
});
