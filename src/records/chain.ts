/**
 * The hash chain over the store. Every stored row that carries a fingerprint (a check run, a
 * calibration iteration; later kinds append the same way) gets one entry in `chain`, in insertion
 * order, written in the same transaction as the row. Each entry's link is SHA-256 over the link
 * before it, the row's kind and number, and the row's fingerprint:
 *
 *   link(n) = SHA-256("benchproof-chain-1\n" + link(n−1) + "\n" + kind + "\n" + id + "\n" + digest(n))
 *
 * with link(0) = 64 zeros. An edit of a row changes its fingerprint; deleting, inserting or
 * reordering rows or entries breaks every link after the place; so the newest link (the chain head,
 * printed in every report) pins the whole store as it was. Hash chaining after Haber and Stornetta,
 * "How to time-stamp a digital document", J. Cryptology 3 (1991).
 */
import type { Database } from 'better-sqlite3';
import { sha256Hex } from './digest.js';

/** 'summary': a run's summary row (runSummary.ts), chained under the run's number after the run itself. */
export type ChainKind = 'run' | 'calibration' | 'summary';

export const CHAIN_START = '0'.repeat(64);

export function chainLink(previous: string, kind: ChainKind, rowId: number, digest: string): string {
  return sha256Hex(`benchproof-chain-1\n${previous}\n${kind}\n${rowId}\n${digest}`);
}

/** The newest link, or CHAIN_START for a store with no rows. */
export function chainHead(db: Database): string {
  const row = db.prepare('SELECT link FROM chain ORDER BY seq DESC LIMIT 1').get() as { link: string } | undefined;
  return row?.link ?? CHAIN_START;
}

/** Append the entry of a row just inserted; call inside the row's write transaction. */
export function appendLink(db: Database, kind: ChainKind, rowId: number, digest: string): string {
  const link = chainLink(chainHead(db), kind, rowId, digest);
  db.prepare('INSERT INTO chain (kind, row_id, row_digest, link) VALUES (?, ?, ?, ?)').run(kind, rowId, digest, link);
  return link;
}

export interface ChainEntry {
  readonly seq: number;
  readonly kind: string;
  readonly row_id: number;
  readonly row_digest: string;
  readonly link: string;
}

/** A chain entry as both engines read it: [seq, kind, row_id, row_digest, link]. */
export type ChainArray = readonly [number, string, number, string, string];

/** Every entry in order, as arrays (better-sqlite3's row objects cost several times more to build for a long chain). */
export function chainRows(db: Database): ChainArray[] {
  return db.prepare('SELECT seq, kind, row_id, row_digest, link FROM chain ORDER BY seq').raw(true).all() as ChainArray[];
}

export function chainEntries(db: Database): ChainEntry[] {
  return chainRows(db).map(entryOf);
}

export const entryOf = ([seq, kind, row_id, row_digest, link]: ChainArray): ChainEntry => ({ seq, kind, row_id, row_digest, link });
