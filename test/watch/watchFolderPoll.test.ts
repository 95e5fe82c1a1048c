/**
 * `watch --poll` on a real folder (for network shares that send no change notices), end to end with
 * chokidar's polling, the real file system and real timers: the one folder-watch test that runs on
 * the clock (the settle and listing rules are tested on fake timers in watchFolder.test.ts and
 * watchFolderRace.test.ts). No timing assertions: the waits only bound how long it may take.
 */
import { describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { useFolderWatch } from './helpers/folderWatch.js';
import { waitFor } from './helpers/session.js';

const folder = useFolderWatch();

describe('watchFolder polling', { timeout: 180_000 }, () => {
  it('watchFolder sees a landing file when it polls, and leaves out ignored names and files in subfolders', async () => {
    const { settled, errors } = await folder.start({ poll: true, settleMs: 200, reconcileMs: 300, ignore: (name) => name.endsWith('.png') });
    mkdirSync(join(folder.dir(), 'benchproof-data'));
    writeFileSync(join(folder.dir(), 'benchproof-data', 'inside.csv'), 'x');
    writeFileSync(join(folder.dir(), 'screen.png'), 'x');
    writeFileSync(join(folder.dir(), 'FK-0102_low.csv'), 'polled');
    await waitFor(() => settled.length >= 1, 'the polled file');
    // Two more listings of the folder: nothing else turns up.
    await new Promise((r) => setTimeout(r, 700));
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 6 }]);
    expect(errors).toEqual([]);
  });
});
