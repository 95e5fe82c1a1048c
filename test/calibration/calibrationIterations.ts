/** Test helpers: calibration iterations of the fictional FK-0104 (demo only), ready for the store. */
import { createHash } from 'node:crypto';
import { decideCalibration } from '../../src/design/index.js';
import { guideTrim } from '../../src/diagnose/index.js';
import type { NewCalibrationIteration } from '../../src/types/index.js';
import { givenReading, kestrelSpec, specText, unitFrequency } from './kestrelCalibration.js';

const spec = kestrelSpec();
const CONTROLS = [0, 1, 2, 3, 4, 5];

/** One iteration of a unit running at scale k and `offsetCents` at 0 V; captures are tiny CSV texts. */
export function calibrationIteration(unit: string, startedAt: string, k: number, offsetCents: number, label?: string): NewCalibrationIteration {
  const readings = CONTROLS.map((c, i) => givenReading(spec, i, unitFrequency(c, k, offsetCents)));
  const result = guideTrim(spec, decideCalibration(spec, unit, readings, label ? { label } : {}));
  const captures = CONTROLS.map((c) => {
    const bytes = Buffer.from(`Time (s),CH1 (V)\n0,${k}\n1e-3,${offsetCents + c}\n`);
    return { path: `bench/${unit}_cv${c}.csv`, sha256: createHash('sha256').update(bytes).digest('hex'), size: bytes.length, layout: 'comma-separated', condition: String(c), bytes };
  });
  return { unit, startedAt, operator: 'jo', station: 'bench-2', spec: { name: spec.name, revision: spec.revision, sha256: spec.sha256, text: specText() }, toolVersion: '0.1.0', result, captures };
}
