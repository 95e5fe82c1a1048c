/**
 * Test helper: synthesized FH-210 captures (src/syntheticCaptures scenario, fixed seeds) turned into Captures in
 * memory, measured by the analysis stage and bound to a spec, as `benchproof check` would do with files.
 */
import { measureCapture } from '../../src/analysis/index.js';
import { bindCapture, planCapture } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import { KESTREL_CONDITIONS, KESTREL_UNITS, kestrelCapture, synthesize } from '../../src/syntheticCaptures/index.js';
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

/**
 * A core with mismatched ramps whose comparator flips `td` seconds late, as triangle and pulse signals for
 * one condition. `rise` is the rising share of the undelayed period; the ramps' slopes stand in the ratio
 * r = s_rise/s_fall = (1 − rise)/rise for a 6 V swing at the nominal frequency. Each ramp runs on past
 * its threshold for td at its own slope, so T = 1/f0 + td·(2 + r + 1/r) (closed form; the law is checked
 * against an ngspice core with a delay line in test/ngspice/delayedComparator.test.ts), and the rising
 * share becomes (rise/f0 + td·(1 + 1/r))/T. With `swingGrows` the triangle also overruns its thresholds
 * (top by s_rise·td, bottom by s_fall·td), as a real late comparator does; without it the swing stays ±3 V.
 * 200 samples a period over 30 periods, at a rate that is not a multiple of the frequency.
 */
export function delayedCore(td: number, rise: number, opts: { swingGrows: boolean; seeds: readonly [number, number] }) {
  const r = (1 - rise) / rise;
  const k = 2 + r + 1 / r;
  return (c: ScenarioCondition): { triangle: SynthSignal; pulse: SynthSignal } => {
    const period = 1 / c.nominal + k * td;
    const sampleRate = (200 * 1.0137) / period;
    const ownRise = (rise / c.nominal + td * (1 + 1 / r)) / period;
    const top = opts.swingGrows ? 3 + ((6 * c.nominal) / rise) * td : 3;
    const bottom = opts.swingGrows ? -3 - ((6 * c.nominal) / (1 - rise)) * td : -3;
    return {
      triangle: synthesize({ shape: 'triangle', frequency: 1 / period, amplitude: (top - bottom) / 2, offset: (top + bottom) / 2, riseFraction: ownRise, sampleRate, samples: 200 * 30, noise: 0.006, seed: opts.seeds[0] }),
      pulse: synthesize({ shape: 'pulse', frequency: 1 / period, amplitude: 5, duty: ownRise, sampleRate, samples: 200 * 30, noise: 0.012, edge: { tau: 1.5e-6 }, seed: opts.seeds[1] }),
    };
  };
}
