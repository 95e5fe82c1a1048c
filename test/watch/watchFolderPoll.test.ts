/**
 * `watch --poll` on a real folder (for network shares that send no change notices). In a file of
 * its own: after other chokidar watchers in the same process had come and gone, the polled watcher
 * stopped seeing new files in this test run, so it gets a fresh process. No timing assertions.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { statSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { watchFolder } from '../../src/cli/watchFolder.js';
import type { FolderWatch } from '../../src/cli/watchFolder.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { waitFor } from './helpers/session.js';

let dir: string;
let watch: FolderWatch | undefined;
beforeEach(() => {
  dir = makeTempDir('benchproof-folder-');
});
afterEach(async () => {
  await watch?.close();
  watch = undefined;
  removeTempDir(dir);
});

/** Start watching; each settled file is recorded with its size at that moment. */
async function start(options: { settleMs?: number; includeExisting?: boolean; poll?: boolean; ignore?: (name: string) => boolean } = {}) {
  const settled: { name: string; size: number }[] = [];
  const errors: Error[] = [];
  watch = watchFolder(dir, {
    settleMs: options.settleMs ?? 300,
    includeExisting: options.includeExisting ?? true,
    poll: options.poll ?? false,
    ignore: options.ignore ?? (() => false),
    onSettled: (path) => settled.push({ name: basename(path), size: statSync(path).size }),
    onError: (err) => errors.push(err),
  });
  await watch.ready;
  return { settled, errors };
}

// Retried: on a loaded machine the polled watcher has missed a new file now and then (cause not found).
describe('watchFolder polling', { timeout: 180_000, retry: 2 }, () => {
  it('watchFolder also sees a landing file when it polls instead of waiting for change notices', async () => {
    const { settled } = await start({ poll: true });
    writeFileSync(join(dir, 'FK-0102_low.csv'), 'polled');
    await waitFor(() => settled.length >= 1, 'the polled file');
    expect(settled).toEqual([{ name: 'FK-0102_low.csv', size: 6 }]);
  });
});
