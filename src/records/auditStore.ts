/**
 * Verifying a whole store before its records are believed: every run and calibration iteration is
 * re-hashed against its fingerprint, every fingerprint against the one in the hash chain, every link
 * of the chain against the one before it (chain.ts), and every archived capture against the SHA-256
 * it is filed under. Each problem names the row it concerns, so a report can say which runs not to
 * rely on while the others stay readable.
 *
 * What this finds: a row edited in the database file or through SQL (its fingerprint no longer
 * matches, or its fingerprint was recomputed and no longer matches the chain); a row deleted, or
 * inserted without its chain entry; chain entries deleted, reordered or edited; a row that does not
 * parse; an archived capture removed or changed. What it cannot find alone: someone who rewrites the
 * rows and the whole chain after them with benchproof's own code; the chain head printed in an
 * earlier report (or kept elsewhere) then differs from the store's, which is how that is caught.
 */
import type { Database } from 'better-sqlite3';
import { createHash } from 'node:crypto';
import { closeSync, openSync, readSync, statSync } from 'node:fs';
import { isAbsolute, join, normalize } from 'node:path';
import { CHAIN_START, chainEntries, chainLink, entryOf } from './chain.js';
import type { ChainArray, ChainEntry } from './chain.js';
import { checkListing } from './listingCheck.js';
import { readRunDigests } from './readRuns.js';
import type { DamagedRow, RunDigestRow } from './readRuns.js';
import type { StoredCalibrationRun } from '../types/index.js';
import { readCalibrationRows } from './calibrationRead.js';
import { summaryHolds, summaryRowOf } from './runSummary.js';
import type { SummaryArray, SummaryRow } from './runSummary.js';
import { readSummaryRows } from './summaryReads.js';

export type AuditProblemKind = 'changed' | 'damaged' | 'missing' | 'unchained' | 'chain-broken' | 'capture-missing' | 'capture-changed';

export interface AuditProblem {
  /** The row concerned: a check run, a calibration iteration, or the chain itself. */
  readonly kind: 'run' | 'calibration' | 'chain';
  readonly id: number | null;
  readonly unit: string | null;
  readonly problem: AuditProblemKind;
  readonly detail: string;
}

export interface StoreAudit {
  /** The newest link of the hash chain (64 hex digits); every report prints its start. */
  readonly head: string;
  /** Rows in the chain. */
  readonly chained: number;
  /** Archived captures re-hashed. */
  readonly archived: number;
  readonly problems: readonly AuditProblem[];
}

interface Fingerprinted {
  readonly kind: 'run' | 'calibration';
  readonly id: number;
  readonly unit: string;
  readonly digest: string;
  readonly intact: boolean;
  readonly captures: readonly { readonly sha256: string; readonly size: number; readonly archivePath: string }[];
  readonly summaryProblem?: string;
}

export interface AuditOptions {
  /**
   * Re-hash the archived captures too (default). A listing that reads no capture (units, batch)
   * leaves them out; a unit's record re-hashes its own (auditUnitCaptures).
   */
  readonly archive?: boolean;
}

export function auditStore(db: Database, dataDir: string, options: AuditOptions = {}): StoreAudit {
  const { archive = true } = options;
  const read = { entries: chainEntries(db), runs: readRunDigests(db), calibrations: readCalibrationRows(db), summaries: readSummaryRows(db) };
  return judgeStore(read, archive ? (c) => hashFile(dataDir, c.archivePath) : undefined);
}

/**
 * The listing's verification: the whole chain, every run row's fingerprint against the chain, every
 * summary against its fingerprint (over the run row's own columns) and the chain, and the calibration
 * iterations; the full verdicts are not read. `chain` and `summaries` are the rows as read (arrays:
 * chainRows, and readListingArrays or readSummaryArrays; `fullRows` reads the latter when the former were given). checkListing (listingCheck.ts) answers whether it all holds without
 * making objects of the rows; only a store that fails is judged here again, to name each problem.
 */
