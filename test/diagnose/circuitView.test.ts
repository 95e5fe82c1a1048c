import { describe, it, expect } from 'vitest';
import { decideUnit, parseSpec } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import { diagnoseUnit } from '../../src/diagnose/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import type { ScenarioCondition } from '../../src/syntheticCaptures/index.js';
import type { CircuitFigure, CircuitView } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { checkedSignals } from './kestrelUnit.js';

/**
 * A core built from chosen parts (test data): the capacitor law dV/dt = I/C sets each ramp, so a
 * triangle of swing Vpp rises for C·Vpp/I_charge and falls for C·Vpp/I_discharge. The captures are
 * synthesized with those times (seeded noise) and run through measurement, decision and diagnosis.
 */
interface Core {
  readonly c: number;
  readonly vpp: number;
  readonly charge: number;
  readonly discharge: number;
}

const rampTimes = (k: Core): [number, number] => [(k.c * k.vpp) / k.charge, (k.c * k.vpp) / k.discharge];

function coreSignals(k: Core, seed: number) {
  const [up, down] = rampTimes(k);
  const frequency = 1 / (up + down);
  const sampleRate = frequency * 200 * 1.0137;
  const common = { frequency, phase: 0.21, sampleRate, samples: 200 * 30 };
  return {
    triangle: synthesize({ ...common, shape: 'triangle', amplitude: k.vpp / 2, riseFraction: up / (up + down), noise: 0.002, seed }),
    pulse: synthesize({ ...common, shape: 'pulse', amplitude: 5, duty: up / (up + down), edge: { tau: 2e-7 }, noise: 0.004, seed: seed + 1 }),
  };
}

/** A spec with one design section; currents given at `at`, conditions named with their nominal frequency. */
function specFor(design: { charge: number; discharge: number; at: string }, conditions: readonly ScenarioCondition[]): Spec {
  const conds = conditions.map((c) => `  ${c.name}:\n    expect:\n      triangle: { frequency: { nominal: ${c.nominal} Hz } }`).join('\n');
  const yaml = `name: test core
revision: A
outputs:
  triangle: { channel: 1, shape: triangle, checks: [ { measure: frequency, tolerance: 2 % } ] }
  pulse: { channel: 2, shape: pulse, checks: [ { measure: highLevel, nominal: 10 V, tolerance: 0.5 V } ] }
conditions:
${conds}
design:
  timingCapacitance: { nominal: 6.8 nF, tolerance: 5 % }
  chargeCurrent: { nominal: ${design.charge * 1e6} µA, tolerance: 2 %, at: ${design.at} }
  dischargeCurrent: { nominal: ${design.discharge * 1e6} µA, tolerance: 2 %, at: ${design.at} }
  upperThreshold: { nominal: 2.5 V, tolerance: 50 mV }
  lowerThreshold: { nominal: -2.5 V, tolerance: 50 mV }
  positiveRail: { nominal: 12 V, tolerance: 5 % }
  logicHigh: { nominal: 10 V, tolerance: 3 % }
`;
  return parseSpec(yaml, 'test-core.yaml');
}

function circuitOf(spec: Spec, conditions: readonly ScenarioCondition[], core: (c: ScenarioCondition) => Core): readonly CircuitView[] {
  const captures = checkedSignals(spec, 'TC-01', conditions, (c) => coreSignals(core(c), 40 + conditions.indexOf(c)));
  return diagnoseUnit(spec, decideUnit(spec, 'TC-01', captures)).circuit ?? [];
}

const fig = (v: CircuitView | undefined, id: string): CircuitFigure | undefined => v?.figures.find((f) => f.id === id);

