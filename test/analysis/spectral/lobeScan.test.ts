import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { LobeScan, inComponentLobe } from '../../../src/analysis/spectrum/noiseFloor.js';
import type { SpectralFrame } from '../../../src/analysis/spectrum/spectralFrame.js';

/** The definition: bin k is in the DC lobe (k < r) or within r bins of a harmonic m·p, m = 1…exclude. */
function covered(k: number, r: number, p: number, exclude: number): boolean {
  if (k < r) return true;
  for (let m = 1; m <= exclude; m++) if (Math.abs(k - m * p) < r) return true;
  return false;
}

describe('LobeScan', () => {
  it('LobeScan marks, bin by bin in increasing order, exactly the bins inside a component lobe', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 40, noNaN: true }),
        fc.double({ min: 0.3, max: 200, noNaN: true }),
        fc.integer({ min: 0, max: 60 }),
        (r, p, exclude) => {
          const scan = new LobeScan(r, p, exclude);
          const frame = { lobeBins: r } as SpectralFrame;
          // Every bin is compared; the bins that disagree are collected and asserted once per run.
          const wrong: string[] = [];
          for (let k = 1; k < 3000; k++) {
            const want = covered(k, r, p, exclude);
            if (scan.covers(k) !== want) wrong.push(`scan k=${k}`);
            if (inComponentLobe(frame, k, p, exclude) !== want) wrong.push(`inComponentLobe k=${k}`);
          }
          expect(wrong).toEqual([]);
        },
      ),
      { seed: 1241, numRuns: 200 },
    );
  });

  it('LobeScan with no fundamental marks only the DC lobe', () => {
    const scan = new LobeScan(4, null, 10);
    expect([1, 3, 4, 5, 100].map((k) => scan.covers(k))).toEqual([true, true, false, false, false]);
  });
});
