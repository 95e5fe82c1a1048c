/**
 * The bench page's routes over the records and the check pipeline: what the page stores is what the
 * command line reads and the reverse, a bad file gets the very message `check` prints, a `check`
 * run in another process shows up as a live event, and plot data is the record's own min/max per
 * column (the definition of min/max decimation; common practice, no source).
 */
import { readFileSync } from 'node:fs';
import { connect } from 'node:net';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore } from '../../src/records/index.js';
import { runCli } from '../helpers/cliHarness.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { SPEC, filesForm, nextEvent, startTestServer } from './serverHarness.js';
import type { TestServer } from './serverHarness.js';
import { tempFolder } from '../helpers/tempFolders.js';

let t: TestServer;
const sample = (name: string): { name: string; bytes: Uint8Array } => ({ name, bytes: readFileSync(`samples/captures/${name}`) });
const drop = (files: { name: string; bytes: Uint8Array | string }[]): Promise<Response> =>
  fetch(`${t.base}/api/drop`, { method: 'POST', headers: { Origin: t.base }, body: filesForm(files) });

beforeAll(async () => {
  t = await startTestServer();
});
afterAll(async () => t?.stop());

describe('the live event stream when the server closes', () => {
  it('ends the open streams, and answers a stream asked for while closing with 204 so the page stops retrying', async () => {
    // HTML Living Standard, server-sent events: a 204 response tells the page's event source to stop
    // reconnecting. A stream attached after the hub closed would keep the server's close waiting on it.
    const own = await startTestServer();
    try {
      const open = await fetch(`${own.base}/api/events`);
      const reader = open.body!.getReader();
      expect(new TextDecoder().decode((await reader.read()).value)).toMatch(/^retry: /);
      own.server.setup.hub.close();
      // The open stream ends once the hub closes (the server ends it, not the page).
      for (let r = await reader.read(); !r.done; r = await reader.read());
      const late = await fetch(`${own.base}/api/events`);
      expect(late.status).toBe(204);
      expect(await late.text()).toBe('');
      expect(own.server.setup.hub.clients()).toBe(0);
    } finally {
      await own.stop();
    }
  });
});

describe('closing the server', () => {
  it('does not wait on a connection that never sent a request (a browser opens spare ones ahead of need)', async () => {
    // Node's closeIdleConnections leaves such a connection, and the close then waits until the client
    // gives it up or Node's header timeout (60 s) ends it. Common practice (no source): a bench tool
    // stopped with Ctrl-C stops at once.
    const own = await startTestServer();
    const { port } = new URL(own.base);
    const spare = connect(Number(port), '127.0.0.1');
    await new Promise<void>((ok, fail) => spare.once('connect', ok).once('error', fail));
    const ended = new Promise<string>((ok) => spare.once('close', () => ok('ended')));
    const guard = new Promise<string>((ok) => setTimeout(() => ok('still open after 20 s'), 20_000).unref());
    const closed = own.stop().then(() => 'closed');
    expect(await Promise.race([closed, guard])).toBe('closed');
    expect(await Promise.race([ended, guard])).toBe('ended');
  }, 30_000);
});

