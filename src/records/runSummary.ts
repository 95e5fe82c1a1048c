/**
 * The light summary of a stored run: what `units` and `batch` need, kept beside the full verdict so
 * a listing never reads, parses or hashes the measurement reports (a real verdict is about 135 kB,
 * mostly plot data; its summary a few hundred bytes, plus about 100 bytes per check).
 *
 * A summary row holds the SHA-256 of the run's verdict text, the state of its conditions (which wait,
 * the worst statement so far, each condition's statement: `state_json`) and its checks in compact
 * form (`checks_json`, with their SHA-256). Its fingerprint is
 *
 *   SHA-256(canonical JSON of { run: the run's fingerprint, verdict: SHA-256 of the verdict text,
 *           checks: SHA-256 of checks_json, head: the run row's own columns, state: state_json })
 *
 * and it joins the hash chain (kind 'summary', the run's number) in the run's own transaction. So a
 * listing verifies a run by one small hash: an edit of the run row's columns, of the summary, or of
 * its fingerprint breaks it or the chain; the verdict's own hash is checked against the summary's
 * copy whenever the full verdict is read (record, compare, reports), with the run's fingerprint.
 */
import type { RunSpec, Statement, StoredRun, UnitVerdict } from '../types/index.js';
import { waitingConditions } from '../types/index.js';
import { CanonicalText, canonicalJson, sha256Hex } from './digest.js';

/** The run row's columns a summary is fingerprinted with (either engine's row). */
export interface SummaryHeadRow {
  id: number;
  unit: string;
  kind: string;
  started_at: string;
  stored_at: string;
  operator: string;
  station: string;
  spec_name: string;
  spec_revision: string;
  spec_sha256: string;
  tool_version: string;
  statement: string;
  attempt?: number | null;
  attempt_reason?: string | null;
  note?: string | null;
  digest: string;
}

/** A run row joined with its summary row (null columns when the run has none). */
export interface SummaryRow extends SummaryHeadRow {
  verdict_sha256: string | null;
  checks_sha256: string | null;
  state_json: string | null;
  summary_digest: string | null;
}

/** What a summary row stores, computed from the run as it is written. */
export interface SummaryValues {
  /** The run's fingerprint and attempt columns, repeated (migration7.ts says why). */
  readonly runDigest: string;
  readonly attempt: number | null;
  readonly attemptReason: string | null;
  readonly note: string | null;
  readonly verdictSha256: string;
  readonly checksSha256: string;
  readonly stateJson: string;
  readonly checksJson: string;
  readonly digest: string;
}

/** The state of a verdict's conditions, as a listing needs it. */
interface SummaryState {
  readonly statement: Statement;
  readonly waitingFor: readonly string[];
  readonly soFar?: Statement;
  readonly conditions: readonly { readonly condition: string; readonly statement: Statement }[];
}

/** One check, compact: condition, output, measurement, unit, value, U, lower, upper, nominal, guard, margin, statement. */
type CompactCheck = [string, string, string, string, number | null, number | null, number | null, number | null, number | null, number, number | null, Statement];

function stateOf(verdict: UnitVerdict): SummaryState {
  return {
    statement: verdict.statement,
    waitingFor: waitingConditions(verdict),
    ...(verdict.soFar !== undefined ? { soFar: verdict.soFar } : {}),
    conditions: verdict.conditions.map((c) => ({ condition: c.condition, statement: c.statement })),
  };
}

function checksOf(verdict: UnitVerdict): CompactCheck[] {
  return verdict.conditions.flatMap((c) =>
    c.checks.map((k): CompactCheck => [k.condition, k.output, k.measurement, k.unit, k.value, k.expandedUncertainty, k.lower, k.upper, k.nominal, k.guard, k.margin, k.statement]),
  );
}

/**
 * The run row's columns as the summary's fingerprint covers them (NULL attempt columns left out): all
 * that the run's own fingerprint covers, so, like it, not the storing time (the same run stored on
 * either engine chains to the same head).
 */
function headOf(row: SummaryHeadRow): Record<string, unknown> {
  return {
    unit: String(row.unit),
    kind: String(row.kind),
    startedAt: String(row.started_at),
    operator: String(row.operator),
    station: String(row.station),
    spec: { name: String(row.spec_name), revision: String(row.spec_revision), sha256: String(row.spec_sha256) },
    toolVersion: String(row.tool_version),
    statement: String(row.statement),
    attempt: typeof row.attempt === 'number' ? row.attempt : undefined,
    attemptReason: typeof row.attempt_reason === 'string' ? row.attempt_reason : undefined,
    note: typeof row.note === 'string' ? row.note : undefined,
  };
}

export function summaryDigest(row: SummaryHeadRow, verdictSha256: string, checksSha256: string, stateJson: string): string {
  return sha256Hex(summaryText(row, verdictSha256, checksSha256, stateJson));
}

