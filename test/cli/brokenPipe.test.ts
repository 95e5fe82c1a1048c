/**
 * `benchproof … | head` closes the pipe before the output ends: the command must finish quietly with
 * its own exit status, not die on an unhandled EPIPE with a stack trace (common practice for Unix
 * filters, no source). Runs the built command line (npm ci builds it).
 */
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';

const built = existsSync('dist/cli/main.js');

describe.runIf(built)('a closed output pipe', () => {
  it('measure stops writing, prints no stack trace and exits 0 when its reader goes away after the first line', async () => {
    const files = readdirSync('samples/captures').map((f) => `samples/captures/${f}`);
    const child = spawn(process.execPath, ['bin/benchproof.js', 'measure', ...files], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => void (stderr += d.toString()));
    child.stdout.once('data', () => child.stdout.destroy());
    const code = await new Promise<number | null>((done) => child.on('close', done));
    expect(stderr).not.toMatch(/EPIPE|at .*\.js:\d+/);
    expect(code).toBe(0);
  }, 60_000);
});
