// The follower built on RecordStore's public interface (src/records/followRecordStore.ts), which the
// bench page uses on the shared store. It is exercised here on the embedded engine, whose public
// interface is the same; the reference for every answer is a freshly opened store's own listing and
// full audit (an independent pass over every row), never the follower's earlier output.
import Database from 'better-sqlite3';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { DATABASE_FILE, followRecordStore, openStore } from '../../src/records/index.js';
import type { RecordStore, RecordStoreFollower } from '../../src/records/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

let dir: string;
let writer: RecordStore;
let follower: RecordStoreFollower | undefined;
let opened = 0;

const open = (): RecordStore => {
  opened += 1;
  return openStore(dir, { mode: 'read', unverified: 'mark' });
};
const reference = (): RecordStore => openStore(dir, { mode: 'read', unverified: 'mark' });
const at = (s: number): string => new Date(Date.UTC(2026, 2, 2, 9, 0, s)).toISOString();

beforeEach(() => {
  dir = makeTempDir();
  opened = 0;
  writer = openStore(dir);
  writer.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: at(1) }));
  writer.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: at(2) }));
});
afterEach(() => {
  follower?.close();
  follower = undefined;
  writer.close();
  removeTempDir(dir);
});

describe('followRecordStore', () => {
  it('lists what a fresh store lists and audits as its full audit does', async () => {
    follower = followRecordStore(open);
    const snap = await follower.catchUp();
    const ref = reference();
    expect(snap.units()).toEqual(ref.listUnits());
    expect(snap.audit).toEqual(ref.audit());
    ref.close();
    expect(snap.units()).toBe(snap.units()); // the same listing for the same view, so callers may keep what they built
  });

  it('answers from the same view while the chain head stays, and verifies again once another writer moved it', async () => {
    follower = followRecordStore(open, { share: 1 });
    const first = await follower.catchUp();
    const before = follower.marker();
    expect(await follower.catchUp()).toBe(first);
    expect(opened).toBe(1);
    writer.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: at(3) }));
    expect(follower.marker()).not.toBe(before); // the page's change marker moves with the head
    const next = await follower.catchUp();
    // Only the new run was verified in full (its unit's one row), not the whole store again.
    expect([next.fullPasses, next.verifiedRows - first.verifiedRows]).toEqual([first.fullPasses, 1]);
    const ref = reference();
    expect(next.units()).toEqual(ref.listUnits());
    ref.close();
    expect(next.units().map((u) => u.unit)).toEqual(['FK-0101', 'FK-0102', 'FK-0103']);
  });

  it('names a row edited in place (the head unchanged) at the next verification, with the audit of a fresh store, and marks its run', async () => {
    follower = followRecordStore(open, { share: 1 });
    await follower.catchUp();
    const raw = new Database(join(dir, DATABASE_FILE));
    raw.exec("DROP TRIGGER runs_no_update; UPDATE runs SET operator = 'someone else' WHERE unit = 'FK-0101'");
    raw.close();
    follower.changed();
    expect((await follower.catchUp()).audit.problems).toEqual([]); // nothing tells it yet: the head is the same
    writer.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: at(3) }));
    const snap = await follower.catchUp();
    const ref = reference();
    // The listing's checks over the whole store find it (the run's columns against its summary), as a full audit does.
    const full = ref.audit();
    expect([snap.audit.head, snap.audit.chained, snap.audit.problems]).toEqual([full.head, full.chained, full.problems]);
    ref.close();
    expect(snap.audit.problems.map((p) => [p.unit, p.problem])).toEqual([['FK-0101', 'changed']]);
    expect(snap.units().find((u) => u.unit === 'FK-0101')?.unverifiedRuns).toEqual([1]);
    const { runs, audit } = await follower.unitRuns('FK-0101');
    expect(audit).toBe(snap.audit);
    expect(runs.map((r) => r.intact)).toEqual([false]);
    expect((await follower.unitRecord('FK-0101')).record?.runs.map((r) => r.intact)).toEqual([false]);
  });

  it('verifies in full each unit stored since its last view, finding a verdict edited in the file that the listing alone does not', async () => {
    follower = followRecordStore(open, { share: 1 });
    await follower.catchUp();
    writer.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: at(3) }));
    const raw = new Database(join(dir, DATABASE_FILE));
    raw.exec(`DROP TRIGGER runs_no_update; UPDATE runs SET verdict_json = replace(verdict_json, '"FK-0103"', '"FK-0130"') WHERE unit = 'FK-0103'`);
    raw.close();
    const snap = await follower.catchUp();
    const ref = reference();
    expect(ref.audit('listing').problems).toEqual([]); // the summary is as stored: only a full read finds it
    expect(snap.audit.problems).toEqual(ref.audit().problems);
    ref.close();
    expect(snap.audit.problems.map((p) => [p.unit, p.problem])).toEqual([['FK-0103', 'changed']]);
  });

  it('verifies the whole store again when the head it verified is no longer in its place', async () => {
    follower = followRecordStore(open, { share: 1 });
    const first = await follower.catchUp();
    const raw = new Database(join(dir, DATABASE_FILE));
    raw.exec(`DROP TRIGGER chain_no_update; UPDATE chain SET link = '${'0'.repeat(64)}' WHERE seq = (SELECT MAX(seq) FROM chain)`);
    raw.close();
    writer.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: at(3) }));
    const snap = await follower.catchUp();
    expect(snap.fullPasses).toBe(first.fullPasses + 1);
    expect(snap.audit.problems.map((p) => p.problem)).toContain('chain-broken');
  });

  it('answers from the last verified view when the head moves again within its share of the time, with the marker showing both heads', async () => {
    // Each open takes at least 20 ms, so with a share of 1/1000 the next verification waits at least 20 s.
    const slow = (): RecordStore => {
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 20);
      return open();
    };
    follower = followRecordStore(slow, { share: 0.001 });
    const first = await follower.catchUp();
    const [head, verified] = follower.marker().split('|');
    expect(head).toBe(verified);
    writer.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: at(3) }));
    expect(await follower.catchUp()).toBe(first);
    const [headNow, verifiedNow] = follower.marker().split('|');
    expect([headNow !== head, verifiedNow]).toEqual([true, verified]);
    expect(opened).toBe(1);
  });

  it('finds an edit in place by its background re-check and moves its marker, with no change announced', async () => {
    follower = followRecordStore(open, { recheckMs: 20 });
    await follower.catchUp();
    const before = follower.marker();
    const raw = new Database(join(dir, DATABASE_FILE));
    raw.exec("DROP TRIGGER runs_no_update; UPDATE runs SET operator = 'someone else' WHERE unit = 'FK-0102'");
    raw.close();
    const deadline = Date.now() + 10_000;
    while (follower.marker() === before && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
    expect(follower.marker()).not.toBe(before);
    expect((await follower.catchUp()).audit.problems.map((p) => [p.unit, p.problem])).toEqual([['FK-0102', 'changed']]);
  });

  it('tries again at the next answer when opening the store fails, and answers once it opens', async () => {
    let failing = true;
    follower = followRecordStore(() => {
      if (failing) throw new Error('out of reach');
      return open();
    });
    await expect(follower.catchUp()).rejects.toThrow('out of reach');
    failing = false;
    expect((await follower.catchUp()).units().map((u) => u.unit)).toEqual(['FK-0101', 'FK-0102']);
  });
});