/**
 * The text a summary's fingerprint is taken of: canonical JSON (digest.ts) of
 * { format, run, verdict, checks, head: headOf(row), state }, written out key by key in sorted order
 * because a listing computes it for every run (canonicalJson's generic walk cost more than the hash).
 * A test holds it equal to canonicalJson of the same object.
 */
export function summaryText(row: SummaryHeadRow, verdictSha256: string, checksSha256: string, stateJson: string): string {
  return textOf(
    row.unit, row.kind, row.started_at, row.operator, row.station, row.spec_name, row.spec_revision, row.spec_sha256, row.tool_version, row.statement,
    row.attempt, row.attempt_reason, row.note, row.digest, verdictSha256, checksSha256, stateJson,
  );
}

/**
 * summaryText of one row of SUMMARY_COLUMNS as read (an array), without making an object of it: the
 * listing verifies every run's summary this way. Undefined when the run has no summary.
 */
export function summaryTextAt(r: readonly unknown[]): string | undefined {
  if (r[S.summaryDigest] === null || r[S.verdictSha256] === null || r[S.checksSha256] === null || r[S.stateJson] === null) return undefined;
  return textOf(r[1], r[2], r[3], r[5], r[6], r[7], r[8], r[9], r[10], r[11], r[12], r[13], r[14], r[15], r[16] as string, r[17] as string, r[18] as string);
}

const q = JSON.stringify;

// One writer for both: the fields in canonicalJson's order (keys sorted), absent attempt columns left out.
function textOf(
  unit: unknown, kind: unknown, startedAt: unknown, operator: unknown, station: unknown, specName: unknown, specRevision: unknown, specSha256: unknown,
  toolVersion: unknown, statement: unknown, attempt: unknown, attemptReason: unknown, note: unknown, digest: unknown, verdictSha256: string, checksSha256: string, stateJson: string,
): string {
  const a = typeof attempt === 'number' ? `"attempt":${q(attempt)},` : '';
  const reason = typeof attemptReason === 'string' ? `"attemptReason":${q(attemptReason)},` : '';
  const n = typeof note === 'string' ? `"note":${q(note)},` : '';
  const spec = `{"name":${q(String(specName))},"revision":${q(String(specRevision))},"sha256":${q(String(specSha256))}}`;
  const head =
    `{${a}${reason}"kind":${q(String(kind))},${n}"operator":${q(String(operator))},"spec":${spec},` +
    `"startedAt":${q(String(startedAt))},"statement":${q(String(statement))},"station":${q(String(station))},` +
    `"toolVersion":${q(String(toolVersion))},"unit":${q(String(unit))}}`;
  return `{"checks":${q(checksSha256)},"format":"benchproof-summary-1","head":${head},"run":${q(String(digest))},"state":${stateJson},"verdict":${q(verdictSha256)}}`;
}

/** The object summaryText writes, for the test that holds the two equal. */
export function summaryDocument(row: SummaryHeadRow, verdictSha256: string, checksSha256: string, stateJson: string): unknown {
  return { format: 'benchproof-summary-1', run: String(row.digest), verdict: verdictSha256, checks: checksSha256, head: headOf(row), state: new CanonicalText(stateJson) };
}

/** The summary of a run about to be stored (or stored before schema 7): `verdictText` is the verdict as stored. */
export function summarize(row: SummaryHeadRow, verdict: UnitVerdict, verdictText: string): SummaryValues {
  const stateJson = canonicalJson(stateOf(verdict));
  const checksJson = canonicalJson(checksOf(verdict));
  const verdictSha256 = sha256Hex(verdictText);
  const checksSha256 = sha256Hex(checksJson);
  return {
    runDigest: String(row.digest),
    attempt: typeof row.attempt === 'number' ? row.attempt : null,
    attemptReason: typeof row.attempt_reason === 'string' ? row.attempt_reason : null,
    note: typeof row.note === 'string' ? row.note : null,
    verdictSha256,
    checksSha256,
    stateJson,
    checksJson,
    digest: summaryDigest(row, verdictSha256, checksSha256, stateJson),
  };
}

/** Does this joined row's summary still match its fingerprint (computed over the run row's columns as read)? */
export function summaryHolds(row: SummaryRow): boolean {
  if (row.summary_digest === null || row.verdict_sha256 === null || row.checks_sha256 === null || row.state_json === null) return false;
  return summaryDigest(row, row.verdict_sha256, row.checks_sha256, row.state_json) === row.summary_digest;
}

const NONE: readonly never[] = Object.freeze([]);
const NO_CAUSES = Object.freeze({ causes: NONE });

