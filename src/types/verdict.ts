/** Decisions against a design spec: ILAC-G8:09/2019 statements per check, per condition, per unit. */
import type { MeasureReport, MeasurementBound, Shape } from './measurement.js';

/** ILAC-G8:09/2019 §4.2.3 statements, plus 'not-measured' for a withheld measurement (never a pass). */
export type Statement = 'pass' | 'conditional-pass' | 'conditional-fail' | 'fail' | 'not-measured';

/** Words shown to users; colour only adds emphasis. */
export const STATEMENT_WORDS: Readonly<Record<Statement, string>> = {
  pass: 'PASS',
  'conditional-pass': 'COND. PASS',
  'conditional-fail': 'COND. FAIL',
  fail: 'FAIL',
  'not-measured': 'NOT MEASURED',
};

export type DecisionRule = 'guarded' | 'simple' | 'guarded-binary';

export interface CheckVerdict {
  /** Spec output name, e.g. 'triangle out'. */
  readonly output: string;
  readonly condition: string;
  /** Measurement id checked. */
  readonly measurement: string;
  readonly unit: string;
  readonly value: number | null;
  /** When value is null: the one-sided bound the check was decided on (e.g. hum below −72 dBc). */
  readonly bound?: MeasurementBound;
  /** Expanded uncertainty U (k = 2), null when none could be estimated. */
  readonly expandedUncertainty: number | null;
  /** Tolerance limits (null = unbounded on that side). */
  readonly lower: number | null;
  readonly upper: number | null;
  readonly nominal: number | null;
  /** Guard band applied on each side (0 with simple acceptance). */
  readonly guard: number;
  /** Signed distance to the nearest tolerance limit, positive inside; null when not measured. */
  readonly margin: number | null;
  readonly statement: Statement;
  /** Why not measured, or anything else the technician should know. */
  readonly note?: string;
  /** The user's own hint from the spec, shown with a failure. */
  readonly hint?: string;
  /** True when nothing was captured for this check yet (its condition or output is still to land). */
  readonly waiting?: boolean;
}

export interface ConditionVerdict {
  readonly condition: string;
  readonly statement: Statement;
  readonly checks: readonly CheckVerdict[];
  /** True when no capture of this condition was given yet: its checks wait (they were not tried). */
  readonly waiting?: boolean;
}

export interface SpecIdentity {
  readonly name: string;
  readonly revision: string;
  readonly sha256: string;
  readonly description?: string;
}

/** One capture as used by a check: what it is, and what was measured from it. */
export interface CheckedCapture {
  readonly path: string;
  readonly sha256: string;
  readonly size: number;
  readonly layout: string;
  readonly unit: string;
  readonly condition: string;
  /** Output names this capture supplied, with the channel used for each. */
  readonly outputs: readonly { output: string; channel: string; expectedShape?: Shape }[];
  readonly report: MeasureReport;
}

export interface UnitVerdict {
  readonly schemaVersion: 1;
  readonly unit: string;
  readonly spec: SpecIdentity;
  readonly decisionRule: DecisionRule;
  readonly statement: Statement;
  readonly conditions: readonly ConditionVerdict[];
  readonly captures: readonly CheckedCapture[];
  /**
   * 'incomplete' while a condition the spec names has no capture yet (see waitingFor); the unit's
   * `statement` then never reads as a pass. Absent in verdicts stored before attempts existed: derive
   * it with `verdictState`.
   */
  readonly state?: VerdictState;
  /**
   * What still waits for a capture, in spec order; empty when complete. A whole condition by its name
   * (`mid`); with one file per output, an output at a captured condition as `mid (pulse out)`.
   */
  readonly waitingFor?: readonly string[];
  /** Worst statement over the conditions captured so far (what the unit shows while it waits). */
  readonly soFar?: Statement;
}

/** A unit's test is complete once every condition of the spec has a capture; until then it waits. */
export type VerdictState = 'complete' | 'incomplete';

export const INCOMPLETE_WORD = 'INCOMPLETE';

/** Conditions without any capture: the stored field, or derived from the captures for older verdicts. */
export function waitingConditions(v: Pick<UnitVerdict, 'conditions' | 'captures' | 'waitingFor'>): readonly string[] {
  if (v.waitingFor) return v.waitingFor;
  // A verdict with one condition and no captures cannot occur (a unit exists through its captures).
  return v.conditions.filter((c) => !v.captures.some((k) => k.condition === c.condition)).map((c) => c.condition);
}

export function verdictState(v: Pick<UnitVerdict, 'conditions' | 'captures' | 'waitingFor'>): VerdictState {
  return waitingConditions(v).length > 0 ? 'incomplete' : 'complete';
}
