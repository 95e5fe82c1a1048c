import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { decideUnit, parseSpec } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import { diagnoseUnit } from '../../src/diagnose/index.js';
import { KESTREL_CONDITIONS } from '../../src/syntheticCaptures/index.js';
import type { UnitTraits } from '../../src/syntheticCaptures/index.js';
import type { Cause, CircuitView, Diagnosis } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { checkedKestrel, kestrelTraits } from './kestrelUnit.js';

// The demo spec with its design section (4.7 nF ± 5 %, 14.76 µA ± 2 % at mid, ±3.0 V thresholds,
// 10 V logic high). Captures are synthesized with fixed seeds; each fault is planted on purpose.
const spec: Spec = parseSpec(readFileSync('samples/fh210-spec.yaml', 'utf8'), 'samples/fh210-spec.yaml');
const good = kestrelTraits('FK-0101');
const variant = (changes: Partial<UnitTraits>): UnitTraits => ({ ...good, serial: 'FK-0189', ...changes });

function diagnose(traits: UnitTraits, conditions = KESTREL_CONDITIONS): Diagnosis {
  const captures = checkedKestrel(spec, traits, conditions);
  return diagnoseUnit(spec, decideUnit(spec, traits.serial, captures));
}

const ids = (cs: readonly Cause[]): string[] => cs.map((c) => c.id);
const numberIn = (text: string, re: RegExp): number => Number(re.exec(text)?.[1]);
const figure = (views: readonly CircuitView[] | undefined, condition: string, id: string) => views?.find((v) => v.condition === condition)?.figures.find((f) => f.id === id);

