/**
 * Batch statistics from stored runs, per spec name: first-pass and final yield, and per checked
 * quantity the count, mean, standard deviation, range, Cp and Cpk (capability.ts, NIST/SEMATECH
 * e-Handbook §6.1.6). Each unit counts once per quantity, with the value from its latest run, so a
 * re-tested unit does not weigh twice. `since` keeps units whose first run is at or after that time.
 */
import type { BatchRemark, BatchReport, BatchUnit, CheckVerdict, MeasurementStats, SpecBatch, Statement, StoredRun, YieldFigure } from '../types/index.js';
import { capability, describeSample } from './capability.js';
import { compareSerials } from './unitSummaries.js';
import { attemptFacts, numberRuns, summarizeAttempts } from './attempts.js';

export interface BatchFilter {
  readonly spec?: string;
  /** ISO 8601 time; units first tested before it are left out. */
  readonly since?: string;
}

/** Below this many units a capability index is a rough estimate. Common practice (no source). */
export const ROUGH_BELOW_UNITS = 30;

/**
 * Runs by start time, then by number. Start times are ISO 8601 UTC texts of one form
 * (Date.prototype.toISOString), which sort by time as plain texts; compared by code unit, not by
 * localeCompare, whose collation gave the same order at several times the cost (50 000 runs sorted).
 */
function oldestFirst(a: StoredRun, b: StoredRun): number {
  return a.startedAt < b.startedAt ? -1 : a.startedAt > b.startedAt ? 1 : a.id - b.id;
}

const accepted = (s: Statement): boolean => s === 'pass' || s === 'conditional-pass';

export function summarizeBatch(runs: readonly StoredRun[], filter: BatchFilter = {}): BatchReport {
  const bySpec = new Map<string, StoredRun[]>();
  for (const r of runs) {
    if (filter.spec !== undefined && r.spec.name !== filter.spec) continue;
    const list = bySpec.get(r.spec.name);
    if (list) list.push(r);
    else bySpec.set(r.spec.name, [r]);
  }
  const since = filter.since === undefined ? -Infinity : Date.parse(filter.since);
  const specs = [...bySpec.entries()]
    .sort(([a], [b]) => compareSerials(a, b))
    .map(([name, list]) => summarizeSpec(name, list, since))
    .filter((s) => s.units.length > 0);
  return { schemaVersion: 1, filter: { ...filter }, specs };
}

/**
 * The runs whose checks the statistics read: per spec name and unit, the last run of the unit's
 * latest complete attempt (as summarizeSpec chooses them), so a reader can fetch only their checks.
 */
export function statisticRunIds(runs: readonly StoredRun[]): Set<number> {
  const groups = new Map<string, StoredRun[]>();
  for (const r of runs) {
    const key = JSON.stringify([r.spec.name, r.unit]);
    const list = groups.get(key);
    if (list) list.push(r);
    else groups.set(key, [r]);
  }
  const ids = new Set<number>();
  for (const list of groups.values()) {
    const ordered = [...list].sort(oldestFirst);
    const done = summarizeAttempts(numberRuns(ordered)).filter((a) => a.state === 'complete');
    const id = done.length ? done[done.length - 1].runIds.at(-1) : undefined;
    if (id !== undefined) ids.add(id);
  }
  return ids;
}

function summarizeSpec(spec: string, runs: readonly StoredRun[], since: number): SpecBatch {
  const byUnit = new Map<string, StoredRun[]>();
  const ordered = [...runs].sort(oldestFirst);
  for (const r of ordered) byUnit.set(r.unit, [...(byUnit.get(r.unit) ?? []), r]);
  const kept = [...byUnit.entries()].filter(([, list]) => Date.parse(list[0].startedAt) >= since).sort(([a], [b]) => compareSerials(a, b));
  // Yields count attempts, not runs: a unit's first complete attempt decides first-pass, its latest final.
  const attempts = new Map(kept.map(([unit, list]) => [unit, summarizeAttempts(numberRuns(list))]));
  const units: BatchUnit[] = kept.map(([unit, list]) => {
    const facts = attemptFacts(attempts.get(unit) ?? []);
    return {
      unit,
      runs: list.length,
      first: facts.firstComplete ?? list[0].statement,
      latest: list[list.length - 1].statement,
      firstTestedAt: list[0].startedAt,
      lastTestedAt: list[list.length - 1].startedAt,
      latestRunId: list[list.length - 1].id,
      ...facts,
    };
  });
  const keptRuns = kept.flatMap(([, list]) => list);
  const revisions = [...new Set(keptRuns.map((r) => r.spec.revision))];
  // The statistics take each unit's latest complete attempt; a unit still waiting adds nothing yet.
  const latestRuns = kept.flatMap(([unit, list]) => {
    const done = (attempts.get(unit) ?? []).filter((a) => a.state === 'complete');
    const id = done.length ? done[done.length - 1].runIds.at(-1) : undefined;
    return list.filter((r) => r.id === id);
  });
  const complete = units.filter((u) => u.latestComplete !== undefined);
  const remarks: BatchRemark[] = revisions.length > 1 ? [{ kind: 'several-revisions', revisions }] : [];
  return {
    spec,
    revisions,
    units,
    runs: keptRuns.length,
    firstPass: yieldOf(complete.map((u) => u.firstComplete ?? u.first)),
    final: yieldOf(complete.map((u) => u.latestComplete ?? u.latest)),
    incomplete: units.filter((u) => u.latestComplete === undefined).map((u) => ({ unit: u.unit, waitingFor: u.waitingFor ?? [] })),
    // Each unit's place in serial order, so the values of every quantity sort by a number, not by the collator again.
    measurements: measurementStats(latestRuns, new Map(kept.map(([unit], i) => [unit, i]))),
    remarks,
  };
}

