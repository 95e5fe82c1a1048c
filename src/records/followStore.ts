/**
 * A verified view of the store for a long-running reader (the bench page's board): it keeps what it
 * has verified and, since the store is an append-only hash chain (chain.ts), brings itself up to date
 * by verifying only what was added after the chain head it last verified. When that head is no
 * longer in the chain at its place (entries deleted, edited or rewritten) it verifies everything
 * again. Rows stored earlier are re-verified in the background too (`sweep`, one unit at a time,
 * yielding between units), because a row edited in place with the store's guards removed leaves the
 * chain as it was: every change of the database schedules such a sweep, so every row is checked as
 * auditStore checks it, with the same problems named, only not all on the request path.
 *
 * The listing is built from light per-run heads (spec, times, statement, attempt columns, which
 * conditions each verdict holds), taken out of the stored JSON by SQLite, never the measurement
 * reports; per unit it is exactly what listUnits gives.
 */
import Database from 'better-sqlite3';
import type { Database as Db } from 'better-sqlite3';
import { join } from 'node:path';
import type { StoredCalibrationRun, StoredRun, UnitRecord } from '../types/index.js';
import { CHAIN_START, chainLink } from './chain.js';
import type { ChainEntry } from './chain.js';
import type { AuditProblem, StoreAudit } from './auditStore.js';
import { auditUnitCaptures } from './auditStore.js';
import { readRunDigests, readRuns } from './readRuns.js';
import { readCalibrationRows, readCalibrations, withCalibrations } from './calibrationRead.js';
import { attemptFacts, numberRuns, readRunHeads, summarizeAttempts } from './attempts.js';
import { DATABASE_FILE } from './openStore.js';
import { buildUnitRecord } from './unitSummaries.js';
import { snapshot } from './followListing.js';
import type { FollowedStore, UnitState } from './followListing.js';

export type { FollowedStore } from './followListing.js';

export interface StoreFollower {
  /** Verify what was added since the last verified head (everything, the first time or when the chain changed). */
  catchUp(): Promise<FollowedStore>;
  /** The database changed in some way (any commit, or an edit): re-verify every row in the background soon. */
  changed(): void;
  /**
   * One unit's runs (or its record), read in full and re-hashed as RecordStore reads them, after a
   * catch-up; `audit` adds the unit's archived captures, re-hashed once per verification of the unit.
   * Runs the audit names are marked not intact.
   */
  unitRuns(serial: string): Promise<{ runs: StoredRun[]; audit: StoreAudit }>;
  unitRecord(serial: string): Promise<{ record: UnitRecord | undefined; audit: StoreAudit }>;
  close(): void;
}

/**
 * Least time between two background sweeps while changes keep arriving, in ms; beyond it the gap is
 * four times the last sweep's duration, so re-verifying the older rows takes at most a fifth of the
 * server's time (a sweep over 2 000 units takes tens of seconds on a busy 2-core machine).
 */
export const SWEEP_GAP_MS = 1_000;
const SWEEP_GAP_FACTOR = 4;

