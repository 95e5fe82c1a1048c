/**
 * The fingerprint of a stored run: SHA-256 over a canonical JSON text (object keys sorted, no spaces,
 * numbers as JavaScript prints them, which round-trips every double exactly). Stored with the run and
 * checked on every read, so a changed record shows up instead of being silently believed.
 */
import * as crypto from 'node:crypto';
import type { Diagnosis, RunKind, RunSpec, StoredCapture, UnitVerdict } from '../types/index.js';

/**
 * JSON text already in canonical form, written by canonicalJson as it is. Runs store their verdict
 * and diagnosis as canonical text, so verifying a run hashes the stored text without parsing it.
 */
export class CanonicalText {
  constructor(readonly text: string) {}
}

/** JSON text with object keys sorted at every level; `undefined` members are left out as JSON does. */
export function canonicalJson(value: unknown): string {
  if (value instanceof CanonicalText) return value.text;
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) {
    // Plot data is long arrays of numbers: JSON.stringify writes them exactly as element by element.
    if (value.every((v) => typeof v === 'number')) return JSON.stringify(value);
    return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  }
  const obj = value as Record<string, unknown>;
  const parts: string[] = [];
  for (const key of Object.keys(obj).sort()) {
    if (obj[key] === undefined || typeof obj[key] === 'function') continue;
    parts.push(`${JSON.stringify(key)}:${canonicalJson(obj[key])}`);
  }
  return `{${parts.join(',')}}`;
}

/** One-shot hashing (Node 20.12 and later) is about twice as fast on short texts as a Hash object. */
const oneShot = (crypto as { hash?: (algorithm: string, data: string | Uint8Array, encoding: 'hex') => string }).hash;

export function sha256Hex(data: string | Uint8Array): string {
  return oneShot ? oneShot('sha256', data, 'hex') : crypto.createHash('sha256').update(data).digest('hex');
}

/** The parts of a run its digest covers: everything except the run number, storing time and digest. */
export interface DigestedRun {
  readonly unit: string;
  readonly kind: RunKind;
  readonly startedAt: string;
  readonly operator: string;
  readonly station: string;
  readonly spec: RunSpec;
  readonly toolVersion: string;
  readonly verdict: UnitVerdict | CanonicalText;
  readonly diagnosis: Diagnosis | CanonicalText;
  readonly captures: readonly Omit<StoredCapture, 'archivePath'>[];
  /** Schema 5 (attempts); absent on older runs, so their digests are unchanged. */
  readonly attempt?: number;
  readonly attemptReason?: string;
  readonly note?: string;
}

export function runDigest(run: DigestedRun): string {
  const doc = {
    unit: run.unit,
    kind: run.kind,
    startedAt: run.startedAt,
    operator: run.operator,
    station: run.station,
    spec: { name: run.spec.name, revision: run.spec.revision, sha256: run.spec.sha256 },
    toolVersion: run.toolVersion,
    verdict: run.verdict,
    diagnosis: run.diagnosis,
    captures: run.captures.map((c) => ({ path: c.path, sha256: c.sha256, size: c.size, layout: c.layout, condition: c.condition })),
    // Left out when undefined (canonicalJson), so a run stored before attempts hashes as it did.
    attempt: run.attempt,
    attemptReason: run.attemptReason,
    note: run.note,
  };
  return sha256Hex(canonicalJson(doc));
}
