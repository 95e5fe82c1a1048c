/**
 * The runs `batch` reads, from verified summaries (runSummary.ts) instead of full verdicts: every run's
 * light head (yields and attempts need them all), and the checks only of the runs the statistics use,
 * each unit's latest complete attempt's last run (summarizeBatch.ts), read in one query per engine
 * and each checked against the SHA-256 its verified summary holds.
 */
import type { StoredRun } from '../types/index.js';
import type { AuditProblem } from './auditStore.js';
import { sha256Hex } from './digest.js';
import { lightRun } from './runSummary.js';
import type { SummaryRow } from './runSummary.js';
import { statisticRunIds } from './summarizeBatch.js';

export type ChecksReader = (ids: readonly number[]) => ReadonlyMap<number, { readonly checks_json: string }>;

/** The light runs of every summary that reads (oldest first). */
export function lightRuns(rows: readonly SummaryRow[]): StoredRun[] {
  const out: StoredRun[] = [];
  for (const row of rows) {
    const run = row.state_json === null ? undefined : lightRun(row);
    if (run) out.push(run);
  }
  return out;
}

export function batchRuns(rows: readonly SummaryRow[], spec: string | undefined, readChecks: ChecksReader): { runs: StoredRun[]; problems: AuditProblem[] } {
  const scoped = spec === undefined ? rows : rows.filter((r) => r.spec_name === spec);
  const heads = lightRuns(scoped);
  const wanted = statisticRunIds(heads);
  const checks = readChecks([...wanted]);
  const problems: AuditProblem[] = [];
  const byId = new Map(scoped.map((r) => [Number(r.id), r]));
  const runs = heads.map((head) => {
    if (!wanted.has(head.id)) return head;
    const row = byId.get(head.id) as SummaryRow;
    const found = checks.get(head.id);
    // The stored SHA-256 compared is the verified summary's, not one read beside the checks.
    if (!found || sha256Hex(String(found.checks_json)) !== row.checks_sha256) {
      problems.push({ kind: 'run', id: head.id, unit: head.unit, problem: 'changed', detail: "its summary's checks no longer match the SHA-256 fingerprinted with it" });
      return { ...head, intact: false };
    }
    return lightRun(row, String(found.checks_json)) ?? { ...head, intact: false };
  });
  return { runs, problems };
}
