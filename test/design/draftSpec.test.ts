import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { decideUnit, parseSpec, planGolden, writeDraftSpec } from '../../src/design/index.js';
import type { Spec } from '../../src/design/index.js';
import { diagnoseUnit } from '../../src/diagnose/index.js';
import { BenchError } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { checkedKestrel, kestrelTraits } from '../diagnose/kestrelUnit.js';

// Golden captures: the demo's good unit FK-0101, synthesized with its fixed seeds and measured.
const demo = parseSpec(readFileSync('samples/fh210-spec.yaml', 'utf8'), 'demo.yaml');
const golden = checkedKestrel(demo, kestrelTraits('FK-0101')).map((c) => ({ path: c.path, condition: c.condition, report: c.report }));
const text = writeDraftSpec(golden, { tolerance: 0.02, pattern: '{unit}_{condition}.csv', name: 'FH-210 Kestrel VCO' });
const drafted: Spec = parseSpec(text, 'drafted.yaml');

function check(serial: string) {
  const captures = checkedKestrel(drafted, kestrelTraits(serial));
  const verdict = decideUnit(drafted, serial, captures);
  return { verdict, causes: diagnoseUnit(drafted, verdict).causes };
}

describe('writeDraftSpec (spec init)', () => {
  it('writes a spec that parses, with one output per channel and the golden conditions', () => {
    expect(drafted.outputs.map((o) => [o.name, o.channel, o.shape])).toEqual([['ch1', 1, 'triangle'], ['ch2', 2, 'square']]);
    expect(drafted.conditions.map((c) => c.name)).toEqual(['low', 'mid', 'high']);
    expect(text).toContain('benchproof spec init');
  });

  it('takes each nominal from the golden capture and the tolerance from the option', () => {
    const f = drafted.conditions[1].checks.find((k) => k.output === 'ch1' && k.measurement === 'frequency')!;
    const measured = golden[1].report.channels[0].measurements.frequency!.value!;
    expectWithin(f.limit.nominal, measured, { rel: 5e-4 }, 'golden capture, written with 4 significant digits (half a unit in the 4th digit)');
    expectWithin(f.limit.upper! - f.limit.nominal!, 0.02 * f.limit.nominal!, { rel: 1e-9 }, '--tolerance 2 %, closed form');
  });

  it('passes the golden unit, and passes the other good unit outright, without a conditional statement', () => {
    expect(check('FK-0101').verdict.statement).toBe('pass');
    // FK-0102 sits 30 mV lower; its swing moves by one 78 mV step of the 8-bit capture. Limits of at
    // least 3U (ILAC-G8 guarded acceptance needs U of room on each reading) leave it clear inside.
    const other = check('FK-0102').verdict;
    const notPassed = other.conditions.flatMap((c) => c.checks).filter((k) => k.statement !== 'pass');
    expect(notPassed).toEqual([]);
  });

  it('drafts one reading per quantity of each shape, not several readings of one swing', () => {
    const ids = (output: string): string[] => [...new Set(drafted.conditions.flatMap((c) => c.checks).filter((k) => k.output === output).map((k) => k.measurement))];
    expect(ids('ch1')).toEqual(['frequency', 'peakToPeak', 'dcOffset', 'symmetry']);
    expect(ids('ch2')).toEqual(['frequency', 'highLevel', 'lowLevel', 'dutyCycle']);
  });

  it('writes nominals with four significant digits and never as quoted numbers', () => {
    expect(text).not.toMatch(/nominal: "/);
    for (const m of text.matchAll(/nominal: (-?[0-9.]+)/g)) expect(m[1].replace(/^-?0\.0*|\./g, '').length).toBeLessThanOrEqual(4);
  });

  it('sets no limit tighter than 3U of the golden reading: its own U, the next unit\'s U and the guard band', () => {
    for (const [i, g] of golden.entries()) {
      for (const k of drafted.conditions[i].checks) {
        const ch = g.report.channels[Number(drafted.outputs.find((o) => o.name === k.output)!.channel) - 1];
        const u = ch.measurements[k.measurement]!.uncertainty!;
        const half = Math.min(k.limit.upper! - k.limit.nominal!, k.limit.nominal! - k.limit.lower!);
        expect(half, `${k.output} ${k.measurement} at ${g.condition}`).toBeGreaterThanOrEqual(3 * 2 * u * (1 - 1e-9));
      }
    }
  });

  it('fails a faulty unit with the right cause first', () => {
    const capacitor = check('FK-0104');
    expect(capacitor.verdict.statement).toBe('fail');
    expect(capacitor.causes[0].id).toBe('timing-scale');
    const mirror = check('FK-0103');
    expect(mirror.verdict.statement).toBe('fail');
    expect(mirror.causes[0].id).toBe('current-mismatch');
    const delay = check('FK-0106');
    expect(delay.verdict.statement).toBe('fail');
    expect(delay.causes[0].id).toBe('switching-delay');
  });
});

describe('planGolden', () => {
  it('reads the condition of each golden capture from its name', () => {
    expect(planGolden('{unit}_{condition}.csv', ['caps/FK-0101_low.csv', 'FK-0101_mid.csv'])).toEqual([
      { path: 'caps/FK-0101_low.csv', unit: 'FK-0101', condition: 'low' },
      { path: 'FK-0101_mid.csv', unit: 'FK-0101', condition: 'mid' },
    ]);
  });

  it('refuses captures of several units, two of one condition, or a name off the pattern', () => {
    const code = (f: () => unknown): string => {
      try {
        f();
      } catch (e) {
        if (e instanceof BenchError) return e.code;
      }
      return 'no error';
    };
    expect(code(() => planGolden('{unit}_{condition}.csv', ['FK-0101_low.csv', 'FK-0102_mid.csv']))).toBe('init.several-units');
    expect(code(() => planGolden('{unit}_{condition}.csv', ['FK-0101_low.csv', 'x/FK-0101_low.csv']))).toBe('init.duplicate-condition');
    expect(code(() => planGolden('{unit}_{condition}.csv', ['golden.csv']))).toBe('init.name-unmatched');
  });
});
