import { describe, it, expect } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';

describe('benchproof command line', () => {
  it('exits 0 and prints usage with examples when asked for help', async () => {
    const r = await runCli(['--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Usage: benchproof');
    expect(r.stdout).toContain('Examples:');
    expect(r.stderr).toBe('');
  });

  it('exits 2 and suggests the nearest command when the command is misspelt', async () => {
    const r = await runCli(['mesure', 'x.csv']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "-: unknown command 'mesure'
        expected: one of the commands that benchproof --help lists
        fix: did you mean measure? (benchproof --help lists every command and option)
      "
    `);
  });

  it('prints a parser error as one JSON object on stderr with --json, and nothing on stdout', async () => {
    const r = await runCli(['check', 'x.csv', '--json']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(JSON.parse(r.stderr)).toEqual({
      error: { code: 'usage.missing-option', file: '-', problem: "required option '--spec <file>' not specified", expected: 'every required option given', fix: 'write --spec <file>, with its value', exitCode: 2 },
    });
  });

  it('names the accepted values when an option gets one it does not accept', async () => {
    const r = await runCli(['record', 'FK-0101', '--format', 'docx']);
    expect(r.code).toBe(2);
    expect(r.stderr.split('\n')[1]).toMatch(/^ {2}expected: one of md, html, json\b/);
  });

  it('prints the help on stdout and exits 0 when run with no arguments', async () => {
    const r = await runCli([]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Usage: benchproof');
    expect(r.stderr).toBe('');
  });

  it('exits 2 on an unknown flag and names it', async () => {
    const r = await runCli(['measure', 'x.csv', '--frobnicate']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("-: unknown option '--frobnicate'");
    expect(r.stderr).toContain('fix: run the command with --help to see its options');
  });

  it('prints the version from package.json and exits 0', async () => {
    const r = await runCli(['--version']);
    expect(r.code).toBe(0);
    expect(r.stdout.trim()).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it('rejects a sample rate that is not a positive number with exit 2 and no stack trace', async () => {
    const r = await runCli(['measure', 'x.csv', '--sample-rate', 'fast']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "-: --sample-rate got "fast", which is not a positive number
        expected: a positive number in SI base units, e.g. --sample-rate 1e6
        fix: write --sample-rate with a plain number such as 2.5e-6 or 400000
      "
    `);
    expect(r.stderr).not.toMatch(/\bat .*\.ts:\d+/);
  });
});
