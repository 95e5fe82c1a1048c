/**
 * Spurious-free dynamic range in dBc (IEEE Std 1241): the fundamental over the largest other
 * component below Nyquist, harmonic or not (hum counts). Fitted harmonics 2…N are read exactly;
 * anything else from its peak bin, corrected by the window's coherent gain (Heinzel et al. 2002,
 * §9: a tone of amplitude A peaks at A·Σw/2). Off-centre it may read low by up to the window's
 * scallop loss (0.83 dB for the 4-term Blackman-Harris window, Harris 1978 Table I).
 */
import type { MeasureResult } from '../../types/index.js';
import type { HarmonicAnalysis } from './harmonicAnalysis.js';
import { LobeScan } from './noiseFloor.js';

interface Spur {
  readonly amplitude: number;
  readonly frequency: number;
  readonly harmonic: number | null;
}

function largestSpur(h: HarmonicAnalysis): Spur {
  const { frame, fit } = h;
  let best: Spur = { amplitude: 0, frequency: 0, harmonic: null };
  for (let n = 2; n <= fit.count; n++) {
    if (fit.amplitude[n] > best.amplitude) best = { amplitude: fit.amplitude[n], frequency: n * fit.fundamental, harmonic: n };
  }
  const s = frame.spectrum;
  const lobes = new LobeScan(frame.lobeBins, fit.fundamental / frame.binWidth, fit.count);
  for (let k = 1; k < s.bins - 1; k++) {
    if (lobes.covers(k)) continue;
    const a = (2 * s.magnitude(k)) / frame.s1 / frame.response(k * frame.binWidth);
    if (a > best.amplitude) best = { amplitude: a, frequency: k * frame.binWidth, harmonic: null };
  }
  return best;
}

export function sfdr(h: HarmonicAnalysis): MeasureResult {
  const spur = largestSpur(h);
  const a1 = h.fit.amplitude[1];
  if (!(spur.amplitude > 0)) return { ok: false, reason: 'below-noise', detail: 'no component other than the fundamental above the numerical floor' };
  const what = spur.harmonic === null ? `a non-harmonic component at ${Number(spur.frequency.toPrecision(6))} Hz (peak bin)` : `harmonic ${spur.harmonic}`;
  return {
    ok: true,
    value: 20 * Math.log10(a1 / spur.amplitude),
    uncertainty: (20 / Math.LN10) * Math.hypot(h.amplitudeSigma / spur.amplitude, h.amplitudeSigma / a1),
    unit: 'dBc',
    method: `fundamental over the largest other component below Nyquist, here ${what} (IEEE 1241 SFDR)`,
  };
}
