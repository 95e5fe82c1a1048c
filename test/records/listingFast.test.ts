/**
 * The listing's fast paths (listingCheck.ts, listUnitsFromRows in unitSummaries.ts) hold the same
 * answers as the object-by-object code they stand in for: the whole-row judgement of auditStore.ts
 * (judgeStore over the chain entries, run rows and summaries as objects) and, for the unit listing, the attempt functions composed over
 * lightRuns (listUnitsFrom here). The expected values come from that slower code, which the tampering tests hold to the
 * rules of chain.ts and runSummary.ts; here each store is tampered with one way at a time, as
 * someone with the database file could (common practice for tamper evidence, no source).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import type { Database as Db } from 'better-sqlite3';
import { judgeStore } from '../../src/records/auditStore.js';
import { chainRows, entryOf } from '../../src/records/chain.js';
import { checkListing } from '../../src/records/listingCheck.js';
import { readCalibrationRows } from '../../src/records/calibrationRead.js';
import { readListingArrays, readSummaryArrays } from '../../src/records/summaryReads.js';
import { summaryRowOf, summaryText, summaryTextSql } from '../../src/records/runSummary.js';
import type { SummaryHeadRow } from '../../src/records/runSummary.js';
import type { SummaryArray } from '../../src/records/runSummary.js';
import { lightRuns } from '../../src/records/batchRuns.js';
import { compareSerials, listUnitsFromRows } from '../../src/records/unitSummaries.js';
import { attemptFacts, numberRuns, summarizeAttempts } from '../../src/records/attempts.js';
import type { StoredRun, UnitSummary } from '../../src/types/index.js';
import { day, fillDemoStore } from './helpers/fixtureStore.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

/**
 * The reference for listUnitsFromRows: the same listing composed of the attempt functions that the
 * unit records use (numberRuns, summarizeAttempts, attemptFacts) over the light runs, one object per run.
 */
function listUnitsFrom(heads: readonly StoredRun[], spec?: string): UnitSummary[] {
  const byUnit = new Map<string, StoredRun[]>();
  for (const r of heads) {
    const list = byUnit.get(r.unit);
    if (list) list.push(r);
    else byUnit.set(r.unit, [r]);
  }
  const out: UnitSummary[] = [];
  for (const [unit, runs] of byUnit) {
    const scoped = spec === undefined ? runs : runs.filter((h) => h.spec.name === spec);
    if (scoped.length === 0) continue;
    const first = scoped[0];
    const last = scoped[scoped.length - 1];
    out.push({
      unit,
      spec: last.spec,
      status: last.statement,
      firstStatement: first.statement,
      firstTestedAt: first.startedAt,
      lastTestedAt: last.startedAt,
      runs: scoped.length,
      ...attemptFacts(summarizeAttempts(numberRuns(runs))),
    });
  }
  return out.sort((a, b) => compareSerials(a.unit, b.unit));
}

let root: string;
beforeEach(() => {
  root = makeTempDir();
});
afterEach(() => removeTempDir(root));

/** The listing's judgement made the slow way: every row an object, judged by judgeStore. */
function slowProblems(db: Db): number {
  const chain = chainRows(db);
  const rows = readSummaryArrays(db).map(summaryRowOf);
  const runs = rows.map((r) => ({ id: Number(r.id), unit: String(r.unit), digest: String(r.digest), intact: true, captures: [] }));
  return judgeStore({ entries: chain.map(entryOf), runs: { rows: runs, damaged: [] }, calibrations: readCalibrationRows(db), summaries: rows }).problems.length;
}

