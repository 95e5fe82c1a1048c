/**
 * Noise level read from the bins of a windowed spectrum that hold no fitted component.
 *
 * White noise of variance σ² gives E|X[k]|² = σ²·Σw² in every bin (Heinzel, Rüdiger & Schilling
 * 2002, §9, "normalization for noise"), so σ² = mean|X[k]|²/Σw² over the bins outside the DC
 * lobe and outside the main lobes of harmonics 1…exclude. The excluded bins are assumed to hold
 * the same noise density (the usual DFT method of IEEE Std 1241's SINAD test).
 */
import type { SpectralFrame } from './spectralFrame.js';

export interface NoiseFloor {
  /** Noise variance per sample over the whole band 0…f_s/2, V². */
  readonly variance: number;
  /** Mean |X[k]|² over the bins read. */
  readonly perBin: number;
  /** Bins read, and the share of all bins they make up. */
  readonly bins: number;
  readonly share: number;
}

/** Fewest bins, and smallest share of the spectrum, that give a usable noise estimate. */
const MIN_BINS = 32;
const MIN_SHARE = 0.05;

/** True when bin k lies in the DC lobe or the main lobe of harmonic 1…exclude of `fundamentalBins`. */
export function inComponentLobe(frame: SpectralFrame, k: number, fundamentalBins: number | null, exclude: number): boolean {
  const r = frame.lobeBins;
  if (k < r) return true;
  if (fundamentalBins === null || exclude < 1) return false;
  // Only harmonics within one lobe half-width of k can cover it (several, when lobes overlap).
  const first = Math.max(1, Math.ceil((k - r) / fundamentalBins));
  const last = Math.min(exclude, Math.floor((k + r) / fundamentalBins));
  for (let m = first; m <= last; m++) {
    if (Math.abs(k - m * fundamentalBins) < r) return true;
  }
  return false;
}

/**
 * inComponentLobe for bins asked about in increasing order, at O(1) per bin: it keeps the lowest
 * harmonic whose lobe is not yet behind k. A bin outside that harmonic's lobe lies below it, and so
 * below every higher lobe too. Scans of all 2^19 bins of a frame use this.
 */
export class LobeScan {
  private m = 1;

  constructor(
    private readonly r: number,
    private readonly p: number | null,
    private readonly exclude: number,
  ) {}

  covers(k: number): boolean {
    const { r, p, exclude } = this;
    if (k < r) return true;
    if (p === null || exclude < 1) return false;
    while (this.m <= exclude && k - this.m * p >= r) this.m++;
    return this.m <= exclude && Math.abs(k - this.m * p) < r;
  }
}

/** Noise floor, or null when the component lobes leave too few bins to read it from. */
export function noiseFloor(frame: SpectralFrame, fundamental: number | null, exclude: number): NoiseFloor | null {
  return noiseFloors(frame, fundamental, exclude, exclude)[0];
}

/**
 * noiseFloor with harmonics 1…exclude and 1…alsoExclude left out, read in one pass over the bins
 * (each sum in the same order as noiseFloor's, so each is the value noiseFloor gives).
 */
export function noiseFloors(frame: SpectralFrame, fundamental: number | null, exclude: number, alsoExclude: number): [NoiseFloor | null, NoiseFloor | null] {
  const s = frame.spectrum;
  const p = fundamental === null ? null : fundamental / frame.binWidth;
  const lobesA = new LobeScan(frame.lobeBins, p, exclude);
  const lobesB = new LobeScan(frame.lobeBins, p, alsoExclude);
  let sumA = 0;
  let binsA = 0;
  let sumB = 0;
  let binsB = 0;
  for (let k = 1; k < s.bins - 1; k++) {
    const a = !lobesA.covers(k);
    const b = !lobesB.covers(k);
    if (!a && !b) continue;
    const power = s.power(k);
    if (a) {
      sumA += power;
      binsA++;
    }
    if (b) {
      sumB += power;
      binsB++;
    }
  }
  return [floorOf(frame, sumA, binsA), floorOf(frame, sumB, binsB)];
}

function floorOf(frame: SpectralFrame, sum: number, bins: number): NoiseFloor | null {
  const share = bins / (frame.spectrum.bins - 2);
  if (bins < MIN_BINS || share < MIN_SHARE) return null;
  const perBin = sum / bins;
  return { variance: perBin / frame.s2, perBin, bins, share };
}
