/**
 * Hostile text from outside (issue 22): escape sequences in file names never reach the terminal raw,
 * blank serials and device specs are refused with exit 2, and Markdown and CSV reports keep their
 * structure whatever an operator name, a path or a spec string holds. Sources: ECMA-48 (C0/C1 control
 * functions, SGR §8.3.117), GitHub Flavored Markdown tables §4.10, RFC 4180 §2 and the OWASP "CSV
 * Injection" guidance; otherwise project rule (no source).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { terminalSafe } from '../../src/cli/terminalText.js';
import { csvText, mdText } from '../../src/report/escapeText.js';

const SPEC = resolve('samples/fh210-spec.yaml');
const sample = (name: string): string => resolve('samples/captures', name);
let root: string;
beforeAll(() => {
  root = makeTempDir();
});
afterAll(() => removeTempDir(root));

// eslint-disable-next-line no-control-regex -- finding control characters is the point
const RAW_CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/;

describe('terminal output', () => {
  it('terminalSafe shows ESC, BEL and CR as escapes and keeps line feeds and tabs', () => {
    expect(terminalSafe('FK-07\x1b]0;x\x07\x1b[2J\r_low.csv\tok\n', false)).toBe('FK-07\\x1b]0;x\\x07\\x1b[2J\\x0d_low.csv\tok\n');
    expect(terminalSafe('a\u202eb\u0085', false)).toBe('a\\u202eb\\x85');
    expect(terminalSafe('a,b\r\nc,d\r\n', false)).toBe('a,b\r\nc,d\r\n');
  });

  it('terminalSafe keeps colour sequences only where colour may be shown', () => {
    expect(terminalSafe('\x1b[31mFAIL\x1b[39m', true)).toBe('\x1b[31mFAIL\x1b[39m');
    expect(terminalSafe('\x1b[31mFAIL\x1b[39m', false)).toBe('\\x1b[31mFAIL\\x1b[39m');
    expect(terminalSafe('\x1b[2J', true)).toBe('\\x1b[2J');
  });

  it('check never writes the escape sequences of a hostile file name raw, also with NO_COLOR', async () => {
    const dir = join(root, 'esc');
    mkdirSync(dir);
    const name = 'FK-07\x1b]0;owned\x07\x1b[2J_low.csv';
    copyFileSync(sample('FK-0101_low.csv'), join(dir, name));
    for (const argv of [['check', join(dir, name), '--spec', SPEC, '--no-store'], ['measure', join(dir, name)], ['check', join(dir, name), '--spec', SPEC, '--unit', 'FK-0107', '--condition', 'low', '--no-store']]) {
      const r = await runCli(argv, { env: { NO_COLOR: '1' } });
      expect(r.code, argv[0]).not.toBe(3);
      expect(r.stdout + r.stderr).not.toMatch(RAW_CONTROL);
    }
  });
});

describe('serials and specs that would have been internal errors', () => {
  it.each(['', '   '])('refuses --unit %j with exit 2', async (unit) => {
    const r = await runCli(['check', sample('FK-0101_mid.csv'), '--spec', SPEC, '--unit', unit, '--condition', 'mid']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('blank serial');
  });

  it('refuses a capture whose serial part is blank (" _mid.csv") as a name that misses the pattern', async () => {
    const file = join(root, ' _mid.csv');
    copyFileSync(sample('FK-0101_mid.csv'), file);
    const r = await runCli(['check', file, '--spec', SPEC]);
    expect(r.code).toBe(2);
    expect(r.stderr).not.toContain('internal error');
  });

  it('refuses a device as the spec at once, for check and spec validate', async () => {
    const check = await runCli(['check', sample('FK-0101_mid.csv'), '--spec', '/dev/zero', '--no-store']);
    expect(check.code).toBe(2);
    expect(check.stderr).toContain('not a regular file');
    const validate = await runCli(['spec', 'validate', '/dev/urandom']);
    expect(validate.code).toBe(2);
    expect(validate.stderr).toContain('not a regular file');
  });

  it('refuses a spec larger than 1 MiB before parsing it', async () => {
    const big = join(root, 'big-spec.yaml');
    writeFileSync(big, `name: big\ndescription: "${'x'.repeat(1 << 20)}"\n`);
    const r = await runCli(['spec', 'validate', big]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('larger than 1 MiB');
  });
});

describe('Markdown and CSV escaping', () => {
  it('mdText keeps a table cell one cell whatever it holds, and lets no raw HTML form', () => {
    const cell = mdText('R. Okafor | PASS\rFK-0999\n<img src=x onerror=alert(1)>`x`\u2028');
    expect(cell).not.toMatch(/(^|[^\\])\|/);
    expect(cell).not.toMatch(/[\r\n\u2028]/);
    expect(cell).not.toMatch(/(^|[^\\])</);
    expect(cell).not.toMatch(/(^|[^\\])`/);
  });

  it('records stored under a hostile operator name and data folder render with every table row intact', async () => {
    const data = join(root, 'data <img src=x onerror=alert(1)> `x` |');
    const operator = 'A | FAIL\rB\n<b>x</b>';
    const files = ['FK-0101_low.csv', 'FK-0101_mid.csv', 'FK-0101_high.csv'].map(sample);
    const stored = await runCli(['check', ...files, '--spec', SPEC, '--data', data, '--operator', operator]);
    expect(stored.code).toBe(0);
    const md = await runCli(['record', 'FK-0101', '--data', data]);
    expect(md.code).toBe(0);
    const lines = md.stdout.split('\n');
    const from = lines.indexOf('## History of runs');
    const history = lines.slice(from + 2).filter((l, i, all) => all.slice(0, i + 1).every((x) => x.startsWith('|')));
    const cells = (l: string): number => l.replace(/\\\\/g, '').replace(/\\\|/g, '').split('|').length;
    expect(history.length).toBe(3);
    expect(history.map(cells)).toEqual([10, 10, 10]);
    expect(md.stdout).not.toMatch(/(^|[^\\])<(img|b)/);
    expect(md.stdout).not.toContain('\r');
  });

  it('csvText neutralises formula prefixes also after leading blanks', () => {
    expect(csvText(' =1+1')).toBe("' =1+1");
    expect(csvText('\t=1+1')).toBe("'\t=1+1");
    expect(csvText('=SUM(A1)')).toBe("'=SUM(A1)");
    expect(csvText('-0.5 V')).toBe("'-0.5 V");
    expect(csvText('FK-0101')).toBe('FK-0101');
    expect(csvText('a,"b"')).toBe('"a,""b"""');
  });
});
