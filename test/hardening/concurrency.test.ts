/**
 * Two terminals at once: parallel `check` processes on one fresh data folder, and two `watch`
 * processes on one drop folder and one data folder. SQLite serialises
 * the writers (WAL mode, one writer at a time with a busy timeout: sqlite.org/wal.html,
 * "Concurrency"); each run must be stored whole, and each capture recorded exactly once.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { newTally, saveTally, scaled, seedFor } from './budget.js';
import { builtCli, drainWatch, dropCapture, makeBench, reportedRuns, seeded, sleep, startCli, watchedRuns } from './cliProcess.js';
import type { ReportedRun } from './cliProcess.js';
import type { Bench } from './cliProcess.js';
import { auditStore } from './storeAudit.js';

const tally = newTally();
const benches: Bench[] = [];
afterAll(() => {
  saveTally('concurrency', tally);
  for (const b of benches) rmSync(b.root, { recursive: true, force: true });
});

const UNITS = ['FK-0101', 'FK-0102', 'FK-0103', 'FK-0104', 'FK-0105', 'FK-0106'];

describe.skipIf(!builtCli())('benchproof processes running at once (built CLI)', () => {
  it('stores every run whole when parallel check processes share one new data folder', { timeout: scaled(120_000, 30 * 60_000) }, async () => {
    const b = makeBench('parallel');
    benches.push(b);
    const rounds = scaled(1, 5);
    const width = scaled(3, 8);
    const reported: ReportedRun[] = [];
    for (let round = 0; round < rounds; round++) {
      const procs = Array.from({ length: width }, (_, k) => {
        const unit = UNITS[(round + k) % UNITS.length];
        return startCli(['check', join(b.captures, `${unit}_mid.csv`), join(b.captures, `${unit}_high.csv`), '--spec', b.spec], { env: { BENCHPROOF_DATA: b.data } });
      });
      for (const f of await Promise.all(procs.map((p) => p.done))) {
        tally.inputs++;
        const runs = reportedRuns(f.stderr);
        // 0, 1, or 4 (stored, the attempt still waiting for a condition) all end with the run stored.
        if (![0, 1, 4].includes(f.code ?? -1) || runs.length !== 1) {
          tally.crashes++;
          tally.notes.push(`parallel check exited ${f.code}: ${f.stderr.split('\n')[0]}`);
        }
        reported.push(...runs);
      }
    }
    const audit = auditStore(b.data);
    expect(tally.notes).toEqual([]);
    expect(audit.problems).toEqual([]);
    expect(audit.runs.size).toBe(rounds * width);
    // Each process reported a distinct run: by store-wide id, or by its number among its unit's runs.
    expect(new Set(reported.map((r) => (r.id !== undefined ? `#${r.id}` : `${r.unit} ${r.number}`))).size).toBe(rounds * width);
    const perUnit = new Map<string, number>();
    for (const unit of audit.runs.values()) perUnit.set(unit, (perUnit.get(unit) ?? 0) + 1);
    for (const r of reported) {
      if (r.id !== undefined) expect(audit.runs.get(r.id)).toBe(r.unit);
      else expect(r.number).toBeLessThanOrEqual(perUnit.get(r.unit) ?? 0);
    }
  });

  it('records each capture exactly once when two watch processes share a folder and a data folder', { timeout: scaled(120_000, 30 * 60_000) }, async () => {
    const b = makeBench('two-watch');
    benches.push(b);
    const drop = join(b.root, 'drop');
    mkdirSync(drop);
    const env = { BENCHPROOF_DATA: b.data };
    const rand = seeded(seedFor(9));
    const files = scaled(3, 24);
    const dropped: string[] = [dropCapture(b, drop, 'FK-8000', 'mid')];
    const args = ['watch', drop, '--spec', b.spec, '--json', '--settle', '150'];
    const a = startCli(args, { env });
    const c = startCli(args, { env });
    for (let i = 1; i < files; i++) {
      await sleep(rand() * 400);
      dropped.push(dropCapture(b, drop, `FK-${8000 + i}`, ['low', 'mid', 'high'][i % 3]));
    }
    // Both have answered for every file (checked, or found it recorded by the other) before they stop.
    const [fa, fc] = await Promise.all([drainWatch(a, files), drainWatch(c, files)]);
    tally.inputs += files;
    const checked = [...watchedRuns(fa.stdout), ...watchedRuns(fc.stdout)];
    expect([fa.code, fc.code], fa.stderr + fc.stderr).toEqual([0, 0]);
    expect(checked.map((r) => r.unit).sort()).toEqual(dropped.map((f) => f.split('_')[0]).sort());
    const db = new Database(join(b.data, 'records.db'), { readonly: true });
    const twice = db.prepare('SELECT r.unit, rc.condition, rc.sha256, COUNT(*) AS n FROM run_captures rc JOIN runs r ON r.id = rc.run_id GROUP BY 1, 2, 3 HAVING n > 1').all();
    db.close();
    if (twice.length > 0) {
      // A capture recorded twice counts with the records lost: the store no longer says what happened.
      tally.lost++;
      tally.notes.push(`captures recorded twice: ${JSON.stringify(twice)}`);
    }
    expect(twice).toEqual([]);
    expect(auditStore(b.data).problems).toEqual([]);
  });
});
