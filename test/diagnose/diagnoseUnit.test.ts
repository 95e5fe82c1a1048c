import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { decideUnit, parseSpec } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import { diagnoseUnit } from '../../src/diagnose/index.js';
import { KESTREL_CONDITIONS, synthesize } from '../../src/syntheticCaptures/index.js';
import type { ScenarioCondition, UnitTraits } from '../../src/syntheticCaptures/index.js';
import type { Cause, CauseFact, CheckedCapture } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { checkedKestrel, checkedSignals, delayedCore, kestrelTraits } from './kestrelUnit.js';
import { jitteryCore } from './jitteryCore.js';

// Every capture here is synthesized with a fixed seed (src/syntheticCaptures); the faults are planted on purpose.
// These tests pin the pattern rules, so the spec's design section is left out: with it, the part
// attribution takes over the rules it refines (test/diagnose/circuitCauses.test.ts).
const { design: _design, ...withoutDesign } = parseSpec(readFileSync('samples/fh210-spec.yaml', 'utf8'), 'samples/fh210-spec.yaml');
const spec: Spec = withoutDesign;
const good = kestrelTraits('FK-0101');

function causesOf(captures: readonly CheckedCapture[]): Cause[] {
  const verdict = decideUnit(spec, captures[0].unit, captures);
  return [...diagnoseUnit(spec, verdict).causes];
}

const ids = (cs: readonly Cause[]): string[] => cs.map((c) => c.id);
/** The cause's facts about one measurement id or part name (assertions read data, never sentences). */
const factsOf = (c: Cause | undefined, key: string): CauseFact[] => (c?.facts ?? []).filter((f) => f.measurement === key || f.part === key);
const variant = (changes: Partial<UnitTraits>): UnitTraits => ({ ...good, serial: 'FK-0199', ...changes });

/** A core synthesized directly: ideal triangle ±3 V and 0/10 V pulse, with optional hum or a ringing edge. */
function core(c: ScenarioCondition, extra: { hum?: number; zeta?: number; seconds?: number }) {
  const sampleRate = c.nominal * 200 * 1.0137;
  const samples = 200 * Math.max(24, Math.ceil((extra.seconds ?? 0) * c.nominal));
  const hum = extra.hum ? [{ frequency: 50, amplitude: extra.hum, phase: 0.3 }] : [];
  const edge = extra.zeta ? { zeta: extra.zeta, omegaN: (2 * Math.PI * sampleRate) / 16 } : { tau: 1.5e-6 };
  return {
    triangle: synthesize({ shape: 'triangle', frequency: c.nominal, amplitude: 3, sampleRate, samples, noise: 0.006, hum, seed: 7 }),
    pulse: synthesize({ shape: 'pulse', frequency: c.nominal, amplitude: 5, sampleRate, samples, noise: 0.012, hum, edge, seed: 8 }),
  };
}

describe('diagnoseUnit on good units', () => {
  it('stays silent on both good demo units (every rule)', () => {
    expect(ids(causesOf(checkedKestrel(spec, kestrelTraits('FK-0101'))))).toEqual([]);
    expect(ids(causesOf(checkedKestrel(spec, kestrelTraits('FK-0102'))))).toEqual([]);
  });

  it('stays silent on an ideal core with a record long enough for the hum search', () => {
    const conditions = KESTREL_CONDITIONS.slice(0, 2);
    expect(ids(causesOf(checkedSignals(spec, 'FK-0198', conditions, (c) => core(c, { seconds: 0.5 }))))).toEqual([]);
  });
});

