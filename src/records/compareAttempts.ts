/**
 * Two test attempts of one unit side by side, as facts: each check's value, U and statement in both,
 * the change, whether it exceeds what the two uncertainties allow, and the causes that went or came.
 * A change counts as significant when |Δ| > √(U₁² + U₂²), i.e. the normalized error |E_n| > 1 of
 * ISO 13528:2022 §9.7 (the same test ISO/IEC 17043 uses to compare two results with their expanded
 * uncertainties). Words are made in src/report.
 */
import { verdictState, waitingConditions } from '../types/index.js';
import type { AttemptComparison, AttemptSummary, CheckVerdict, ComparedAttempt, ComparedCheck, StoredRun, UnitRecord } from '../types/index.js';

/** Compare attempt `a` (before) with attempt `b` (after); throws RangeError for a number the record lacks. */
export function compareAttempts(rec: UnitRecord, a: number, b: number): AttemptComparison {
  const before = side(rec, a);
  const after = side(rec, b);
  const checks = pairChecks(before.run.verdict.conditions.flatMap((c) => c.checks), after.run.verdict.conditions.flatMap((c) => c.checks));
  const ids = (s: ComparedAttempt): Set<string> => new Set(s.causes.map((c) => c.id));
  return {
    schemaVersion: 1,
    unit: rec.unit,
    spec: after.run.spec,
    before: before.facts,
    after: after.facts,
    checks,
    causesGone: before.facts.causes.filter((c) => !ids(after.facts).has(c.id)).map(({ id, title }) => ({ id, title })),
    causesNew: after.facts.causes.filter((c) => !ids(before.facts).has(c.id)).map(({ id, title }) => ({ id, title })),
  };
}

function side(rec: UnitRecord, n: number): { run: StoredRun; facts: ComparedAttempt } {
  const attempt: AttemptSummary | undefined = rec.attempts?.find((x) => x.number === n);
  if (!attempt) throw new RangeError(`compareAttempts: ${rec.unit} has no attempt #${n}`);
  const runId = attempt.runIds[attempt.runIds.length - 1];
  const run = rec.runs.find((r) => r.id === runId);
  if (!run) throw new RangeError(`compareAttempts: run #${runId} of attempt #${n} is not in the record`);
  return {
    run,
    facts: {
      number: n,
      statement: run.statement,
      state: verdictState(run.verdict),
      waitingFor: waitingConditions(run.verdict),
      notes: attempt.notes,
      startedAt: attempt.startedAt,
      runId,
      ...(run.number !== undefined ? { runNumber: run.number } : {}),
      causes: run.diagnosis.causes.map((c) => ({ id: c.id, title: c.title, score: c.score })),
    },
  };
}

const keyOf = (k: CheckVerdict): string => JSON.stringify([k.condition, k.output, k.measurement]);
const valueOf = (k: CheckVerdict | undefined): ComparedCheck['before'] =>
  k ? { value: k.value, expandedUncertainty: k.expandedUncertainty, statement: k.statement } : null;

/** Every check of either attempt, in the after attempt's order, then those only the before one had. */
function pairChecks(before: readonly CheckVerdict[], after: readonly CheckVerdict[]): ComparedCheck[] {
  const old = new Map(before.map((k) => [keyOf(k), k]));
  const seen = new Set<string>();
  const out: ComparedCheck[] = [];
  for (const k of [...after, ...before]) {
    const key = keyOf(k);
    if (seen.has(key)) continue;
    seen.add(key);
    const b = old.get(key);
    const a = after.find((x) => keyOf(x) === key);
    const both = a && b && a.value !== null && b.value !== null;
    const change = both ? (a.value as number) - (b.value as number) : null;
    const rss = both ? Math.hypot(a.expandedUncertainty ?? 0, b.expandedUncertainty ?? 0) : null;
    out.push({
      condition: k.condition,
      output: k.output,
      measurement: k.measurement,
      unit: k.unit,
      lower: (a ?? k).lower,
      upper: (a ?? k).upper,
      before: valueOf(b),
      after: valueOf(a),
      change,
      significant: change !== null && rss !== null && Math.abs(change) > rss,
      statementChanged: (a?.statement ?? null) !== (b?.statement ?? null),
    });
  }
  return out;
}
