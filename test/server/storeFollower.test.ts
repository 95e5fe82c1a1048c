// The board's verified view of the records (src/records/followStore.ts): it must list what listUnits
// lists and name the problems auditStore names (the reference here is the store's own full audit,
// an independent pass over every row), while verifying only what was added since its last head.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createContext } from '../../src/cli/context.js';
import type { CliIo } from '../../src/cli/io.js';
import { checkPlans, loadSpec, planFiles, runOf } from '../../src/cli/checkRun.js';
import type { CheckedUnit } from '../../src/cli/store.js';
import { followStore, openStore } from '../../src/records/index.js';
import type { RecordStore, StoreFollower } from '../../src/records/index.js';
import { auditStore } from '../../src/records/auditStore.js';
import { SPEC } from './serverHarness.js';

const io: CliIo = { stdout: () => {}, stderr: () => {}, stdoutIsTTY: false, stderrIsTTY: false, env: {}, cwd: process.cwd() };
const ctx = createContext(io);
let complete: CheckedUnit;
let waiting: CheckedUnit;
let specText: string;

beforeAll(async () => {
  const { spec, text } = loadSpec(ctx, SPEC);
  specText = text;
  [complete] = await checkPlans(ctx, spec, planFiles(spec, ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0101_${c}.csv`), {}), {});
  [waiting] = await checkPlans(ctx, spec, planFiles(spec, ['samples/captures/FK-0102_low.csv'], {}), {});
}, 60_000);

let dir: string;
let store: RecordStore;
let follower: StoreFollower | undefined;
let second = 0;

function save(unit: CheckedUnit, serial: string, extra: { note?: string } = {}) {
  second += 1;
  const at = new Date(Date.UTC(2026, 0, 1, 0, 0, second)).toISOString();
  const run = runOf(ctx, { verdict: { ...unit.verdict, unit: serial }, diagnosis: unit.diagnosis }, { operator: 'test', station: 'test' }, at, specText);
  return store.saveRun({ ...run, unit: serial, ...extra });
}

/** The reference: a full audit of every row (archive left out, as the board leaves it out). */
function fullAudit() {
  const db = new Database(join(dir, 'records.db'), { readonly: true });
  try {
    return auditStore(db, dir, { archive: false });
  } finally {
    db.close();
  }
}

function writable(sql: string, ...args: unknown[]): void {
  const db = new Database(join(dir, 'records.db'));
  try {
    db.prepare(sql).run(...args);
  } finally {
    db.close();
  }
}

const byRow = (p: { kind: string; id: number | null; problem: string }) => `${p.kind}:${p.id}:${p.problem}`;

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'benchproof-follow-'));
  store = openStore(dir, { mode: 'write' });
  save(complete, 'FK-0201');
  save(complete, 'FK-0202');
  save(waiting, 'FK-0203');
  save(complete, 'FK-0202', { note: 'C3 replaced' });
});

afterEach(() => {
  follower?.close();
  follower = undefined;
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('the board follower', () => {
  it('lists every unit exactly as listUnits does, with and without a spec name', async () => {
    follower = followStore(dir);
    const seen = await follower.catchUp();
    expect(seen.units()).toEqual(store.listUnits());
    expect(seen.units(complete.verdict.spec.name)).toEqual(store.listUnits({ spec: complete.verdict.spec.name }));
    expect(seen.units('no such spec')).toEqual([]);
    expect(seen.audit.problems).toEqual([]);
    expect(seen.audit.head).toBe(store.chainHead());
  });

  it('verifies only the unit of a run stored after its last head, and lists it', async () => {
    follower = followStore(dir);
    const before = await follower.catchUp();
    expect(before.fullPasses).toBe(1);
    expect(before.verifiedRows).toBe(4);
    save(waiting, 'FK-0204');
    const after = await follower.catchUp();
    expect(after.fullPasses).toBe(1);
    expect(after.verifiedRows).toBe(5);
    expect(after.units()).toEqual(store.listUnits());
    expect(after.units().find((u) => u.unit === 'FK-0204')?.state).toBe('incomplete');
  });

  it('answers an unchanged store without reading a row again', async () => {
    follower = followStore(dir);
    const first = await follower.catchUp();
    const again = await follower.catchUp();
    expect(again.verifiedRows).toBe(first.verifiedRows);
    expect(again.units()).toEqual(first.units());
  });

  it('names a new run changed before it was read, as the full audit names it', async () => {
    follower = followStore(dir);
    await follower.catchUp();
    const added = save(complete, 'FK-0205');
    writable('DROP TRIGGER runs_no_update');
    writable("UPDATE runs SET verdict_json = replace(verdict_json, '\"statement\":\"pass\"', '\"statement\":\"fail\"') WHERE id = ?", added.id);
    const seen = await follower.catchUp();
    expect(seen.fullPasses).toBe(1);
    expect(seen.audit.problems.map(byRow)).toEqual(fullAudit().problems.map(byRow));
    expect(seen.audit.problems.map(byRow)).toContain(`run:${added.id}:changed`);
    expect(seen.units().find((u) => u.unit === 'FK-0205')?.unverifiedRuns).toEqual([added.id]);
  });

  it('finds a row edited in place after it was verified, in the sweep a change of the database schedules', async () => {
    follower = followStore(dir, { sweepGapMs: 0, sweepGapFactor: 0 });
    const first = await follower.catchUp();
    writable('DROP TRIGGER runs_no_update');
    writable("UPDATE runs SET operator = 'someone else' WHERE unit = 'FK-0201'");
    follower.changed();
    let seen = await follower.catchUp();
    for (const end = Date.now() + 30_000; Date.now() < end && seen.fullPasses === first.fullPasses; ) {
      await new Promise((done) => setTimeout(done, 20));
      seen = await follower.catchUp();
    }
    expect(seen.fullPasses).toBe(2);
    expect(seen.audit.problems.map(byRow)).toEqual(fullAudit().problems.map(byRow));
    expect(seen.audit.problems.length).toBe(1);
  });

  it('verifies everything again when the head it knew is no longer in the chain', async () => {
    follower = followStore(dir);
    const first = await follower.catchUp();
    writable('DROP TRIGGER chain_no_update');
    writable(`UPDATE chain SET link = '${'f'.repeat(64)}' WHERE seq = (SELECT MAX(seq) FROM chain)`);
    const seen = await follower.catchUp();
    expect(seen.fullPasses).toBe(first.fullPasses + 1);
    expect(seen.audit.problems.map(byRow)).toEqual(fullAudit().problems.map(byRow));
    expect(seen.audit.problems.map((p) => p.problem)).toContain('chain-broken');
    expect(seen.audit.head).toBe('f'.repeat(64));
  });

  it('names a deleted run as missing, as the full audit does', async () => {
    follower = followStore(dir, { sweepGapMs: 0, sweepGapFactor: 0 });
    await follower.catchUp();
    writable('DROP TRIGGER runs_no_delete');
    const db = new Database(join(dir, 'records.db'));
    db.pragma('foreign_keys = OFF');
    for (const t of ['condition_results', 'checks', 'causes', 'run_captures', 'measurements']) {
      try {
        db.exec(`DROP TRIGGER IF EXISTS ${t}_no_delete`);
        db.prepare(`DELETE FROM ${t} WHERE run_id = 1`).run();
      } catch {
        // a table this schema does not have
      }
    }
    db.prepare('DELETE FROM runs WHERE id = 1').run();
    db.close();
    follower.changed();
    let seen = await follower.catchUp();
    for (const end = Date.now() + 30_000; Date.now() < end && seen.fullPasses < 2; ) {
      await new Promise((done) => setTimeout(done, 20));
      seen = await follower.catchUp();
    }
    // The sweep the change scheduled is what the answer reflects (a stale snapshot once hid it for the whole wait).
    expect(seen.fullPasses).toBe(2);
    expect(seen.audit.problems.map(byRow)).toEqual(fullAudit().problems.map(byRow));
    expect(seen.audit.problems.map(byRow)).toContain('run:1:missing');
    expect(seen.units().map((u) => u.unit)).not.toContain('FK-0201');
  });

  it('reads a unit record as the store reads it, and marks a run edited in place once the sweep found it', async () => {
    follower = followStore(dir, { sweepGapMs: 0, sweepGapFactor: 0 });
    const { record, audit } = await follower.unitRecord('FK-0202');
    expect(audit.problems).toEqual([]);
    expect(record).toEqual(store.unitRecord('FK-0202'));
    expect((await follower.unitRuns('FK-0202')).runs).toEqual(store.runs({ unit: 'FK-0202' }));
    const [first] = store.runs({ unit: 'FK-0202' });
    writable('DROP TRIGGER runs_no_update');
    writable("UPDATE runs SET operator = 'someone else' WHERE id = ?", first.id);
    follower.changed();
    let seen = await follower.unitRuns('FK-0202');
    for (const end = Date.now() + 30_000; Date.now() < end && seen.audit.problems.length === 0; ) {
      await new Promise((done) => setTimeout(done, 20));
      seen = await follower.unitRuns('FK-0202');
    }
    expect(seen.runs.find((r) => r.id === first.id)?.intact).toBe(false);
    expect(seen.runs.filter((r) => r.intact)).toHaveLength(1);
  });

  it('names a unit whose archived capture changed, as the store does for its record', async () => {
    follower = followStore(dir);
    const [run] = store.runs({ unit: 'FK-0201' });
    const { appendFileSync } = await import('node:fs');
    appendFileSync(join(dir, run.captures[0].archivePath), '\n0,0\n');
    const { audit } = await follower.unitRecord('FK-0201');
    expect(audit.problems.map((p) => p.problem)).toContain('capture-changed');
    expect((await follower.unitRecord('FK-0203')).audit.problems).toEqual([]);
  });
});
