/**
 * `watch` and the drop folder's awkward entries (issue 22): a name that is not valid UTF-8 is
 * reported with its bytes shown, never skipped in silence; a symbolic link that loops is reported as
 * a file that cannot be read, and the session goes on. Project rule (no source).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { copyFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { copySample, makeDrop, SAMPLES, startSession, waitFor } from '../watch/helpers/session.js';

let root: string;
let drop: string;
beforeEach(() => {
  root = makeTempDir('benchproof-watch-names-');
  drop = makeDrop(root);
});
afterEach(() => removeTempDir(root));

describe('watch on a drop folder with names it cannot use', { timeout: 180_000 }, () => {
  it('reports a name that is not valid UTF-8 at the start, with its bytes escaped', async () => {
    const name = Buffer.concat([Buffer.from('FK-0101_'), Buffer.from([0xff, 0xfe]), Buffer.from('mid.csv')]);
    copyFileSync(join(SAMPLES, 'FK-0101_mid.csv'), Buffer.concat([Buffer.from(`${drop}/`), name]));
    const s = startSession(root);
    await s.ready;
    await s.stop();
    expect(s.err()).toContain('FK-0101_\\xff\\xfemid.csv');
    expect(s.err()).toContain('not valid UTF-8');
  });

  it('reports a link that loops as unreadable and still checks the next capture', async () => {
    symlinkSync('FK-0102_mid.csv', join(drop, 'FK-0102_mid.csv.tmp-loop'));
    symlinkSync('FK-0102_mid.csv.tmp-loop', join(drop, 'FK-0102_mid.csv'));
    writeFileSync(join(drop, 'notes.txt'), 'bench notes');
    const s = startSession(root);
    await s.ready;
    copySample('FK-0101_mid.csv', drop);
    await waitFor(() => s.lines().length >= 1, 'the line of FK-0101_mid.csv', s.err);
    await s.stop();
    expect(s.lines()[0]).toMatch(/^FK-0101_mid\.csv {2}FK-0101 {2}mid/);
    expect(s.err()).not.toContain('internal');
    expect(s.err()).toContain('FK-0102_mid.csv: the entry cannot be read (a symbolic link that loops)');
  });
});
