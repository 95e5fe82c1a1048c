import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { parseSpec } from '../../src/design/index.js';
import type { Spec, SpecCheck } from '../../src/design/index.js';
import { BenchError } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

const SAMPLE = 'samples/fh210-spec.yaml';
const sampleText = readFileSync(SAMPLE, 'utf8');

function checkAt(spec: Spec, condition: string, output: string, measurement: string): SpecCheck {
  const c = spec.conditions.find((x) => x.name === condition)?.checks.find((k) => k.output === output && k.measurement === measurement);
  if (!c) throw new Error(`no ${output}.${measurement} at ${condition}`);
  return c;
}

function errorOf(text: string, file = 'bench.yaml'): BenchError {
  try {
    parseSpec(text, file);
  } catch (e) {
    if (e instanceof BenchError) return e;
    throw e;
  }
  throw new Error('expected the spec to be refused');
}

const minimal = (checks: string, extra = ''): string => `name: test module\nrevision: A\noutputs:\n  tri:\n    channel: 1\n    checks:\n${checks}${extra}`;

describe('parseSpec on the demo spec', () => {
  const spec = parseSpec(sampleText, SAMPLE);

  it('reads identity, pattern, decision rule, outputs and conditions', () => {
    expect([spec.name, spec.revision, spec.pattern, spec.decision]).toEqual(['FH-210 Kestrel VCO', 'C', '{unit}_{condition}.csv', 'guarded']);
    expect(spec.outputs.map((o) => [o.name, o.channel, o.shape])).toEqual([['triangle', 1, 'triangle'], ['pulse', 2, 'pulse']]);
    expect(spec.conditions.map((c) => c.name)).toEqual(['low', 'mid', 'high']);
    expect(spec.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('gives each condition its own frequency nominal with the output’s relative tolerance', () => {
    // 1 V/octave from C2 = 65.41 Hz: REFERENCES §9 (common practice); limits nominal·(1 ± 1.5 %), closed form.
    for (const [cond, f] of [['low', 65.41], ['mid', 261.63], ['high', 2093.0]] as const) {
      const k = checkAt(spec, cond, 'triangle', 'frequency');
      expectWithin(k.limit.nominal, f, { rel: 1e-15 }, 'spec value');
      expectWithin(k.limit.lower, f * 0.985, { rel: 1e-12 }, 'nominal − 1.5 %, closed form');
      expectWithin(k.limit.upper, f * 1.015, { rel: 1e-12 }, 'nominal + 1.5 %, closed form');
    }
  });

  it('reads a % tolerance on a percentage (duty cycle) as percentage points', () => {
    const duty = checkAt(spec, 'mid', 'pulse', 'dutyCycle');
    expectWithin(duty.limit.lower, 48.5, { abs: 1e-12 }, '50 % − 1.5 points');
    expectWithin(duty.limit.upper, 51.5, { abs: 1e-12 }, '50 % + 1.5 points');
  });

  it('reads the design section in SI units with its tolerances', () => {
    expectWithin(spec.design?.timingCapacitance?.nominal, 4.7e-9, { rel: 1e-15 }, 'spec value, SI Brochure prefixes');
    expectWithin(spec.design?.timingCapacitance?.upper, 4.935e-9, { rel: 1e-12 }, '4.7 nF + 5 %, closed form');
    expect(spec.design?.chargeCurrent?.at).toBe('mid');
  });

  it('reads the same spec written as JSON to the same limits', () => {
    const asJson = JSON.stringify({
      name: 'FH-210 Kestrel VCO',
      revision: 'C',
      outputs: { triangle: { channel: 1, checks: [{ measure: 'peakToPeak', nominal: '6.0 Vpp', tolerance: '4 %' }] } },
    });
    const k = checkAt(parseSpec(asJson, 'spec.json'), 'default', 'triangle', 'peakToPeak');
    expect(k.limit).toEqual(checkAt(spec, 'mid', 'triangle', 'peakToPeak').limit);
  });
});

describe('parseSpec limits', () => {
  it('accepts one-sided limits and min/max bands', () => {
    const spec = parseSpec(minimal('      - measure: overshoot\n        max: 5 %\n      - measure: highLevel\n        min: 9.5 V\n      - measure: dutyCycle\n        min: 48 %\n        max: 52 %\n'), 'x.yaml');
    const at = (m: string) => checkAt(spec, 'default', 'tri', m).limit;
    expect(at('overshoot')).toEqual({ lower: null, upper: 5, nominal: null });
    expect(at('highLevel')).toEqual({ lower: 9.5, upper: null, nominal: null });
    expect(at('dutyCycle')).toEqual({ lower: 48, upper: 52, nominal: null });
  });

  it('lets a condition replace a band with min/max, or fill in only the nominal', () => {
    const text = minimal(
      '      - measure: frequency\n        nominal: 100 Hz\n        tolerance: 2 %\n',
      '\nconditions:\n  a: {}\n  b:\n    expect:\n      tri:\n        frequency: { nominal: 1 kHz }\n  c:\n    expect:\n      tri:\n        frequency: { min: 90 Hz, max: 95 Hz }\n',
    );
    const spec = parseSpec(text, 'x.yaml');
    expect(checkAt(spec, 'a', 'tri', 'frequency').limit).toEqual({ lower: 98, upper: 102, nominal: 100 });
    const b = checkAt(spec, 'b', 'tri', 'frequency').limit;
    expectWithin(b.lower, 980, { rel: 1e-12 }, '1 kHz − 2 %, closed form');
    expect(checkAt(spec, 'c', 'tri', 'frequency').limit).toEqual({ lower: 90, upper: 95, nominal: null });
  });

  it('turns nominal ± relative tolerance into nominal·(1 ± t/100) for any values (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e6, noNaN: true }), fc.double({ min: 0.01, max: 50, noNaN: true }), (n, t) => {
        const spec = parseSpec(minimal(`      - measure: frequency\n        nominal: ${n} Hz\n        tolerance: ${t} %\n`), 'p.yaml');
        const l = checkAt(spec, 'default', 'tri', 'frequency').limit;
        expectWithin(l.lower, n * (1 - t / 100), { rel: 1e-12 }, 'closed form');
        expectWithin(l.upper, n * (1 + t / 100), { rel: 1e-12 }, 'closed form');
      }),
    );
  });
});

