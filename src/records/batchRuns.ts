/**
 * The runs `batch` reads, from verified summaries (runSummary.ts) instead of full verdicts: every run's
 * light head (yields and attempts need them all), and the checks only of the runs the statistics use,
 * each unit's latest complete attempt's last run (summarizeBatch.ts), read in one query per engine
 * and each checked against the SHA-256 its verified summary holds.
 */
import type { StoredRun } from '../types/index.js';
import type { AuditProblem } from './auditStore.js';
import { sha256Hex } from './digest.js';
import { lightRun, S } from './runSummary.js';
import type { SummaryArray } from './runSummary.js';
import { statisticRunIds } from './summarizeBatch.js';

export type ChecksReader = (ids: readonly number[]) => ReadonlyMap<number, string>;

/**
 * The light runs of every summary that reads (oldest first within each unit), each numbered within
 * its unit's runs here (so numberRuns need not copy it: attempts.ts).
 */
export function lightRuns(rows: readonly SummaryArray[]): StoredRun[] {
  const out: StoredRun[] = [];
  let unit: string | undefined;
  let number = 0;
  for (const row of rows) {
    const run = lightRun(row);
    if (!run) continue;
    number = run.unit === unit ? number + 1 : 1;
    unit = run.unit;
    out.push(Object.assign(run, { number }));
  }
  return out;
}

export function batchRuns(rows: readonly SummaryArray[], spec: string | undefined, readChecks: ChecksReader): { runs: StoredRun[]; problems: AuditProblem[] } {
  const scoped = spec === undefined ? rows : rows.filter((r) => String(r[S.specName]) === spec);
  const heads = lightRuns(scoped);
  const wanted = statisticRunIds(heads);
  const checks = readChecks([...wanted]);
  const problems: AuditProblem[] = [];
  const byId = new Map<number, SummaryArray>();
  for (const r of scoped) if (wanted.has(Number(r[S.id]))) byId.set(Number(r[S.id]), r);
  const runs = heads.map((head) => {
    if (!wanted.has(head.id)) return head;
    const row = byId.get(head.id) as SummaryArray;
    const found = checks.get(head.id);
    // The stored SHA-256 compared is the verified summary's, not one read beside the checks.
    if (found === undefined || sha256Hex(found) !== row[S.checksSha256]) {
      problems.push({ kind: 'run', id: head.id, unit: head.unit, problem: 'changed', detail: "its summary's checks no longer match the SHA-256 fingerprinted with it" });
      return { ...head, intact: false };
    }
    const run = lightRun(row, found);
    return run ? Object.assign(run, { number: head.number }) : { ...head, intact: false };
  });
  return { runs, problems };
}
