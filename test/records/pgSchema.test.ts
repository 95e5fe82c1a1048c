/**
 * The shared store's schema and capture archive on a throwaway PostgreSQL cluster: the same
 * numbered steps as the embedded store, a newer schema refused, the append-only rule, and captures
 * content-addressed in chunks, verified on every read. Skips without the server.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { PgSyncClient } from '../../src/records/engines/pgSync.js';
import { isUnreachable } from '../../src/records/engines/pgErrors.js';
import { applyPgMigrations, pgSchemaVersion } from '../../src/records/engines/pgSchema.js';
import { CHUNK_BYTES, putCapture, readCapture } from '../../src/records/engines/pgCaptures.js';
import { LATEST_SCHEMA, MIGRATIONS } from '../../src/records/index.js';
import { isSkipped, startPgCluster } from '../helpers/pgCluster.js';
import type { PgCluster } from '../helpers/pgCluster.js';

const started = startPgCluster();
const skip = isSkipped(started) ? started.skip : undefined;
if (skip) console.warn(`note: PostgreSQL tests skipped: ${skip}`);
afterAll(() => {
  if (!isSkipped(started)) started.stop();
});

const SHOWN = 'postgres://postgres@/schema';

function caught(fn: () => unknown): unknown {
  try {
    fn();
  } catch (err) {
    return err;
  }
  throw new Error('expected a throw');
}

describe.skipIf(skip !== undefined)('the shared store schema', () => {
  const cluster = started as PgCluster;

  it('applyPgMigrations brings an empty database to the latest schema, logging every step once, and again changes nothing', () => {
    const c = new PgSyncClient(cluster.createDatabase('fresh'));
    try {
      expect(pgSchemaVersion(c)).toBe(0);
      expect(applyPgMigrations(c, SHOWN)).toBe(LATEST_SCHEMA);
      expect(applyPgMigrations(c, SHOWN)).toBe(LATEST_SCHEMA);
      const log = c.query<{ version: number }>('SELECT version FROM schema_migrations ORDER BY version').rows.map((r) => r.version);
      expect(log).toEqual(MIGRATIONS.map((m) => m.version));
    } finally {
      c.close();
    }
  });

  it('applyPgMigrations refuses a store written by a newer schema with records.newer-schema and leaves it untouched', () => {
    const url = cluster.createDatabase('newer');
    const c = new PgSyncClient(url);
    try {
      applyPgMigrations(c, SHOWN);
      c.query("INSERT INTO schema_migrations (version, name, applied_at) VALUES ($1, 'from the future', '2030-01-01T00:00:00Z')", [LATEST_SCHEMA + 1]);
      expect(caught(() => applyPgMigrations(c, SHOWN))).toMatchObject({ code: 'records.newer-schema' });
      expect(pgSchemaVersion(c)).toBe(LATEST_SCHEMA + 1);
    } finally {
      c.close();
    }
  });

  it('the shared store refuses to change or remove a stored row (append-only), but lets a spec text be added once', () => {
    const c = new PgSyncClient(cluster.createDatabase('appendonly'));
    try {
      applyPgMigrations(c, SHOWN);
      c.query("INSERT INTO specs (sha256, name, revision) VALUES ('ab', 'FH-210', 'C')");
      c.query("UPDATE specs SET text = 'frequency: 1 kHz' WHERE sha256 = 'ab'");
      expect(caught(() => c.query("UPDATE specs SET text = 'changed' WHERE sha256 = 'ab'"))).toMatchObject({ message: expect.stringContaining('append-only') });
      expect(caught(() => c.query("DELETE FROM specs WHERE sha256 = 'ab'"))).toMatchObject({ message: expect.stringContaining('append-only') });
    } finally {
      c.close();
    }
  });
});

describe.skipIf(skip !== undefined)('captures in the shared store', () => {
  const cluster = started as PgCluster;

  it('putCapture stores a capture once by its SHA-256 and readCapture returns the same bytes across chunk edges', () => {
    const c = new PgSyncClient(cluster.createDatabase('captures'));
    try {
      applyPgMigrations(c, SHOWN);
      // 2.5 chunks of a seeded byte pattern; expected hash from node:crypto (an independent SHA-256).
      const bytes = Buffer.alloc(CHUNK_BYTES * 2 + CHUNK_BYTES / 2);
      for (let i = 0, x = 12345; i < bytes.length; i++) bytes[i] = (x = (x * 1103515245 + 12345) >>> 0) >>> 24;
      const expected = createHash('sha256').update(bytes).digest('hex');
      const sha = c.transaction(() => putCapture(c, bytes, 'captures/x.csv', '2026-12-05T10:00:00Z'));
      expect(sha).toBe(expected);
      c.transaction(() => putCapture(c, bytes, 'captures/x.csv', '2026-12-05T11:00:00Z'));
      expect(Number(c.query<{ n: string }>('SELECT COUNT(*) AS n FROM capture_chunks').rows[0].n)).toBe(3);
      expect(readCapture(c, sha, SHOWN).equals(bytes)).toBe(true);
      const empty = c.transaction(() => putCapture(c, Buffer.alloc(0), 'captures/e.csv', '2026-12-05T12:00:00Z'));
      expect(readCapture(c, empty, SHOWN).length).toBe(0);
    } finally {
      c.close();
    }
  });

  it('readCapture refuses bytes changed behind the store with records.capture-changed', () => {
    const url = cluster.createDatabase('tampered');
    const c = new PgSyncClient(url);
    try {
      applyPgMigrations(c, SHOWN);
      const sha = c.transaction(() => putCapture(c, Buffer.from('t,ch1\n0,0.5\n1e-6,0.6\n'), 'captures/s.csv', '2026-12-05T10:00:00Z'));
      // A superuser going around the triggers, as a restore from a damaged backup would.
      cluster.psql("SET session_replication_role = replica; UPDATE capture_chunks SET bytes = convert_to('t,ch1 0,0.5 1e-6,0.7', 'UTF8')", 'tampered');
      expect(caught(() => readCapture(c, sha, SHOWN))).toMatchObject({ code: 'records.capture-changed' });
      expect(caught(() => readCapture(c, 'f'.repeat(64), SHOWN))).toMatchObject({ code: 'records.capture-missing' });
    } finally {
      c.close();
    }
  });

  it('a server killed inside a write transaction keeps none of it: the capture is absent after restart', () => {
    const url = cluster.createDatabase('killed');
    const c = new PgSyncClient(url);
    applyPgMigrations(c, SHOWN);
    const bytes = Buffer.from('t,ch1\n0,0.25\n');
    const err = caught(() =>
      c.transaction(() => {
        putCapture(c, bytes, 'captures/x.csv', '2026-12-05T10:00:00Z');
        cluster.kill(); // immediate stop: no checkpoint, like a power cut of the server
        return c.query('SELECT 1');
      }),
    );
    c.close();
    cluster.restart();
    expect(isUnreachable(err)).toBe(true);
    const d = new PgSyncClient(url);
    try {
      expect(Number(d.query<{ n: string }>('SELECT COUNT(*) AS n FROM blobs').rows[0].n)).toBe(0);
      expect(Number(d.query<{ n: string }>('SELECT COUNT(*) AS n FROM capture_chunks').rows[0].n)).toBe(0);
    } finally {
      d.close();
    }
  });
});
