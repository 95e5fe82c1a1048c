/**
 * The attempt rule and its place in the fingerprint: runs group into attempts (a run continues its
 * unit's latest attempt while that attempt waits for a condition), and the attempt number and note of
 * a run are covered by its fingerprint, so changing them behind benchproof's back is seen on reading.
 * The invariants tested are the rule's own statement (issue 16), common practice (no source).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import fc from 'fast-check';
import Database from 'better-sqlite3';
import { numberRuns, openStore, summarizeAttempts } from '../../src/records/index.js';
import type { StoredRun, UnitVerdict } from '../../src/types/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

let root: string;
beforeEach(() => {
  root = makeTempDir();
});
afterEach(() => removeTempDir(root));

const CONDITIONS = ['low', 'mid', 'high'];

/** A stored run (as read back before attempts) whose captures cover the given conditions. */
function oldRun(id: number, covered: readonly string[], spec = 'FH-210 Kestrel VCO'): StoredRun {
  const verdict = {
    schemaVersion: 1,
    unit: 'FK-0101',
    statement: 'pass',
    conditions: CONDITIONS.map((condition) => ({ condition, statement: 'pass', checks: [] })),
    captures: covered.map((condition) => ({ condition })),
  } as unknown as UnitVerdict;
  return { id, unit: 'FK-0101', spec: { name: spec, revision: 'C', sha256: '0'.repeat(64) }, statement: 'pass', verdict, captures: [] } as unknown as StoredRun;
}

describe('grouping runs into attempts', () => {
  it('closes an attempt at its first complete run and keeps a waiting attempt only as the last one (property, fixed seed)', () => {
    const subset = fc.subarray(CONDITIONS, { minLength: 1 });
    fc.assert(
      fc.property(fc.array(subset, { minLength: 1, maxLength: 12 }), (sets) => {
        const runs = numberRuns(sets.map((s, i) => oldRun(i + 1, s)));
        const attempts = summarizeAttempts(runs);
        expect(attempts.map((a) => a.number)).toEqual(attempts.map((_, i) => i + 1));
        expect(runs.map((r) => r.number)).toEqual(runs.map((_, i) => i + 1));
        attempts.forEach((a, i) => {
          const members = runs.filter((r) => r.attempt === a.number);
          const complete = members.filter((r) => r.verdict.captures.length === CONDITIONS.length);
          if (i < attempts.length - 1) {
            // A closed attempt ends with its one complete run.
            expect(complete.map((r) => r.id)).toEqual([members[members.length - 1].id]);
          } else {
            expect(complete.length).toBeLessThanOrEqual(1);
            expect(a.closed).toBe(a.state === 'complete');
          }
        });
      }),
      { seed: 16, numRuns: 200 },
    );
  });

  it('opens a new attempt when the spec name changes, even while the previous one waits', () => {
    const runs = numberRuns([oldRun(1, ['low']), oldRun(2, ['mid'], 'FH-211 Osprey VCF')]);
    expect(runs.map((r) => [r.attempt, r.attemptReason])).toEqual([
      [1, 'first'],
      [2, 'other-spec'],
    ]);
  });
});

describe('attempt fields in the fingerprint', () => {
  it('marks a run whose note was changed outside benchproof as not intact', () => {
    const dir = join(root, 'data');
    const store = openStore(dir);
    store.saveRun({ ...kestrelRun({ unit: 'FK-0106', startedAt: '2026-03-02T09:00:00.000Z' }), note: 'U3 replaced' });
    store.close();
    const db = new Database(join(dir, 'records.db'));
    db.exec('DROP TRIGGER runs_no_update');
    db.prepare("UPDATE runs SET note = 'nothing was replaced', attempt = 1 WHERE id = 1").run();
    db.close();
    const again = openStore(dir, { mode: 'read', unverified: 'mark' });
    try {
      const [run] = again.runs();
      expect(run.note).toBe('nothing was replaced');
      expect(run.intact).toBe(false);
    } finally {
      again.close();
    }
  });
});
