/**
 * The throwaway cluster the PostgreSQL store tests run against: it starts, answers over its Unix
 * socket through the `pg` driver, and leaves nothing behind. Skips with a note without the server.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync } from 'node:fs';
import pg from 'pg';
import { isSkipped, startPgCluster } from '../helpers/pgCluster.js';
import type { PgCluster } from '../helpers/pgCluster.js';

const started = startPgCluster();
const skip = isSkipped(started) ? started.skip : undefined;
if (skip) console.warn(`note: PostgreSQL tests skipped: ${skip}`);

describe.skipIf(skip !== undefined)('the throwaway PostgreSQL cluster', () => {
  let cluster: PgCluster;
  beforeAll(() => {
    cluster = started as PgCluster;
  });
  afterAll(() => {
    if (!isSkipped(started)) started.stop();
  });

  it('pgCluster answers a query over its Unix socket through the pg driver when started', async () => {
    const url = cluster.createDatabase('smoke');
    const client = new pg.Client({ connectionString: url });
    await client.connect();
    try {
      const { rows } = await client.query<{ v: string }>("SELECT current_setting('server_version_num') AS v");
      // Debian's postgresql package is PostgreSQL 15 (server_version_num 15xxxx, PostgreSQL docs "SHOW").
      expect(Math.floor(Number(rows[0].v) / 10_000)).toBe(15);
    } finally {
      await client.end();
    }
  });

  it('pgCluster removes its whole folder when stopped', () => {
    const other = startPgCluster();
    if (isSkipped(other)) throw new Error(other.skip);
    expect(existsSync(other.root)).toBe(true);
    other.stop();
    expect(existsSync(other.root)).toBe(false);
  });
});
