/**
 * Hostile paths: capture names with spaces, quotes, shell characters, non-Latin letters, a line
 * break, and names that read as options (`--json.csv`, `-x.csv`: POSIX utility syntax guideline 10,
 * "--" ends the options — IEEE Std 1003.1-2017 XBD §12.2); and a data folder on a read-only or full
 * disk (a real tmpfs where the machine allows mounting, else simulated). Each gives a result or a
 * clear BenchError (exit 2), and never a partial run.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { openStore } from '../../src/records/index.js';
import { isBenchError } from '../../src/types/index.js';
import { runCli } from '../helpers/cliHarness.js';
import { kestrelRun } from '../records/fixtures/kestrelRun.js';
import { newTally, saveTally } from './budget.js';
import { auditStore } from './storeAudit.js';
import { canMount, mountScratch } from './scratchMount.js';

const tally = newTally();
const work = mkdtempSync(join(tmpdir(), 'benchproof-paths-'));
afterAll(() => {
  saveTally('hostile-paths', tally);
  rmSync(work, { recursive: true, force: true });
});

const SAMPLE = resolve('samples/captures/FK-0101_mid.csv');
const SPEC = resolve('samples/fh210-spec.yaml');
const NAMES = ['FK-0101 mid copy.csv', `it's "quoted".csv`, 'Kanal µ Ω ñ 測試.csv', 'line\nbreak.csv', ' leading space.csv', 'semi;colon&$(echo x)`id`.csv', '--json.csv', '-x.csv'];

async function cli(argv: string[], env: Record<string, string> = {}): ReturnType<typeof runCli> {
  tally.inputs++;
  const r = await runCli(argv, { cwd: work, env: { BENCHPROOF_DATA: join(work, 'data'), ...env } });
  if (r.code === 3) {
    tally.crashes++;
    tally.notes.push(`exit 3 for ${JSON.stringify(argv)}: ${r.stderr.split('\n')[0]}`);
  }
  return r;
}

describe('capture names that are awkward for a shell or look like options', () => {
  it.each(NAMES)('measures %j when it is given after -- and as ./name', async (name) => {
    copyFileSync(SAMPLE, join(work, name));
    for (const argv of [['measure', '--', name], ['measure', `./${name}`], ['measure', '--json', '--', join(work, name)]]) {
      const r = await cli(argv);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toContain(argv[0] === 'measure' && argv[1] === '--json' ? '"schemaVersion": 1' : '6 000 samples');
    }
  });

  it('says how to name a file that looks like an option when it is given bare', async () => {
    for (const name of ['--json.csv', '-x.csv']) {
      copyFileSync(SAMPLE, join(work, name));
      const r = await cli(['measure', name]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain(`unknown option '${name}'`);
      expect(r.stderr).toContain(`fix: a file name that starts with "-" reads as an option: write ./${name}, or put -- before the file names`);
    }
  });

  it('stores and reads back a unit whose serial holds spaces and non-Latin letters, from an awkward file name', async () => {
    const name = `it's "quoted".csv`;
    copyFileSync(SAMPLE, join(work, name));
    const r = await cli(['check', '--spec', SPEC, '--unit', 'FK 0107 ü', '--condition', 'mid', '--', name]);
    expect([0, 1, 4], r.stderr).toContain(r.code);
    expect(r.stderr).toMatch(/stored run #?\d+ of FK 0107 ü[ ,].*next: /);
    const back = await cli(['record', 'FK 0107 ü', '--format', 'json']);
    expect(back.code, back.stderr).toBe(0);
    expect(JSON.parse(back.stdout)).toMatchObject({ unit: 'FK 0107 ü' });
  });

  it('names a missing capture with an awkward name in a capture.unreadable error', async () => {
    const r = await cli(['measure', '--json', '--', `no such 'file' ü.csv`]);
    expect(r.code).toBe(2);
    expect(JSON.parse(r.stderr)).toMatchObject({ error: { code: 'capture.unreadable', file: expect.stringContaining(`no such 'file' ü.csv`) } });
  });
});

describe('a data folder that cannot take the run (simulated failures, any machine)', () => {
  it('stores nothing and says the disk is full when the commit fails with SQLITE_FULL', () => {
    const dir = join(work, 'full-data');
    const store = openStore(dir);
    const full = Object.assign(new Error('database or disk is full'), { code: 'SQLITE_FULL' });
    let caught: unknown;
    try {
      store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:00:00Z' }), { beforeCommit: () => { throw full; } });
    } catch (err) {
      caught = err;
    }
    store.close();
    tally.inputs++;
    expect(isBenchError(caught) && caught.code).toBe('records.disk-full');
    const audit = auditStore(dir);
    expect([audit.runs.size, audit.problems, audit.temps]).toEqual([0, [], []]);
  });

  it('reports a disk I/O error of SQLite on a disk with room as records.io-error, not an internal error', () => {
    const dir = join(work, 'ioerr-data');
    const store = openStore(dir);
    const ioerr = Object.assign(new Error('disk I/O error'), { code: 'SQLITE_IOERR_WRITE' });
    let caught: unknown;
    try {
      store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:00:00Z' }), { beforeCommit: () => { throw ioerr; } });
    } catch (err) {
      caught = err;
    }
    store.close();
    tally.inputs++;
    expect(isBenchError(caught) && caught.code).toBe('records.io-error');
    expect(auditStore(dir).runs.size).toBe(0);
  });
});

const MOUNT = canMount();
if (!MOUNT) console.warn('note: no tmpfs mount rights here; the real read-only and full-disk tests are skipped (simulated ones ran)');

describe.skipIf(!MOUNT)('a data folder on a real read-only or full disk (tmpfs, needs root)', () => {
  it('refuses to store on a read-only disk with records.read-only, and keeps what was there', async () => {
    const m = mountScratch(4 << 20)!;
    try {
      const env = { BENCHPROOF_DATA: join(m.dir, 'data') };
      const first = await cli(['check', '--spec', SPEC, SAMPLE], env);
      expect([0, 1, 4], first.stderr).toContain(first.code);
      m.remount('ro');
      const again = await cli(['check', '--spec', SPEC, '--json', SAMPLE], env);
      expect(again.code).toBe(2);
      expect(again.stdout).toBe('');
      expect(JSON.parse(again.stderr)).toMatchObject({ error: { code: 'records.read-only' } });
      const fresh = await cli(['check', '--spec', SPEC, SAMPLE], { BENCHPROOF_DATA: join(m.dir, 'new-data') });
      expect([fresh.code, fresh.stderr]).toEqual([2, expect.stringContaining('cannot be written')]);
      const list = await cli(['units'], env);
      expect([list.code, list.stderr]).toEqual([2, expect.stringContaining('read-only disk')]);
      m.remount('rw');
      const audit = auditStore(env.BENCHPROOF_DATA);
      expect([audit.runs.size, audit.problems]).toEqual([1, []]);
    } finally {
      m.release();
    }
  });

  it('stores nothing, leaves no partial copy and says so when the disk fills while archiving captures', async () => {
    const m = mountScratch(512 << 10)!;
    try {
      const data = join(m.dir, 'data');
      const captures = ['low', 'mid', 'high'].map((c) => resolve(`samples/captures/FK-0101_${c}.csv`));
      const r = await cli(['check', '--spec', SPEC, ...captures], { BENCHPROOF_DATA: data });
      expect([r.code, r.stderr]).toEqual([2, expect.stringContaining('the disk holding the data folder is full; nothing was stored')]);
      const audit = auditStore(data);
      expect([audit.runs.size, audit.problems, audit.temps]).toEqual([0, [], []]);
    } finally {
      m.release();
    }
  });

  it('stores nothing and says so when the disk fills while the database is written, and stores again once there is room', async () => {
    const m = mountScratch(1536 << 10)!;
    try {
      const env = { BENCHPROOF_DATA: join(m.dir, 'data') };
      const first = await cli(['check', '--spec', SPEC, SAMPLE], env);
      expect([0, 1, 4], first.stderr).toContain(first.code);
      for (const leave of [8 << 10, 32 << 10]) {
        m.fill(leave);
        const full = await cli(['check', '--spec', SPEC, SAMPLE], env);
        expect([full.code, full.stderr]).toEqual([2, expect.stringContaining('is full; nothing was stored')]);
        m.unfill();
      }
      const after = await cli(['check', '--spec', SPEC, SAMPLE], env);
      expect([0, 1, 4], after.stderr).toContain(after.code);
      const audit = auditStore(env.BENCHPROOF_DATA);
      expect([audit.runs.size, audit.problems, audit.temps]).toEqual([2, [], []]);
    } finally {
      m.release();
    }
  });
});