/**
 * A verified summary (a row of SUMMARY_COLUMNS as read) as the run shape that attempts.ts and
 * summarizeBatch read: spec, times, statement, attempt columns, the verdict's condition states, and
 * its checks when `checksJson` is given (else none). Everything else of the verdict (the measurement
 * reports) and the diagnosis are absent, so it is typed through unknown, as runHead does
 * (attempts.ts); it never reaches a report. Undefined when the row has no state that reads.
 */
export function lightRun(r: SummaryArray, checksJson?: string): StoredRun | undefined {
  if (r[S.stateJson] === null) return undefined;
  let state: SummaryState;
  let checks: CompactCheck[] = [];
  try {
    state = JSON.parse(String(r[S.stateJson])) as SummaryState;
    if (checksJson !== undefined) checks = JSON.parse(checksJson) as CompactCheck[];
  } catch {
    return undefined;
  }
  if (state === null || typeof state !== 'object' || !Array.isArray(state.conditions)) return undefined;
  const byCondition = new Map<string, object[]>();
  for (const [condition, output, measurement, unit, value, expandedUncertainty, lower, upper, nominal, guard, margin, statement] of checks) {
    const list = byCondition.get(condition);
    const check = { condition, output, measurement, unit, value, expandedUncertainty, lower, upper, nominal, guard, margin, statement };
    if (list) list.push(check);
    else byCondition.set(condition, [check]);
  }
  const unit = String(r[S.unit]);
  const spec: RunSpec = { name: String(r[S.specName]), revision: String(r[S.specRevision]), sha256: String(r[S.specSha256]) };
  // The parsed conditions take their checks in place (they are this run's own objects); the empty
  // parts are shared, frozen: a listing makes one light run per stored run.
  for (const c of state.conditions as { condition: string; checks?: readonly object[] }[]) c.checks = byCondition.get(c.condition) ?? NONE;
  // A listing's row (listingColumns) has no kind, operator, station, tool version or storing time: left out.
  const optional = (i: number): string | undefined => (r[i] === null ? undefined : String(r[i]));
  const run: Record<string, unknown> = {
    id: Number(r[S.id]),
    unit,
    kind: optional(S.kind),
    startedAt: String(r[S.startedAt]),
    operator: optional(5),
    station: optional(6),
    spec,
    toolVersion: optional(10),
    statement: String(r[S.statement]),
    storedAt: optional(S.storedAt),
    digest: String(r[S.digest]),
    intact: true,
    diagnosis: NO_CAUSES,
    captures: NONE,
    verdict: {
      unit,
      spec,
      statement: state.statement,
      waitingFor: state.waitingFor,
      ...(state.soFar !== undefined ? { soFar: state.soFar } : {}),
      conditions: state.conditions,
      captures: NONE,
    },
  };
  if (typeof r[S.attempt] === 'number') run.attempt = r[S.attempt];
  if (typeof r[S.attemptReason] === 'string') run.attemptReason = r[S.attemptReason];
  if (typeof r[S.note] === 'string') run.note = r[S.note];
  return run as unknown as StoredRun;
}

/**
 * The SQL columns of a run joined with its summary (`r` runs, `s` run_summaries), the same on both
 * engines, in this order (readSummaryRows reads them by position). The run's fingerprint and attempt columns are the summary's copies (verified with it), so
 * no column after the verdict text is read from the run's row; a run without a summary gives its own
 * fingerprint (COALESCE stops at the first value that is not NULL, so it reads it only then).
 */
export const SUMMARY_COLUMNS = `r.id, r.unit, r.kind, r.started_at, r.stored_at, r.operator, r.station, r.spec_name, r.spec_revision,
  r.spec_sha256, r.tool_version, r.statement, s.attempt, s.attempt_reason, s.note, COALESCE(s.run_digest, r.digest) AS digest,
  s.verdict_sha256, s.checks_sha256, s.state_json, s.digest AS summary_digest`;

/** Positions in a row of SUMMARY_COLUMNS read as an array. */
export const S = { id: 0, unit: 1, kind: 2, startedAt: 3, storedAt: 4, specName: 7, specRevision: 8, specSha256: 9, statement: 11, attempt: 12, attemptReason: 13, note: 14, digest: 15, verdictSha256: 16, checksSha256: 17, stateJson: 18, summaryDigest: 19, holds: 20 } as const;

/**
 * What a listing reads of each run (units, batch): SUMMARY_COLUMNS in the same positions, NULL where
 * the listing shows nothing (kind, storing time, operator, station, tool version, the verdict's
 * SHA-256), and at position 20 whether the summary's fingerprint holds: the database writes the text
 * summaryText writes, from the same columns (summaryTextSql), and compares its SHA-256 with the
 * stored fingerprint. SQLite hashes it with node:crypto through a function of the connection
 * (SQLITE_SHA256, registered by readListingArrays), PostgreSQL with its own pg_catalog.sha256, as it
 * hashes the captures when the store is verified. So a listing neither builds nor keeps eleven
 * strings per run to hash them. A text that is not the one summaryText writes (NULL columns, a value
 * escaped otherwise) fails, and the listing is then judged again from SUMMARY_COLUMNS in JavaScript
 * (auditStore.ts, judgeListing): it never passes what summaryText would fail, since a JSON text names
 * its values one way only.
 */
