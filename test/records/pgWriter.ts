/**
 * Child process for the shared store's concurrency test: `pgWriter.ts URL STATION UNIT_PREFIX COUNT UNITS`.
 * Stores COUNT runs through pgSaveRun as bench STATION, cycling over UNITS units named
 * `<UNIT_PREFIX>-<n>` (so processes given the same prefix test the same units at once), and prints
 * `stored <id> <unit> <attempt>` after each commit.
 */
import { writeSync } from 'node:fs';
import { PgSyncClient } from '../../src/records/engines/pgSync.js';
import { pgSaveRun } from '../../src/records/engines/pgSaveRun.js';
import { kestrelRun } from './fixtures/kestrelRun.js';

const [url, station, prefix, countText, unitsText] = process.argv.slice(2);
const client = new PgSyncClient(url);
try {
  for (let i = 0; i < Number(countText); i++) {
    const unit = `${prefix}-${String(i % Number(unitsText)).padStart(2, '0')}`;
    const run = { ...kestrelRun({ unit, startedAt: new Date(Date.UTC(2026, 11, 5, 9, 0, i)).toISOString(), seed: 100 + i }), station };
    const stored = pgSaveRun(client, run);
    writeSync(1, `stored ${stored.id} ${stored.unit} ${stored.attempt}\n`);
  }
} finally {
  client.close();
}
