/**
 * The settle rule of `watch`: a file is reported once its size and modification time have held
 * still for the whole settle time, and each version of it exactly once (common practice for
 * drop-folder watchers and scope exports, no source). Run on fake timers over a folder in memory
 * (helpers/memoryFolder.ts), so the times below are exact and the tests take milliseconds; the
 * real folder and chokidar are covered end to end by watchFolderPoll.test.ts and the session tests.
 */
import { describe, expect, it } from 'vitest';
import { useMemoryWatch } from './helpers/memoryFolder.js';

const w = useMemoryWatch();

describe('watchFolder settle rule', () => {
  it('watchFolder reports a file written in slow pieces once, at its full size, a settle time after the last piece', async () => {
    const { settled, errors, watch } = await w.start({ settleMs: 1500 });
    for (let i = 0; i < 8; i++) {
      w.folder().append('FK-0101_mid.csv', 5000);
      await w.advance(100);
    }
    // 100 ms have passed since the last piece: it has not held still for 1500 ms yet.
    await w.advance(1300);
    expect(settled).toEqual([]);
    expect(watch.pending()).toBe(1);
    await w.advance(100);
    expect(settled).toEqual([{ name: 'FK-0101_mid.csv', size: 40_000 }]);
    // Long after, through many listings of the folder, it is never reported again.
    await w.advance(60_000);
    expect(settled).toHaveLength(1);
    expect(errors).toEqual([]);
    expect(watch.pending()).toBe(0);
  });

  it('watchFolder waits while a file is rewritten at the same size, since its modification time moves', async () => {
    const { settled } = await w.start({ settleMs: 1000 });
    w.folder().write('FK-0102_low.csv', 300);
    for (let i = 0; i < 5; i++) {
      await w.advance(600);
      w.folder().write('FK-0102_low.csv', 300);
    }
    expect(settled).toEqual([]);
    await w.advance(1000);
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 300 }]);
  });

  it('watchFolder restarts the settle clock when a file grows without a notice, and reports it once it holds still', async () => {
    const { settled } = await w.start({ settleMs: 1000, reconcileMs: 5000 });
    w.folder().write('FK-0103_high.csv', 100);
    await w.advance(900);
    w.folder().append('FK-0103_high.csv', 100, { silent: true });
    // At 1000 ms the size differs from the one the clock started with: the clock starts again.
    await w.advance(100);
    expect(settled).toEqual([]);
    await w.advance(999);
    expect(settled).toEqual([]);
    await w.advance(1);
    expect(settled).toEqual([{ name: 'FK-0103_high.csv', size: 200 }]);
  });

  it('watchFolder reports files already there when asked, and not when not', async () => {
    w.folder().write('old.csv', 1);
    const first = await w.start({ includeExisting: true });
    await w.advance(10_000);
    const second = await w.start({ includeExisting: false });
    w.folder().write('new.csv', 1);
    await w.advance(10_000);
    expect(first.settled.map((f) => f.name)).toEqual(['old.csv']);
    expect(second.settled.map((f) => f.name)).toEqual(['new.csv']);
  });

  it('watchFolder skips ignored names and subfolders, and forgets a file removed before it settled', async () => {
    const { settled, watch } = await w.start({ settleMs: 1500, ignore: (name) => name.endsWith('.png') });
    w.folder().mkdir('benchproof-data');
    w.folder().write('screen.png', 10);
    w.folder().write('gone.csv', 10);
    await w.advance(700);
    w.folder().remove('gone.csv');
    w.folder().write('kept.csv', 10);
    await w.advance(0);
    expect(watch.pending()).toBe(1);
    await w.advance(30_000);
    expect(settled.map((f) => f.name)).toEqual(['kept.csv']);
  });

  it('watchFolder reports nothing after it is closed, and forgets what was still settling', async () => {
    const { settled, watch } = await w.start({ settleMs: 1000 });
    w.folder().write('FK-0104_low.csv', 10);
    await w.advance(500);
    expect(watch.pending()).toBe(1);
    await watch.close();
    expect(watch.pending()).toBe(0);
    w.folder().write('FK-0104_mid.csv', 10);
    await w.advance(30_000);
    expect(settled).toEqual([]);
  });

  it('watchFolder reports each of many files landing at once exactly once', async () => {
    const { settled } = await w.start({ settleMs: 1000 });
    const names = Array.from({ length: 300 }, (_, i) => `FK-${5000 + Math.floor(i / 3)}_${['low', 'mid', 'high'][i % 3]}.csv`);
    for (const [i, name] of names.entries()) w.folder().write(name, 1000 + i, { silent: i % 2 === 1 });
    await w.advance(10_000);
    expect(settled.map((f) => f.name).sort()).toEqual([...names].sort());
  });
});
