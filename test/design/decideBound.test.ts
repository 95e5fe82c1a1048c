/**
 * Decisions on a one-sided bound (nothing detected above or below a level). Reading: ILAC-G8:09/2019
 * §4.2 decides on the interval a quantity lies in; a bound is that interval's far end, so an upper
 * bound at or inside an upper limit is wholly inside (pass), one below a lower limit wholly outside
 * (fail), and one that straddles a limit cannot be decided.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bindCapture, decideBound, decideCheck, decideUnit, parseSpec, planCapture } from '../../src/design/index.js';
import type { ChannelReport } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureStub, channel, report } from './handReports.js';

describe('decideBound', () => {
  it('decideBound passes an upper bound under an upper limit and gives the margin from the bound', () => {
    const d = decideBound({ kind: 'upper', value: -72 }, { lower: null, upper: -60 });
    expect(d?.statement).toBe('pass');
    expectWithin(d?.margin, 12, { abs: 1e-12 }, 'limit − bound');
  });

  it('decideBound cannot settle an upper bound above an upper limit (the value may lie either side)', () => {
    expect(decideBound({ kind: 'upper', value: -50 }, { lower: null, upper: -60 })).toBeNull();
  });

  it('decideBound fails an upper bound below a lower limit, and a lower bound above an upper limit', () => {
    expect(decideBound({ kind: 'upper', value: 1 }, { lower: 2, upper: 5 })?.statement).toBe('fail');
    expect(decideBound({ kind: 'lower', value: 6 }, { lower: 2, upper: 5 })?.statement).toBe('fail');
    expect(decideBound({ kind: 'lower', value: 80 }, { lower: 60, upper: null })?.statement).toBe('pass');
  });

  it('decideBound leaves a two-sided limit undecided when the bound lies inside it', () => {
    expect(decideBound({ kind: 'upper', value: 3 }, { lower: 2, upper: 5 })).toBeNull();
  });

  it('decideBound agrees with decideCheck on the value at the bound with no uncertainty whenever it decides', () => {
    fc.assert(
      fc.property(fc.double({ min: -100, max: 100, noNaN: true }), fc.double({ min: -100, max: 100, noNaN: true }), fc.boolean(), (b, tl, upperLimit) => {
        const limit = upperLimit ? { lower: null, upper: tl } : { lower: tl, upper: null };
        for (const kind of ['upper', 'lower'] as const) {
          const d = decideBound({ kind, value: b }, limit);
          if (d !== null) expect(d.statement).toBe(decideCheck(b, 0, limit, 'simple').statement);
        }
      }),
      { seed: 15, numRuns: 300 },
    );
  });
});

describe('decideUnit on a measurement given as a bound', () => {
  const spec = parseSpec(['name: hum', 'revision: A', 'outputs:', '  out:', '    channel: 1', '    checks:', '      - measure: humLevel', '        max: -60 dBc'].join('\n'), 'h.yaml');
  const unitWith = (ch: ChannelReport) => {
    const path = 'U1_default.csv';
    return decideUnit(spec, 'U1', [bindCapture(spec, planCapture(spec, path), captureStub(path, ['CH1']), report(path, [ch]))]);
  };
  const clean = (bound: number): ChannelReport => {
    const ch = channel('CH1', 'triangle', {});
    return { ...ch, measurements: { humLevel: { value: null, unit: 'dBc', uncertainty: null, reason: 'below-noise', note: 'no mains component', bound: { kind: 'upper', value: bound }, method: 'upper bound' } } };
  };

  it('decideUnit passes a clean unit against an upper hum limit and shows the bound', () => {
    const v = unitWith(clean(-72));
    expect(v.statement).toBe('pass');
    expect(v.conditions[0].checks[0]).toMatchObject({ value: null, bound: { kind: 'upper', value: -72 }, statement: 'pass' });
  });

  it('decideUnit fails a humming unit against the same limit', () => {
    expect(unitWith(channel('CH1', 'triangle', { humLevel: [-40, null] })).statement).toBe('fail');
  });

  it('decideUnit leaves a check not measured when the bound is above the limit', () => {
    const v = unitWith(clean(-50));
    expect(v.statement).toBe('not-measured');
    expect(v.conditions[0].checks[0].note).toMatch(/does not settle/);
  });
});
