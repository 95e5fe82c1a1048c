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
    expect(r.stderr).toContain('(Did you mean measure?)');
  });

  it('exits 2 on an unknown flag and names it', async () => {
    const r = await runCli(['measure', 'x.csv', '--frobnicate']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("unknown option '--frobnicate'");
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
