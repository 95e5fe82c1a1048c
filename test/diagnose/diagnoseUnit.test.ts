import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { decideUnit, parseSpec } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import { diagnoseUnit } from '../../src/diagnose/index.js';
import { KESTREL_CONDITIONS, synthesize } from '../../src/syntheticCaptures/index.js';
import type { ScenarioCondition, UnitTraits } from '../../src/syntheticCaptures/index.js';
import type { Cause, CheckedCapture } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { checkedKestrel, checkedSignals, kestrelTraits } from './kestrelUnit.js';
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
    expect(causes[0].evidence.join(' ')).toContain('×0.94');
    expect(causes[0].confirm).toContain('timing capacitor');
  });

  it('blames comparator and switching delay first when the error grows with frequency, and estimates the delay', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0106')));
    expect(causes[0].id).toBe('switching-delay');
    // The scenario plants t_d = 7.6 µs; each ramp runs on for t_d and comes back, T = 1/f0 + 4·t_d (closed form).
    const td = /([\d.]+) µs at high/.exec(causes[0].evidence[1]);
    expectWithin(Number(td?.[1]), 7.6, { rel: 0.03 }, 'planted delay, closed form T = 1/f0 + 4·t_d');
    expect(ids(causes)).not.toContain('threshold-levels');
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
    const text = causes[0].evidence.join(' ');
    expect(text).toContain('slope ratio');
    expect(text).toContain('pulse duty');
    expect(text).toContain('2nd harmonic');
  });

  it('blames the threshold divider when the swing is off (and frequency follows 1/Vpp)', () => {
    const causes = causesOf(checkedKestrel(spec, variant({ swing: 3.3, frequencyScale: 3.0 / 3.3 })));
    expect(ids(causes)).toContain('threshold-levels');
    expect(causes.find((c) => c.id === 'threshold-levels')?.evidence.join(' ')).toContain('f ∝ 1/Vpp');
  });

  it('blames the bias divider or amplifier offset for a triangle off centre', () => {
    const causes = causesOf(checkedKestrel(spec, variant({ triangleOffset: 0.4 })));
    expect(causes[0].id).toBe('offset-bias');
  });

  it('blames saturation first for a triangle pinned flat (the scenario’s FK-0105)', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0105')));
    expect(causes[0].id).toBe('saturation');
    // The scenario clamps FK-0105's triangle at 2.55 V inside the 8-bit scope's ±10 V (src/syntheticCaptures/scenario.ts).
    expect(causes[0].evidence[0]).toMatch(/flat on its top at 2\.55 V, inside the scope's range/);
    expect(ids(causes)).not.toContain('threshold-levels');
  });
});

describe('diagnoseUnit edges, interference and logic levels', () => {
  it('blames comparator filtering/hysteresis or the probe ground for ringing at each flip', () => {
    // Second-order edge with ζ = 0.3 overshoots by exp(−πζ/√(1−ζ²)) = 37.2 % (Ogata §5-3, closed form).
    const causes = causesOf(checkedSignals(spec, 'FK-0197', KESTREL_CONDITIONS, (c) => core(c, { zeta: 0.3 })));
    expect(causes[0].id).toBe('edge-ringing');
    const os = /overshoot ([\d.]+) %/.exec(causes[0].evidence[0]);
    expectWithin(Number(os?.[1]), 37.2, { abs: 1 }, 'exp(−πζ/√(1−ζ²)), Ogata §5-3');
  });

  it('blames a ground loop or probe grounding for 50 Hz hum', () => {
    const conditions = KESTREL_CONDITIONS.slice(0, 2);
    const causes = causesOf(checkedSignals(spec, 'FK-0196', conditions, (c) => core(c, { hum: 0.05, seconds: 0.5 })));
    expect(causes[0].id).toBe('mains-hum');
    expect(causes[0].evidence.join(' ')).toContain('hum at 50 Hz');
  });

  it('blames a noisy supply or threshold for a period that wanders from cycle to cycle', () => {
    const causes = causesOf(checkedSignals(spec, 'FK-0195', KESTREL_CONDITIONS, (c) => jitteryCore(c.nominal, 0.01, 5)));
    expect(causes[0].id).toBe('period-jitter');
  });

  it('blames loading of the pull-up divider for a low logic high that is not clipped', () => {
    const causes = causesOf(checkedKestrel(spec, variant({ pulseHigh: 8.6 })));
    expect(causes[0].id).toBe('weak-logic-high');
    const high = /pulse high ([\d.]+) V/.exec(causes[0].evidence[0]);
    expectWithin(Number(high?.[1]), 8.6, { abs: 0.08 }, 'planted level; half the 8-bit step of the 40 V scenario range');
  });
});

describe('diagnoseUnit output', () => {
  it('ranks causes by score and gives every one evidence, a confirming measurement and a JSON-safe shape', () => {
    const causes = causesOf(checkedKestrel(spec, kestrelTraits('FK-0105')));
    for (let i = 1; i < causes.length; i++) expect(causes[i - 1].score).toBeGreaterThanOrEqual(causes[i].score);
    for (const c of causes) {
      expect(c.evidence.length).toBeGreaterThan(0);
      expect(c.confirm.length).toBeGreaterThan(10);
      expect(c.score).toBeGreaterThan(0);
      expect(c.score).toBeLessThanOrEqual(1);
    }
    expect(JSON.parse(JSON.stringify(causes))).toEqual(causes);
  });
});
