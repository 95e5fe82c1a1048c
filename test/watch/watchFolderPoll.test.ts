/**
 * `watch --poll` on a real folder (for network shares that send no change notices), end to end
 * with chokidar's polling and real timers. No retries and no timing assertions: the watch's own
 * listing of the folder must find the file whatever the polling does.
 */
import { describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { useFolderWatch } from './helpers/folderWatch.js';
import { waitFor } from './helpers/session.js';

const folder = useFolderWatch();
const start = folder.start;

describe('watchFolder polling', { timeout: 180_000 }, () => {
  it('watchFolder also sees a landing file when it polls instead of waiting for change notices', async () => {
    const { settled } = await start({ poll: true });
    writeFileSync(join(folder.dir(), 'FK-0102_low.csv'), 'polled');
    await waitFor(() => settled.length >= 1, 'the polled file');
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 6 }]);
  });
});
