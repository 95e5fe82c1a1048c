/**
 * Capture bytes in the shared store, content-addressed by SHA-256: one `blobs` row per distinct
 * capture and its bytes in `capture_chunks`, 1 MiB per row. Inside the database rather than in a
 * shared folder because a network folder is exactly what the shared store replaces (its locking and
 * its half-written files are how records got lost), and because a capture then commits in the same
 * transaction as the run that names it: no run can point at bytes that never arrived. Chunks keep
 * each row far below PostgreSQL's 1 GB field limit and let a large capture be read piecewise.
 *
 * Writing a capture already stored adds nothing (the same hash is the same bytes). Every read
 * recomputes the SHA-256 and the size and refuses bytes that do not match (`records.capture-changed`).
 */
import { createHash } from 'node:crypto';
import { BenchError } from '../../types/index.js';
import type { PgSyncClient } from './pgSync.js';

export const CHUNK_BYTES = 1 << 20;

/** Store the capture's bytes unless that hash is stored already; call inside the run's transaction. */
export function putCapture(client: PgSyncClient, bytes: Buffer, file: string, storedAt: string): string {
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  // `file` is the name the capture has in a bench's archive (archive.ts), where it is kept once read.
  const added = client.query('INSERT INTO blobs (sha256, size, file, first_stored_at) VALUES ($1, $2, $3, $4) ON CONFLICT (sha256) DO NOTHING', [sha256, bytes.length, file, storedAt]);
  if (added.rowCount === 0) return sha256;
  for (let seq = 0, at = 0; at < bytes.length || seq === 0; seq++, at += CHUNK_BYTES) {
    client.query('INSERT INTO capture_chunks (sha256, seq, bytes) VALUES ($1, $2, $3)', [sha256, seq, bytes.subarray(at, at + CHUNK_BYTES)]);
  }
  return sha256;
}

/** The capture's bytes, verified against its hash and size; `shown` names the store in errors. */
export function readCapture(client: PgSyncClient, sha256: string, shown: string): Buffer {
  const blob = client.query<{ size: string }>('SELECT size FROM blobs WHERE sha256 = $1', [sha256]).rows[0];
  if (!blob) throw captureError(shown, sha256, 'records.capture-missing', 'no capture with this SHA-256 is stored');
  const chunks = client.query<{ seq: number; bytes: Buffer }>('SELECT seq, bytes FROM capture_chunks WHERE sha256 = $1 ORDER BY seq', [sha256]).rows;
  const gap = chunks.findIndex((c, i) => c.seq !== i);
  if (chunks.length === 0 || gap >= 0) throw captureError(shown, sha256, 'records.capture-missing', `part ${gap >= 0 ? gap : 0} of the capture's bytes is missing`);
  const bytes = Buffer.concat(chunks.map((c) => c.bytes));
  const actual = createHash('sha256').update(bytes).digest('hex');
  if (actual !== sha256 || bytes.length !== Number(blob.size)) {
    throw captureError(shown, sha256, 'records.capture-changed', `the stored bytes hash to ${actual.slice(0, 12)}… (${bytes.length} bytes), not the SHA-256 and size recorded`);
  }
  return bytes;
}

function captureError(shown: string, sha256: string, code: 'records.capture-missing' | 'records.capture-changed', problem: string): BenchError {
  return new BenchError({
    code,
    file: shown,
    problem: `capture ${sha256.slice(0, 12)}…: ${problem}`,
    expected: 'the capture bytes exactly as stored when the run was checked',
    fix: 'restore the shared store from its last backup; the runs that name this capture are marked until then',
  });
}
