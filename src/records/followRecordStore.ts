/**
 * The board's verified view for any RecordStore, built on its public interface only: the shared
 * store on PostgreSQL (engines/pgStore.ts) has no database file to watch and no local SQLite to read,
 * so this follower asks the store for its chain head and, when the head moved (a run stored by this
 * server or by another bench), opens the store again and verifies it the way `units` and `record` do:
 * the whole audit (fingerprints, hash chain, every capture), then the listing. Between changes every
 * answer comes from the last verified view, with one query for the head.
 *
 * A row edited in place with the store's guards removed leaves the chain head as it was, so the
 * store is verified again in the background as well (`recheckMs` apart at least, and at least four
 * times the last verification's duration apart, so re-checking takes at most a fifth of the
 * server's time). Its problems are part of `marker()`, so a change marker that includes it tells the
 * page when a re-check found something new.
 *
 * Each verified view holds two handles opened in 'mark' mode: one for the audit and the listing, and
 * one for unit reads, whose per-unit verification fetches the unit's captures into this bench's
 * archive (re-hashed on the way), where the plots read them. The caller decides whether problems
 * refuse an answer (as the CLI does, unless --allow-unverified).
 */
import type { StoredRun, UnitSummary } from '../types/index.js';
import type { RecordStore } from './openStore.js';
import type { StoreAudit } from './auditStore.js';
import type { FollowedStore, StoreFollower } from './followStore.js';

export interface RecordStoreFollower extends StoreFollower {
  /** The store's chain head now and the problems last found: changes with every run stored and when a re-check finds something new. */
  marker(): string;
}

/** Least time between two background re-checks of an unchanged store, in ms. */
export const RECHECK_MS = 30_000;
const RECHECK_FACTOR = 4;

interface View {
  readonly head: string;
  readonly listing: RecordStore;
  /** Opened on the first unit read of this view. */
  units?: RecordStore;
  readonly snap: FollowedStore;
}

export function followRecordStore(open: () => RecordStore, options: { readonly recheckMs?: number } = {}): RecordStoreFollower {
  const { recheckMs = RECHECK_MS } = options;
  let view: View | undefined;
  let verifiedRows = 0;
  let fullPasses = 0;
  /** Something changed that the head may not show (an edit in place): verify again at the next answer. */
  let stale = false;
  let closed = false;
  let lastMs = 0;
  let timer: NodeJS.Timeout | undefined;

  const verify = (): View => {
    const started = Date.now();
    const listing = open();
    try {
      // The head first: a run stored while verifying moves the head past it, so the next answer looks again.
      const head = listing.chainHead();
      const audit = listing.audit();
      verifiedRows += audit.chained;
      fullPasses += 1;
      const snap = followedView(listing, audit, verifiedRows, fullPasses);
      lastMs = Date.now() - started;
      return { head, listing, snap };
    } catch (err) {
      listing.close();
      throw err;
    }
  };

  const replace = (next: View): void => {
    const old = view;
    view = next;
    old?.listing.close();
    old?.units?.close();
  };

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
    if (view && !stale && liveHead(view) === view.head) return view;
    // Stays stale until a verification succeeds: a store out of reach is tried again at the next answer.
    stale = true;
    replace(verify());
    stale = false;
    return view as View;
  };

  const recheck = (): void => {
    timer = undefined;
    if (closed) return;
    try {
      replace(verify());
    } catch {
      // The store is out of reach or failing: the next answer opens it again and says why.
      stale = true;
    }
    plan();
  };
  function plan(): void {
    if (closed || timer) return;
    timer = setTimeout(recheck, Math.max(recheckMs, RECHECK_FACTOR * lastMs));
    timer.unref();
  }

  const unitStore = (): { v: View; store: RecordStore } => {
    const v = current();
    v.units ??= open();
    return { v, store: v.units };
  };

  return {
    async catchUp() {
      const v = current();
      plan();
      return v.snap;
    },
    changed() {
      stale = true;
    },
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
      if (head === undefined) {
        stale = true;
        return 'failed';
      }
      return `${head}|${v.snap.audit.problems.map((p) => `${p.kind}:${p.id}:${p.problem}`).join(',')}`;
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
