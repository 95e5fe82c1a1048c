/**
 * Crash safety of the records: `check` and `watch` processes killed with
 * SIGKILL at random moments — during start-up, reading, storing or printing — as a power cut or a
 * closed terminal would. Afterwards the data folder must pass the audit (storeAudit.ts), and every
 * run a process reported as stored must be there. What SQLite promises for this: a transaction is
 * atomic across a crash, in WAL mode too (sqlite.org/atomiccommit.html, sqlite.org/wal.html).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { newTally, saveTally, scaled, seedFor } from './budget.js';
import type { Tally } from './budget.js';
import { builtCli, drainWatch, dropCapture, makeBench, reportedRuns, runCliProcess, seeded, sleep, startCli, watchedRuns } from './cliProcess.js';
import type { ReportedRun } from './cliProcess.js';
import type { Bench, Finished } from './cliProcess.js';
import { auditStore } from './storeAudit.js';

const tally = newTally();
const benches: Bench[] = [];
afterAll(() => {
  saveTally('store-crash', tally);
  for (const b of benches) rmSync(b.root, { recursive: true, force: true });
});

const UNITS = ['FK-0101', 'FK-0102', 'FK-0103', 'FK-0104', 'FK-0105', 'FK-0106'];
const CONDITIONS = ['low', 'mid', 'high'];

function checkArgs(b: Bench, unit: string, conditions: readonly string[]): string[] {
  return ['check', ...conditions.map((c) => join(b.captures, `${unit}_${c}.csv`)), '--spec', b.spec];
}

/** Compare what the processes reported with what the audit found; count what is lost. */
function settle(t: Tally, dataDir: string, reported: readonly ReportedRun[]): ReturnType<typeof auditStore> {
  const audit = auditStore(dataDir);
  for (const p of audit.problems) t.notes.push(`store: ${p}`);
  if (audit.problems.length > 0) t.crashes++;
  const perUnit = new Map<string, number>();
  for (const unit of audit.runs.values()) perUnit.set(unit, (perUnit.get(unit) ?? 0) + 1);
  const numbers = new Set<string>();
  for (const r of reported) {
    if (r.id !== undefined && audit.runs.get(r.id) !== r.unit) {
      t.lost++;
      t.notes.push(`run #${r.id} of ${r.unit} was reported as stored but is ${audit.runs.has(r.id) ? `unit ${audit.runs.get(r.id)}` : 'missing'}`);
    }
    // Reported by its number among the unit's runs: that many runs of the unit must be there, and no
    // two processes may have reported the same number.
    if (r.number !== undefined && (r.number > (perUnit.get(r.unit) ?? 0) || numbers.has(`${r.unit} ${r.number}`))) {
      t.lost++;
      t.notes.push(`run ${r.number} of ${r.unit} was reported as stored, but the store has ${perUnit.get(r.unit) ?? 0} run(s) of it${numbers.has(`${r.unit} ${r.number}`) ? ' and the number was reported twice' : ''}`);
    }
    if (r.number !== undefined) numbers.add(`${r.unit} ${r.number}`);
  }
  return audit;
}

/** A process that ended on its own must have ended well: 0/1 with its run reported; 2 or 3 is a failure. */
function judgeExit(t: Tally, f: Finished, what: string): number {
  if (f.signal !== null) return 0;
  const stored = reportedRuns(f.stderr).length + watchedRuns(f.stdout).length;
  // 4: stored, and the unit's attempt still waits for a condition (README, exit status).
  if (f.code === 3 || f.code === 2 || ((f.code === 0 || f.code === 1 || f.code === 4) && stored === 0 && what.startsWith('check'))) {
    t.crashes++;
    t.notes.push(`${what} exited ${f.code}: ${f.stderr.split('\n').slice(0, 2).join(' / ')}`);
    return 1;
  }
  return 0;
}

