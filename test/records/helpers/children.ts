/** Spawning writer.ts as a real separate Node process (TypeScript through the cached transpiling hooks of test/helpers), and waiting on it. */
import { spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const here = (name: string): string => fileURLToPath(new URL(name, import.meta.url));

export function spawnWriter(dataDir: string, prefix: string, count: number, mode: 'loop' | 'hang', barrierDir = ''): ChildProcess {
  const args = [here('./writer.ts'), dataDir, prefix, String(count), mode, barrierDir];
  return spawn(process.execPath, ['--import', here('../../helpers/registerCachedTs.mjs'), ...args], {
    stdio: ['ignore', 'pipe', 'pipe'],
  });
}

export interface Exit {
  readonly code: number | null;
  readonly signal: NodeJS.Signals | null;
  readonly stdout: string;
  readonly stderr: string;
}

export function exited(child: ChildProcess): Promise<Exit> {
  let stdout = '';
  let stderr = '';
  child.stdout?.on('data', (d: Buffer) => (stdout += d.toString()));
  child.stderr?.on('data', (d: Buffer) => (stderr += d.toString()));
  return new Promise((resolve) => child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr })));
}

/** [first write began, last commit] of a `loop` writer, from its stdout. */
export function writeSpan(out: string): [number, number] {
  const rows = out.trim().split('\n').map((l) => l.split(' ').map(Number));
  return [Math.min(...rows.map((r) => r[2])), Math.max(...rows.map((r) => r[3]))];
}

/** Resolves once the child has printed `lines` lines matching `pattern` on stdout. */
export function printed(child: ChildProcess, pattern: RegExp, lines = 1): Promise<void> {
  let seen = 0;
  let buffer = '';
  return new Promise((resolve, reject) => {
    child.on('exit', () => reject(new Error(`child exited before printing ${pattern} ${lines} time(s)`)));
    child.stdout?.on('data', (d: Buffer) => {
      buffer += d.toString();
      const parts = buffer.split('\n');
      buffer = parts.pop() ?? '';
      seen += parts.filter((p) => pattern.test(p)).length;
      if (seen >= lines) resolve();
    });
  });
}
