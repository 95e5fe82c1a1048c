/**
 * How the executable starts (issue 21): bin/benchproof.js takes the CommonJS bundle with V8 code
 * caches beside its chunks (bin/bundleLoader.js), or dist/cli/main.js when the bundle is older, and
 * the command line sets up only the command a run names. The loader tests start the real bin files
 * as separate processes (the process start is what is tested) in a temporary copy of the layout,
 * with small hand-written chunks in place of the built bundle, so they do not depend on `npm run
 * build`. Expected behaviour is the loader's contract (common practice, no source): a cache is
 * used only with the very chunk file it was made from, and never changes what a run does.
 */
import { describe, it, expect } from 'vitest';
import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readFileSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { Command } from 'commander';
import { tempFolder } from '../helpers/tempFolders.js';
import { COMMANDS } from '../../src/cli/commands/index.js';
import { createContext } from '../../src/cli/context.js';
import { buildProgram } from '../../src/cli/main.js';

const BIN = resolve('bin');

/** A checkout-like folder with the real bin files and nothing built yet. */
function layout(): string {
  const root = tempFolder('benchproof-startup-');
  mkdirSync(join(root, 'bin'));
  for (const f of ['benchproof.js', 'bundleLoader.js', 'package.json']) copyFileSync(join(BIN, f), join(root, 'bin', f));
  writeFileSync(join(root, 'package.json'), '{ "type": "module" }\n');
  return root;
}

/** A bundle whose entry prints a word from a second chunk and its arguments, and exits with the code its first argument names (0 otherwise). */
function writeBundle(root: string, word: string, at: Date): string {
  const dir = join(root, 'dist', 'bundle');
  mkdirSync(dir, { recursive: true });
  const entry = join(dir, 'main.cjs');
  writeFileSync(join(dir, 'word.cjs'), `exports.word = ${JSON.stringify(word)};\n`);
  writeFileSync(
    entry,
    `const { word } = require('./word.cjs');\nexports.run = async (argv) => { process.stdout.write(word + ' ' + argv.join(' ') + '\\n'); return /^\\d+$/.test(argv[0] ?? '') ? Number(argv[0]) : 0; };\n`,
  );
  for (const f of ['word.cjs', 'main.cjs']) utimesSync(join(dir, f), at, at);
  return entry;
}

function start(root: string, ...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(root, 'bin', 'benchproof.js'), ...args], { encoding: 'utf8', timeout: 30_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

// Whole seconds, so that a file's time reads back exactly (a millisecond time can come back as x.999).
const secondsAgo = (s: number): Date => new Date((Math.floor(Date.now() / 1000) - s) * 1000);
const HOUR_AGO = secondsAgo(3_600);
const LONG_AGO = secondsAgo(86_400);

describe('bin/benchproof.js with the bundle and its code cache', () => {
  it('runs the bundle, writes a missing cache on exit, and then uses it without rewriting it', () => {
    const root = layout();
    const entry = writeBundle(root, 'kestrel', HOUR_AGO);
    const first = start(root, '0', 'x');
    expect(first).toEqual({ code: 0, stdout: 'kestrel 0 x\n', stderr: '' });
    const cache = `${entry}.v8cache`;
    expect(readFileSync(cache).subarray(0, 22).toString()).toBe('benchproof code cache ');
    // A cache that V8 accepts is left as it is: its time stays where the test put it.
    utimesSync(cache, LONG_AGO, LONG_AGO);
    const second = start(root, '0', 'y');
    expect(second).toEqual({ code: 0, stdout: 'kestrel 0 y\n', stderr: '' });
    expect(statSync(cache).mtimeMs).toBe(LONG_AGO.getTime());
  });

  it('never runs the cache of a rebuilt chunk of the same length: the new code runs and the cache is replaced', () => {
    const root = layout();
    writeBundle(root, 'kestrel', LONG_AGO);
    expect(start(root).stdout).toBe('kestrel \n');
    const wordCache = join(root, 'dist', 'bundle', 'word.cjs.v8cache');
    const before = readFileSync(wordCache);
    // Same length, other content, a later time: what a rebuild leaves behind.
    writeBundle(root, 'swallow', HOUR_AGO);
    expect(start(root).stdout).toBe('swallow \n');
    expect(readFileSync(wordCache).equals(before)).toBe(false);
    expect(start(root).stdout).toBe('swallow \n');
  });

  it('ignores a damaged cache file and replaces it', () => {
    const root = layout();
    const entry = writeBundle(root, 'kestrel', HOUR_AGO);
    writeFileSync(`${entry}.v8cache`, 'not a cache at all');
    expect(start(root, '0')).toEqual({ code: 0, stdout: 'kestrel 0\n', stderr: '' });
    expect(readFileSync(`${entry}.v8cache`).subarray(0, 22).toString()).toBe('benchproof code cache ');
  });

  it('ends with the exit code the command line returns', () => {
    const root = layout();
    writeBundle(root, 'kestrel', HOUR_AGO);
    expect(start(root, '2').code).toBe(2);
    expect(start(root, '4').code).toBe(4);
  });

  it('uses dist/cli/main.js when the bundle is older than it, and the bundle otherwise', () => {
    const root = layout();
    writeBundle(root, 'bundle', HOUR_AGO);
    const modules = join(root, 'dist', 'cli', 'main.js');
    mkdirSync(join(root, 'dist', 'cli'), { recursive: true });
    writeFileSync(modules, `export async function run(argv) { process.stdout.write('modules ' + argv.join(' ') + '\\n'); return 0; }\n`);
    const now = new Date();
    utimesSync(modules, now, now);
    expect(start(root, 'a')).toEqual({ code: 0, stdout: 'modules a\n', stderr: '' });
    utimesSync(modules, LONG_AGO, LONG_AGO);
    expect(start(root, 'a')).toEqual({ code: 0, stdout: 'bundle a\n', stderr: '' });
  });

  it('says how to build it, exit 3, when nothing is built', () => {
    const root = layout();
    const r = start(root, 'measure', 'x.csv');
    expect(r.code).toBe(3);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('run npm run build there');
    expect(existsSync(join(root, 'dist'))).toBe(false);
  });
});

describe('command set-up', () => {
  const io = { stdout: () => undefined, stderr: () => undefined, stdoutIsTTY: false, stderrIsTTY: false, env: {}, cwd: process.cwd() };

  it('lists each command under the name its set-up gives it', () => {
    for (const entry of COMMANDS) {
      const cmd = entry.register(new Command('benchproof'), createContext(io));
      expect(cmd.name()).toBe(entry.name);
    }
  });

  it('sets up only the command a run starts with, and every command for help or anything else', () => {
    const ctx = createContext(io);
    const all = COMMANDS.map((c) => c.name);
    expect(buildProgram(ctx, ['measure', 'x.csv', '--json']).commands.map((c) => c.name())).toEqual(['measure']);
    expect(buildProgram(ctx, ['spec', 'validate', 'x.yaml']).commands.map((c) => c.name())).toEqual(['spec']);
    expect(buildProgram(ctx, ['--help']).commands.map((c) => c.name())).toEqual(all);
    expect(buildProgram(ctx, ['--no-color', 'measure', 'x.csv']).commands.map((c) => c.name())).toEqual(all);
    expect(buildProgram(ctx, ['mesure']).commands.map((c) => c.name())).toEqual(all);
  });
});
