/**
 * `benchproof check --json`: one document with every unit's checks (value, U, limits, margin,
 * statement, notes), its captures and measurements, its ranked causes, and the display name of each
 * measurement id (`labels`). schemaVersion 1; fields may be added, never renamed.
 */
import { measurementLabelsOf, verdictState, waitingConditions } from '../types/index.js';
import type { Diagnosis, Statement, UnitVerdict, VerdictState } from '../types/index.js';
import type { Spec } from '../design/index.js';
import type { UnitCheck } from './checkText.js';

export interface CheckDocument {
  readonly schemaVersion: 1;
  readonly spec: { readonly file: string; readonly name: string; readonly revision: string; readonly sha256: string; readonly decisionRule: UnitVerdict['decisionRule'] };
  readonly units: readonly {
    readonly unit: string;
    readonly statement: Statement;
    /** 'incomplete' while a condition has no capture yet (then `statement` is never a pass). */
    readonly state: VerdictState;
    readonly waitingFor: readonly string[];
    readonly verdict: UnitVerdict;
    readonly diagnosis: Diagnosis;
    /** True when the causes were named from part of the conditions only. */
    readonly preliminaryCauses: boolean;
  }[];
  /** The display name of each measurement id in the document (the label table, src/types/measurementLabels.ts). */
  readonly labels: Readonly<Record<string, string>>;
}

export function checkDocument(spec: Spec, units: readonly UnitCheck[]): CheckDocument {
  return {
    schemaVersion: 1,
    spec: { file: spec.file, name: spec.name, revision: spec.revision, sha256: spec.sha256, decisionRule: spec.decision },
    units: units.map((u) => ({
      unit: u.verdict.unit,
      statement: u.verdict.statement,
      state: verdictState(u.verdict),
      waitingFor: waitingConditions(u.verdict),
      verdict: u.verdict,
      diagnosis: u.diagnosis,
      preliminaryCauses: verdictState(u.verdict) === 'incomplete',
    })),
    labels: measurementLabelsOf(units.flatMap((u) => u.verdict.conditions.flatMap((c) => c.checks.map((k) => k.measurement)))),
  };
}
