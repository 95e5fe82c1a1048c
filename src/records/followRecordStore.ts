/**
 * The board's verified view for any RecordStore, built on its public interface only: the shared
 * store on PostgreSQL (engines/pgStore.ts) has no database file to watch and no local SQLite to read,
 * so this follower asks the store for its chain head and, when the head moved (a run stored by this
 * server or by another bench), opens the store again and verifies what was added after the head it
 * last verified, as followStore.ts does on the embedded store: the listing's checks over the whole
 * store (every chain link, every run against the chain and its summary: what `units` verifies, a few
 * microseconds a run), and each unit with rows stored since verified in full as reading it does
 * (runs re-hashed, captures); the problems the last full verification found in older rows are kept.
 * When the head it verified is no longer where it was in the chain, it verifies everything again.
 * Between changes every answer comes from the last verified view, with one query for the head.
 *
 * The first view, and each background re-check, is the whole audit (fingerprints of every run, hash
 * chain, every capture: about 2 ms a run on a busy 2-core machine against a local server), so
 * verifications are spaced to take at most `share` (a fifth) of the server's time: a head
 * that moves again soon after a verification is answered from the last verified view and caught up
 * with in the background a moment later. `marker()` holds the store's head now and the verified one,
 * so a change marker built on it moves both when a run is stored and when the view catches up.
 *
 * A row edited in place with the store's guards removed leaves the chain head as it was, so the
 * store is verified again in the background as well (`recheckMs` apart at least, and spaced as
 * above); the problems found are part of `marker()` too.
 *
 * Each verified view holds two handles opened in 'mark' mode: one for the audit and the listing, and
 * one for unit reads, whose per-unit verification fetches the unit's captures into this bench's
 * archive (re-hashed on the way), where the plots read them. The caller decides whether problems
 * refuse an answer (as the CLI does, unless --allow-unverified).
 */
import type { StoredRun, UnitSummary } from '../types/index.js';
import type { ChainMark, RecordStore } from './openStore.js';
import type { AuditProblem, StoreAudit } from './auditStore.js';
import type { FollowedStore, StoreFollower } from './followStore.js';

export interface RecordStoreFollower extends StoreFollower {
  /** The store's chain head now and the problems last found: changes with every run stored and when a re-check finds something new. */
  marker(): string;
}

/** Least time between two background re-checks of an unchanged store, in ms. */
export const RECHECK_MS = 30_000;
/** Most of the server's time spent verifying: a head that moves sooner is caught up with later. */
export const VERIFY_SHARE = 0.2;

interface View {
  readonly head: string;
  /** Where the verified head is in the chain, for the next verification to start after it. */
  readonly mark: ChainMark;
  readonly listing: RecordStore;
  /** Opened on the first unit read of this view. */
  units?: RecordStore;
  readonly snap: FollowedStore;
}

export interface FollowRecordStoreOptions {
  readonly recheckMs?: number;
  /** Share of the time verification may take (0 < share ≤ 1); 1 verifies at every answer after a change. */
  readonly share?: number;
}

