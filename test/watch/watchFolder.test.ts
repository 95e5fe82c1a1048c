/**
 * The settle rule of `watch` on a real folder: a file is reported once its size and modification
 * time have held still for the settle time (common practice for scope exports, no source). No
 * timing assertions: the waits only bound how long a test may take on a busy machine.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { watchFolder } from '../../src/cli/watchFolder.js';
import type { FolderWatch } from '../../src/cli/watchFolder.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { waitFor, writeSlowly } from './helpers/session.js';

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

describe('watchFolder', { timeout: 180_000 }, () => {
  it('watchFolder reports a file written in slow pieces once, at its full size', async () => {
    const { settled, errors } = await start({ settleMs: 1500 });
    const bytes = Buffer.alloc(40_000, 0x31);
    await writeSlowly(join(dir, 'FK-0101_mid.csv'), bytes, 8, 100);
    await waitFor(() => settled.length >= 1, 'the settled file');
    await new Promise((r) => setTimeout(r, 2000));
    expect(settled).toEqual([{ name: 'FK-0101_mid.csv', size: bytes.length }]);
    expect(errors).toEqual([]);
    expect(watch?.pending()).toBe(0);
  });

  it('watchFolder reports files already there when asked, and not when not', async () => {
    writeFileSync(join(dir, 'old.csv'), 'a');
    const first = await start({ includeExisting: true });
    await waitFor(() => first.settled.length >= 1, 'the existing file');
    await watch?.close();
    const second = await start({ includeExisting: false });
    writeFileSync(join(dir, 'new.csv'), 'b');
    await waitFor(() => second.settled.length >= 1, 'the new file');
    expect(first.settled.map((f) => f.name)).toEqual(['old.csv']);
    expect(second.settled.map((f) => f.name)).toEqual(['new.csv']);
  });

  it('watchFolder skips ignored names and files in subfolders, and forgets a file removed before it settled', async () => {
    const { settled } = await start({ settleMs: 1500, ignore: (name) => name.endsWith('.png') });
    mkdirSync(join(dir, 'benchproof-data'));
    writeFileSync(join(dir, 'benchproof-data', 'inside.csv'), 'x');
    writeFileSync(join(dir, 'screen.png'), 'x');
    writeFileSync(join(dir, 'gone.csv'), 'x');
    rmSync(join(dir, 'gone.csv'));
    writeFileSync(join(dir, 'kept.csv'), 'x');
    await waitFor(() => settled.length >= 1, 'the kept file');
    await new Promise((r) => setTimeout(r, 2000));
    expect(settled.map((f) => f.name)).toEqual(['kept.csv']);
  });

});
