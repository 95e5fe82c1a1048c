/**
 * A real `watch` session run in-process on a temporary folder, with captured stdout/stderr and an
 * AbortController in place of Ctrl-C. Waits poll for what was printed, with generous time limits
 * (the test machine is shared), and never assert on timing.
 */
import { copyFileSync, mkdirSync } from 'node:fs';
import { open } from 'node:fs/promises';
import { join } from 'node:path';
import { createContext } from '../../../src/cli/context.js';
import type { CliIo } from '../../../src/cli/io.js';
import { createStyle } from '../../../src/report/index.js';
import { runWatchSession } from '../../../src/cli/watchSession.js';
import type { WatchSettings } from '../../../src/cli/watchSession.js';
import type { WatchTally } from '../../../src/cli/watchLines.js';

export const SPEC = 'samples/fh210-spec.yaml';
export const SAMPLES = 'samples/captures';

export interface Session {
  out(): string;
  err(): string;
  /** Lines printed on stdout so far. */
  lines(): string[];
  /** Resolves once the watcher is ready (its start line is out). */
  ready: Promise<void>;
  /** Ask it to stop, as Ctrl-C would, and wait for the summary. */
  stop(): Promise<WatchTally>;
}

export function startSession(root: string, overrides: Partial<WatchSettings> = {}): Session {
  let out = '';
  let err = '';
  const io: CliIo = {
    stdout: (s) => void (out += s),
    stderr: (s) => void (err += s),
    stdoutIsTTY: false,
    stderrIsTTY: false,
    env: { BENCHPROOF_OPERATOR: 'T. Ashgrove' },
    cwd: process.cwd(),
  };
  const controller = new AbortController();
  const settings: WatchSettings = {
    dir: join(root, 'drop'),
    specFile: SPEC,
    overrides: {},
    flags: { data: join(root, 'data') },
    settleMs: 200,
    newOnly: false,
    json: false,
    timing: {},
    style: createStyle(false),
    ...overrides,
  };
  const finished = runWatchSession(createContext(io), settings, controller.signal);
  finished.catch(() => undefined);
  return {
    out: () => out,
    err: () => err,
    lines: () => out.split('\n').filter(Boolean),
    ready: waitFor(() => err.includes('watching') || err.includes('"event":"watching"'), 'the start line', () => err),
    stop: async () => {
      controller.abort();
      return finished;
    },
  };
}

/** Poll until `cond` holds; fail after `ms` with what was printed. */
export async function waitFor(cond: () => boolean, what: string, printed: () => string = () => '', ms = 90_000): Promise<void> {
  const until = Date.now() + ms;
  while (!cond()) {
    if (Date.now() > until) throw new Error(`gave up waiting for ${what}; printed so far:\n${printed()}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

export function makeDrop(root: string): string {
  const drop = join(root, 'drop');
  mkdirSync(drop, { recursive: true });
  return drop;
}

export function copySample(name: string, dir: string, as = name): string {
  const to = join(dir, as);
  copyFileSync(join(SAMPLES, name), to);
  return to;
}

/** Write `bytes` in `pieces` appends, `gapMs` apart, the way a slow scope export lands. */
export async function writeSlowly(path: string, bytes: Buffer, pieces: number, gapMs: number): Promise<void> {
  const handle = await open(path, 'w');
  try {
    const step = Math.ceil(bytes.length / pieces);
    for (let at = 0; at < bytes.length; at += step) {
      await handle.write(bytes.subarray(at, Math.min(at + step, bytes.length)));
      await handle.sync();
      await new Promise((r) => setTimeout(r, gapMs));
    }
  } finally {
    await handle.close();
  }
}
