/**
 * When `watch` gives memory back (src/cli/watchMemory.ts): one full collection once the queue has
 * been idle for the quiet time and memory has grown by the margin since the last collection, never
 * during a batch. Small stand-ins for resident memory and the collector, on fake timers; the 1 GB
 * capture itself is in the hardening runner. Project rule (no source).
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { fullCollection, memoryRelease } from '../../src/cli/watchMemory.js';
import { serialQueue } from '../../src/cli/watchQueue.js';

const MiB = 2 ** 20;

/** Resident memory as the test sets it; a collection brings it back to `after`. */
function fakeProcess(start: number) {
  let rss = start;
  let after = start;
  return {
    rss: () => rss,
    grow: (to: number, collectsTo = start) => {
      rss = to;
      after = collectsTo;
    },
    collect: vi.fn(() => void (rss = after)),
  };
}

beforeEach(() => void vi.useFakeTimers());
afterEach(() => void vi.useRealTimers());

describe('memoryRelease', () => {
  it('memoryRelease collects once, a quiet time after the queue went idle, when memory grew by the margin', async () => {
    const p = fakeProcess(80 * MiB);
    const m = memoryRelease({ rss: p.rss, collect: p.collect, quietMs: 1000, marginBytes: 64 * MiB });
    p.grow(490 * MiB, 83 * MiB);
    m.idle();
    await vi.advanceTimersByTimeAsync(999);
    expect(p.collect).not.toHaveBeenCalled();
    await vi.advanceTimersByTimeAsync(1);
    expect(p.collect).toHaveBeenCalledTimes(1);
    expect(m.floor()).toBe(83 * MiB);
    // Idle again with nothing grown: no second collection.
    m.idle();
    await vi.advanceTimersByTimeAsync(10_000);
    expect(m.collections()).toBe(1);
  });

  it('memoryRelease leaves memory alone while it is within the margin of the last floor', async () => {
    const p = fakeProcess(80 * MiB);
    const m = memoryRelease({ rss: p.rss, collect: p.collect, marginBytes: 64 * MiB });
    p.grow(80 * MiB + 64 * MiB - 1);
    m.idle();
    await vi.advanceTimersByTimeAsync(60_000);
    expect(p.collect).not.toHaveBeenCalled();
    p.grow(80 * MiB + 64 * MiB);
    m.idle();
    await vi.advanceTimersByTimeAsync(60_000);
    expect(p.collect).toHaveBeenCalledTimes(1);
  });

  it('memoryRelease measures the next growth from what stayed after a collection', async () => {
    const p = fakeProcess(80 * MiB);
    const m = memoryRelease({ rss: p.rss, collect: p.collect, marginBytes: 64 * MiB });
    p.grow(400 * MiB, 200 * MiB); // a collection that keeps 200 MiB (code loaded, caches)
    m.idle();
    await vi.advanceTimersByTimeAsync(2000);
    p.grow(250 * MiB, 200 * MiB);
    m.idle();
    await vi.advanceTimersByTimeAsync(2000);
    expect(p.collect).toHaveBeenCalledTimes(1);
    p.grow(270 * MiB, 200 * MiB);
    m.idle();
    await vi.advanceTimersByTimeAsync(2000);
    expect(p.collect).toHaveBeenCalledTimes(2);
  });

  it('memoryRelease does not collect when a file starts within the quiet time, or after it is closed', async () => {
    const p = fakeProcess(80 * MiB);
    const m = memoryRelease({ rss: p.rss, collect: p.collect, quietMs: 1000 });
    p.grow(500 * MiB);
    m.idle();
    await vi.advanceTimersByTimeAsync(500);
    m.busy();
    await vi.advanceTimersByTimeAsync(10_000);
    expect(p.collect).not.toHaveBeenCalled();
    m.idle();
    m.close();
    await vi.advanceTimersByTimeAsync(10_000);
    expect(p.collect).not.toHaveBeenCalled();
  });

  it('memoryRelease is told busy for each file and idle once when a batch is done', async () => {
    const events: string[] = [];
    const q = serialQueue(async (file) => ({ status: 'recorded-already', file, unit: 'FK-0101', condition: 'mid', runId: 1 }), () => undefined, {
      busy: () => events.push('busy'),
      idle: () => events.push('idle'),
    });
    for (const f of ['a.csv', 'b.csv', 'c.csv']) q.push(f);
    await vi.advanceTimersByTimeAsync(0);
    expect(events).toEqual(['busy', 'busy', 'busy', 'idle']);
  });

  it('fullCollection gives a collector in a process started without --expose-gc', () => {
    const gc = fullCollection();
    expect(typeof gc).toBe('function');
    expect(() => gc?.()).not.toThrow();
  });
});
