// The bench page on a shared store (issue 20: serve works the same on both stores). The reference
// for every check is the command line on the same store: `units`, `record` and the refusal of a
// tampered row are what the CLI prints (test/records/sharedStoreCli.test.ts checks those against
// the embedded store), and a run stored by another bench comes from a separate process with its own
// data folder, as a second station would store it. Needs PostgreSQL's server binaries; skipped with
// a note without them, as the other shared-store tests are.
import { afterAll, describe, expect, it } from 'vitest';
import { execFile } from 'node:child_process';

import { join } from 'node:path';
import { promisify } from 'node:util';
import { runCli } from '../helpers/cliHarness.js';
import { isSkipped, startPgCluster } from '../helpers/pgCluster.js';
import type { PgCluster } from '../helpers/pgCluster.js';
import { removeTempDir } from '../records/helpers/tempData.js';
import { nextEvent, SPEC, startTestServer } from './serverHarness.js';
import type { TestServer } from './serverHarness.js';
import { tempFolder } from '../helpers/tempFolders.js';

const started = startPgCluster();
const skip = isSkipped(started) ? started.skip : undefined;
if (skip) console.warn(`note: bench page on the shared store skipped: ${skip}`);
const made: string[] = [];
const servers: TestServer[] = [];
afterAll(async () => {
  for (const s of servers) await s.stop();
  if (!isSkipped(started)) started.stop();
  for (const d of made) removeTempDir(d);
});

const files = (serial: string, conditions = ['low', 'mid', 'high']): string[] => conditions.map((c) => `samples/captures/${serial}_${c}.csv`);
const folder = (): string => {
  const d = tempFolder('benchproof-serve-shared-');
  made.push(d);
  return join(d, 'benchproof-data');
};

/** `check` as a bench beside the page runs it: in its own data folder, on the shared store. */
async function checkElsewhere(url: string, serial: string, extra: string[] = []): Promise<number> {
  const r = await runCli(['check', ...files(serial), '--spec', SPEC, '--operator', 'bench A', ...extra], { env: { BENCHPROOF_DATA: folder(), BENCHPROOF_STORE: url } });
  expect(r.code, r.stderr).toBeLessThan(2);
  return r.code;
}

async function serveOn(url: string, extra: { allowUnverified?: boolean } = {}): Promise<TestServer> {
  const t = await startTestServer({ flags: { data: folder(), store: url, ...extra } });
  servers.push(t);
  return t;
}

type Board = { data: string; units: { unit: string; status: string; runs: number; unverified: number }[] };
const board = async (t: TestServer): Promise<{ status: number; body: Board & { error?: { code: string; message: string } } }> => {
  const res = await fetch(`${t.base}/api/board`);
  return { status: res.status, body: (await res.json()) as Board & { error?: { code: string; message: string } } };
};

describe.skipIf(skip !== undefined)('the bench page on a shared store', () => {
  const cluster = started as PgCluster;

  it('lists a unit that check stored from another data folder, with the state units gives, and shows its record and plots', async () => {
    const url = cluster.createDatabase('servelist');
    await checkElsewhere(url, 'FK-0101');
    const t = await serveOn(url);
    const units = JSON.parse((await runCli(['units', '--json', '--store', url], { env: { BENCHPROOF_DATA: folder() } })).stdout) as { units: { unit: string; status: string; runs: number }[] };
    const { status, body } = await board(t);
    expect(status).toBe(200);
    // Reference: the CLI's units listing of the same shared store.
    expect(body.units.map((u) => [u.unit, u.status, u.runs, u.unverified])).toEqual(units.units.map((u) => [u.unit, u.status, u.runs, 0]));
    expect(body.units.map((u) => u.unit)).toEqual(['FK-0101']);
    expect(body.data).not.toMatch(/benchproof-serve-/); // the store's address, not this bench's folder
    const unit = await fetch(`${t.base}/api/units/FK-0101`);
    expect(unit.status).toBe(200);
    const record = JSON.parse((await runCli(['record', 'FK-0101', '--json', '--store', url], { env: { BENCHPROOF_DATA: folder() } })).stdout) as { runs: { id: number; captures: { sha256: string }[] }[] };
    const run = record.runs[0];
    // A plot reads the capture this server fetched from the shared store into its own archive.
    const plot = await fetch(`${t.base}/api/plot/wave?unit=FK-0101&run=${run.id}&sha=${run.captures[0].sha256}&channel=CH1&width=64`);
    const plotBody = (await plot.json()) as { samples?: number; error?: unknown };
    expect(plot.status, JSON.stringify(plotBody.error)).toBe(200);
    expect(plotBody.samples).toBeGreaterThan(0);
  }, 120_000);

  it('announces on the event stream a run that another process stores from its own data folder, and lists it', async () => {
    const url = cluster.createDatabase('serveevent');
    await checkElsewhere(url, 'FK-0101');
    const t = await serveOn(url);
    expect((await board(t)).body.units.map((u) => u.unit)).toEqual(['FK-0101']);
    const other = folder();
    // A separate process, as a second bench would run it (the built CLI: npm ci builds it).
    const event = await nextEvent(
      t.base,
      'changed',
      () =>
        promisify(execFile)(process.execPath, ['bin/benchproof.js', 'check', ...files('FK-0103', ['mid']), '--spec', SPEC, '--data', other, '--store', url]).catch((err: { code?: number; stderr?: string }) => {
          if (err.code !== 1 && err.code !== 4) throw err; // 1 or 4: one capture of three does not pass yet
        }),
      30_000,
    );
    expect(event).toHaveProperty('at');
    // A head that moves soon after a verification is caught up with a moment later (verifying keeps to
    // a fifth of the server's time); the page asks again at the next event, the test every 200 ms.
    let listed: string[] = [];
    for (const until = Date.now() + 30_000; Date.now() < until; await new Promise((r) => setTimeout(r, 200))) {
      listed = (await board(t)).body.units.map((u) => u.unit).sort();
      if (listed.length > 1) break;
    }
    expect(listed).toEqual(['FK-0101', 'FK-0103']);
  }, 120_000);

  it('refuses a tampered shared row with the message units prints, and marks it with --allow-unverified', async () => {
    const url = cluster.createDatabase('servetamper');
    await checkElsewhere(url, 'FK-0101');
    await checkElsewhere(url, 'FK-0104', ['--summary']);
    cluster.psql("DROP TRIGGER runs_append_only ON runs; UPDATE runs SET operator = 'someone else' WHERE unit = 'FK-0101'", 'servetamper');
    const cli = await runCli(['units', '--store', url], { env: { BENCHPROOF_DATA: folder() } });
    expect(cli.code).toBe(2);
    const strict = await serveOn(url);
    const refused = await board(strict);
    expect(refused.status).toBe(422);
    expect(refused.body.error?.code).toBe('records.tampered');
    // The same three-line message the CLI prints (reference: units on the same store).
    expect(refused.body.error?.message.trim()).toBe(cli.stderr.trim());
    expect((await fetch(`${strict.base}/api/units/FK-0101`)).status).toBe(422);
    const marked = await serveOn(url, { allowUnverified: true });
    const listed = await board(marked);
    expect(listed.status).toBe(200);
    expect(listed.body.units.map((u) => [u.unit, u.unverified]).sort()).toEqual([['FK-0101', 1], ['FK-0104', 0]]);
    const unit = (await (await fetch(`${marked.base}/api/units/FK-0101`)).json()) as { record?: { runs: { intact: boolean }[] } };
    expect(JSON.stringify(unit)).toContain('"intact":false');
  }, 120_000);
});