const TAMPERS: Record<string, (db: Db) => void> = {
  none: () => {},
  'run statement edited': (db) => db.exec("UPDATE runs SET statement = 'pass' WHERE unit = 'FK-0103'"),
  'run operator edited': (db) => db.exec("UPDATE runs SET operator = 'someone' WHERE id = 2"),
  'summary state edited': (db) => db.exec(`UPDATE run_summaries SET state_json = replace(state_json, '"fail"', '"pass"') WHERE run_id = 3`),
  'summary attempt edited': (db) => db.exec('UPDATE run_summaries SET attempt = 7 WHERE run_id = 1'),
  'summary deleted': (db) => db.exec('DELETE FROM run_summary_checks WHERE run_id = 4; DELETE FROM run_summaries WHERE run_id = 4'),
  'run deleted with its summary': (db) =>
    db.exec('DELETE FROM run_summary_checks WHERE run_id = 2; DELETE FROM run_summaries WHERE run_id = 2; DELETE FROM condition_results WHERE run_id = 2; DELETE FROM checks WHERE run_id = 2; DELETE FROM measurements WHERE run_id = 2; DELETE FROM causes WHERE run_id = 2; DELETE FROM run_captures WHERE run_id = 2; DELETE FROM runs WHERE id = 2'),
  'chain link edited': (db) => db.exec("UPDATE chain SET link = replace(link, substr(link, 1, 1), 'f') WHERE seq = 3"),
  'chain entry digest edited': (db) => db.exec("UPDATE chain SET row_digest = '00' || substr(row_digest, 3) WHERE seq = 4"),
  'last chain entry deleted': (db) => db.exec('DELETE FROM chain WHERE seq = (SELECT MAX(seq) FROM chain)'),
  'chain entry of a run deleted': (db) => db.exec("DELETE FROM chain WHERE kind = 'run' AND row_id = 5"),
  'run fingerprint copied from another': (db) => db.exec('UPDATE run_summaries SET run_digest = (SELECT digest FROM runs WHERE id = 1) WHERE run_id = 2'),
};

describe('the listing verification made without row objects', () => {
  for (const [name, tamper] of Object.entries(TAMPERS)) {
    it(`checkListing answers as the object-by-object judgement does when ${name}`, () => {
      const dir = fillDemoStore(root);
      const db = new Database(join(dir, 'records.db'));
      for (const { name: trigger } of db.prepare("SELECT name FROM sqlite_master WHERE type = 'trigger'").all() as { name: string }[]) db.exec(`DROP TRIGGER "${trigger}"`);
      tamper(db);
      const quick = checkListing(chainRows(db), readSummaryArrays(db), readCalibrationRows(db));
      // The same with the summary's text written and hashed in the query (listingColumns), as the store reads it.
      const listing = checkListing(chainRows(db), readListingArrays(db), readCalibrationRows(db));
      const problems = slowProblems(db);
      db.close();
      expect(quick.holds).toBe(problems === 0);
      expect(listing).toEqual(quick);
      expect(quick.holds).toBe(name === 'none');
    });
  }
});

