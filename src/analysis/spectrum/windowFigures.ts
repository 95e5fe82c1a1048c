/**
 * Figures of merit of a DFT window, as defined by Harris (Proc. IEEE 66(1), 1978, §III and
 * Table I): coherent gain Σw/L, equivalent noise bandwidth L·Σw²/(Σw)² in bins (eq. 11), scallop
 * loss (gain lost by a tone half a bin off centre) and highest sidelobe level.
 */
import { mainLobeHalfWidth, windowKernel, windowSamples, type WindowKind } from './windows.js';

export interface WindowFigures {
  readonly coherentGain: number;
  /** Equivalent noise bandwidth in bins. */
  readonly enbw: number;
  /** Positive number of dB lost half a bin off centre. */
  readonly scallopLossDb: number;
  /** Highest sidelobe relative to the main-lobe peak, dB (negative). */
  readonly highestSidelobeDb: number;
}

export function windowFigures(kind: WindowKind, length = 4096): WindowFigures {
  const w = windowSamples(kind, length);
  let s1 = 0;
  let s2 = 0;
  for (let i = 0; i < length; i++) {
    s1 += w[i];
    s2 += w[i] * w[i];
  }
  const gainAt = (bins: number): number => {
    const k = windowKernel(kind, length, (2 * Math.PI * bins) / length);
    return Math.hypot(k.re, k.im) / s1;
  };
  return {
    coherentGain: s1 / length,
    enbw: (length * s2) / (s1 * s1),
    scallopLossDb: -20 * Math.log10(gainAt(0.5)),
    highestSidelobeDb: 20 * Math.log10(highestSidelobe(gainAt, mainLobeHalfWidth(kind))),
  };
}

/** Largest gain beyond the first null, scanned in 1/64-bin steps over the next 200 bins. */
function highestSidelobe(gainAt: (bins: number) => number, firstNull: number): number {
  let peak = 0;
  for (let b = firstNull; b <= firstNull + 200; b += 1 / 64) peak = Math.max(peak, gainAt(b));
  return peak;
}
