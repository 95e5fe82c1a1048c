/**
 * The run's PostgreSQL folder (vitest globalSetup, see vitest.config.ts): one folder per test run
 * under the system's temporary folder, handed to the workers with `provide`. In it pgCluster.ts
 * makes, once per run and only when a test asks for a cluster, a template data directory with
 * `initdb`, and each test file's cluster as a copy of it (initdb was most of a cluster's start-up).
 *
 * At the end of the run every server still running in the folder is stopped and the folder removed.
 * A run that was killed before its end leaves its folder behind: the next run stops and removes it
 * once the process that made it is gone (its pid is in the folder's `owner` file).
 */
import { execFileSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';

export const RUN_PREFIX = 'benchproof-pgrun-';
const PG_BIN = process.env.BENCHPROOF_PG_BIN ?? '/usr/lib/postgresql/15/bin';
const asRoot = typeof process.getuid === 'function' && process.getuid() === 0;

declare module 'vitest' {
  export interface ProvidedContext {
    /** The run's folder for PostgreSQL clusters (pgRunFolder.ts), or '' when none could be made. */
    benchproofPgRun: string;
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Stop every server whose data directory lies one or two levels below `dir` (a cluster, the template), then remove `dir`. */
export function clearRunFolder(dir: string): void {
  const dataDirs: string[] = [];
  for (const entry of existsSync(dir) ? readdirSync(dir, { withFileTypes: true }) : []) {
    if (entry.isDirectory() && existsSync(join(dir, entry.name, 'data', 'postmaster.pid'))) dataDirs.push(join(dir, entry.name, 'data'));
  }
  for (const data of dataDirs) {
    const file = join(PG_BIN, 'pg_ctl');
    const [cmd, argv] = asRoot ? ['runuser', ['-u', 'postgres', '--', file, '-D', data, '-m', 'immediate', '-w', 'stop']] : [file, ['-D', data, '-m', 'immediate', '-w', 'stop']];
    try {
      execFileSync(cmd, argv, { stdio: 'ignore', timeout: 60_000 });
    } catch {
      // already stopped (a stale pid file): nothing to stop
    }
  }
  rmSync(dir, { recursive: true, force: true });
}

/** Folders of earlier runs whose process is gone (a run killed before its end). */
function clearStaleRuns(): void {
  for (const name of readdirSync(tmpdir())) {
    if (!name.startsWith(RUN_PREFIX)) continue;
    const dir = join(tmpdir(), name);
    let owner = NaN;
    try {
      owner = Number(readFileSync(join(dir, 'owner'), 'utf8'));
    } catch {
      // No owner file: a run killed at its first step, or one starting this very moment (left a minute).
      if (Date.now() - (statSync(dir, { throwIfNoEntry: false })?.mtimeMs ?? 0) < 60_000) continue;
    }
    if (!Number.isInteger(owner) || !alive(owner)) clearRunFolder(dir);
  }
}

export default function setup(project: TestProject): () => void {
  clearStaleRuns();
  const dir = mkdtempSync(join(tmpdir(), RUN_PREFIX));
  writeFileSync(join(dir, 'owner'), String(process.pid));
  // The server runs as the postgres user when the tests run as root: it must be able to pass through.
  chmodSync(dir, 0o711);
  project.provide('benchproofPgRun', dir);
  let cleared = false;
  const clear = (): void => {
    if (cleared) return;
    cleared = true;
    clearRunFolder(dir);
  };
  // Ctrl-C or a kill of the run: the servers must not outlive it.
  process.once('exit', clear);
  return clear;
}