describe('part attribution with a design section', () => {
  it('names the timing capacitor for FK-0104 (C +6 %) and says the captures cannot tell it from the reference current', () => {
    const d = diagnose(kestrelTraits('FK-0104'));
    const [first, second] = d.causes;
    expect(first.id).toBe('timing-capacitor');
    expect(first.indistinguishableFrom).toEqual(['reference-current']);
    expect(second.id).toBe('reference-current');
    expect(second.indistinguishableFrom).toEqual(['timing-capacitor']);
    expect(first.evidence[0]).toMatch(/^capacitance [\d.]+ nF effective vs 4\.7 nF ± 5 % — consistent with a capacitor above its tolerance$/);
    expectWithin(numberIn(first.evidence[0], /capacitance ([\d.]+) nF/), 4.7 * 1.06, { rel: 0.005 }, 'planted C = 4.7 nF × 1.06 (scenario FK-0104)');
    const text = first.evidence.join(' ');
    expect(text).toContain('both currents within');
    expect(text).toContain('the captures cannot tell this from the reference current');
    expect(text).toContain('capacitance meter');
    expect(ids(d.causes)).not.toContain('timing-scale');
  });

  it('gives FK-0103 (mismatched mirror) as charge and discharge currents in µA and how hot or cold the sink runs', () => {
    const d = diagnose(kestrelTraits('FK-0103'));
    expect(d.causes[0].id).toBe('current-mirror');
    // Scenario: rise share r = 1/(1 + 1.0833) at 261.63 Hz, C = 4.7 nF, Vpp 6 V: I = C·Vpp·f/r (capacitor law).
    const r = 1 / (1 + 1.0833);
    expectWithin(figure(d.circuit, 'mid', 'chargeCurrent')?.value, 4.7e-9 * 6 * 261.63 / r, { rel: 0.005 }, 'planted rise share, capacitor law');
    expectWithin(figure(d.circuit, 'mid', 'dischargeCurrent')?.value, 4.7e-9 * 6 * 261.63 / (1 - r), { rel: 0.005 }, 'planted rise share, capacitor law');
    expect(d.causes[0].evidence[0]).toMatch(/^charging at 15\.\d+ µA, discharging at 14\.\d+ µA at mid \(taking C = 4\.7 nF\): the sink runs 7\.[6-8] % cold against the source/);
    expect(d.circuit?.find((v) => v.condition === 'mid')?.summary[0]).toMatch(/^charging at 15\.\d+ µA, discharging at 14\.\d+ µA \(taking C = 4\.7 nF\): the sink runs 7\.\d % cold$/);
  });

  it('names the discharge sink when the falling ramp alone is 6 % slow, and folds the frequency pattern into it', () => {
    // Sink at 0.94·I: fall time grows by 1/0.94, so f scales by 2/(1 + 1/0.94) and the rise share is 1/(1 + 1/0.94).
    const d = diagnose(variant({ frequencyScale: 2 / (1 + 1 / 0.94), riseFraction: 1 / (1 + 1 / 0.94) }));
    expect(d.causes[0].id).toBe('discharge-sink');
    expectWithin(numberIn(d.causes[0].evidence[0], /discharge current ([\d.]+) µA at mid/), 0.94 * 14.76, { rel: 0.005 }, 'planted sink at 94 % of 14.76 µA');
    expect(ids(d.causes)).not.toContain('timing-scale');
    expect(ids(d.causes)).not.toContain('timing-capacitor');
  });

  it('names the threshold divider when the swing is 10 % wide and the ramps are on design', () => {
    const d = diagnose(variant({ swing: 3.3, frequencyScale: 3.0 / 3.3 }));
    expect(d.causes[0].id).toBe('threshold-divider');
    expect(d.causes[0].evidence[0]).toContain('with the ramp slopes on design');
    expectWithin(numberIn(d.causes[0].evidence[0], /swing ([\d.]+) V effective/), 6.6, { rel: 0.02 }, 'planted swing 2 × 3.3 V; one 78 mV step of the 8-bit capture');
    expect(ids(d.causes)).not.toContain('timing-capacitor');
  });

  it('cannot tell a threshold divider from switching delay with one condition, and says which capture separates them', () => {
    const d = diagnose(variant({ swing: 3.3, frequencyScale: 3.0 / 3.3 }), KESTREL_CONDITIONS.slice(1, 2));
    const lead = d.causes[0];
    expect(['threshold-divider', 'switching-delay']).toContain(lead.id);
    expect(lead.indistinguishableFrom).toEqual([lead.id === 'threshold-divider' ? 'switching-delay' : 'threshold-divider']);
    expect(lead.evidence.join(' ')).toContain('a capture at another condition also tells');
  });

  it('names loading of the output stage for a logic high of 8.6 V that is not clipped', () => {
    const d = diagnose(variant({ pulseHigh: 8.6 }));
    expect(d.causes[0].id).toBe('logic-loading');
    expectWithin(numberIn(d.causes[0].evidence[0], /logic high ([\d.]+) V/), 8.6, { abs: 0.08 }, 'planted level; half the 8-bit step of the 40 V scenario range');
    expect(d.causes[0].confirm).toContain('jack unplugged');
  });

  it('blames nothing in circuit terms on the good demo units, yet shows their circuit view at every condition', () => {
    for (const serial of ['FK-0101', 'FK-0102']) {
      const d = diagnose(kestrelTraits(serial));
      expect(d.causes).toEqual([]);
      expect(d.circuit?.map((v) => v.condition)).toEqual(['low', 'mid', 'high']);
      expectWithin(figure(d.circuit, 'mid', 'timingCapacitance')?.value, 4.7e-9, { rel: 0.01 }, 'good unit: nominal C within 1 % (frequency scale 1.0012 / 0.9985)');
    }
  });

  it('keeps a pattern rule’s evidence under the part that refines it, ranks by score, and survives a JSON round trip', () => {
    const d = diagnose(kestrelTraits('FK-0106'));
    expect(d.causes[0].id).toBe('switching-delay');
    expect(d.causes[0].evidence.join(' ')).toMatch(/each period is longer by 4·t_d: .*7\.\d µs at high/);
    for (let i = 1; i < d.causes.length; i++) expect(d.causes[i - 1].score).toBeGreaterThanOrEqual(d.causes[i].score);
    expect(JSON.parse(JSON.stringify(d))).toEqual(d);
  });
});
