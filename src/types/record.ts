/**
 * Stored test records (src/records) and the documents built from them: the per-unit record and the
 * batch statistics. Plain readonly data that survives a JSON round trip; `record --format json` and
 * `batch --format json` print these objects as they are. Fields may be added, never renamed.
 */
import type { Diagnosis } from './cause.js';
import type { Statement, UnitVerdict, VerdictState } from './verdict.js';
import type { StoredCalibrationRun } from './calibration.js';

/** What a run was. Only checks today; calibration runs will be a second kind (with a migration). */
export type RunKind = 'check';

/** The spec a run was checked against: name, revision and SHA-256 of its exact text. */
export interface RunSpec {
  readonly name: string;
  readonly revision: string;
  readonly sha256: string;
}

/** One capture handed to the store. Give its bytes, or the path to read them from (read, never changed). */
export interface NewCapture {
  /** Path as the user gave it, kept for the record. */
  readonly path: string;
  readonly sha256: string;
  readonly size: number;
  /** Layout as described by the capture reader (delimiter, header line, time column …). */
  readonly layout: string;
  readonly condition: string;
  readonly bytes?: Uint8Array;
  /** Absolute path to read the bytes from when `bytes` is absent. */
  readonly sourcePath?: string;
}

/** Everything one `check` run stores, in one call: `store.saveRun(run)`. */
export interface NewRun {
  readonly unit: string;
  readonly kind?: RunKind;
  /** ISO 8601 time the run started, e.g. `2026-03-14T09:30:00.000Z`. */
  readonly startedAt: string;
  readonly operator: string;
  /** Host name of the bench computer. */
  readonly station: string;
  /** `text` (the spec file's exact text or bytes) is kept once per SHA-256 so a record can show it. */
  readonly spec: RunSpec & { readonly text?: string | Uint8Array };
  readonly toolVersion: string;
  readonly verdict: UnitVerdict;
  readonly diagnosis: Diagnosis;
  readonly captures: readonly NewCapture[];
  /** Start a new test attempt of the unit even when its latest one still waits (`--new-attempt`). */
  readonly newAttempt?: boolean;
  /** What was done to the unit before this run (a part replaced, a trimmer turned); opens a new attempt. */
  readonly note?: string;
}

/**
 * Why a run opened a new test attempt: the unit's first run, the previous attempt was complete, the
 * user asked (`--new-attempt`), a note said what was repaired, the unit was calibrated since, or the
 * run is against another spec.
 */
export type AttemptReason = 'first' | 'after-complete' | 'requested' | 'note' | 'after-calibration' | 'other-spec';

export interface StoredCapture {
  readonly path: string;
  readonly sha256: string;
  readonly size: number;
  readonly layout: string;
  readonly condition: string;
  /** Where the archived copy lives, relative to the data folder, with `/` separators. */
  readonly archivePath: string;
}

export interface StoredRun {
  /** Run number in this data folder, counting from 1. */
  readonly id: number;
  readonly unit: string;
  readonly kind: RunKind;
  readonly startedAt: string;
  /** ISO 8601 time the store committed the run. */
  readonly storedAt: string;
  readonly operator: string;
  readonly station: string;
  readonly spec: RunSpec;
  readonly toolVersion: string;
  readonly statement: Statement;
  readonly verdict: UnitVerdict;
  readonly diagnosis: Diagnosis;
  readonly captures: readonly StoredCapture[];
  /** SHA-256 of the run's canonical JSON, computed when it was stored. */
  readonly digest: string;
  /** True when the stored content still hashes to `digest` (nothing changed it since). */
  readonly intact: boolean;
  /** The unit's test attempt this run belongs to (the unit's own count, from 1). */
  readonly attempt?: number;
  /** Set on the run that opened its attempt: why it did. */
  readonly attemptReason?: AttemptReason;
  /** The technician's note stored with the run. */
  readonly note?: string;
  /** The run's number among its unit's runs (from 1); `id` counts across the whole data folder. */
  readonly number?: number;
}

/**
 * One test attempt of a unit: the captures checked together until every condition of the spec is
 * present. Its latest run decides it. It is closed once complete, or once a later attempt started.
 */
