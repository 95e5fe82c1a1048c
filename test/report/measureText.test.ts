import { describe, expect, it } from 'vitest';
import { createStyle, renderMeasureText } from '../../src/report/index.js';
import type { MeasureReport } from '../../src/types/index.js';

// A small hand-made report (demo scenario: FH-210 Kestrel VCO, unit FK-0105 at `mid`), so the
// text is pinned independently of the analysis.
const report: MeasureReport = {
  schemaVersion: 1,
  file: 'FK-0105_mid.csv',
  sha256: 'ab12cd34ef56'.padEnd(64, '0'),
  sampleInterval: 1e-5,
  samples: 20_000,
  duration: 0.2,
  warnings: [{ code: 'footer', message: 'ignored 2 footer lines', line: 20_003 }],
  channels: [
    {
      name: 'triangle out',
      unit: 'V',
      shape: 'triangle',
      measurements: {
        frequency: { value: 261.6302, unit: 'Hz', uncertainty: 0.00043, method: 'fit' },
        jitter: { value: null, unit: 's', uncertainty: null, reason: 'below-noise', note: 'the period scatter is within the capture floor' },
        amplitude: { value: 5.984, unit: 'V', uncertainty: 0.0061, method: 'peaks' },
        slopeRatio: { value: 1.0803, unit: '', uncertainty: 0.0004, method: 'ratio' },
      },
      harmonics: [],
      warnings: [],
    },
    {
      name: 'pulse out',
      unit: 'V',
      shape: 'square',
      measurements: {
        lowLevel: { value: null, unit: 'V', uncertainty: null, reason: 'clipped', note: 'the trace is clipped' },
        amplitude: { value: null, unit: 'V', uncertainty: null, reason: 'clipped', note: 'the trace is clipped' },
        dutyCycle: { value: 49.98, unit: '%', uncertainty: 0.1, method: 'mean' },
      },
      harmonics: [
        { n: 1, frequency: 261.63, amplitude: 6.3, dbc: 0 },
        { n: 3, frequency: 784.89, amplitude: 2.1, dbc: -9.54 },
      ],
      harmonicsMethod: 'least-squares fit',
      warnings: [{ code: 'aliasing', channel: 'pulse out', message: 'may be aliased' }],
    },
  ],
};

describe('renderMeasureText', () => {
  it('renderMeasureText groups measurements per channel with uncertainties, notes and warnings', () => {
    expect(renderMeasureText([report], createStyle(false))).toMatchInlineSnapshot(`
      "FK-0105_mid.csv
        20 000 samples at 10 µs (200 ms), sha256 ab12cd34ef56
        warning: ignored 2 footer lines (line 20003)

        triangle out (V)  shape: triangle  ± is U (k = 2)
          timing
            frequency      261.63020 Hz  ± 0.00086 Hz
            period jitter  NOT MEASURED  the period scatter is within the capture floor
          levels
            amplitude          5.984 V   ± 0.013 V
          ramps
            slope ratio      1.08030     ± 0.00080

        pulse out (V)  shape: square  ± is U (k = 2)
          warning: may be aliased
          levels
            low state level  NOT MEASURED  the trace is clipped
            amplitude        NOT MEASURED  (as for low state level)
          edges
            duty cycle       49.98 %  ± 0.20 %
          harmonics (dBc)
            3: −9.5
            least-squares fit
      "
    `);
  });

  it('renderMeasureText adds colour only as emphasis when the style asks for it', () => {
    const plain = renderMeasureText([report], createStyle(false));
    const coloured = renderMeasureText([report], createStyle(true));
    // eslint-disable-next-line no-control-regex
    expect(coloured.replace(/\u001b\[[0-9;]*m/g, '')).toBe(plain);
    expect(coloured).not.toBe(plain);
  });

  it('renderMeasureText prints nothing but a newline-terminated block per capture', () => {
    const text = renderMeasureText([report, { ...report, file: 'FK-0106_mid.csv' }], createStyle(false));
    expect(text.split('\n').filter((l) => l.endsWith('.csv'))).toEqual(['FK-0105_mid.csv', 'FK-0106_mid.csv']);
    expect(text.endsWith('\n')).toBe(true);
  });
});
