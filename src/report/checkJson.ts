/**
 * `benchproof check --json`: one document with every unit's checks (value, U, limits, margin,
 * statement, notes), its captures and measurements, and its ranked causes. schemaVersion 1; fields
 * may be added, never renamed.
 */
import type { Diagnosis, Statement, UnitVerdict } from '../types/index.js';
import type { Spec } from '../spec/index.js';
import type { UnitCheck } from './checkText.js';

export interface CheckDocument {
  readonly schemaVersion: 1;
  readonly spec: { readonly file: string; readonly name: string; readonly revision: string; readonly sha256: string; readonly decisionRule: UnitVerdict['decisionRule'] };
  readonly units: readonly { readonly unit: string; readonly statement: Statement; readonly verdict: UnitVerdict; readonly diagnosis: Diagnosis }[];
}

export function checkDocument(spec: Spec, units: readonly UnitCheck[]): CheckDocument {
  return {
    schemaVersion: 1,
    spec: { file: spec.file, name: spec.name, revision: spec.revision, sha256: spec.sha256, decisionRule: spec.decision },
    units: units.map((u) => ({ unit: u.verdict.unit, statement: u.verdict.statement, verdict: u.verdict, diagnosis: u.diagnosis })),
  };
}