describe('circuit view on a core built from chosen I, C and swing (capacitor law dV/dt = I/C)', () => {
  const core: Core = { c: 6.8e-9, vpp: 5, charge: 40e-6, discharge: 43e-6 };
  const [up, down] = rampTimes(core);
  const bench: ScenarioCondition = { name: 'bench', control: 0, nominal: 1 / (up + down) };

  it('recovers mismatched charge and discharge currents within 0.5 % from the slopes and the nominal C', () => {
    const [view] = circuitOf(specFor({ charge: 40e-6, discharge: 40e-6, at: 'bench' }, [bench]), [bench], () => core);
    expectWithin(fig(view, 'chargeCurrent')?.value, 40e-6, { rel: 0.005 }, 'planted 40 µA; capacitor law I = C·dV/dt');
    expectWithin(fig(view, 'dischargeCurrent')?.value, 43e-6, { rel: 0.005 }, 'planted 43 µA; capacitor law I = C·dV/dt');
    expectWithin(fig(view, 'sinkVsSource')?.value, 7.5, { abs: 0.1 }, 'planted 43/40 − 1 = 7.5 %; slope ratio, C cancels');
    expect(view.summary).toEqual([]); // words are report's (test/report/causeWords.test.ts)
  });

  it('recovers the capacitance within 0.5 % when the design currents are the true ones, and predicts the frequency', () => {
    const [view] = circuitOf(specFor({ charge: 40e-6, discharge: 43e-6, at: 'bench' }, [bench]), [bench], () => core);
    expectWithin(fig(view, 'timingCapacitance')?.value, 6.8e-9, { rel: 0.005 }, 'planted 6.8 nF; capacitor law C = I/(dV/dt)');
    expectWithin(fig(view, 'designFrequency')?.value, bench.nominal, { rel: 1e-9 }, 'closed form 1/f = C·Vpp·(1/I_charge + 1/I_discharge)');
    expectWithin(fig(view, 'frequency')?.deviation, 0, { abs: 0.5 }, 'planted core runs at the design-value frequency');
    expectWithin(fig(view, 'upperThreshold')?.value, 2.5, { abs: 0.03 }, 'planted swing 5 Vpp; one sample step of the ramp is 0.025 V');
    expectWithin(fig(view, 'lowerThreshold')?.value, -2.5, { abs: 0.03 }, 'planted swing 5 Vpp; one sample step of the ramp is 0.025 V');
    expectWithin(fig(view, 'logicHigh')?.value, 10, { abs: 0.02 }, 'planted 10 V logic high');
    expectWithin(fig(view, 'railHeadroom')?.value, 2, { abs: 0.02 }, 'design rail 12 V minus the planted 10 V logic high');
  });

  it('carries the design current to another condition by the frequency ratio (1 V/octave) and finds it there', () => {
    const lo: ScenarioCondition = { name: 'lo', control: 0, nominal: 40e-6 / (2 * 6.8e-9 * 5) };
    const hi: ScenarioCondition = { name: 'hi', control: 2, nominal: 4 * lo.nominal };
    const views = circuitOf(specFor({ charge: 40e-6, discharge: 40e-6, at: 'lo' }, [lo, hi]), [lo, hi], (c) => {
      const i = c.name === 'hi' ? 160e-6 : 40e-6;
      return { c: 6.8e-9, vpp: 5, charge: i, discharge: i };
    });
    const high = views.find((v) => v.condition === 'hi');
    expectWithin(fig(high, 'chargeCurrent')?.design, 160e-6, { rel: 1e-9 }, 'common practice (no source): 1 V/octave, two octaves up is ×4');
    expectWithin(fig(high, 'chargeCurrent')?.value, 160e-6, { rel: 0.005 }, 'planted 160 µA; capacitor law I = C·dV/dt');
    expect(fig(high, 'chargeCurrent')?.withinTolerance).toBe(true);
  });

  it('withholds the design comparison, with a note, when a current names no condition and the conditions differ', () => {
    const lo: ScenarioCondition = { name: 'lo', control: 0, nominal: 1000 };
    const hi: ScenarioCondition = { name: 'hi', control: 1, nominal: 2000 };
    const spec = specFor({ charge: 40e-6, discharge: 40e-6, at: 'lo' }, [lo, hi]);
    const loose: Spec = { ...spec, design: { ...spec.design, chargeCurrent: { ...spec.design!.chargeCurrent!, at: undefined } } };
    const views = circuitOf(loose, [lo, hi], (c) => ({ c: 6.8e-9, vpp: 5, charge: 2 * 6.8e-9 * 5 * c.nominal, discharge: 2 * 6.8e-9 * 5 * c.nominal }));
    expect(fig(views[0], 'chargeCurrent')?.design).toBeUndefined();
    expect(views[0].gaps).toEqual([{ code: 'current-no-condition', key: 'chargeCurrent' }]);
    expect(JSON.parse(JSON.stringify(views))).toEqual(views);
  });
});