export interface AttemptSummary {
  readonly number: number;
  readonly reason: AttemptReason;
  readonly state: VerdictState;
  /** The latest run's statement (never a pass while incomplete). */
  readonly statement: Statement;
  /** Worst statement over the conditions captured so far. */
  readonly soFar: Statement;
  readonly waitingFor: readonly string[];
  readonly closed: boolean;
  readonly spec: RunSpec;
  readonly startedAt: string;
  readonly lastAt: string;
  /** Store-wide ids of its runs, oldest first. */
  readonly runIds: readonly number[];
  /** Notes of its runs, oldest first. */
  readonly notes: readonly string[];
  /** Captures replaced by a later capture of the same condition within the attempt. */
  readonly recaptures: number;
}

export interface UnitSummary {
  readonly unit: string;
  /** Spec of the latest run. */
  readonly spec: RunSpec;
  /** The latest run decides the current status. */
  readonly status: Statement;
  readonly firstStatement: Statement;
  readonly firstTestedAt: string;
  readonly lastTestedAt: string;
  readonly runs: number;
  /** Runs of this unit that failed verification (changed, damaged, deleted); absent when none. */
  readonly unverifiedRuns?: readonly number[];
  /** State of the unit's latest attempt, and the conditions it still waits for. */
  readonly state?: VerdictState;
  readonly waitingFor?: readonly string[];
  readonly attempts?: number;
  /** Statement of the unit's first and latest complete attempts; absent while none is complete. */
  readonly firstComplete?: Statement;
  readonly latestComplete?: Statement;
}

/** Who produced a document, from where and when; set by the command line, absent in the store. */
export interface DocumentSource {
  readonly generatedAt: string;
  readonly toolVersion: string;
  readonly dataDir: string;
  /** The newest link of the store's hash chain when the document was made; pins the store's state. */
  readonly chainHead?: string;
}

/** The per-unit test record: every run, oldest first; the latest decides the status. */
export interface UnitRecord {
  readonly schemaVersion: 1;
  readonly unit: string;
  readonly status: Statement;
  readonly spec: RunSpec;
  readonly firstTestedAt: string;
  readonly lastTestedAt: string;
  readonly runs: readonly StoredRun[];
  /** The unit's test attempts, oldest first, and the state of the latest one. */
  readonly attempts?: readonly AttemptSummary[];
  readonly state?: VerdictState;
  readonly waitingFor?: readonly string[];
  /** Calibration runs with their iterations, oldest first; absent when the unit has none. */
  readonly calibrations?: readonly StoredCalibrationRun[];
  readonly source?: DocumentSource;
}

/** Process capability per NIST/SEMATECH e-Handbook §6.1.6; null where a limit or spread is missing. */
export interface Capability {
  readonly cp: number | null;
  readonly cpu: number | null;
  readonly cpl: number | null;
  readonly cpk: number | null;
}

/**
 * Why a batch figure is missing or rough, from a closed list (report/batchRemarks.ts words them):
 * values withheld; fewer than two units; no spread; no limits or one limit; few units; limits that
 * differ between revisions; a spread below the measurement's standard uncertainty (s and u in the
 * quantity's unit); runs under several spec revisions.
 */
export type BatchRemark =
  | { readonly kind: 'withheld'; readonly units: number }
  | { readonly kind: 'too-few-units' }
  | { readonly kind: 'no-spread' }
  | { readonly kind: 'no-limits' }
  | { readonly kind: 'one-sided' }
  | { readonly kind: 'few-units'; readonly units: number }
  | { readonly kind: 'limits-differ' }
  | { readonly kind: 'spread-below-u'; readonly sd: number; readonly u: number }
  | { readonly kind: 'several-revisions'; readonly revisions: readonly string[] };

