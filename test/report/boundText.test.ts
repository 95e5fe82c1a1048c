/**
 * What was not detected is shown as its bound, "< −72.4 dBc", in measure and check text, rounded
 * away from the side it bounds so the shown bound still holds. Hand-made reports (demo figures, ours).
 */
import { describe, expect, it } from 'vitest';
import { createStyle, renderMeasureText } from '../../src/report/index.js';
import type { MeasureReport } from '../../src/types/index.js';

const report: MeasureReport = {
  schemaVersion: 1,
  file: 'FK-0101_mid.csv',
  sha256: '0'.repeat(64),
  sampleInterval: 1e-5,
  samples: 50_000,
  duration: 0.5,
  warnings: [],
  channels: [
    {
      name: 'triangle out',
      unit: 'V',
      shape: 'triangle',
      measurements: {
        humLevel: { value: null, unit: 'dBc', uncertainty: null, reason: 'below-noise', note: 'no mains component stands above the noise', bound: { kind: 'upper', value: -72.437 }, method: 'upper bound' },
      },
      harmonics: [],
      warnings: [],
    },
  ],
};

describe('bounds in text', () => {
  it('renderMeasureText shows an upper bound as "< level", rounded up to three digits', () => {
    const text = renderMeasureText([report], createStyle(false));
    expect(text).toMatch(/hum level\s+< [-−]72\.4 dBc/);
  });
});