describe('parseSpec problems', () => {
  it('lists every problem at once, each with its dotted path and line, in file order', () => {
    const text = [
      'name: test module', //                                   1
      'revision: A', //                                          2
      'decison: guarded', //                                     3
      'outputs:', //                                             4
      '  tri:', //                                               5
      '    channel: 0', //                                       6
      '    checks:', //                                          7
      '      - measure: frequncy', //                            8
      '        nominal: 1 kHz', //                               9
      '      - measure: peakToPeak', //                          10
      '        nominal: 6 Hz', //                                11
      '        tolerance: 2 %', //                               12
      '      - measure: dutyCycle', //                           13
      '        min: 52 %', //                                    14
      '        max: 48 %', //                                    15
      '      - measure: humLevel', //                            16
      '        nominal: -60 dBc', //                             17
      '        tolerance: 5 %', //                               18
      '      - measure: dcOffset', //                            19
      'conditions:', //                                          20
      '  low:', //                                               21
      '    expect:', //                                          22
      '      square: { frequency: { nominal: 100 Hz } }', //     23
      'captures:', //                                            24
      '  pattern: "{serial}.csv"', //                            25
      '',
    ].join('\n');
    const e = errorOf(text);
    expect(e.code).toBe('spec.invalid');
    expect(e.issues?.map((i) => [i.line, i.code])).toEqual([
      [3, 'spec.unknown-field'],
      [6, 'spec.bad-value'],
      [8, 'spec.unknown-measurement'],
      [11, 'spec.wrong-unit'],
      [13, 'spec.limit-order'],
      [18, 'spec.bad-tolerance'],
      [19, 'spec.no-limit'],
      [23, 'spec.unknown-output'],
      [25, 'spec.bad-pattern'],
      [25, 'spec.bad-pattern'],
    ]);
    expect(e.message).toMatchInlineSnapshot(`
      "bench.yaml: 10 problems in the spec
        expected: a spec whose every field is valid (listed below with their lines)
        fix: correct each one, then run \`benchproof spec validate bench.yaml\`
      bench.yaml:3: decison: unknown field "decison"
        expected: one of the fields a spec defines at (top level)
        fix: did you mean "decision"? rename the field
      bench.yaml:6: outputs.tri.channel: 0 is not valid here
        expected: a channel name as in the CSV header, or its 1-based number
        fix: write outputs.tri.channel as a channel name as in the CSV header, or its 1-based number
      bench.yaml:8: outputs.tri.checks[0].measure: "frequncy" is not a measurement benchproof makes
        expected: one of frequency, period, peakToPeak, maximum, minimum, highLevel, lowLevel, amplitude, dcOffset, rms, acRms, riseSlope, fallSlope, slopeRatio, symmetry, linearity, dutyCycle, riseTime, fallTime, jitter, overshoot, undershoot, thd, snr, sinad, sfdr, enob, humFrequency, humLevel, shapeError, evenOddRatio, cycleToCycleJitter
        fix: did you mean "frequency"?
      bench.yaml:11: outputs.tri.checks[1].nominal: "6 Hz" is in Hz, but peakToPeak is in V
        expected: a value in V, e.g. "6 V"
        fix: write outputs.tri.checks[1].nominal as e.g. "6 V"
      bench.yaml:13: outputs.tri.checks[2]: min (52 %) is not below max (48 %)
        expected: min, max, or nominal with tolerance
        fix: swap min and max
      bench.yaml:18: outputs.tri.checks[3].tolerance: a tolerance in % has no meaning for humLevel in dBc
        expected: an absolute tolerance in dBc, e.g. "3 dBc"
        fix: write outputs.tri.checks[3].tolerance in dBc, or give min/max instead
      bench.yaml:19: outputs.tri.checks[4]: no limit given for condition "low"
        expected: min, max, or nominal with tolerance
        fix: add \`nominal:\` with \`tolerance:\`, or \`min:\`/\`max:\` (e.g. under conditions.low.expect.tri.dcOffset)
      bench.yaml:23: conditions.low.expect.square: no output named "square"
        expected: one of the outputs: tri
        fix: use an output name from \`outputs:\`
      bench.yaml:25: captures.pattern: unknown token {serial}
        expected: a pattern with {unit}, {condition} and optionally {output}, e.g. "{unit}_{condition}.csv"
        fix: use only {unit}, {condition} and {output}
      bench.yaml:25: captures.pattern: no {unit} token
        expected: a pattern with {unit}, {condition} and optionally {output}, e.g. "{unit}_{condition}.csv"
        fix: add {unit} where the serial number sits in the file name"
    `);
  });

  it('reports YAML syntax errors with their line', () => {
    const e = errorOf('name: x\nrevision: A\noutputs:\n  tri: [1, 2\n  sq: 3\n');
    expect(e.issues?.[0].code).toBe('spec.syntax');
    expect(e.issues?.[0].line).toBeGreaterThanOrEqual(4);
  });

  it('names the condition that leaves a nominal unset', () => {
    const text = minimal('      - measure: frequency\n        tolerance: 1 %\n', '\nconditions:\n  low:\n    expect:\n      tri: { frequency: { nominal: 65.41 Hz } }\n  mid: {}\n');
    const e = errorOf(text);
    expect(e.issues?.map((i) => i.problem)).toEqual(['outputs.tri.checks[0]: tolerance 1 % has no nominal for condition "mid"']);
    expect(e.issues?.[0].line).toBe(7);
  });

  it('refuses a spec with no checks, a missing name and a design value in the wrong unit', () => {
    const e = errorOf('revision: A\noutputs:\n  tri:\n    channel: 1\ndesign:\n  timingCapacitance: { nominal: 4.7 nA, tolerance: 5 % }\n');
    expect(e.issues?.map((i) => i.code).sort()).toEqual(['spec.missing-field', 'spec.wrong-unit']);
    const e2 = errorOf('name: a\nrevision: A\noutputs:\n  tri:\n    channel: 1\n');
    expect(e2.issues?.map((i) => i.code)).toEqual(['spec.no-checks']);
  });

  it('refuses a text that is not a map', () => {
    expect(errorOf('- just\n- a list\n').issues?.[0].code).toBe('spec.not-a-map');
  });
});