export function followStore(dir: string, options: { readonly sweepGapMs?: number; readonly sweepGapFactor?: number } = {}): StoreFollower {
  // Tests set both to 0 to sweep at once after a change, whatever the machine's load made the last sweep take.
  const { sweepGapMs = SWEEP_GAP_MS, sweepGapFactor = SWEEP_GAP_FACTOR } = options;
  const db: Db = new Database(join(dir, DATABASE_FILE), { readonly: true, fileMustExist: true, timeout: 15_000 });
  let entries: ChainEntry[] = [];
  /** Entries actually read (a gap in the numbers leaves fewer than the last number). */
  let known = 0;
  let head = CHAIN_START;
  let linkProblems: AuditProblem[] = [];
  const units = new Map<string, UnitState>();
  let maxRun = 0;
  let maxIteration = 0;
  let verifiedRows = 0;
  let fullPasses = 0;
  let full: Promise<void> | undefined = undefined;
  let sweepTimer: NodeJS.Timeout | undefined;
  let lastSweepEnd = 0;
  let lastSweepMs = 0;
  /** A change arrived while a sweep ran: the rows it already passed may have changed, so sweep again. */
  let again = false;
  let closed = false;
  /** Bumped whenever anything verified changes, so an unchanged store answers from the last snapshot. */
  let version = 0;
  let last: { version: number; snap: FollowedStore } | undefined;

  /** Read chain entries after the last verified one and check each link; false when the known head is gone. */
  const extendChain = (): { ok: boolean; added: ChainEntry[] } => {
    const seq = entries.length;
    if (seq > 0) {
      const at = db.prepare('SELECT link, (SELECT COUNT(*) FROM chain WHERE seq <= ?) AS n FROM chain WHERE seq = ?').get(seq, seq) as { link: string; n: number } | undefined;
      if (!at || at.link !== head || at.n !== known) return { ok: false, added: [] };
    }
    const added = db.prepare('SELECT seq, kind, row_id, row_digest, link FROM chain WHERE seq > ? ORDER BY seq').all(seq) as ChainEntry[];
    for (const e of added) {
      const expected = chainLink(head, e.kind as 'run', e.row_id, e.row_digest);
      // A run's summary entry (runSummary.ts) is named by its run, as auditStore names it.
      const kind = e.kind === 'calibration' ? 'calibration' : e.kind === 'run' || e.kind === 'summary' ? 'run' : 'chain';
      if (e.seq !== entries.length + 1) linkProblems.push({ kind: 'chain', id: null, unit: null, problem: 'chain-broken', detail: `chain entries ${entries.length + 1}–${e.seq - 1} are gone (deleted rows or entries)` });
      else if (e.link !== expected) linkProblems.push({ kind, id: e.row_id, unit: null, problem: 'chain-broken', detail: `chain entry ${e.seq} (${e.kind} #${e.row_id}) does not follow from the entry before it: entries were edited, deleted or reordered` });
      // A gap leaves the entries array shorter than the numbers: later looks compare by number.
      while (entries.length < e.seq - 1) entries.push({ seq: entries.length + 1, kind: 'gap', row_id: -1, row_digest: '', link: head });
      entries.push(e);
      known += 1;
      version += 1;
      head = e.link;
    }
    return { ok: true, added };
  };

  /** Every row of one unit (runs and calibration iterations), fingerprint-checked, and its run heads. */
  const verifyUnit = (unit: string): void => {
    const runs = readRunDigests(db, { unit });
    const cals = readCalibrationRows(db, unit);
    const rows = [
      ...runs.rows.map((r) => ({ kind: 'run' as const, id: r.id, digest: r.digest, intact: r.intact })),
      ...cals.runs.flatMap((c) => c.iterations.map((i) => ({ kind: 'calibration' as const, id: i.id, digest: i.digest, intact: i.intact }))),
    ];
    verifiedRows += rows.length + runs.damaged.length + cals.damaged.length;
    const heads = readRunHeads(db, unit);
    const state = { rows, damaged: [...runs.damaged, ...cals.damaged], heads, facts: heads.length ? attemptFacts(summarizeAttempts(numberRuns(heads))) : null };
    version += 1;
    if (state.rows.length === 0 && state.damaged.length === 0) units.delete(unit);
    else units.set(unit, state);
  };

  const newIds = (): { units: Set<string>; run: number; iteration: number } => {
    const top = db.prepare('SELECT (SELECT COALESCE(MAX(id), 0) FROM runs) AS run, (SELECT COALESCE(MAX(id), 0) FROM calibration_iterations) AS iteration').get() as { run: number; iteration: number };
    const names = db
      .prepare(
        `SELECT unit FROM runs WHERE id > @run
         UNION SELECT c.unit FROM calibration_iterations i JOIN calibration_runs c ON c.id = i.calibration_id WHERE i.id > @iteration`,
      )
      .all({ run: maxRun, iteration: maxIteration }) as { unit: string }[];
    return { units: new Set(names.map((n) => String(n.unit))), run: top.run, iteration: top.iteration };
  };

  const unitsOf = (added: readonly ChainEntry[]): Set<string> => {
    const runIds = added.filter((e) => e.kind === 'run').map((e) => e.row_id);
    const iterationIds = added.filter((e) => e.kind === 'calibration').map((e) => e.row_id);
    const rows = db
      .prepare(
        `SELECT unit FROM runs WHERE id IN (SELECT value FROM json_each(@runs))
         UNION SELECT c.unit FROM calibration_iterations i JOIN calibration_runs c ON c.id = i.calibration_id WHERE i.id IN (SELECT value FROM json_each(@its))`,
      )
      .all({ runs: JSON.stringify(runIds), its: JSON.stringify(iterationIds) }) as { unit: string }[];
    return new Set(rows.map((r) => String(r.unit)));
  };

  /** Everything again: the whole chain at once, then every unit, yielding to other work between units. */
  const sweep = async (): Promise<void> => {
    entries = [];
    known = 0;
    head = CHAIN_START;
    linkProblems = [];
    extendChain();
    const all = db
      .prepare('SELECT unit FROM runs UNION SELECT unit FROM calibration_runs')
      .all()
      .map((r) => String((r as { unit: string }).unit));
    const top = db.prepare('SELECT (SELECT COALESCE(MAX(id), 0) FROM runs) AS run, (SELECT COALESCE(MAX(id), 0) FROM calibration_iterations) AS iteration').get() as { run: number; iteration: number };
    const present = new Set(all);
    for (const unit of [...units.keys()]) if (!present.has(unit)) units.delete(unit);
    for (const unit of all) {
      if (closed) return;
      verifyUnit(unit);
      await new Promise((done) => setImmediate(done));
    }
    maxRun = Math.max(maxRun, top.run);
    maxIteration = Math.max(maxIteration, top.iteration);
    fullPasses += 1;
    // The snapshot carries the pass count: a catch-up answered during the sweep must not be served again after it.
    version += 1;
  };

  const runSweep = (): Promise<void> => {
    const started = Date.now();
    full ??= sweep().finally(() => {
      full = undefined;
      lastSweepEnd = Date.now();
      lastSweepMs = lastSweepEnd - started;
      if (again) {
        again = false;
        schedule();
      }
    });
    return full;
  };

  /** Archived captures re-hashed per unit, kept while the unit's verified state is the same object. */
  const captureAudits = new WeakMap<UnitState, readonly AuditProblem[]>();
  const unitAudit = async (serial: string): Promise<StoreAudit> => {
    const { audit } = await follower.catchUp();
    const state = units.get(serial);
    if (!state) return audit;
    let captures = captureAudits.get(state);
    if (!captures) captureAudits.set(state, (captures = auditUnitCaptures(db, dir, serial)));
    return captures.length ? { ...audit, problems: [...audit.problems, ...captures] } : audit;
  };

  function schedule(): void {
    if (closed) return;
    if (full) {
      again = true;
      return;
    }
    if (sweepTimer) return;
    const wait = Math.max(0, lastSweepEnd + Math.max(sweepGapMs, sweepGapFactor * lastSweepMs) - Date.now());
    sweepTimer = setTimeout(() => {
      sweepTimer = undefined;
      void runSweep();
    }, wait);
    sweepTimer.unref();
  }

  const follower: StoreFollower = {
    async catchUp() {
      if (fullPasses === 0) await runSweep();
      // The head verified last is no longer where it was: the chain changed under us, verify it all.
      let extended = extendChain();
      while (!extended.ok) {
        await runSweep();
        extended = extendChain();
      }
      const fresh = newIds();
      for (const unit of new Set([...unitsOf(extended.added), ...fresh.units])) verifyUnit(unit);
      maxRun = Math.max(maxRun, fresh.run);
      maxIteration = Math.max(maxIteration, fresh.iteration);
      if (last?.version !== version) last = { version, snap: snapshot(entries, linkProblems, units, head, verifiedRows, fullPasses) };
      return last.snap;
    },
    changed: () => schedule(),
    async unitRuns(serial) {
      const audit = await unitAudit(serial);
      return { runs: marked(readRuns(db, { unit: serial }), audit), audit };
    },
    async unitRecord(serial) {
      const audit = await unitAudit(serial);
      const runs = marked(readRuns(db, { unit: serial }), audit);
      return { record: withCalibrations(buildUnitRecord(serial, runs), serial, markedCalibrations(readCalibrations(db, serial), audit)), audit };
    },
    close() {
      closed = true;
      if (sweepTimer) clearTimeout(sweepTimer);
      db.close();
    },
  };
  return follower;
}

/** Runs the audit names, marked not intact (as RecordStore marks them). */
function marked(runs: StoredRun[], audit: StoreAudit): StoredRun[] {
  const bad = new Set(audit.problems.filter((p) => p.kind === 'run' && p.id !== null).map((p) => p.id));
  return runs.map((r) => (r.intact && bad.has(r.id) ? { ...r, intact: false } : r));
}

function markedCalibrations(list: StoredCalibrationRun[], audit: StoreAudit): StoredCalibrationRun[] {
  const bad = new Set(audit.problems.filter((p) => p.kind === 'calibration' && p.id !== null).map((p) => p.id));
  return list.map((c) => ({ ...c, iterations: c.iterations.map((i) => (i.intact && bad.has(i.id) ? { ...i, intact: false } : i)) }));
}
