/**
 * The fingerprint of a stored calibration iteration: SHA-256 over the canonical JSON (digest.ts) of
 * everything it holds except its numbers in the store, storing time and the digest itself.
 */
import type { CalibrationIteration, RunSpec, StoredCapture } from '../types/index.js';
import { canonicalJson, sha256Hex } from './digest.js';

export interface DigestedIteration {
  readonly unit: string;
  readonly startedAt: string;
  readonly operator: string;
  readonly station: string;
  readonly spec: RunSpec;
  readonly toolVersion: string;
  readonly result: CalibrationIteration;
  readonly captures: readonly Omit<StoredCapture, 'archivePath'>[];
}

export function iterationDigest(it: DigestedIteration): string {
  return sha256Hex(
    canonicalJson({
      kind: 'calibration',
      unit: it.unit,
      startedAt: it.startedAt,
      operator: it.operator,
      station: it.station,
      spec: { name: it.spec.name, revision: it.spec.revision, sha256: it.spec.sha256 },
      toolVersion: it.toolVersion,
      result: it.result,
      captures: it.captures.map((c) => ({ path: c.path, sha256: c.sha256, size: c.size, layout: c.layout, condition: c.condition })),
    }),
  );
}
