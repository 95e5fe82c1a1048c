import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';
import { expectWithin } from '../helpers/expectWithin.js';

// FK-0104 of the demo scenario (samples/, src/syntheticCaptures/scenario.ts) is built with a timing capacitor
// about 6 % above its 4.7 nF ± 5 % design value. Its cause carries that as data: the part, the value
// the captures imply, the design band from the spec, the share of the deviation it explains and the
// measurement that would confirm it. Assertions read the facts, never numbers out of sentences.
const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0104_${c}.csv`);

describe('causes carry structured facts', () => {
  it('the timing capacitor cause of FK-0104 states part, observed vs design, share explained and the confirming measurement', async () => {
    const r = await runCli(['check', '--no-store', ...files, '--spec', 'samples/fh210-spec.yaml', '--json']);
    const cause = (JSON.parse(r.stdout) as { units: { diagnosis: { causes: { id: string; evidence: string[]; facts?: { part: string; observed: { value: number; unit: string }; design?: { nominal: number; lower: number; upper: number; unit: string }; shareExplained?: number; confirm: string }[] }[] } }[] }).units[0].diagnosis.causes[0];
    expect(cause.id).toBe('timing-capacitor');
    expect(cause.evidence.length).toBeGreaterThan(0);
    const [fact] = cause.facts!;
    expect(fact.part).toBe('timing capacitor');
    expect(fact.observed.unit).toBe('F');
    // Design values from samples/fh210-spec.yaml: 4.7 nF ± 5 %.
    expectWithin(fact.design!.nominal, 4.7e-9, { rel: 1e-12 }, 'samples/fh210-spec.yaml design value');
    expectWithin(fact.design!.upper, 4.7e-9 * 1.05, { rel: 1e-9 }, 'samples/fh210-spec.yaml tolerance');
    // f = I/(2·C·Vpp): the measured frequency is 5.7 % low at every condition (check tables), so C ≈ 4.7 nF / 0.943.
    expectWithin(fact.observed.value, 4.7e-9 / 0.943, { rel: 0.01 }, 'closed form f = I/(2·C·Vpp), scenario scale 0.943');
    expect(fact.observed.value).toBeGreaterThan(fact.design!.upper);
    expect(fact.shareExplained).toBeGreaterThan(0.5);
    expect(fact.shareExplained).toBeLessThanOrEqual(1);
    expect(fact.confirm).toContain('capacitance meter');
  });

  it('--detail renders the fact through the shared formatter, the design band in the value’s prefix', async () => {
    const r = await runCli(['check', '--no-store', ...files, '--spec', 'samples/fh210-spec.yaml', '--detail']);
    expect(r.stdout).toMatch(/part: {5}timing capacitor ≈ 4\.9\d nF against 4\.7 nF \(4\.4\d nF … 4\.9\d nF\), would explain \d+ % of the error; confirm: measure the timing capacitor out of circuit on a capacitance meter/);
  });
});
