/**
 * A triangle core whose every period is drawn afresh (a noisy threshold): triangle and pulse with
 * period T·(1 + σ·g), g standard normal from the seeded generator in src/syntheticCaptures. Test data only.
 */
import { createRandom } from '../../src/syntheticCaptures/index.js';
import type { SynthSignal } from '../../src/syntheticCaptures/index.js';

export function jitteryCore(frequency: number, sigma: number, seed: number): { triangle: SynthSignal; pulse: SynthSignal } {
  const sampleRate = frequency * 200 * 1.0137;
  const n = 200 * 24;
  const dt = 1 / sampleRate;
  const rnd = createRandom(seed);
  const tri = new Float64Array(n);
  const pulse = new Float64Array(n);
  let start = 0;
  let period = (1 + sigma * rnd.gaussian()) / frequency;
  for (let i = 0; i < n; i++) {
    const t = i * dt;
    while (t >= start + period) {
      start += period;
      period = (1 + sigma * rnd.gaussian()) / frequency;
    }
    const p = (t - start) / period;
    tri[i] = p < 0.5 ? -3 + 12 * p : 3 - 12 * (p - 0.5);
    pulse[i] = p < 0.5 ? 10 : 0;
  }
  return { triangle: { t0: 0, dt, values: tri }, pulse: { t0: 0, dt, values: pulse } };
}
