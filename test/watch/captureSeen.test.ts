/**
 * The idempotency rule of `watch` at the store: the same capture bytes (SHA-256, FIPS 180-4) for the
 * same unit and condition are recorded once. Runs are the demo fixture (invented data).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openStore } from '../../src/records/index.js';
import { kestrelRun } from '../records/fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

let root: string;
let dir: string;
beforeEach(() => {
  root = makeTempDir('benchproof-watch-');
  dir = join(root, 'benchproof-data');
});
afterEach(() => removeTempDir(root));

/** One condition of the fixture run, as `watch` stores a single landed file. */
function oneCaptureRun(unit: string, index: number, startedAt = '2026-03-02T09:15:00.000Z') {
  const run = kestrelRun({ unit, startedAt });
  return { ...run, captures: [run.captures[index]] };
}

describe('captureRecorded', () => {
  it('captureRecorded finds the run that stored the bytes only for the same unit, condition and SHA-256', () => {
    const store = openStore(dir);
    try {
      const run = oneCaptureRun('FK-0101', 1);
      const c = run.captures[0];
      expect(store.captureRecorded({ unit: 'FK-0101', condition: c.condition, sha256: c.sha256 })).toBeUndefined();
      const saved = store.saveRun(run);
      expect(store.captureRecorded({ unit: 'FK-0101', condition: c.condition, sha256: c.sha256 })).toBe(saved.id);
      expect(store.captureRecorded({ unit: 'FK-0102', condition: c.condition, sha256: c.sha256 })).toBeUndefined();
      expect(store.captureRecorded({ unit: 'FK-0101', condition: 'high', sha256: c.sha256 })).toBeUndefined();
      expect(store.captureRecorded({ unit: 'FK-0101', condition: c.condition, sha256: '0'.repeat(64) })).toBeUndefined();
    } finally {
      store.close();
    }
  });
});

describe('saveRunOnce', () => {
  it('saveRunOnce stores a run once and names the earlier run when the same bytes come again, across store sessions', () => {
    const first = openStore(dir);
    const a = first.saveRunOnce(oneCaptureRun('FK-0101', 0));
    first.close();
    expect(a.stored).toBe(true);
    const second = openStore(dir);
    try {
      const b = second.saveRunOnce(oneCaptureRun('FK-0101', 0, '2026-03-03T10:00:00.000Z'));
      expect(b).toEqual({ stored: false, runId: a.stored ? a.run.id : -1 });
      expect(second.runs({ unit: 'FK-0101' })).toHaveLength(1);
    } finally {
      second.close();
    }
  });

  it('saveRunOnce stores the same bytes again for another unit, and a run in which any capture is new', () => {
    const store = openStore(dir);
    try {
      expect(store.saveRunOnce(oneCaptureRun('FK-0101', 2)).stored).toBe(true);
      expect(store.saveRunOnce(oneCaptureRun('FK-0102', 2)).stored).toBe(true);
      // The full fixture run holds the recorded `high` capture plus two new ones: stored.
      expect(store.saveRunOnce(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-04T08:00:00.000Z' })).stored).toBe(true);
      expect(store.saveRunOnce(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-05T08:00:00.000Z' })).stored).toBe(false);
      expect(store.runs()).toHaveLength(3);
    } finally {
      store.close();
    }
  });

  it('saveRunOnce leaves nothing behind when the write fails before commit', () => {
    const store = openStore(dir);
    try {
      const run = oneCaptureRun('FK-0101', 1);
      expect(() =>
        store.saveRunOnce(run, {
          beforeCommit: () => {
            throw new Error('power cut');
          },
        }),
      ).toThrow('power cut');
      expect(store.runs()).toHaveLength(0);
      expect(store.captureRecorded({ unit: 'FK-0101', condition: 'mid', sha256: run.captures[0].sha256 })).toBeUndefined();
      expect(store.saveRunOnce(run).stored).toBe(true);
    } finally {
      store.close();
    }
  });

  it('saveRunOnce refuses a run with no captures, since there is nothing to decide on', () => {
    const store = openStore(dir);
    try {
      expect(() => store.saveRunOnce({ ...oneCaptureRun('FK-0101', 1), captures: [] })).toThrow(RangeError);
    } finally {
      store.close();
    }
  });
});
