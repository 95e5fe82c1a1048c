/**
 * `watch --poll` on a real folder (for network shares that send no change notices). In a file of
 * its own: after other chokidar watchers in the same process had come and gone, the polled watcher
 * stopped seeing new files in this test run, so it gets a fresh process. No timing assertions.
 */
import { describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { useFolderWatch } from './helpers/folderWatch.js';
import { waitFor } from './helpers/session.js';

const folder = useFolderWatch();
const start = folder.start;

// Retried: on a loaded machine the polled watcher has missed a new file now and then (cause not found).
describe('watchFolder polling', { timeout: 180_000, retry: 2 }, () => {
  it('watchFolder also sees a landing file when it polls instead of waiting for change notices', async () => {
    const { settled } = await start({ poll: true });
    writeFileSync(join(folder.dir(), 'FK-0102_low.csv'), 'polled');
    await waitFor(() => settled.length >= 1, 'the polled file');
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 6 }]);
  });
});
