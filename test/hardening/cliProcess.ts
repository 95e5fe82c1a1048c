/**
 * The built command line (`node bin/benchproof.js`, after `npm run build`) as separate processes, for
 * the tests that kill, race or starve it; plus the bench folder those tests work in: copies of the
 * demo captures and spec in a fresh folder under the system temp folder, never the checkout.
 */
import { spawn } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

export const CLI = resolve('bin/benchproof.js');
const SAMPLES = resolve('samples');

/** Built output present: the process tests run the compiled CLI, not the sources. */
export function builtCli(): boolean {
  return existsSync(resolve('dist/cli/main.js'));
}

export interface Bench {
  readonly root: string;
  /** Copies of samples/captures/*.csv. */
  readonly captures: string;
  readonly spec: string;
  readonly data: string;
}

export function makeBench(prefix: string): Bench {
  const root = mkdtempSync(join(tmpdir(), `benchproof-${prefix}-`));
  const captures = join(root, 'captures');
  mkdirSync(captures);
  for (const f of readdirSync(join(SAMPLES, 'captures'))) if (f.endsWith('.csv')) copyFileSync(join(SAMPLES, 'captures', f), join(captures, f));
  const spec = join(root, 'fh210-spec.yaml');
  copyFileSync(join(SAMPLES, 'fh210-spec.yaml'), spec);
  return { root, captures, spec, data: join(root, 'data') };
}

export interface Finished {
  readonly code: number | null;
  readonly signal: NodeJS.Signals | null;
  readonly stdout: string;
  readonly stderr: string;
}

export interface Running {
  readonly child: ChildProcess;
  readonly done: Promise<Finished>;
  /** Output so far (for a process that is killed before it ends). */
  output(): { stdout: string; stderr: string };
}

export function startCli(args: readonly string[], options: { cwd?: string; env?: Record<string, string> } = {}): Running {
  const child = spawn(process.execPath, [CLI, ...args], {
    cwd: options.cwd,
    env: { ...process.env, NO_COLOR: '1', CI: 'true', BENCHPROOF_OPERATOR: 'hardening', ...options.env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let stdout = '';
  let stderr = '';
  child.stdout!.setEncoding('utf8').on('data', (s: string) => (stdout += s));
  child.stderr!.setEncoding('utf8').on('data', (s: string) => (stderr += s));
  const done = new Promise<Finished>((res) => child.on('close', (code, signal) => res({ code, signal, stdout, stderr })));
  return { child, done, output: () => ({ stdout, stderr }) };
}

export function runCliProcess(args: readonly string[], options: { cwd?: string; env?: Record<string, string> } = {}): Promise<Finished> {
  return startCli(args, options).done;
}

/** A run `check` reported as stored: by its store-wide id ("run #12"), or by its number among its unit's runs ("run 2"). */
export interface ReportedRun {
  readonly unit: string;
  readonly id?: number;
  readonly number?: number;
}

/**
 * "stored run #12 of FK-0101 (PASS)" or "stored run 2 of FK-0101, attempt #1 (INCOMPLETE, …)" lines on
 * stderr: the runs `check` reported as stored.
 */
export function reportedRuns(stderr: string): ReportedRun[] {
  return [...stderr.matchAll(/stored run (#?)(\d+) of (.+?)(?:, attempt #\d+)? \(/g)].map((m) => (m[1] ? { id: Number(m[2]), unit: m[3] } : { number: Number(m[2]), unit: m[3] }));
}

/** `watch --json` lines on stdout for stored captures: {"event":"checked","runId":…,"unit":…}. */
export function watchedRuns(stdout: string): { id: number; unit: string; file: string }[] {
  const out: { id: number; unit: string; file: string }[] = [];
  for (const line of stdout.split('\n')) {
    if (!line.startsWith('{')) continue;
    try {
      const o = JSON.parse(line) as { event?: string; runId?: number; unit?: string; file?: string };
      if (o.event === 'checked' && typeof o.runId === 'number') out.push({ id: o.runId, unit: String(o.unit), file: String(o.file) });
    } catch {
      // A line cut by the kill: it was not fully reported.
    }
  }
  return out;
}

/** A small seeded generator (Park–Miller minimal standard, CACM 31(10), 1988) for kill times. */
export function seeded(seed: number): () => number {
  let s = (seed % 2147483646) + 1;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

export const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

/** A copy of a demo capture under a new unit name, with one comment line so its bytes are its own. */
export function dropCapture(b: Bench, folder: string, unit: string, condition: string): string {
  const name = `${unit}_${condition}.csv`;
  const bytes = readFileSync(join(b.captures, `FK-0101_${condition}.csv`), 'utf8');
  // Written beside the folder and renamed into it whole, as a careful copy tool would.
  const temp = join(b.root, `${name}.part`);
  writeFileSync(temp, `${bytes}# copy for ${unit}\n`);
  renameSync(temp, join(folder, name));
  return name;
}

/** Let a running `watch --json` answer for `expected` files, then stop it with SIGTERM (as Ctrl-C would). */
export async function drainWatch(w: Running, expected: number, limitMs = 120_000): Promise<Finished> {
  const deadline = Date.now() + limitMs;
  for (;;) {
    const { stdout, stderr } = w.output();
    const answered = (stdout + stderr).split('\n').filter((l) => /"event":"(checked|recorded-already|error|unmatched)"/.test(l)).length;
    if (answered >= expected || Date.now() > deadline) break;
    await sleep(200);
  }
  w.child.kill('SIGTERM');
  return w.done;
}