describe("the summary's text written by the database", () => {
  it('json_quote in SQLite writes the text summaryText writes, for any strings and attempt columns, seeded', () => {
    const db = new Database(':memory:');
    db.exec(`CREATE TABLE runs (id INTEGER, unit TEXT, kind TEXT, started_at TEXT, operator TEXT, station TEXT, spec_name TEXT, spec_revision TEXT, spec_sha256 TEXT, tool_version TEXT, statement TEXT, digest TEXT);
      CREATE TABLE run_summaries (run_id INTEGER, run_digest TEXT, attempt INTEGER, attempt_reason TEXT, note TEXT, verdict_sha256 TEXT, checks_sha256 TEXT, state_json TEXT, digest TEXT)`);
    const insertRun = db.prepare('INSERT INTO runs VALUES (1, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)');
    const insertSummary = db.prepare("INSERT INTO run_summaries VALUES (1, ?, ?, ?, ?, ?, ?, '{\"statement\":\"pass\"}', 'x')");
    const read = db.prepare(`SELECT ${summaryTextSql('sqlite')} FROM runs r LEFT JOIN run_summaries s ON s.run_id = r.id`).raw(true);
    // Well-formed Unicode: SQLite holds text as UTF-8, which has no lone surrogates.
    const text = fc.string({ unit: 'grapheme' });
    const row = fc.record({
      id: fc.constant(1), unit: text, kind: text, started_at: text, stored_at: text, operator: text, station: text, spec_name: text,
      spec_revision: text, spec_sha256: text, tool_version: text, statement: text, digest: text,
      attempt: fc.option(fc.integer({ min: 1, max: 100_000 })), attempt_reason: fc.option(text), note: fc.option(text),
    });
    fc.assert(
      fc.property(row, text, text, (r: SummaryHeadRow, verdictSha, checksSha) => {
        db.exec('DELETE FROM runs; DELETE FROM run_summaries');
        insertRun.run(r.unit, r.kind, r.started_at, r.operator, r.station, r.spec_name, r.spec_revision, r.spec_sha256, r.tool_version, r.statement, r.digest);
        insertSummary.run(r.digest, r.attempt, r.attempt_reason, r.note, verdictSha, checksSha);
        const [got] = read.all() as unknown[][];
        expect(got[0]).toBe(summaryText(r, verdictSha, checksSha, '{"statement":"pass"}'));
      }),
      { numRuns: 300 },
    );
    db.close();
  });
});

describe('the unit listing made without run objects', () => {
  it('listUnitsFromRows gives exactly what listUnitsFrom gives over the light runs of the demo store, with and without a spec', () => {
    const dir = fillDemoStore(root);
    const db = new Database(join(dir, 'records.db'), { readonly: true });
    const rows = readSummaryArrays(db);
    const listing = readListingArrays(db);
    db.close();
    for (const spec of [undefined, 'FH-210 Kestrel VCO', 'no such spec']) {
      expect(JSON.stringify(listUnitsFromRows(rows, spec))).toBe(JSON.stringify(listUnitsFrom(lightRuns(rows), spec)));
      expect(JSON.stringify(listUnitsFromRows(listing, spec))).toBe(JSON.stringify(listUnitsFrom(lightRuns(rows), spec)));
    }
  });

  it('listUnitsFromRows follows numberRuns for any mix of stored and replayed attempts, waiting states and spec names, seeded', () => {
    const run = fc.record({
      unit: fc.constantFrom('FK-1', 'FK-2', 'FK-10'),
      spec: fc.constantFrom('A', 'B'),
      attempt: fc.option(fc.integer({ min: 1, max: 4 })),
      waiting: fc.subarray(['low', 'mid', 'high']),
      statement: fc.constantFrom('pass', 'fail', 'conditional-pass'),
      unreadable: fc.boolean(),
    });
    fc.assert(
      fc.property(fc.array(run, { maxLength: 14 }), fc.constantFrom(undefined, 'A', 'B'), (runs, spec) => {
        // Rows as the query gives them: by unit, then oldest first.
        const sorted = runs.map((r, i) => ({ ...r, i })).sort((a, b) => (a.unit < b.unit ? -1 : a.unit > b.unit ? 1 : a.i - b.i));
        const rows: SummaryArray[] = sorted.map((r) => {
          const state = { conditions: ['low', 'mid', 'high'].map((condition) => ({ condition, statement: r.statement })), statement: r.statement, waitingFor: r.waiting };
          return [r.i + 1, r.unit, 'check', day(1 + r.i), day(1 + r.i), 'op', 'bench', r.spec, 'A', 'f'.repeat(64), '0.1.0', r.statement, r.attempt, r.attempt === null ? null : 'first', null, 'd', 'v', 'c', r.unreadable ? '{not json' : JSON.stringify(state), 's'];
        });
        expect(JSON.stringify(listUnitsFromRows(rows, spec))).toBe(JSON.stringify(listUnitsFrom(lightRuns(rows), spec)));
      }),
      { numRuns: 300 },
    );
  });
});
