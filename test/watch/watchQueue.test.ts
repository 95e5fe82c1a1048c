/**
 * The order in which `watch` handles settled files: strictly one at a time, in the order they
 * settled, each queued once however often it settles before its turn, and on stop only the file in
 * hand is finished (project rules, no source). Handlers here are promises the test resolves itself.
 */
import { describe, expect, it } from 'vitest';
import { serialQueue } from '../../src/cli/watchQueue.js';
import type { CaptureOutcome } from '../../src/cli/watchCapture.js';

interface Pending {
  readonly file: string;
  finish(): void;
}

function controlledHandler() {
  const started: Pending[] = [];
  let running = 0;
  let mostAtOnce = 0;
  const handle = (file: string): Promise<CaptureOutcome> =>
    new Promise((done) => {
      running += 1;
      mostAtOnce = Math.max(mostAtOnce, running);
      started.push({
        file,
        finish: () => {
          running -= 1;
          done({ status: 'recorded-already', file, unit: 'FK-0101', condition: 'mid', runId: 1 });
        },
      });
    });
  return { handle, started, mostAtOnce: () => mostAtOnce };
}

const tick = (): Promise<void> => new Promise((r) => setImmediate(r));

describe('serialQueue', () => {
  it('serialQueue handles files one at a time in the order they were pushed, queuing a waiting file once', async () => {
    const h = controlledHandler();
    const printed: string[] = [];
    const q = serialQueue(h.handle, (o) => printed.push(o.file));
    for (const f of ['a.csv', 'b.csv', 'c.csv', 'b.csv', 'c.csv']) q.push(f);
    expect(q.waiting()).toBe(2); // a.csv in hand; b.csv and c.csv wait, once each
    for (let i = 0; i < 4; i++) {
      await tick();
      h.started.at(-1)?.finish();
    }
    await tick();
    expect(h.started.map((p) => p.file)).toEqual(['a.csv', 'b.csv', 'c.csv']);
    expect(printed).toEqual(['a.csv', 'b.csv', 'c.csv']);
    expect(h.mostAtOnce()).toBe(1);
  });

  it('serialQueue queues a file again once its earlier turn has started (a new version landed)', async () => {
    const h = controlledHandler();
    const q = serialQueue(h.handle, () => undefined);
    q.push('a.csv');
    await tick();
    q.push('a.csv');
    expect(q.waiting()).toBe(1);
    h.started[0].finish();
    await tick();
    h.started[1]?.finish();
    await tick();
    expect(h.started.map((p) => p.file)).toEqual(['a.csv', 'a.csv']);
  });

  it('serialQueue on finish lets the file in hand end and starts no other', async () => {
    const h = controlledHandler();
    const printed: string[] = [];
    const q = serialQueue(h.handle, (o) => printed.push(o.file));
    q.push('a.csv');
    q.push('b.csv');
    await tick();
    const finished = q.finish();
    h.started[0].finish();
    await finished;
    q.push('c.csv');
    await tick();
    expect(printed).toEqual(['a.csv']);
    expect(h.started.map((p) => p.file)).toEqual(['a.csv']);
    // b.csv and c.csv are left for the next start.
    expect(q.waiting()).toBe(2);
  });

  it('serialQueue turns a handler that throws into an error line and goes on with the next file', async () => {
    const printed: CaptureOutcome[] = [];
    const q = serialQueue(async (file) => {
      if (file === 'bad.csv') throw new Error('disk gone');
      return { status: 'recorded-already', file, unit: 'FK-0101', condition: 'mid', runId: 1 };
    }, (o) => printed.push(o));
    q.push('bad.csv');
    q.push('good.csv');
    for (let i = 0; i < 5 && printed.length < 2; i++) await tick();
    expect(printed[0]).toMatchObject({ status: 'error', file: 'bad.csv', error: { message: 'disk gone' } });
    expect(printed[1]).toMatchObject({ status: 'recorded-already', file: 'good.csv' });
  });
});
