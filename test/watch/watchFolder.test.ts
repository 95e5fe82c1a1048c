/**
 * The settle rule of `watch` on a real folder: a file is reported once its size and modification
 * time have held still for the settle time (common practice for scope exports, no source). No
 * timing assertions: the waits only bound how long a test may take on a busy machine.
 */
import { describe, expect, it } from 'vitest';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { useFolderWatch } from './helpers/folderWatch.js';
import { waitFor, writeSlowly } from './helpers/session.js';

const folder = useFolderWatch();
const start = folder.start;

describe('watchFolder', { timeout: 180_000 }, () => {
  it('watchFolder reports a file written in slow pieces once, at its full size', async () => {
    const { settled, errors } = await start({ settleMs: 1500 });
    const bytes = Buffer.alloc(40_000, 0x31);
    await writeSlowly(join(folder.dir(), 'FK-0101_mid.csv'), bytes, 8, 100);
    await waitFor(() => settled.length >= 1, 'the settled file');
    await new Promise((r) => setTimeout(r, 2000));
    expect(settled).toEqual([{ name: 'FK-0101_mid.csv', size: bytes.length }]);
    expect(errors).toEqual([]);
    expect(folder.current()?.pending()).toBe(0);
  });

  it('watchFolder reports files already there when asked, and not when not', async () => {
    writeFileSync(join(folder.dir(), 'old.csv'), 'a');
    const first = await start({ includeExisting: true });
    await waitFor(() => first.settled.length >= 1, 'the existing file');
    await folder.close();
    const second = await start({ includeExisting: false });
    writeFileSync(join(folder.dir(), 'new.csv'), 'b');
    await waitFor(() => second.settled.length >= 1, 'the new file');
    expect(first.settled.map((f) => f.name)).toEqual(['old.csv']);
    expect(second.settled.map((f) => f.name)).toEqual(['new.csv']);
  });

  it('watchFolder skips ignored names and files in subfolders, and forgets a file removed before it settled', async () => {
    const { settled } = await start({ settleMs: 1500, ignore: (name) => name.endsWith('.png') });
    mkdirSync(join(folder.dir(), 'benchproof-data'));
    writeFileSync(join(folder.dir(), 'benchproof-data', 'inside.csv'), 'x');
    writeFileSync(join(folder.dir(), 'screen.png'), 'x');
    writeFileSync(join(folder.dir(), 'gone.csv'), 'x');
    rmSync(join(folder.dir(), 'gone.csv'));
    writeFileSync(join(folder.dir(), 'kept.csv'), 'x');
    await waitFor(() => settled.length >= 1, 'the kept file');
    await new Promise((r) => setTimeout(r, 2000));
    expect(settled.map((f) => f.name)).toEqual(['kept.csv']);
  });

});
