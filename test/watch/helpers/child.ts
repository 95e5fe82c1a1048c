/** `benchproof watch` as a real separate process (Node with TypeScript hooks that keep what they transpile, cachedTsHooks.mjs). */
import { spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { waitFor } from './session.js';

const here = (name: string): string => fileURLToPath(new URL(name, import.meta.url));

export interface WatchChild {
  readonly child: ChildProcess;
  out(): string;
  err(): string;
  /** Resolves with the exit code and signal once the process has ended. */
  readonly exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  /** Resolves once the start line is on stderr. */
  ready(): Promise<void>;
}

export function spawnWatch(args: readonly string[], env: Record<string, string> = {}): WatchChild {
  const child = spawn(process.execPath, ['--import', here('../../helpers/registerCachedTs.mjs'), here('./cliEntry.ts'), 'watch', ...args], {
    stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, BENCHPROOF_OPERATOR: 'T. Ashgrove', ...env },
  });
  let out = '';
  let err = '';
  child.stdout?.on('data', (d: Buffer) => void (out += d.toString()));
  child.stderr?.on('data', (d: Buffer) => void (err += d.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('close', (code, signal) => resolve({ code, signal })));
  let ended = false;
  void exited.then(() => (ended = true));
  return {
    child,
    out: () => out,
    err: () => err,
    exited,
    ready: () => waitFor(() => ended || /watching|"event":"watching"/.test(err), 'the watch start line', () => err, 120_000),
  };
}
