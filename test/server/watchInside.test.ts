// serve --watch when its folder fails: the watch inside the server reports it as the BenchError
// `watch` itself would give, and tells the page before serve stops. Project rule (no source).
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createContext } from '../../src/cli/context.js';
import type { CliIo } from '../../src/cli/io.js';
import { startInsideWatch, watchFolderProblem } from '../../src/server/watchInside.js';
import type { EventHub } from '../../src/server/eventHub.js';
import { SPEC } from './serverHarness.js';

const dirs: string[] = [];
afterEach(() => dirs.splice(0).forEach((d) => rmSync(d, { recursive: true, force: true })));
const io: CliIo = { stdout: () => {}, stderr: () => {}, stdoutIsTTY: false, stderrIsTTY: false, env: {}, cwd: process.cwd() };

describe('the folder watch inside serve', () => {
  it('names a missing folder and a file given as the folder before anything starts', () => {
    const base = mkdtempSync(join(tmpdir(), 'benchproof-inside-'));
    dirs.push(base);
    const ctx = createContext(io);
    expect(watchFolderProblem(ctx, join(base, 'none'))?.code).toBe('watch.no-folder');
    expect(watchFolderProblem(ctx, SPEC)?.problem).toContain('a file, not a folder');
    expect(watchFolderProblem(ctx, base)).toBeUndefined();
  });

  it('resolves failed with the folder gone and tells the page, when the folder is removed', async () => {
    const base = mkdtempSync(join(tmpdir(), 'benchproof-inside-'));
    dirs.push(base);
    const stick = join(base, 'stick');
    mkdirSync(stick);
    const events: [string, unknown][] = [];
    const hub = { publish: (e: string, d: unknown) => void events.push([e, d]) } as unknown as EventHub;
    const watch = startInsideWatch(createContext(io), stick, SPEC, { data: join(base, 'data') }, hub, 200, 50);
    try {
      await new Promise((done) => setTimeout(done, 300));
      rmSync(stick, { recursive: true });
      const err = await Promise.race([watch.failed, new Promise<undefined>((done) => setTimeout(() => done(undefined), 15_000))]);
      expect(err?.code).toBe('watch.no-folder');
      expect(err?.problem).toContain('gone');
      await new Promise((done) => setImmediate(done));
      expect(events).toContainEqual(['watch', expect.objectContaining({ status: 'stopped', file: stick, error: expect.objectContaining({ code: 'watch.no-folder' }) })]);
    } finally {
      await watch.stop();
    }
  });
});