describe('diagnoseUnit frequency patterns (f = I/(2·C·Vpp))', () => {
  it('blames the timing capacitor or reference current first when every condition is off by the same ratio', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0104')));
    expect(causes[0].id).toBe('timing-scale');
    // The scenario runs FK-0104 at 0.943 of nominal at every condition (src/syntheticCaptures/scenario.ts).
    const freq = factsOf(causes[0], 'frequency');
    expect(freq.map((f) => f.condition)).toEqual(['low', 'mid', 'high']);
    for (const f of freq) {
      expect(f.expected?.basis).toBe('nominal');
      expectWithin(f.observed.value / f.expected!.value, 0.943, { abs: 0.005 }, 'scenario frequency scale 0.943');
      expect(f.observed.expandedUncertainty).toBeGreaterThan(0);
    }
    expect(causes[0].remarks).toContain('same-ratio-everywhere');
    expect(causes[0].confirm).toContain('timing capacitor');
  });

  it('blames comparator and switching delay first when the error grows with frequency, and estimates the delay', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0106')));
    expect(causes[0].id).toBe('switching-delay');
    // The scenario plants t_d = 7.6 µs; each ramp runs on for t_d and comes back, T = 1/f0 + 4·t_d (closed form).
    const td = factsOf(causes[0], 'switching delay per flip').find((f) => f.condition === 'high')!;
    expect(td.observed.unit).toBe('s');
    expectWithin(td.observed.value, 7.6e-6, { rel: 0.03 }, 'planted delay, closed form T = 1/f0 + 4·t_d');
    expect(causes[0].remarks).toEqual(expect.arrayContaining(['error-grows-with-frequency', 'period-longer-by-4td']));
    expect(ids(causes)).not.toContain('threshold-levels');
  });

  it('estimates the delay with the unequal-slope period law when the ramps are mismatched', () => {
    // Ramps in the ratio r = s_rise/s_fall = 1.5 (rising share 0.4) and t_d = 7.6 µs. Each overrun at one
    // slope is undone at the other, so T = 1/f0 + t_d·(2 + r + 1/r) (closed form, checked against an
    // ngspice core with a delay line in test/ngspice/delayedComparator.test.ts); 4·t_d would read 4 % high.
    const td = 7.6e-6;
    const rise = 0.4;
    const delayed = delayedCore(td, rise, { swingGrows: false, seeds: [21, 22] });
    const causes = causesOf(checkedSignals(spec, 'FK-0197', KESTREL_CONDITIONS, delayed));
    const cause = causes.find((c) => c.id === 'switching-delay');
    expect(cause).toBeDefined();
    const high = factsOf(cause, 'switching delay per flip').find((f) => f.condition === 'high')!;
    expectWithin(high.observed.value, td, { rel: 0.02 }, 'planted delay, closed form T = 1/f0 + t_d·(2 + r + 1/r)');
  });

  it('blames leakage or bias current when the error is largest at the low end', () => {
    // A fixed 2 % of the low-end charge current lost to leakage: error −k/f with k = 0.02·65.41 Hz.
    const leaky = (c: ScenarioCondition): UnitTraits => variant({ frequencyScale: 1 - (0.02 * 65.41) / c.nominal });
    const causes = causesOf(checkedKestrel(spec, leaky));
    expect(causes[0].id).toBe('low-end-leakage');
    expect(ids(causes)).not.toContain('timing-scale');
  });
});

describe('diagnoseUnit shape patterns', () => {
  it('blames charge/discharge current mismatch first for a slope ratio ≠ 1, with duty and even harmonics as evidence', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0103')));
    expect(causes[0].id).toBe('current-mismatch');
    // Scenario FK-0103: rise share 1/(1 + 1.0833), so the rising slope is 1.0833 × the falling one (slopes are I/C).
    for (const f of factsOf(causes[0], 'slopeRatio')) expectWithin(f.observed.value, 1.0833, { rel: 0.01 }, 'planted current ratio 1.0833');
    // Rising share of the period 1/(1 + ratio) = 48.0 % (triangle geometry), or its complement on the pulse.
    const duties = factsOf(causes[0], 'dutyCycle');
    expect(duties.length).toBeGreaterThan(0);
    for (const f of duties) expectWithin(Math.min(f.observed.value, 100 - f.observed.value), 100 / (1 + 1.0833), { abs: 0.5 }, 'rising share 1/(1 + ratio)');
    expect(factsOf(causes[0], '2nd harmonic').every((f) => f.observed.unit === 'dBc' && f.observed.value > -45)).toBe(true);
    expect(causes[0].remarks).toEqual(expect.arrayContaining(['duty-follows-slopes', 'no-even-harmonics']));
  });

  it('blames the threshold divider when the swing is off (and frequency follows 1/Vpp)', () => {
    const causes = causesOf(checkedKestrel(spec, variant({ swing: 3.3, frequencyScale: 3.0 / 3.3 })));
    expect(ids(causes)).toContain('threshold-levels');
    const cause = causes.find((c) => c.id === 'threshold-levels');
    expect(cause?.remarks).toContain('frequency-follows-swing');
    // Planted swing 2 × 3.3 V against the 6 V nominal.
    expectWithin(factsOf(cause, 'peakToPeak')[0].observed.value, 6.6, { rel: 0.02 }, 'planted swing 2 × 3.3 V; one 78 mV step of the 8-bit capture');
  });

  it('blames the bias divider or amplifier offset for a triangle off centre', () => {
    const causes = causesOf(checkedKestrel(spec, variant({ triangleOffset: 0.4 })));
    expect(causes[0].id).toBe('offset-bias');
  });

  it('blames saturation first for a triangle pinned flat (the scenario’s FK-0105)', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0105')));
    expect(causes[0].id).toBe('saturation');
    // The scenario clamps FK-0105's triangle at 2.55 V inside the 8-bit scope's ±10 V (src/syntheticCaptures/scenario.ts).
    const level = factsOf(causes[0], 'flat top level')[0];
    expect(level.output).toBe('triangle');
    expectWithin(level.observed.value, 2.55, { abs: 0.08 }, 'planted clamp 2.55 V; one 78 mV step of the 8-bit ±10 V capture');
    expect(causes[0].remarks).toContain('one-side-flat');
    expect(ids(causes)).not.toContain('threshold-levels');
  });
});