export function followRecordStore(open: () => RecordStore, options: FollowRecordStoreOptions = {}): RecordStoreFollower {
  const { recheckMs = RECHECK_MS, share = VERIFY_SHARE } = options;
  let view: View | undefined;
  let verifiedRows = 0;
  let fullPasses = 0;
  /** The last verification failed (the store out of reach): the next answer tries again at once. */
  let failed = false;
  let closed = false;
  let lastMs = 0;
  let lastEnd = 0;
  let timer: NodeJS.Timeout | undefined;
  let timerAt = Infinity;

  /** The wait after a verification that keeps verifying within its share of the time. */
  const gap = (): number => lastMs * (1 / share - 1);

  /** Verify what was added since `previous` (everything when there is none, or when its head moved in the chain). */
  const verify = (previous: View | undefined): View => {
    const started = Date.now();
    const listing = open();
    try {
      // The head first: a run stored while verifying moves the head past it, so the next answer looks again.
      const head = listing.chainHead();
      const added = previous && listing.auditAdded(previous.mark);
      let audit: StoreAudit;
      if (previous && added) {
        audit = joined(listing.audit('listing'), previous.snap.audit, added.problems, new Set(added.units));
        verifiedRows += added.rows;
      } else {
        audit = listing.audit();
        verifiedRows += audit.chained;
        fullPasses += 1;
      }
      const snap = followedView(listing, audit, verifiedRows, fullPasses);
      lastEnd = Date.now();
      lastMs = lastEnd - started;
      return { head, mark: { seq: audit.chained, link: audit.head }, listing, snap };
    } catch (err) {
      listing.close();
      throw err;
    }
  };

  const replace = (whole = false): View => {
    failed = true;
    const next = verify(whole ? undefined : view);
    failed = false;
    const old = view;
    view = next;
    old?.listing.close();
    old?.units?.close();
    wake(lastEnd + Math.max(recheckMs, gap()));
    return next;
  };

  /** Verify in the background at `at` (the earlier of this and any wake already set). */
  function wake(at: number): void {
    if (closed || (timer && timerAt <= at)) return;
    if (timer) clearTimeout(timer);
    timerAt = at;
    timer = setTimeout(() => {
      timer = undefined;
      timerAt = Infinity;
      try {
        replace(true);
      } catch {
        // The store is out of reach or failing: the next answer opens it again and says why.
      }
    }, Math.max(0, at - Date.now()));
    timer.unref();
  }

  /** The head the view's handle sees now; undefined when that handle failed (a connection lost). */
  const liveHead = (v: View): string | undefined => {
    try {
      return v.listing.chainHead();
    } catch {
      return undefined;
    }
  };

  const current = (): View => {
    if (closed) throw new RangeError('followRecordStore: the follower is closed');
    if (!view || failed) return replace();
    const live = liveHead(view);
    if (live === view.head) return view;
    if (live === undefined || Date.now() >= lastEnd + gap()) return replace();
    // Verified a moment ago and the head moved again: answer from that view and catch up soon; the
    // marker moves when the new view is in, so the page asks again.
    wake(lastEnd + gap());
    return view;
  };

  const unitStore = (): { v: View; store: RecordStore } => {
    const v = current();
    v.units ??= open();
    return { v, store: v.units };
  };

  return {
    async catchUp() {
      return current().snap;
    },
    // Every run stored moves the head, which each answer compares; an edit in place moves nothing,
    // so only the background re-check can find it: there is nothing more to do on a change.
    changed() {},
    async unitRuns(serial) {
      const { v, store } = unitStore();
      const runs = store.runs({ unit: serial });
      return { runs: marked(runs, v.snap.audit), audit: v.snap.audit };
    },
    async unitRecord(serial) {
      const { v, store } = unitStore();
      const record = store.unitRecord(serial);
      return { record: record && { ...record, runs: marked(record.runs, v.snap.audit) }, audit: v.snap.audit };
    },
    marker() {
      // The first look verifies (it throws, and so marks, while the store is out of reach).
      const v = view ?? current();
      const head = liveHead(v);
      if (head === undefined) return 'failed';
      return `${head}|${v.head}|${v.snap.audit.problems.map((p) => `${p.kind}:${p.id}:${p.problem}`).join(',')}`;
    },
    close() {
      closed = true;
      if (timer) clearTimeout(timer);
      view?.listing.close();
      view?.units?.close();
      view = undefined;
    },
  };
}

/**
 * The audit of a view verified incrementally: the listing's checks over the whole store as found now,
 * the problems the last view named in units not verified again, and those of the units verified again.
 */
function joined(listing: StoreAudit, last: StoreAudit, added: readonly AuditProblem[], again: ReadonlySet<string>): StoreAudit {
  const kept = last.problems.filter((p) => p.unit === null || !again.has(p.unit));
  const seen = new Set<string>();
  const problems = [...listing.problems, ...kept, ...added].filter((p) => {
    const key = `${p.kind}:${p.id}:${p.problem}:${p.detail}`;
    return !seen.has(key) && (seen.add(key), true);
  });
  return { ...listing, archived: last.archived, problems };
}

/** The audit and listing of one verified handle; each spec's listing read once and kept. */
function followedView(listing: RecordStore, audit: StoreAudit, verifiedRows: number, fullPasses: number): FollowedStore {
  const listed = new Map<string | undefined, readonly UnitSummary[]>();
  return {
    audit,
    units(spec) {
      let found = listed.get(spec);
      if (!found) listed.set(spec, (found = listing.listUnits(spec === undefined ? {} : { spec })));
      return found;
    },
    verifiedRows,
    fullPasses,
  };
}

/** Runs the view's audit names, marked not intact, in case the unit handle verified an earlier state. */
function marked(runs: readonly StoredRun[], audit: StoreAudit): StoredRun[] {
  const bad = new Set(audit.problems.filter((p) => p.kind === 'run' && p.id !== null).map((p) => p.id));
  return runs.map((r) => (r.intact && bad.has(r.id) ? { ...r, intact: false } : r));
}
