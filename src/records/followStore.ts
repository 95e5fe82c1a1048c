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
import type { StoredRun, UnitSummary } from '../types/index.js';
import { CHAIN_START, chainLink } from './chain.js';
import type { ChainEntry } from './chain.js';
import type { AuditProblem, StoreAudit } from './auditStore.js';
import { readRunDigests } from './readRuns.js';
import type { DamagedRow } from './readRuns.js';
import { readCalibrationRows } from './calibrationRead.js';
import { attemptFacts, numberRuns, readRunHeads, summarizeAttempts } from './attempts.js';
import { DATABASE_FILE } from './openStore.js';
import { compareSerials } from './unitSummaries.js';

export interface StoreFollower {
  /** Verify what was added since the last verified head (everything, the first time or when the chain changed). */
  catchUp(): Promise<FollowedStore>;
  /** The database changed in some way (any commit, or an edit): re-verify every row in the background soon. */
  changed(): void;
  close(): void;
}

export interface FollowedStore {
  /** As auditStore(…, { archive: false }) would find it now. */
  readonly audit: StoreAudit;
  /** As listUnits gives them, with each unit's unverified runs. */
  units(spec?: string): UnitSummary[];
  /** How many rows were verified since the follower started, and how many full passes it made (for tests and the bench). */
  readonly verifiedRows: number;
  readonly fullPasses: number;
}

interface UnitState {
  readonly rows: readonly { kind: 'run' | 'calibration'; id: number; digest: string; intact: boolean }[];
  readonly damaged: readonly DamagedRow[];
  readonly heads: readonly StoredRun[];
  /** The attempts of all the unit's runs, as a listing shows them; worked out once per verification. */
  readonly facts: ReturnType<typeof attemptFacts> | null;
}

/**
 * Least time between two background sweeps while changes keep arriving, in ms; beyond it the gap is
 * four times the last sweep's duration, so re-verifying the older rows takes at most a fifth of the
 * server's time (a sweep over 2 000 units takes tens of seconds on a busy 2-core machine).
 */
export const SWEEP_GAP_MS = 1_000;
const SWEEP_GAP_FACTOR = 4;

export function followStore(dir: string, options: { readonly sweepGapMs?: number } = {}): StoreFollower {
  const { sweepGapMs = SWEEP_GAP_MS } = options;
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
      const kind = e.kind === 'run' || e.kind === 'calibration' ? e.kind : 'chain';
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
    for (const unit of [...units.keys()]) if (!all.includes(unit)) units.delete(unit);
    for (const unit of all) {
      if (closed) return;
      verifyUnit(unit);
      await new Promise((done) => setImmediate(done));
    }
    maxRun = Math.max(maxRun, top.run);
    maxIteration = Math.max(maxIteration, top.iteration);
    fullPasses += 1;
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

  function schedule(): void {
    if (closed) return;
    if (full) {
      again = true;
      return;
    }
    if (sweepTimer) return;
    const wait = Math.max(0, lastSweepEnd + Math.max(sweepGapMs, SWEEP_GAP_FACTOR * lastSweepMs) - Date.now());
    sweepTimer = setTimeout(() => {
      sweepTimer = undefined;
      void runSweep();
    }, wait);
    sweepTimer.unref();
  }

  return {
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
    close() {
      closed = true;
      if (sweepTimer) clearTimeout(sweepTimer);
      db.close();
    },
  };
}

/** The audit and listing as they stand: the same problems auditStore names, in the same words. */
function snapshot(entries: readonly ChainEntry[], linkProblems: readonly AuditProblem[], units: ReadonlyMap<string, UnitState>, head: string, verifiedRows: number, fullPasses: number): FollowedStore {
  const problems: AuditProblem[] = [...linkProblems];
  const byRow = new Map(entries.map((e) => [`${e.kind}:${e.row_id}`, e]));
  const present = new Set<string>();
  for (const [unit, s] of units) {
    for (const d of s.damaged) {
      present.add(`${d.kind}:${d.id}`);
      problems.push({ kind: d.kind, id: d.id, unit: d.unit, problem: 'damaged', detail: d.problem });
    }
    for (const r of s.rows) {
      present.add(`${r.kind}:${r.id}`);
      const entry = byRow.get(`${r.kind}:${r.id}`);
      if (!r.intact) problems.push({ kind: r.kind, id: r.id, unit, problem: 'changed', detail: 'its content no longer matches the fingerprint taken when it was stored' });
      else if (!entry) problems.push({ kind: r.kind, id: r.id, unit, problem: 'unchained', detail: 'it is not in the hash chain: it was not stored by benchproof' });
      else if (entry.row_digest !== r.digest) problems.push({ kind: r.kind, id: r.id, unit, problem: 'changed', detail: 'its fingerprint differs from the one the hash chain holds (it was edited and re-fingerprinted)' });
    }
  }
  for (const e of entries) {
    if ((e.kind === 'run' || e.kind === 'calibration') && !present.has(`${e.kind}:${e.row_id}`)) {
      problems.push({ kind: e.kind, id: e.row_id, unit: null, problem: 'missing', detail: 'it is in the hash chain but no longer in the store: it was deleted' });
    }
  }
  const audit: StoreAudit = { head, chained: entries.filter((e) => e.kind !== 'gap').length, archived: 0, problems };
  const listed = new Map<string | undefined, UnitSummary[]>();
  const list = (spec?: string): UnitSummary[] => {
    let found = listed.get(spec);
    if (!found) listed.set(spec, (found = listFollowed(units, problems, spec)));
    return [...found];
  };
  return { audit, units: list, verifiedRows, fullPasses };
}

/** listUnits over the kept heads: first and latest run under the spec, attempts over all the unit's runs. */
function listFollowed(units: ReadonlyMap<string, UnitState>, problems: readonly AuditProblem[], spec?: string): UnitSummary[] {
  const unverified = new Map<string, Set<number>>();
  for (const p of problems) {
    if (p.kind !== 'run' || p.id === null || p.unit === null) continue;
    unverified.set(p.unit, (unverified.get(p.unit) ?? new Set()).add(p.id));
  }
  const out: UnitSummary[] = [];
  for (const [unit, s] of units) {
    const mine = spec === undefined ? s.heads : s.heads.filter((r) => r.spec.name === spec);
    if (mine.length === 0) continue;
    const first = mine[0];
    const last = mine[mine.length - 1];
    const bad = unverified.get(unit);
    out.push({
      unit,
      spec: last.spec,
      status: last.statement,
      firstStatement: first.statement,
      firstTestedAt: first.startedAt,
      lastTestedAt: last.startedAt,
      runs: mine.length,
      ...s.facts,
      ...(bad ? { unverifiedRuns: [...bad] } : {}),
    });
  }
  return out.sort((a, b) => compareSerials(a.unit, b.unit));
}