export function judgeListing(
  chain: readonly ChainArray[],
  summaries: readonly SummaryArray[],
  calibrations: StoreRows['calibrations'],
  runDigests?: RunDigestReader,
  fullRows?: () => readonly SummaryArray[],
): StoreAudit {
  const quick = checkListing(chain, summaries, calibrations);
  if (quick.holds) return { head: quick.head, chained: chain.length, archived: 0, problems: [] };
  // A listing's rows (listingColumns) leave out columns the slow judgement hashes: read them whole.
  const rows = (fullRows ? fullRows() : summaries).map(summaryRowOf);
  // The run rows as the chain sees them: their fingerprints, not re-hashed here (the summary covers their columns).
  const runs = rows.map((r) => ({ id: Number(r.id), unit: String(r.unit), digest: String(r.digest), intact: true, captures: [] }));
  const audit = judgeStore({ entries: chain.map(entryOf), runs: { rows: runs, damaged: [] }, calibrations, summaries: rows });
  return runDigests ? namedRefingerprints(audit, rows, runDigests) : audit;
}

/** The fingerprints the run rows hold now, by run (read only for the few runs a listing found changed). */
export type RunDigestReader = (ids: readonly number[]) => ReadonlyMap<number, string>;

const CHANGED = 'its content no longer matches the fingerprint taken when it was stored';
const REFINGERPRINTED = 'its fingerprint differs from the one the hash chain holds (it was edited and re-fingerprinted)';

/**
 * A listing reads a run's fingerprint from its summary, so a run whose columns no longer match its
 * summary may also carry a new fingerprint of its own: the runs it found changed are looked up, and
 * one re-fingerprinted is named as such, as a full read names it.
 */
function namedRefingerprints(audit: StoreAudit, summaries: readonly SummaryRow[], runDigests: RunDigestReader): StoreAudit {
  const changed = new Set(audit.problems.filter((p) => p.kind === 'run' && p.id !== null && p.detail === CHANGED).map((p) => p.id as number));
  if (changed.size === 0) return audit;
  const digests = runDigests([...changed]);
  // The fingerprint each run had when stored, as its summary (verified against the chain by its own entry) repeats it.
  const stored = new Map(summaries.filter((r) => changed.has(Number(r.id))).map((r) => [Number(r.id), String(r.digest)]));
  return {
    ...audit,
    problems: audit.problems.map((p) => {
      const now = p.kind === 'run' && p.detail === CHANGED && p.id !== null ? digests.get(p.id) : undefined;
      return now !== undefined && now !== stored.get(p.id as number) ? { ...p, detail: REFINGERPRINTED } : p;
    }),
  };
}

/** What verifying a store reads from either engine. */
export interface StoreRows {
  readonly entries: readonly ChainEntry[];
  readonly runs: { readonly rows: readonly RunDigestRow[]; readonly damaged: readonly DamagedRow[] };
  readonly calibrations: { readonly runs: readonly StoredCalibrationRun[]; readonly damaged: readonly DamagedRow[] };
  /** Every run joined with its summary (schema 7); absent for a store read before it. */
  readonly summaries?: readonly SummaryRow[];
}

/** The SHA-256 of a stored capture's bytes as the store holds them now, or null when they are gone. */
export type CaptureHasher = (capture: { readonly sha256: string; readonly archivePath: string }) => string | null;

/** The judgement of auditStore over rows either engine read; `hashOf` re-hashes the captures when given. */
export function judgeStore(read: StoreRows, hashOf?: CaptureHasher): StoreAudit {
  const problems: AuditProblem[] = [];
  const { entries } = read;
  const head = checkLinks(entries, problems);
  const byRow = new Map(entries.map((e) => [`${e.kind}:${e.row_id}`, e]));
  const { rows: runs, damaged } = read.runs;
  const calibrations = read.calibrations;
  const rows: Fingerprinted[] = [
    ...runs.map((r) => ({ kind: 'run' as const, id: r.id, unit: r.unit, digest: r.digest, intact: r.intact, captures: r.captures, summaryProblem: r.summaryProblem })),
    ...calibrations.runs.flatMap((c) => c.iterations.map((i) => ({ kind: 'calibration' as const, id: i.id, unit: c.unit, digest: i.digest, intact: i.intact, captures: i.captures }))),
  ];
  const present = new Set<string>();
  for (const d of [...damaged, ...calibrations.damaged]) {
    present.add(`${d.kind}:${d.id}`);
    problems.push({ kind: d.kind, id: d.id, unit: d.unit, problem: 'damaged', detail: d.problem });
  }
  for (const r of rows) {
    present.add(`${r.kind}:${r.id}`);
    const entry = byRow.get(`${r.kind}:${r.id}`);
    if (!r.intact) problems.push({ kind: r.kind, id: r.id, unit: r.unit, problem: 'changed', detail: 'its content no longer matches the fingerprint taken when it was stored' });
    else if (!entry) problems.push({ kind: r.kind, id: r.id, unit: r.unit, problem: 'unchained', detail: 'it is not in the hash chain: it was not stored by benchproof' });
    else if (entry.row_digest !== r.digest) problems.push({ kind: r.kind, id: r.id, unit: r.unit, problem: 'changed', detail: 'its fingerprint differs from the one the hash chain holds (it was edited and re-fingerprinted)' });
    else if (r.summaryProblem) problems.push({ kind: r.kind, id: r.id, unit: r.unit, problem: 'changed', detail: r.summaryProblem });
  }
  if (read.summaries) judgeSummaries(read.summaries, byRow, problems);
  for (const e of entries) {
    if ((e.kind === 'run' || e.kind === 'calibration') && !present.has(`${e.kind}:${e.row_id}`)) {
      problems.push({ kind: e.kind, id: e.row_id, unit: null, problem: 'missing', detail: 'it is in the hash chain but no longer in the store: it was deleted' });
    }
  }
  const archived = hashOf ? checkArchive(hashOf, rows, problems) : 0;
  // A run found changed both by its summary and by its own fingerprint is named once.
  const seen = new Set<string>();
  const unique = problems.filter((p) => {
    const key = `${p.kind}:${p.id}:${p.problem}:${p.detail}`;
    return !seen.has(key) && (seen.add(key), true);
  });
  return { head, chained: entries.length, archived, problems: unique };
}