/** Statistics of one checked quantity across the units of a batch (one value per unit). */
export interface MeasurementStats extends Capability {
  readonly condition: string;
  readonly output: string;
  readonly measurement: string;
  readonly unit: string;
  readonly lower: number | null;
  readonly upper: number | null;
  readonly nominal: number | null;
  /** Units with a value. */
  readonly count: number;
  /** Units whose value was withheld (not measured). */
  readonly withheld: number;
  readonly mean: number | null;
  /** Sample standard deviation (n − 1). */
  readonly sd: number | null;
  readonly min: number | null;
  readonly max: number | null;
  /** Why a figure is missing or rough, as data (report words them). */
  readonly remarks: readonly BatchRemark[];
  /** The values behind the figures, for histograms and spreadsheets. */
  readonly values: readonly { readonly unit: string; readonly value: number; readonly runId: number }[];
}

/** Accepted = PASS or COND. PASS (ILAC-G8:09/2019: a conditional pass is a pass with a flag). */
export interface YieldFigure {
  readonly units: number;
  readonly accepted: number;
  readonly conditional: number;
  /** accepted / units; null with no units. */
  readonly fraction: number | null;
}

export interface BatchUnit {
  readonly unit: string;
  readonly runs: number;
  readonly first: Statement;
  readonly latest: Statement;
  readonly firstTestedAt: string;
  readonly lastTestedAt: string;
  readonly latestRunId: number;
  /** Attempts counted; the first and latest complete ones; absent while the unit has none complete. */
  readonly attempts?: number;
  readonly firstComplete?: Statement;
  readonly latestComplete?: Statement;
  readonly state?: VerdictState;
  readonly waitingFor?: readonly string[];
}

export interface SpecBatch {
  readonly spec: string;
  /** Revisions seen, oldest first. */
  readonly revisions: readonly string[];
  readonly units: readonly BatchUnit[];
  readonly runs: number;
  /** Over units with a complete attempt: the first complete attempt decides first-pass, the latest final. */
  readonly firstPass: YieldFigure;
  readonly final: YieldFigure;
  /** Units with no complete attempt yet, with the conditions each waits for; left out of both yields. */
  readonly incomplete?: readonly { readonly unit: string; readonly waitingFor: readonly string[] }[];
  readonly measurements: readonly MeasurementStats[];
  /** About the batch as a whole, as data (report words them). */
  readonly remarks: readonly BatchRemark[];
}

export interface BatchReport {
  readonly schemaVersion: 1;
  readonly filter: { readonly spec?: string; readonly since?: string };
  readonly specs: readonly SpecBatch[];
  readonly source?: DocumentSource;
}

/** One side of a comparison: an attempt as its latest run left it. */
export interface ComparedAttempt {
  readonly number: number;
  readonly statement: Statement;
  readonly state: VerdictState;
  readonly waitingFor: readonly string[];
  readonly notes: readonly string[];
  readonly startedAt: string;
  /** The run that decides it: store-wide id and the unit's own run number. */
  readonly runId: number;
  readonly runNumber?: number;
  readonly causes: readonly { readonly id: string; readonly title: string; readonly score: number }[];
}

/** One check in both attempts; a side is null when that attempt did not check it. */
export interface ComparedCheck {
  readonly condition: string;
  readonly output: string;
  readonly measurement: string;
  readonly unit: string;
  readonly lower: number | null;
  readonly upper: number | null;
  readonly before: { readonly value: number | null; readonly expandedUncertainty: number | null; readonly statement: Statement } | null;
  readonly after: { readonly value: number | null; readonly expandedUncertainty: number | null; readonly statement: Statement } | null;
  /** after − before, when both were measured. */
  readonly change: number | null;
  /** True when |change| exceeds the root-sum-square of both expanded uncertainties (k = 2). */
  readonly significant: boolean;
  readonly statementChanged: boolean;
}

/** Two attempts of one unit side by side: values, statements and causes, and what changed. */
export interface AttemptComparison {
  readonly schemaVersion: 1;
  readonly unit: string;
  readonly spec: RunSpec;
  readonly before: ComparedAttempt;
  readonly after: ComparedAttempt;
  readonly checks: readonly ComparedCheck[];
  /** Causes named before and no longer, and named now but not before (by id). */
  readonly causesGone: readonly { readonly id: string; readonly title: string }[];
  readonly causesNew: readonly { readonly id: string; readonly title: string }[];
  readonly source?: DocumentSource;
}
