/**
 * `benchproof serve` as a user starts it, and a spec with problems: the spec page lists them as
 * `spec validate` prints them and drops are refused with the same message. Project rule (no source).
 */
import { spawn } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';
import { filesForm, startTestServer } from './serverHarness.js';

const dirs: string[] = [];
const fresh = (): string => {
  const d = mkdtempSync(join(tmpdir(), 'benchproof-serve-cmd-'));
  dirs.push(d);
  return d;
};
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

describe('benchproof serve', () => {
  it('prints the address on loopback, answers there, and stops cleanly on Ctrl-C (SIGINT)', async () => {
    const data = fresh();
    const child = spawn(process.execPath, ['bin/benchproof.js', 'serve', '--spec', 'samples/fh210-spec.yaml', '--data', data], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (b: Buffer) => (stderr += b.toString()));
    const exited = new Promise<number | null>((done) => child.on('exit', (code) => done(code)));
    const deadline = Date.now() + 30_000;
    while (!/http:\/\/127\.0\.0\.1:\d+\//.test(stderr) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    const url = /http:\/\/127\.0\.0\.1:\d+\//.exec(stderr)?.[0];
    expect(url, stderr).toBeDefined();
    expect(stderr).not.toContain('token');
    const board = (await (await fetch(`${url}api/board`)).json()) as { spec: { name: string } };
    expect(board.spec.name).toBe('FH-210 Kestrel VCO');
    child.kill('SIGINT');
    expect(await exited).toBe(0);
    expect(stderr).toContain('the bench page has stopped');
  });

  it('refuses --watch on a folder that does not exist before it starts the page (exit 2)', async () => {
    const data = fresh();
    const r = await runCli(['serve', '--spec', 'samples/fh210-spec.yaml', '--data', data, '--watch', join(data, 'no-such-stick')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('no such folder');
    expect(r.stderr).toContain('expected: the folder the scope or copy tool saves captures into');
    expect(r.stderr).not.toContain('bench page is at');
  });

  it('stops and exits 2, saying so, when the watched folder is removed while it serves', async () => {
    const data = fresh();
    const stick = join(fresh(), 'stick');
    mkdirSync(stick);
    const child = spawn(process.execPath, ['bin/benchproof.js', 'serve', '--spec', 'samples/fh210-spec.yaml', '--data', data, '--watch', stick], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (b: Buffer) => (stderr += b.toString()));
    const exited = new Promise<number | null>((done) => child.on('exit', (code) => done(code)));
    const deadline = Date.now() + 30_000;
    while (!/watching .*stick/.test(stderr) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    expect(stderr).toMatch(/bench page is at http:\/\/127\.0\.0\.1:\d+\//);
    rmSync(stick, { recursive: true });
    const code = await Promise.race([exited, new Promise((r) => setTimeout(() => r('still running'), 20_000))]);
    if (code === 'still running') child.kill('SIGKILL');
    expect(code, stderr).toBe(2);
    expect(stderr).toContain('the watched folder is gone');
    expect(stderr).toContain('fix: ');
    expect(stderr).toContain('the bench page has stopped');
  }, 60_000);

  it('refuses a port that is not a number with a usage error', async () => {
    const r = await runCli(['serve', '--port', 'eighty']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--port got "eighty"');
  });

  it('lists the problems of a spec as spec validate does, and refuses drops with them', async () => {
    const dir = fresh();
    const file = join(dir, 'broken-spec.yaml');
    writeFileSync(file, readFileSync('samples/fh210-spec.yaml', 'utf8').replace(/^format: 1/m, 'format: 1\nsurprise: yes'));
    const t = await startTestServer({ specFile: file });
    try {
      const cli = await runCli(['spec', 'validate', file]);
      expect(cli.code).toBe(2);
      const spec = (await (await fetch(`${t.base}/api/spec`)).json()) as { valid: boolean; error: { message: string } };
      expect(spec.valid).toBe(false);
      expect(spec.error.message).toBe(cli.stderr.trim());
      const drop = await fetch(`${t.base}/api/drop`, { method: 'POST', headers: { Origin: t.base }, body: filesForm([{ name: 'FK-0101_mid.csv', bytes: readFileSync('samples/captures/FK-0101_mid.csv') }]) });
      expect(drop.status).toBe(422);
      expect(((await drop.json()) as { error: { message: string } }).error.message).toBe(cli.stderr.trim());
    } finally {
      await t.stop();
    }
  });
});