describe('diagnoseUnit edges, interference and logic levels', () => {
  it('blames comparator filtering/hysteresis or the probe ground for ringing at each flip', () => {
    // Second-order edge with ζ = 0.3 overshoots by exp(−πζ/√(1−ζ²)) = 37.2 % (Ogata §5-3, closed form).
    const causes = causesOf(checkedSignals(spec, 'FK-0197', KESTREL_CONDITIONS, (c) => core(c, { zeta: 0.3 })));
    expect(causes[0].id).toBe('edge-ringing');
    const os = factsOf(causes[0], 'overshoot')[0];
    expect(os.observed.unit).toBe('%');
    expectWithin(os.observed.value, 37.2, { abs: 1 }, 'exp(−πζ/√(1−ζ²)), Ogata §5-3');
  });

  it('blames a ground loop or probe grounding for 50 Hz hum', () => {
    const conditions = KESTREL_CONDITIONS.slice(0, 2);
    const causes = causesOf(checkedSignals(spec, 'FK-0196', conditions, (c) => core(c, { hum: 0.05, seconds: 0.5 })));
    expect(causes[0].id).toBe('mains-hum');
    for (const f of factsOf(causes[0], 'humFrequency')) expectWithin(f.observed.value, 50, { abs: 0.5 }, 'planted 50 Hz hum (IEC 60038 mains frequency)');
    expect(factsOf(causes[0], 'humLevel').length).toBeGreaterThan(0);
  });

  it('blames a noisy supply or threshold for a period that wanders from cycle to cycle', () => {
    const causes = causesOf(checkedSignals(spec, 'FK-0195', KESTREL_CONDITIONS, (c) => jitteryCore(c.nominal, 0.01, 5)));
    expect(causes[0].id).toBe('period-jitter');
  });

  it('blames loading of the pull-up divider for a low logic high that is not clipped', () => {
    const causes = causesOf(checkedKestrel(spec, variant({ pulseHigh: 8.6 })));
    expect(causes[0].id).toBe('weak-logic-high');
    const high = factsOf(causes[0], 'highLevel')[0];
    expectWithin(high.observed.value, 8.6, { abs: 0.08 }, 'planted level; half the 8-bit step of the 40 V scenario range');
    expect(high.expected?.value).toBe(10);
  });
});

describe('diagnoseUnit output', () => {
  it('ranks causes by score and gives every one facts, a confirming measurement and a JSON-safe shape, leaving the words to report', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0105')));
    for (let i = 1; i < causes.length; i++) expect(causes[i - 1].score).toBeGreaterThanOrEqual(causes[i].score);
    for (const c of causes) {
      expect((c.facts?.length ?? 0) + (c.remarks?.length ?? 0)).toBeGreaterThan(0);
      expect(c.evidence).toEqual([]);
      for (const f of c.facts ?? []) expect(Number.isFinite(f.observed.value)).toBe(true);
      expect(c.confirm.length).toBeGreaterThan(10);
      expect(c.score).toBeGreaterThan(0);
      expect(c.score).toBeLessThanOrEqual(1);
    }
    expect(JSON.parse(JSON.stringify(causes))).toEqual(causes);
  });
});
