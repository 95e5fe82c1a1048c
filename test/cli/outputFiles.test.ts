/**
 * Every command that writes a file the user named follows the same rules (src/cli/outputFile.ts):
 * never through or over a symbolic link, never over a device or anything but a regular file, never
 * inside the data folder, never over one of its own inputs, and a temporary name planted beforehand
 * is never followed. The attack cases come from issue 22 (records destroyed by `--out`).
 * Project rule (no source): the store and the user's files are never modified by a report.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, lstatSync, mkdirSync, readFileSync, readdirSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { runCli } from '../helpers/cliHarness.js';
import { fillDemoStore } from '../records/helpers/fixtureStore.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

let root: string;
let data: string;
const inRoot = { cwd: '' };
const sha = (p: string): string => createHash('sha256').update(readFileSync(p)).digest('hex');

beforeAll(() => {
  root = makeTempDir();
  data = fillDemoStore(root);
  inRoot.cwd = root;
});
afterAll(() => removeTempDir(root));

describe('report files (--out)', () => {
  it('record --out refuses the store file itself and leaves it intact', async () => {
    const before = sha(join(data, 'records.db'));
    const r = await runCli(['record', 'FK-0101', '--data', data, '--out', join(data, 'records.db')], inRoot);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('inside the data folder');
    expect(r.stderr).not.toContain('internal error');
    expect(sha(join(data, 'records.db'))).toBe(before);
    const units = await runCli(['units', '--data', data, '--json'], inRoot);
    expect(units.code).toBe(0);
  });

  it('batch --out refuses an archived capture in the data folder', async () => {
    const archive = join(data, 'captures');
    const first = readdirSync(archive)[0];
    const file = join(archive, first, readdirSync(join(archive, first))[0]);
    const before = sha(file);
    const r = await runCli(['batch', '--data', data, '--format', 'csv', '--out', file], inRoot);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/output|data folder/);
    expect(sha(file)).toBe(before);
  });

  it('refuses to replace a device node and leaves it a device', async () => {
    const r = await runCli(['record', 'FK-0101', '--data', data, '--out', '/dev/null'], inRoot);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('not a regular file');
    expect(lstatSync('/dev/null').isCharacterDevice()).toBe(true);
  });

  it('refuses a symbolic link at the output path, for record and spec init alike, and leaves its target', async () => {
    const victim = join(root, 'victim.txt');
    writeFileSync(victim, 'keep me');
    const link = join(root, 'report-link.md');
    symlinkSync(victim, link);
    const rec = await runCli(['record', 'FK-0101', '--data', data, '--out', link], inRoot);
    expect(rec.code).toBe(2);
    expect(rec.stderr).toContain('symbolic link');
    const init = await runCli(['spec', 'init', '--from', join(process.cwd(), 'samples/captures/FK-0101_mid.csv'), '-o', link, '--force'], inRoot);
    expect(init.code).toBe(2);
    expect(init.stderr).toContain('symbolic link');
    expect(readFileSync(victim, 'utf8')).toBe('keep me');
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
  });

  it('never follows a link planted at a temporary name beside the report', async () => {
    const victim = join(root, 'victim2.txt');
    writeFileSync(victim, 'keep me too');
    const out = join(root, 'FK-0101.md');
    // The temporary names of the old writer, and any the new one might choose, with the process id.
    symlinkSync(victim, `${out}.${process.pid}.part`);
    const r = await runCli(['record', 'FK-0101', '--data', data, '--out', out], inRoot);
    expect(r.code).toBe(0);
    expect(readFileSync(victim, 'utf8')).toBe('keep me too');
    expect(readFileSync(out, 'utf8')).toMatch(/^# Test record — unit FK-0101/);
    expect(readdirSync(root).filter((n) => n.endsWith('.part') && !n.startsWith('FK-0101.md.'))).toEqual([]);
  });

  it('replaces an existing regular report file whole', async () => {
    const out = join(root, 'again.md');
    writeFileSync(out, 'old');
    const r = await runCli(['record', 'FK-0102', '--data', data, '--out', out], inRoot);
    expect(r.code).toBe(0);
    expect(readFileSync(out, 'utf8')).toMatch(/unit FK-0102/);
  });

  it('spec init -o refuses to overwrite one of its --from captures even with --force', async () => {
    const folder = join(root, 'golden');
    mkdirSync(folder);
    const capture = join(folder, 'FK-0101_mid.csv');
    writeFileSync(capture, readFileSync('samples/captures/FK-0101_mid.csv'));
    const before = sha(capture);
    const r = await runCli(['spec', 'init', '--from', capture, '-o', capture, '--force'], inRoot);
    expect(r.code).toBe(2);
    expect(sha(capture)).toBe(before);
  });

  it('refuses an output folder that does not exist with a usage error, not an internal one', async () => {
    const r = await runCli(['batch', '--data', data, '--out', join(root, 'no-such-folder', 'b.md')], inRoot);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--out: the folder of the file cannot be used: there is no file or folder at this path');
    expect(existsSync(join(root, 'no-such-folder'))).toBe(false);
  });
});