/**
 * Each run's summary against its fingerprint and the chain. A run without one failed its fingerprint
 * when the store was upgraded (migration7.ts) or lost its summary; a summary entry of the chain whose
 * run is still there but whose summary is not was deleted.
 */
function judgeSummaries(rows: readonly SummaryRow[], byRow: ReadonlyMap<string, ChainEntry>, problems: AuditProblem[]): void {
  const summarised = new Set<number>();
  const runIds = new Set<number>();
  for (const r of rows) {
    const id = Number(r.id);
    const unit = String(r.unit);
    runIds.add(id);
    const add = (problem: AuditProblemKind, detail: string): void => void problems.push({ kind: 'run', id, unit, problem, detail });
    if (r.summary_digest === null) {
      add('changed', 'it has no summary: it failed its fingerprint when the store was upgraded, or its summary was deleted');
      continue;
    }
    summarised.add(id);
    const entry = byRow.get(`summary:${id}`);
    // Worded as the full re-hash words an edit, so one edit read both ways is named once (verifiedReads.ts).
    if (!summaryHolds(r)) add('changed', 'its content no longer matches the fingerprint taken when it was stored');
    else if (!entry) add('unchained', 'its summary is not in the hash chain: it was not stored by benchproof');
    else if (entry.row_digest !== r.summary_digest) add('changed', "its summary's fingerprint differs from the one the hash chain holds (it was edited and re-fingerprinted)");
  }
  for (const [key, e] of byRow) {
    if (e.kind === 'summary' && runIds.has(e.row_id) && !summarised.has(e.row_id)) {
      problems.push({ kind: 'run', id: e.row_id, unit: null, problem: 'missing', detail: `its summary is in the hash chain (${key}) but no longer in the store: it was deleted` });
    }
  }
}

/** The captures of some runs and calibration iterations re-hashed by `hashOf` (one unit's, for a record). */
export function judgeCaptures(runs: readonly RunDigestRow[], calibrations: readonly StoredCalibrationRun[], hashOf: CaptureHasher): AuditProblem[] {
  const problems: AuditProblem[] = [];
  const rows: Fingerprinted[] = [
    ...runs.map((r) => ({ kind: 'run' as const, id: r.id, unit: r.unit, digest: r.digest, intact: r.intact, captures: r.captures })),
    ...calibrations.flatMap((c) => c.iterations.map((i) => ({ kind: 'calibration' as const, id: i.id, unit: c.unit, digest: i.digest, intact: i.intact, captures: i.captures }))),
  ];
  checkArchive(hashOf, rows, problems);
  return problems;
}

/**
 * What reading one unit in full verifies beyond the listing: each of its runs re-hashed against its
 * fingerprint and its verdict against its summary's hash, and its archived captures (`hashOf`).
 */
