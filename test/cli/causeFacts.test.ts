import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cliHarness.js';
import { expectWithin } from '../helpers/expectWithin.js';
import type { Cause } from '../../src/types/index.js';

// FK-0104 of the demo scenario (samples/, src/syntheticCaptures/scenario.ts) is built with a timing capacitor
// about 6 % above its 4.7 nF ± 5 % design value. Its cause carries that as data: the part, the value
// the captures imply with its U, the design band from the spec, the share of the deviation it explains
// and the measurement that would confirm it. Assertions read the facts, never numbers out of sentences.
const filesOf = (serial: string): string[] => ['low', 'mid', 'high'].map((c) => `samples/captures/${serial}_${c}.csv`);
const files = filesOf('FK-0104');

async function causesOf(serial: string): Promise<Cause[]> {
  const r = await runCli(['check', '--no-store', ...filesOf(serial), '--spec', 'samples/fh210-spec.yaml', '--json']);
  return (JSON.parse(r.stdout) as { units: { diagnosis: { causes: Cause[] } }[] }).units[0].diagnosis.causes;
}

describe('causes carry structured facts', () => {
  it('the timing capacitor cause of FK-0104 states part, observed vs design, share explained and the confirming measurement', async () => {
    const [cause] = await causesOf('FK-0104');
    expect(cause.id).toBe('timing-capacitor');
    const [fact] = cause.facts!;
    expect(fact.part).toBe('timing capacitor, effective');
    expect(fact.observed.unit).toBe('F');
    // Design values from samples/fh210-spec.yaml: 4.7 nF ± 5 %.
    expectWithin(fact.design!.nominal, 4.7e-9, { rel: 1e-12 }, 'samples/fh210-spec.yaml design value');
    expectWithin(fact.design!.upper, 4.7e-9 * 1.05, { rel: 1e-9 }, 'samples/fh210-spec.yaml tolerance');
    // f = I/(2·C·Vpp): the measured frequency is 5.7 % low at every condition (check tables), so C ≈ 4.7 nF / 0.943.
    expectWithin(fact.observed.value, 4.7e-9 / 0.943, { rel: 0.01 }, 'closed form f = I/(2·C·Vpp), scenario scale 0.943');
    expect(fact.observed.value).toBeGreaterThan(fact.design!.upper);
    expect(fact.observed.expandedUncertainty).toBeGreaterThan(0);
    expect(fact.observed.expandedUncertainty).toBeLessThan(fact.observed.value - fact.design!.upper);
    expect(fact.shareExplained).toBeGreaterThan(0.5);
    expect(fact.shareExplained).toBeLessThanOrEqual(1);
    expect(fact.confirm).toContain('capacitance meter');
  });

  it('every cause of every faulty demo unit carries facts with units, and the JSON keeps evidence written from them', async () => {
    for (const serial of ['FK-0103', 'FK-0104', 'FK-0105', 'FK-0106']) {
      const causes = await causesOf(serial);
      expect(causes.length).toBeGreaterThan(0);
      for (const c of causes) {
        expect(c.facts?.length).toBeGreaterThan(0);
        for (const f of c.facts!) {
          expect(Number.isFinite(f.observed.value)).toBe(true);
          expect(typeof f.observed.unit).toBe('string');
        }
        // One line per fact and remark (a pattern heading adds one per pattern taken over).
        const patterns = new Set(c.facts!.filter((f) => f.pattern).map((f) => f.pattern!.id)).size;
        expect(c.evidence).toHaveLength(c.facts!.length + (c.remarks?.length ?? 0) + patterns);
      }
    }
  });

  it('--detail renders the fact through the shared formatter, U labelled and the design band in the value’s prefix', async () => {
    const r = await runCli(['check', '--no-store', ...files, '--spec', 'samples/fh210-spec.yaml', '--detail']);
    expect(r.stdout).toMatch(/· timing capacitor, effective: 4\.9\d+ nF ± 0\.\d+ nF \(U, k = 2\) against 4\.7 nF design \(4\.465 nF … 4\.935 nF\) \(\+\d\.\d\d %\), above its tolerance; alone it would explain \d+ % of the deviation/);
    expect(r.stdout).toContain('confirm: measure the timing capacitor out of circuit on a capacitance meter');
  });
});