function yieldOf(statements: readonly Statement[]): YieldFigure {
  const ok = statements.filter(accepted).length;
  return {
    units: statements.length,
    accepted: ok,
    conditional: statements.filter((s) => s === 'conditional-pass').length,
    fraction: statements.length ? ok / statements.length : null,
  };
}

interface Gathered {
  readonly limits: CheckVerdict;
  readonly values: { unit: string; value: number; runId: number }[];
  /** Expanded uncertainty U (k = 2) of each value that has one. */
  readonly expanded: number[];
  withheld: number;
  limitsDiffer: boolean;
}

function measurementStats(latestRuns: readonly StoredRun[], place: ReadonlyMap<string, number>): MeasurementStats[] {
  const byKey = new Map<string, Gathered>();
  // Newest first, so the quantities come in the newest revision's order and its limits are the ones used.
  const newestFirst = [...latestRuns].sort((a, b) => oldestFirst(b, a));
  for (const run of newestFirst) {
    for (const check of run.verdict.conditions.flatMap((c) => c.checks)) {
      const key = JSON.stringify([check.condition, check.output, check.measurement]);
      const g = byKey.get(key) ?? { limits: check, values: [], expanded: [], withheld: 0, limitsDiffer: false };
      if (check.lower !== g.limits.lower || check.upper !== g.limits.upper) g.limitsDiffer = true;
      if (check.value === null) g.withheld += 1;
      else {
        g.values.push({ unit: run.unit, value: check.value, runId: run.id });
        if (check.expandedUncertainty !== null && check.expandedUncertainty > 0) g.expanded.push(check.expandedUncertainty);
      }
      byKey.set(key, g);
    }
  }
  return [...byKey.values()].map((g) => statsOf(g, place));
}

function statsOf(g: Gathered, place: ReadonlyMap<string, number>): MeasurementStats {
  const { limits } = g;
  // In serial order (compareSerials), by each unit's place in the spec's units, which are sorted so.
  const values = [...g.values].sort((a, b) => (place.get(a.unit) ?? 0) - (place.get(b.unit) ?? 0) || compareSerials(a.unit, b.unit));
  const sample = describeSample(values.map((v) => v.value));
  // A spread smaller than one value's standard uncertainty u = U/2 (GUM §6.2.1) is the measurement's
  // own scatter or its resolution, not the units': Cp/Cpk from it would be meaningless (common practice).
  const u = medianOf(g.expanded) / 2;
  const belowU = sample.sd !== null && sample.sd > 0 && u > 0 && sample.sd < u;
  const cap =
    sample.mean !== null && sample.sd !== null && !belowU
      ? capability({ mean: sample.mean, sd: sample.sd, lower: limits.lower, upper: limits.upper })
      : { cp: null, cpu: null, cpl: null, cpk: null };
  return {
    condition: limits.condition,
    output: limits.output,
    measurement: limits.measurement,
    unit: limits.unit,
    lower: limits.lower,
    upper: limits.upper,
    nominal: limits.nominal,
    ...sample,
    withheld: g.withheld,
    ...cap,
    remarks: belowU ? [...remarksFor(g, sample.count, sample.sd).filter((r) => r.kind !== 'few-units'), { kind: 'spread-below-u', sd: sample.sd!, u }] : remarksFor(g, sample.count, sample.sd),
    values,
  };
}

function medianOf(xs: readonly number[]): number {
  if (xs.length === 0) return 0;
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

function remarksFor(g: Gathered, count: number, sd: number | null): BatchRemark[] {
  const remarks: BatchRemark[] = [];
  const { lower, upper } = g.limits;
  if (g.withheld > 0) remarks.push({ kind: 'withheld', units: g.withheld });
  if (count < 2) remarks.push({ kind: 'too-few-units' });
  else if (sd === 0) remarks.push({ kind: 'no-spread' });
  else if (lower === null && upper === null) remarks.push({ kind: 'no-limits' });
  else if (lower === null || upper === null) remarks.push({ kind: 'one-sided' });
  if (count >= 2 && count < ROUGH_BELOW_UNITS) remarks.push({ kind: 'few-units', units: count });
  if (g.limitsDiffer) remarks.push({ kind: 'limits-differ' });
  return remarks;
}
