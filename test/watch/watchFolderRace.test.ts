/**
 * The watch cannot miss a file, whatever its event source does. The event source is replaced by a
 * controlled one, so the race that used to lose a capture (a file written between the source's
 * first listing and its baseline, which no notice ever announces) happens on every run instead of
 * now and then on a loaded machine. Rule: each version of a file is reported exactly once (common
 * practice for drop-folder watchers, no source). No timing assertions: waits only bound the test.
 */
import { describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { FolderEventSource, FolderEvents } from '../../src/cli/watchFolder.js';
import { useFolderWatch } from './helpers/folderWatch.js';
import { waitFor } from './helpers/session.js';

const folder = useFolderWatch();
const FAST = { settleMs: 40, reconcileMs: 60 } as const;
const pause = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

/** A source that runs `atStart` when it is created, announces only what `announce` lists, and never anything else. */
function controlledSource(atStart: () => void, announce: readonly string[] = []): FolderEventSource {
  return (dir) => {
    const adds: ((path: string) => void)[] = [];
    atStart();
    const events: FolderEvents = {
      on: (event: string, listener: (arg: never) => void) => {
        if (event === 'add') adds.push(listener as (path: string) => void);
      },
      ready: pause(20).then(() => {
        for (const name of announce) for (const add of adds) add(join(dir, name));
      }),
      close: async () => undefined,
    };
    return events;
  };
}

describe('watchFolder reconciliation', { timeout: 60_000 }, () => {
  it('watchFolder reports a file written while the event source starts, which no notice announces', async () => {
    const write = (): void => writeFileSync(join(folder.dir(), 'FK-0102_low.csv'), 'landed at start');
    const { settled, errors } = await folder.start({ ...FAST, includeExisting: false, source: controlledSource(write) });
    await waitFor(() => settled.length >= 1, 'the file the source never announced');
    await pause(5 * FAST.reconcileMs);
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 15 }]);
    expect(errors).toEqual([]);
  });

  it('watchFolder reports a file once when both a notice and its own listing find it', async () => {
    const write = (): void => writeFileSync(join(folder.dir(), 'FK-0101_mid.csv'), 'twice found');
    const { settled } = await folder.start({ ...FAST, source: controlledSource(write, ['FK-0101_mid.csv']) });
    await waitFor(() => settled.length >= 1, 'the file');
    await pause(5 * FAST.reconcileMs);
    expect(settled.map((f) => f.name)).toEqual(['FK-0101_mid.csv']);
  });

  it('watchFolder without existing files skips what was there before it started and reports a later rewrite', async () => {
    writeFileSync(join(folder.dir(), 'old.csv'), 'old');
    const { settled } = await folder.start({ ...FAST, includeExisting: false, source: controlledSource(() => undefined) });
    await pause(5 * FAST.reconcileMs);
    expect(settled).toEqual([]);
    await pause(20); // a new modification time, even on file systems with coarse time stamps
    writeFileSync(join(folder.dir(), 'old.csv'), 'rewritten');
    await waitFor(() => settled.length >= 1, 'the rewritten file');
    expect(settled).toEqual([{ name: 'old.csv', size: 9 }]);
  });

  it('watchFolder reports a file removed and written again at the same size once more', async () => {
    const { settled } = await folder.start({ ...FAST, source: controlledSource(() => undefined) });
    writeFileSync(join(folder.dir(), 'FK-0103_high.csv'), 'abc');
    await waitFor(() => settled.length >= 1, 'the first copy');
    const { rmSync } = await import('node:fs');
    rmSync(join(folder.dir(), 'FK-0103_high.csv'));
    await pause(5 * FAST.reconcileMs);
    writeFileSync(join(folder.dir(), 'FK-0103_high.csv'), 'xyz');
    await waitFor(() => settled.length >= 2, 'the second copy');
    expect(settled.map((f) => f.name)).toEqual(['FK-0103_high.csv', 'FK-0103_high.csv']);
  });
});