export function judgeUnit(runs: { readonly rows: readonly RunDigestRow[]; readonly damaged: readonly DamagedRow[] }, calibrations: readonly StoredCalibrationRun[], hashOf: CaptureHasher): AuditProblem[] {
  const problems: AuditProblem[] = runs.damaged.map((d) => ({ kind: d.kind, id: d.id, unit: d.unit, problem: 'damaged' as const, detail: d.problem }));
  for (const r of runs.rows) {
    if (!r.intact) problems.push({ kind: 'run', id: r.id, unit: r.unit, problem: 'changed', detail: 'its content no longer matches the fingerprint taken when it was stored' });
    else if (r.summaryProblem) problems.push({ kind: 'run', id: r.id, unit: r.unit, problem: 'changed', detail: r.summaryProblem });
  }
  return [...problems, ...judgeCaptures(runs.rows, calibrations, hashOf)];
}

/** judgeUnit on the embedded store. */
export function auditUnit(db: Database, dataDir: string, unit: string): AuditProblem[] {
  const calibrations = readCalibrationRows(db).runs.filter((c) => c.unit === unit);
  return judgeUnit(readRunDigests(db, { unit }, true), calibrations, (c) => hashFile(dataDir, c.archivePath));
}

/** The archived captures of one unit's runs and calibration iterations, re-hashed. */
export function auditUnitCaptures(db: Database, dataDir: string, unit: string): AuditProblem[] {
  const runs = readRunDigests(db, { unit }).rows;
  const calibrations = readCalibrationRows(db).runs.filter((c) => c.unit === unit);
  return judgeCaptures(runs, calibrations, (c) => hashFile(dataDir, c.archivePath));
}

/** Each link against the one stored before it; a gap in the entry numbers is a deleted entry. */
function checkLinks(entries: readonly ChainEntry[], problems: AuditProblem[]): string {
  let previous = CHAIN_START;
  let seq = 0;
  for (const e of entries) {
    const kind = e.kind === 'run' || e.kind === 'calibration' || e.kind === 'summary' ? (e.kind === 'calibration' ? 'calibration' : 'run') : 'chain';
    const expected = chainLink(previous, e.kind as 'run', e.row_id, e.row_digest);
    if (e.seq !== seq + 1) {
      problems.push({ kind: 'chain', id: null, unit: null, problem: 'chain-broken', detail: `chain entries ${seq + 1}–${e.seq - 1} are gone (deleted rows or entries)` });
    } else if (e.link !== expected) {
      problems.push({ kind, id: e.row_id, unit: null, problem: 'chain-broken', detail: `chain entry ${e.seq} (${e.kind} #${e.row_id}) does not follow from the entry before it: entries were edited, deleted or reordered` });
    }
    previous = e.link;
    seq = e.seq;
  }
  return previous;
}

/** Re-hash every archived capture the rows use, once per file; name each row that uses a bad one. */
function checkArchive(hashOf: CaptureHasher, rows: readonly Fingerprinted[], problems: AuditProblem[]): number {
  const users = new Map<string, { sha256: string; size: number; archivePath: string; rows: Fingerprinted[] }>();
  for (const r of rows) {
    for (const c of r.captures) {
      const u = users.get(c.archivePath) ?? { sha256: c.sha256, size: c.size, archivePath: c.archivePath, rows: [] };
      if (u.rows[u.rows.length - 1] !== r) u.rows.push(r); // a run's captures are listed together
      users.set(c.archivePath, u);
    }
  }
  for (const [file, u] of users) {
    const found = hashOf(u);
    if (found === u.sha256) continue;
    const problem = found === null ? 'capture-missing' : 'capture-changed';
    const detail = found === null ? `its archived capture ${file} is missing` : `its archived capture ${file} no longer hashes to ${u.sha256.slice(0, 12)}…`;
    for (const r of u.rows) problems.push({ kind: r.kind, id: r.id, unit: r.unit, problem, detail });
  }
  return users.size;
}

const PIECE = 1 << 20;

/** SHA-256 of an archived file, streamed; null when it is missing, not a file, or outside the archive. */
export function hashFile(dataDir: string, rel: string): string | null {
  const clean = normalize(rel);
  if (isAbsolute(clean) || clean.startsWith('..')) return null;
  const path = join(dataDir, clean);
  let fd: number;
  try {
    if (!statSync(path).isFile()) return null;
    fd = openSync(path, 'r');
  } catch {
    return null;
  }
  try {
    const hash = createHash('sha256');
    const buf = Buffer.allocUnsafe(PIECE);
    for (let n = readSync(fd, buf, 0, PIECE, null); n > 0; n = readSync(fd, buf, 0, PIECE, null)) hash.update(buf.subarray(0, n));
    return hash.digest('hex');
  } catch {
    return null;
  } finally {
    closeSync(fd);
  }
}
