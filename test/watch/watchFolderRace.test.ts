/**
 * The watch cannot miss a file, whatever its event source does. The event source is replaced by a
 * controlled one over a folder in memory, on fake timers, so the race that used to lose a capture
 * (a file written between the watch's first listing and the source's start, which no notice ever
 * announces) happens on every run instead of now and then on a loaded machine. Rule: each version
 * of a file is reported exactly once (common practice for drop-folder watchers, no source).
 */
import { describe, expect, it } from 'vitest';
import { useMemoryWatch } from './helpers/memoryFolder.js';

const w = useMemoryWatch();
const FAST = { settleMs: 40, reconcileMs: 60 } as const;

describe('watchFolder reconciliation', () => {
  it('watchFolder reports a file written while the event source starts, which no notice announces', async () => {
    const write = (): void => w.folder().write('FK-0102_low.csv', 15, { silent: true });
    const { settled, errors } = await w.start({ ...FAST, includeExisting: false, source: { atStart: write } });
    // Found by the listing made once the source is ready, then settled.
    await w.advance(FAST.settleMs);
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 15 }]);
    await w.advance(50 * FAST.reconcileMs);
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 15 }]);
    expect(errors).toEqual([]);
  });

  it('watchFolder reports a file once when both a notice and its own listing find it', async () => {
    const write = (): void => w.folder().write('FK-0101_mid.csv', 11, { silent: true });
    const { settled } = await w.start({ ...FAST, source: { atStart: write, announce: ['FK-0101_mid.csv'] } });
    await w.advance(50 * FAST.reconcileMs);
    expect(settled.map((f) => f.name)).toEqual(['FK-0101_mid.csv']);
  });

  it('watchFolder finds a file within a listing interval and a settle time when no notice ever comes', async () => {
    const { settled } = await w.start({ ...FAST, source: { silent: true } });
    w.folder().write('FK-0105_mid.csv', 7);
    await w.advance(FAST.reconcileMs + FAST.settleMs);
    expect(settled).toEqual([{ name: 'FK-0105_mid.csv', size: 7 }]);
  });

  it('watchFolder without existing files skips what was there before it started and reports a later rewrite', async () => {
    w.folder().write('old.csv', 3);
    const { settled } = await w.start({ ...FAST, includeExisting: false });
    await w.advance(50 * FAST.reconcileMs);
    expect(settled).toEqual([]);
    w.folder().write('old.csv', 9);
    await w.advance(50 * FAST.reconcileMs);
    expect(settled).toEqual([{ name: 'old.csv', size: 9 }]);
  });

  it('watchFolder reports a file removed and written again at the same size once more', async () => {
    const { settled } = await w.start(FAST);
    w.folder().write('FK-0103_high.csv', 3);
    await w.advance(5 * FAST.reconcileMs);
    expect(settled).toHaveLength(1);
    w.folder().remove('FK-0103_high.csv');
    await w.advance(5 * FAST.reconcileMs);
    w.folder().write('FK-0103_high.csv', 3);
    await w.advance(5 * FAST.reconcileMs);
    expect(settled.map((f) => f.name)).toEqual(['FK-0103_high.csv', 'FK-0103_high.csv']);
  });

  it('watchFolder reports a file removed and written again between two listings, unseen by notices, once more', async () => {
    const { settled } = await w.start({ ...FAST, source: { silent: true } });
    w.folder().write('FK-0106_low.csv', 3);
    await w.advance(5 * FAST.reconcileMs);
    expect(settled).toHaveLength(1);
    await w.advance(1);
    // Same name and size, a later modification time: a new version of the file.
    w.folder().write('FK-0106_low.csv', 3);
    await w.advance(5 * FAST.reconcileMs);
    expect(settled).toHaveLength(2);
  });

  it('watchFolder reports a file once when change notices with nothing changed arrive while it is being confirmed', async () => {
    // Every offset of the notice against the slow look that confirms the file, 1 ms apart.
    for (let offset = 0; offset <= 25; offset++) {
      const name = `FK-${6000 + offset}_mid.csv`;
      const { settled } = await w.start({ ...FAST, source: {} });
      w.folder().slowLooks(10);
      w.folder().write(name, 5);
      await w.advance(10 + FAST.settleMs - 5 + offset);
      w.folder().notice(name);
      await w.advance(50 * FAST.reconcileMs);
      expect(settled.map((f) => f.name), `notice ${offset} ms into the confirmation`).toEqual([name]);
      w.folder().slowLooks(0);
      w.folder().remove(name, { silent: true });
    }
  });
});
