/**
 * How hard the hardening tests push: short runs under `npm test`, long runs under `npm run hardening`
 * (BENCHPROOF_HARDENING=long). Each test file also writes a tally (inputs tried, crashes, hangs,
 * records lost) into BENCHPROOF_HARDENING_TALLY when that folder is given, for the summary that
 * scripts/hardening.js prints.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

export const LONG = process.env.BENCHPROOF_HARDENING === 'long';

/** The short count under `npm test`, the long one under `npm run hardening`. */
export function scaled(short: number, long: number): number {
  return LONG ? long : short;
}

/**
 * fast-check options for a time budget. Under `npm run hardening` a long run stops at its limit (what
 * it reached is what it checked; the tally counts the inputs). Under `npm test` there is none: a limit
 * there made the number of inputs checked depend on how busy the machine was, so the normal run now
 * always checks its whole fixed, seeded set.
 */
export function timeBudget(longMs: number): { interruptAfterTimeLimit?: number; markInterruptAsFailure?: boolean } {
  return LONG ? { interruptAfterTimeLimit: longMs, markInterruptAsFailure: false } : {};
}

/**
 * Fixed seeds, so that a failure can be replayed; BENCHPROOF_HARDENING_SEED moves the long run to
 * fresh inputs (the seed is printed with every failure).
 */
export function seedFor(area: number): number {
  const base = Number(process.env.BENCHPROOF_HARDENING_SEED ?? '20260302');
  return (Number.isFinite(base) ? base : 20260302) + area;
}

export interface Tally {
  /** Inputs tried (files read, specs parsed, processes started). */
  inputs: number;
  /** Uncaught exceptions, internal errors (exit 3), NaN or Infinity in output, or broken invariants. */
  crashes: number;
  /** Inputs that did not finish within their time limit. */
  hangs: number;
  /** Runs reported as stored that are missing or incomplete in the store. */
  lost: number;
  /** Changes to a store that its verification did not name (tampering area). */
  missed?: number;
  /** Hostile text that reached output raw: a control character on a terminal, broken Markdown or CSV. */
  injected?: number;
  /** One line per problem, for the summary. */
  notes: string[];
}

export function newTally(): Tally {
  return { inputs: 0, crashes: 0, hangs: 0, lost: 0, notes: [] };
}

/** Write one area's tally for scripts/hardening.js (no-op when the folder is not set). */
export function saveTally(area: string, tally: Tally): void {
  const dir = process.env.BENCHPROOF_HARDENING_TALLY;
  if (!dir) return;
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, `${area}.json`), `${JSON.stringify({ area, ...tally, notes: tally.notes.slice(0, 20) }, null, 2)}\n`);
}

/** Every number in a value, typed arrays included, is finite; returns the paths of those that are not. */
export function nonFinitePaths(x: unknown, path = '$', out: string[] = []): string[] {
  if (out.length >= 10) return out;
  if (typeof x === 'number') {
    if (!Number.isFinite(x)) out.push(`${path} = ${x}`);
  } else if (ArrayBuffer.isView(x) && !(x instanceof DataView)) {
    const a = x as unknown as ArrayLike<number>;
    for (let i = 0; i < a.length; i++) {
      if (typeof a[i] === 'number' && !Number.isFinite(a[i])) {
        out.push(`${path}[${i}] = ${a[i]}`);
        break;
      }
    }
  } else if (Array.isArray(x)) x.forEach((v, i) => nonFinitePaths(v, `${path}[${i}]`, out));
  else if (x !== null && typeof x === 'object') for (const [k, v] of Object.entries(x)) nonFinitePaths(v, `${path}.${k}`, out);
  return out;
}