describe('the bench page routes', () => {
  it('stores a dropped unit as check would, and the command line reads the same run', async () => {
    const res = await drop(['FK-0101_low.csv', 'FK-0101_mid.csv', 'FK-0101_high.csv'].map(sample));
    const body = (await res.json()) as { units: { unit: string; statement: string; runId: number }[] };
    expect(res.status).toBe(200);
    // The same three files through `check --json --no-store` decide the same statement.
    const cli = await runCli(['check', ...['low', 'mid', 'high'].map((c) => `samples/captures/FK-0101_${c}.csv`), '--spec', SPEC, '--json', '--no-store']);
    expect(body.units).toEqual([expect.objectContaining({ unit: 'FK-0101', statement: JSON.parse(cli.stdout).units[0].statement })]);
    const store = openStore(t.dataDir, { mode: 'read' });
    try {
      const [run] = store.runs({ unit: 'FK-0101' });
      expect(run.id).toBe(body.units[0].runId);
      expect(run.captures.map((c) => c.path).sort()).toEqual(['FK-0101_high.csv', 'FK-0101_low.csv', 'FK-0101_mid.csv']);
      expect(run.operator).toBe('page test');
    } finally {
      store.close();
    }
    const board = (await (await fetch(`${t.base}/api/board`)).json()) as { units: { unit: string; status: string }[] };
    expect(board.units.find((u) => u.unit === 'FK-0101')?.status).toBe(body.units[0].statement);
  });

  it('answers a bad file with the same three lines check prints for it', async () => {
    const bad = 'Time (s),CH1 (V)\n0,1\n0,2\n0,3\n';
    const res = await drop([{ name: 'FK-0102_mid.csv', bytes: bad }]);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(res.status).toBe(422);
    const { writeFileSync } = await import('node:fs');
    const dir = tempFolder('benchproof-bad-');
    writeFileSync(join(dir, 'FK-0102_mid.csv'), bad);
    const cli = await runCli(['check', 'FK-0102_mid.csv', '--spec', join(process.cwd(), SPEC), '--no-store'], { cwd: dir });
    expect(cli.code).toBe(2);
    // The page names the file as dropped; check names it with the folder it was given in.
    expect(cli.stderr.trim().replaceAll(`${dir}/`, '')).toBe(body.error.message);
    expect(body.error.message).toMatch(/^FK-0102_mid\.csv:\d+: /);
    expect(body.error.code).toMatch(/^capture\./);
  });

  it('sends a live event when check in another process stores a run in the same records', async () => {
    const { execFile } = await import('node:child_process');
    const { promisify } = await import('node:util');
    // A separate process, as a terminal beside the page would run it (the built CLI: npm ci builds it).
    const event = await nextEvent(t.base, 'changed', () =>
      promisify(execFile)(process.execPath, ['bin/benchproof.js', 'check', 'samples/captures/FK-0103_mid.csv', '--spec', SPEC, '--data', t.dataDir]).catch((err: { code?: number }) => {
        if (err.code !== 1) throw err; // 1: the unit did not pass, which is expected with one capture of three
      }),
    );
    expect(event).toHaveProperty('at');
    const board = (await (await fetch(`${t.base}/api/board`)).json()) as { units: { unit: string }[] };
    expect(board.units.map((u) => u.unit)).toContain('FK-0103');
  });

  it('reports the reading progress of a drop as live events, then its outcome', async () => {
    const event = (await nextEvent(t.base, 'drop', () => drop([sample('FK-0104_mid.csv')]))) as { status: string; file: string; done: number; total: number };
    expect(event.status).toBe('reading');
    expect(event.file).toBe('FK-0104_mid.csv');
    expect(event.total).toBe(readFileSync('samples/captures/FK-0104_mid.csv').length);
  });

  it('sends plot columns that are the min and max of the archived record in each column', async () => {
    const unit = (await (await fetch(`${t.base}/api/units/FK-0101`)).json()) as { runs: { id: number; captures: { sha256: string; path: string; channels: { name: string }[] }[] }[] };
    const run = unit.runs[0];
    const cap = run.captures.find((c) => c.path === 'FK-0101_mid.csv')!;
    const ch = cap.channels[0];
    const rows = readFileSync('samples/captures/FK-0101_mid.csv', 'utf8').trim().split('\n').slice(1).map((l) => l.split(',').map(Number));
    const column = 1 + ['CH1', 'CH2'].indexOf(ch.name.replace(/ .*/, ''));
    const q = new URLSearchParams({ unit: 'FK-0101', run: String(run.id), sha: cap.sha256, channel: ch.name, width: '100' });
    for (const [from, to] of [[undefined, undefined], [0.01, 0.02]] as const) {
      if (from !== undefined) q.set('from', String(from));
      if (to !== undefined) q.set('to', String(to));
      const p = (await (await fetch(`${t.base}/api/plot/wave?${q}`)).json()) as { t: number[]; min: number[]; max: number[]; first: number; end: number; step: number };
      expect(p.t.length).toBeLessThanOrEqual(100);
      if (from !== undefined) expect(p.end - p.first).toBeLessThan(rows.length / 2);
      for (let c = 0; c < p.t.length; c++) {
        const slice = rows.slice(p.first + c * p.step, Math.min(p.end, p.first + (c + 1) * p.step)).map((r) => r[column]);
        expect(p.min[c]).toBe(Math.min(...slice));
        expect(p.max[c]).toBe(Math.max(...slice));
        expectWithin(p.t[c], rows[p.first + c * p.step][0], { rel: 5e-7 }, 'time column of the CSV, printed to 7 significant digits');
      }
    }
  });

  it('refuses plot requests for unknown runs and windows outside the record', async () => {
    const q = new URLSearchParams({ unit: 'FK-0101', run: '999', sha: 'a'.repeat(64), channel: 'CH1' });
    expect((await fetch(`${t.base}/api/plot/wave?${q}`)).status).toBe(404);
    expect((await fetch(`${t.base}/api/plot/wave?unit=FK-0101`)).status).toBe(400);
    expect((await fetch(`${t.base}/api/units/FK-9999`)).status).toBe(404);
  });

  it('refuses to show records changed behind the store’s back, with the records error check would print', async () => {
    const Database = (await import('better-sqlite3')).default;
    const db = new Database(join(t.dataDir, 'records.db'));
    try {
      // The store's own guard refuses this; a hand edit of the file (trigger dropped) gets past it.
      expect(() => db.prepare("UPDATE runs SET operator = 'someone else'").run()).toThrow(/append-only/);
      db.exec('DROP TRIGGER runs_no_update');
      db.prepare("UPDATE runs SET operator = 'someone else' WHERE id = 1").run();
    } finally {
      db.close();
    }
    await expect.poll(async () => (await fetch(`${t.base}/api/board`)).status, { timeout: 10_000 }).toBe(422);
    const body = (await (await fetch(`${t.base}/api/board`)).json()) as { error: { code: string; message: string } };
    expect(body.error.code).toMatch(/^records\.(tampered|damaged)$/);
    expect(body.error.message).toContain('fix: ');
  });
});