describe.skipIf(!builtCli())('records when benchproof processes are killed (built CLI)', () => {
  it('keeps every reported run, and no partial one, when check processes are killed at random moments', { timeout: scaled(120_000, 60 * 60_000) }, async () => {
    const b = makeBench('crash');
    benches.push(b);
    const env = { BENCHPROOF_DATA: b.data };
    const rand = seeded(seedFor(7));
    const reported: ReportedRun[] = [];
    const t0 = Date.now();
    const first = await runCliProcess(checkArgs(b, 'FK-0101', CONDITIONS), { env });
    const typical = Date.now() - t0;
    tally.inputs++;
    judgeExit(tally, first, 'check (not killed)');
    reported.push(...reportedRuns(first.stderr));
    const iterations = scaled(5, 120);
    for (let i = 0; i < iterations; i++) {
      // One or two processes at once, on one to three captures; killed anywhere in their life, with
      // half the kills aimed at the second half, where the run is stored.
      const procs = Array.from({ length: 1 + (i % 2) }, (_, k) => {
        const conditions = CONDITIONS.filter(() => rand() < 0.6);
        return startCli(checkArgs(b, UNITS[(2 * i + k) % UNITS.length], conditions.length ? conditions : ['mid']), { env });
      });
      const delay = i % 2 === 0 ? rand() * typical * 1.2 : typical * (0.5 + 0.7 * rand());
      await sleep(delay);
      for (const p of procs) p.child.kill('SIGKILL');
      for (const f of await Promise.all(procs.map((p) => p.done))) {
        tally.inputs++;
        judgeExit(tally, f, 'check');
        reported.push(...reportedRuns(f.stderr));
      }
    }
    // The store still works afterwards, and clears what killed writers left in its temporary folder.
    const last = await runCliProcess(checkArgs(b, 'FK-0102', CONDITIONS), { env });
    tally.inputs++;
    judgeExit(tally, last, 'check (after the kills)');
    reported.push(...reportedRuns(last.stderr));
    const audit = settle(tally, b.data, reported);
    expect(audit.problems).toEqual([]);
    expect(tally.lost, tally.notes.join('\n')).toBe(0);
    expect(tally.crashes, tally.notes.join('\n')).toBe(0);
    expect(audit.temps).toEqual([]);
    expect(audit.archived).toBeGreaterThanOrEqual(3);
    expect(reported.length).toBeGreaterThanOrEqual(2);
  });

  it('keeps every reported run and records each capture once when watch processes are killed', { timeout: scaled(120_000, 60 * 60_000) }, async () => {
    const b = makeBench('crash-watch');
    benches.push(b);
    const drop = join(b.root, 'drop');
    const env = { BENCHPROOF_DATA: b.data };
    const rand = seeded(seedFor(8));
    let failed = 0;
    const reported: ReportedRun[] = [];
    const dropped: string[] = [];
    const iterations = scaled(2, 40);
    mkdirSync(drop);
    for (let i = 0; i < iterations; i++) {
      const w = startCli(['watch', drop, '--spec', b.spec, '--json', '--settle', '150'], { env });
      // New captures land while it runs: a demo capture with a comment line added, so each has its own bytes.
      for (let k = 0; k < 2; k++) {
        await sleep(rand() * 600);
        dropped.push(dropCapture(b, drop, `FK-${7000 + 2 * i + k}`, CONDITIONS[(i + k) % 3]));
      }
      await sleep(rand() * 2500);
      w.child.kill('SIGKILL');
      const f = await w.done;
      tally.inputs++;
      failed += judgeExit(tally, f, 'watch');
      reported.push(...watchedRuns(f.stdout));
    }
    const final = await drainWatch(startCli(['watch', drop, '--spec', b.spec, '--json', '--settle', '150'], { env }), dropped.length);
    tally.inputs++;
    failed += judgeExit(tally, final, 'watch (not killed)');
    reported.push(...watchedRuns(final.stdout));
    const audit = settle(tally, b.data, reported);
    expect(audit.problems).toEqual([]);
    expect(tally.lost, tally.notes.join('\n')).toBe(0);
    expect(failed, tally.notes.join('\n')).toBe(0);
    // Every dropped capture ends recorded exactly once, whatever the kills interrupted.
    const units = [...audit.runs.values()].sort();
    expect(units).toEqual(dropped.map((f) => f.split('_')[0]).sort());
  });
});
