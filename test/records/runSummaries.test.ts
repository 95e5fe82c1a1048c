/**
 * Run summaries (schema 7, runSummary.ts): what `units` and `batch` read and verify instead of every
 * full verdict. Expected values: the canonical JSON rule of digest.ts (object keys sorted, as
 * JSON.stringify writes each value); the listing an older release printed for the fixture store
 * (attemptsMigration.test.ts: FK-0101 PASS 1 run, FK-0102 NOT MEASURED 1 run, FK-0103 FAIL 3 runs,
 * FK-0106 FAIL 2 runs); and, for the batch, summarizeBatch over the full runs read back and re-hashed.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { fileURLToPath } from 'node:url';
import Database from 'better-sqlite3';
import { canonicalJson, openStore, summarizeBatch } from '../../src/records/index.js';
import { summaryDocument, summaryText } from '../../src/records/runSummary.js';
import type { SummaryHeadRow } from '../../src/records/runSummary.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { fillDemoStore } from './helpers/fixtureStore.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

const FIXTURE = fileURLToPath(new URL('./fixtures/store-c320a2a.records.db.gz', import.meta.url));

let root: string;
beforeEach(() => {
  root = makeTempDir();
});
afterEach(() => removeTempDir(root));

/** The fixture store of the release before attempts (schema 3), records.db only. */
function oldStore(): string {
  const dir = join(root, 'benchproof-data');
  mkdirSync(dir);
  writeFileSync(join(dir, 'records.db'), gunzipSync(readFileSync(FIXTURE)));
  return dir;
}

describe('run summaries', () => {
  it('summaryText writes exactly the canonical JSON of the summary document, with and without attempt columns', () => {
    const text = fc.string({ unit: 'binary' });
    const row = fc.record({
      id: fc.nat(), unit: text, kind: text, started_at: text, stored_at: text, operator: text, station: text, spec_name: text,
      spec_revision: text, spec_sha256: text, tool_version: text, statement: text, digest: text,
      attempt: fc.option(fc.integer({ min: 1, max: 1000 })), attempt_reason: fc.option(text), note: fc.option(text),
    });
    fc.assert(
      fc.property(row, text, text, (r: SummaryHeadRow, verdictSha, checksSha) => {
        const state = canonicalJson({ statement: 'pass', waitingFor: [], conditions: [{ condition: verdictSha, statement: 'pass' }] });
        expect(summaryText(r, verdictSha, checksSha, state)).toBe(canonicalJson(summaryDocument(r, verdictSha, checksSha, state)));
      }),
    );
  });

  it('fills a summary for every run of an older store on upgrade, chained after its entries, and lists it as that release did', () => {
    const dir = oldStore();
    const store = openStore(dir, { mode: 'read' });
    const units = store.listUnits().map((u) => [u.unit, u.status, u.runs]);
    const audit = store.audit('listing');
    store.close();
    // The release's own `units` output for this store (see the file header).
    expect(units).toEqual([
      ['FK-0101', 'pass', 1],
      ['FK-0102', 'not-measured', 1],
      ['FK-0103', 'fail', 3],
      ['FK-0106', 'fail', 2],
    ]);
    expect(audit.problems).toEqual([]);
    const db = new Database(join(dir, 'records.db'), { readonly: true });
    const kinds = (db.prepare('SELECT kind FROM chain ORDER BY seq').all() as { kind: string }[]).map((r) => r.kind);
    const summarised = db.prepare('SELECT COUNT(*) AS n FROM run_summaries').get() as { n: number };
    db.close();
    // 7 runs and 2 calibration iterations chained by schema 4, then one summary entry per run.
    expect(kinds.slice(-7)).toEqual(Array(7).fill('summary'));
    expect(kinds.filter((k) => k !== 'summary')).toHaveLength(9);
    expect(summarised.n).toBe(7);
  });

  it('gives no summary to a run that fails its fingerprint when the store is upgraded, so every listing names it', () => {
    const dir = oldStore();
    const db = new Database(join(dir, 'records.db'));
    db.exec("DROP TRIGGER runs_no_update; UPDATE runs SET operator = 'someone else' WHERE id = 2");
    db.close();
    const store = openStore(dir, { mode: 'read', unverified: 'mark' });
    const problems = store.audit('listing').problems.map((p) => [p.id, p.unit, p.problem]);
    const fk0106 = store.listUnits().find((u) => u.unit === 'FK-0106');
    store.close();
    expect(problems).toEqual([[2, 'FK-0106', 'changed']]);
    expect(fk0106?.unverifiedRuns).toEqual([2]);
    const raw = new Database(join(dir, 'records.db'), { readonly: true });
    expect(raw.prepare('SELECT run_id FROM run_summaries ORDER BY run_id').all()).toEqual([1, 3, 4, 5, 6, 7].map((run_id) => ({ run_id })));
    raw.close();
  });

  it('gives batch the same statistics from summaries as from the full runs read back and re-hashed', () => {
    const dir = fillDemoStore(root);
    const store = openStore(dir);
    store.saveRun(kestrelRun({ unit: 'FK-0105', startedAt: '2026-03-06T09:00:00.000Z', frequencyScale: 1.01 }));
    const light = summarizeBatch(store.batchRuns(), {});
    const full = summarizeBatch(store.runs(), {});
    store.close();
    expect(light).toEqual(full);
    const frequency = light.specs[0].measurements.find((m) => m.measurement === 'frequency' && m.condition === 'mid');
    expect(frequency?.count).toBe(5);
    // Mean of the five units' latest values, computed here from the full runs (not through the summaries).
    const values = full.specs[0].measurements.find((m) => m.measurement === 'frequency' && m.condition === 'mid')!.values.map((v) => v.value);
    expectWithin(frequency!.mean!, values.reduce((a, b) => a + b, 0) / values.length, { rel: 1e-12 }, 'arithmetic mean of the full runs\u2019 values');
  });
});