export function listingColumns(dialect: 'sqlite' | 'pg'): string {
  const text = summaryTextSql(dialect);
  const holds = dialect === 'sqlite' ? `${SQLITE_SHA256}(${text}) = s.digest` : `encode(pg_catalog.sha256(convert_to(${text}, 'UTF8')), 'hex') = s.digest`;
  return `r.id, r.unit, NULL, r.started_at, NULL, NULL, NULL, r.spec_name, r.spec_revision, r.spec_sha256, NULL, r.statement, s.attempt, s.attempt_reason, s.note,
  COALESCE(s.run_digest, r.digest), NULL, s.checks_sha256, s.state_json, s.digest, ${holds}`;
}

/** The name of the SHA-256 function listingColumns calls on SQLite (hex of the text's UTF-8 bytes). */
export const SQLITE_SHA256 = 'benchproof_sha256';

/**
 * summaryText as an SQL expression over `r` (runs) and `s` (run_summaries): JSON strings by json_quote
 * (SQLite) or to_json (PostgreSQL), which escape as JSON.stringify does; NULL when a part is NULL.
 */
export function summaryTextSql(dialect: 'sqlite' | 'pg'): string {
  const q = (x: string): string => (dialect === 'sqlite' ? `json_quote(${x})` : `to_json(${x})::text`);
  const has = (x: string, type: 'integer' | 'text'): string => (dialect === 'sqlite' ? `typeof(${x}) = '${type}'` : `${x} IS NOT NULL`);
  return [
    `'{"checks":'`, q('s.checks_sha256'), `',"format":"benchproof-summary-1","head":{'`,
    `CASE WHEN ${has('s.attempt', 'integer')} THEN '"attempt":' || s.attempt || ',' ELSE '' END`,
    `CASE WHEN ${has('s.attempt_reason', 'text')} THEN '"attemptReason":' || ${q('s.attempt_reason')} || ',' ELSE '' END`,
    `'"kind":'`, q('r.kind'), `','`,
    `CASE WHEN ${has('s.note', 'text')} THEN '"note":' || ${q('s.note')} || ',' ELSE '' END`,
    `'"operator":'`, q('r.operator'), `',"spec":{"name":'`, q('r.spec_name'), `',"revision":'`, q('r.spec_revision'), `',"sha256":'`, q('r.spec_sha256'),
    `'},"startedAt":'`, q('r.started_at'), `',"statement":'`, q('r.statement'), `',"station":'`, q('r.station'), `',"toolVersion":'`, q('r.tool_version'),
    `',"unit":'`, q('r.unit'), `'},"run":'`, q('COALESCE(s.run_digest, r.digest)'), `',"state":'`, 's.state_json', `',"verdict":'`, q('s.verdict_sha256'), `'}'`,
  ].join(' || ');
}

/** A row of SUMMARY_COLUMNS as both engines read it: an array of the column values in that order. */
export type SummaryArray = readonly unknown[];

/** One row of SUMMARY_COLUMNS read as an array (both engines read them so), as an object of one shape. */
export function summaryRowOf(r: readonly unknown[]): SummaryRow {
  return {
    id: r[0] as number, unit: r[1] as string, kind: r[2] as string, started_at: r[3] as string, stored_at: r[4] as string, operator: r[5] as string,
    station: r[6] as string, spec_name: r[7] as string, spec_revision: r[8] as string, spec_sha256: r[9] as string, tool_version: r[10] as string,
    statement: r[11] as string, attempt: r[12] as number | null, attempt_reason: r[13] as string | null, note: r[14] as string | null, digest: r[15] as string,
    verdict_sha256: r[16] as string | null, checks_sha256: r[17] as string | null, state_json: r[18] as string | null, summary_digest: r[19] as string | null,
  };
}

/** A row of SUMMARY_COLUMNS read as an object, as the array the listing reads (summaryRowOf's inverse). */
export function summaryArrayOf(r: SummaryRow): SummaryArray {
  return [
    r.id, r.unit, r.kind, r.started_at, r.stored_at, r.operator, r.station, r.spec_name, r.spec_revision, r.spec_sha256, r.tool_version, r.statement,
    r.attempt ?? null, r.attempt_reason ?? null, r.note ?? null, r.digest, r.verdict_sha256, r.checks_sha256, r.state_json, r.summary_digest,
  ];
}
