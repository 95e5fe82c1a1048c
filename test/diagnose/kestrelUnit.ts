/**
 * Test helper: synthesized FH-210 captures (src/syntheticCaptures scenario, fixed seeds) turned into Captures in
 * memory, measured by the analysis stage and bound to a spec, as `benchproof check` would do with files.
 */
import { measureCapture } from '../../src/analysis/index.js';
import { bindCapture, planCapture } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import { KESTREL_CONDITIONS, KESTREL_UNITS, kestrelCapture } from '../../src/syntheticCaptures/index.js';
import type { ScenarioCondition, SynthSignal, UnitTraits } from '../../src/syntheticCaptures/index.js';
import type { Capture, CheckedCapture } from '../../src/types/index.js';
import { plainLayout } from '../helpers/plainLayout.js';

export interface SignalChannel {
  readonly name: string;
  readonly signal: SynthSignal;
  /** Level the synthesizer clamped the signal at: samples there are flagged as pinned, as the capture reader would. */
  readonly clipHigh?: number;
}

export function captureOf(path: string, channels: readonly SignalChannel[]): Capture {
  const { t0, dt, values } = channels[0].signal;
  return {
    path,
    sha256: '0'.repeat(64),
    size: values.length * 24,
    layout: plainLayout(values.length, channels.map((c) => c.name)),
    metadata: {},
    startTime: t0,
    sampleInterval: dt,
    length: values.length,
    channels: channels.map((c) => ({ name: c.name, unit: 'V', displayUnit: 'V', samples: c.signal.values, invalidCount: 0 })),
    warnings: [],
  };
}

export function kestrelTraits(serial: string): UnitTraits {
  const t = KESTREL_UNITS.find((u) => u.serial === serial);
  if (!t) throw new RangeError(`no scenario unit ${serial}`);
  return t;
}

/** The three condition captures of a unit (or a variant of it), measured and bound to the spec. */
export function checkedKestrel(spec: Spec, traits: UnitTraits | ((c: ScenarioCondition) => UnitTraits), conditions = KESTREL_CONDITIONS): CheckedCapture[] {
  return checkedSignals(spec, typeof traits === 'function' ? traits(conditions[0]).serial : traits.serial, conditions, (cond) => {
    const t = typeof traits === 'function' ? traits(cond) : traits;
    const cap = kestrelCapture(t, cond);
    return { triangle: cap.triangle, pulse: cap.pulse, ...(t.triangleClip !== undefined ? { triangleClip: t.triangleClip } : {}) };
  });
}

/** Captures from any signals per condition (triangle on CH1, pulse on CH2), measured and bound to the spec. */
export function checkedSignals(
  spec: Spec,
  serial: string,
  conditions: readonly ScenarioCondition[],
  signals: (c: ScenarioCondition) => { triangle: SynthSignal; pulse: SynthSignal; triangleClip?: number },
): CheckedCapture[] {
  return conditions.map((cond) => {
    const { triangle, pulse, triangleClip } = signals(cond);
    const path = `${serial}_${cond.name}.csv`;
    const capture = captureOf(path, [
      { name: 'CH1', signal: triangle, ...(triangleClip !== undefined ? { clipHigh: triangleClip } : {}) },
      { name: 'CH2', signal: pulse },
    ]);
    return bindCapture(spec, planCapture(spec, path), capture, measureCapture(capture));
  });
}
