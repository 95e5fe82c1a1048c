/**
 * The listing's verification (auditStore.ts, judgeListing) over the rows as both engines read them
 * (arrays, never objects): every chain link recomputed from the one before it, every run row against
 * its chain entry, every run summary re-hashed against its fingerprint and against its own chain entry,
 * every chain entry of a run or calibration iteration matched by a row, and the calibration
 * iterations as judgeStore judges them. It answers only whether all of that holds: when anything
 * fails, judgeListing judges the same rows again the slow way, which names each problem in its words.
 * A test (listingFast.test.ts) holds the two to the same answer on a store tampered in each of a dozen
 * ways (rows and summaries edited or deleted, chain entries edited or deleted, fingerprints swapped).
 *
 * It exists for speed: a listing of 50 000 runs verifies 100 000 links and 50 000 summaries, and
 * making an object of each row cost more than the hashing (objects kept alive for the whole listing
 * are what the garbage collector spends its time on).
 */
import type { StoredCalibrationRun } from '../types/index.js';
import { CHAIN_START, chainLink } from './chain.js';
import type { ChainArray } from './chain.js';
import type { DamagedRow } from './readRuns.js';
import { sha256Hex } from './digest.js';
import { S, summaryTextAt } from './runSummary.js';
import type { SummaryArray } from './runSummary.js';

export interface ListingCheck {
  /** True when judgeListing would name no problem. */
  readonly holds: boolean;
  /** The newest link as stored (what judgeStore reports as the head). */
  readonly head: string;
}

/** A listing's row carries the database's answer (listingColumns: 1 or true); a full row is hashed here. */
function summaryHolds(r: SummaryArray): boolean {
  if (r.length > S.holds) return r[S.holds] === 1 || r[S.holds] === true;
  const text = summaryTextAt(r);
  return text !== undefined && sha256Hex(text) === r[S.summaryDigest];
}

export function checkListing(
  chain: readonly ChainArray[],
  summaries: readonly SummaryArray[],
  calibrations: { readonly runs: readonly StoredCalibrationRun[]; readonly damaged: readonly DamagedRow[] },
): ListingCheck {
  let holds = calibrations.damaged.length === 0;
  let previous = CHAIN_START;
  let seq = 0;
  const runEntries = new Map<number, string>();
  const summaryEntries = new Map<number, string>();
  const calibrationEntries = new Map<number, string>();
  for (const [at, kind, rowId, digest, link] of chain) {
    if (at !== seq + 1 || link !== chainLink(previous, kind as 'run', rowId, digest)) holds = false;
    previous = link;
    seq = at;
    if (kind === 'run') runEntries.set(rowId, digest);
    else if (kind === 'summary') summaryEntries.set(rowId, digest);
    else if (kind === 'calibration') calibrationEntries.set(rowId, digest);
  }
  if (!holds) return { holds, head: previous };
  // Every run row is chained with the fingerprint its summary repeats, and its summary holds and is chained.
  for (const r of summaries) {
    const id = Number(r[S.id]);
    if (runEntries.get(id) !== String(r[S.digest]) || !summaryHolds(r) || summaryEntries.get(id) !== r[S.summaryDigest]) {
      return { holds: false, head: previous };
    }
  }
  // Each row matched one entry (ids are unique); an entry left over is a row deleted.
  if (runEntries.size !== summaries.length) return { holds: false, head: previous };
  let iterations = 0;
  for (const c of calibrations.runs) {
    for (const i of c.iterations) {
      iterations += 1;
      if (!i.intact || calibrationEntries.get(i.id) !== i.digest) return { holds: false, head: previous };
    }
  }
  return { holds: iterations === calibrationEntries.size, head: previous };
}
