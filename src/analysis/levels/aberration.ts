/**
 * Overshoot and undershoot in % of the amplitude, per IEEE Std 181-2011 (definitions in
 * transitions.ts; overshoot of a second-order step is exp(−πζ/√(1 − ζ²)), REFERENCES.md §5).
 * Reported: the larger of the rising-edge median and the falling-edge median, so a fault on one edge
 * is not averaged away by the other.
 * Standard uncertainty (JCGM 100:2008): √(π/2)·s/√n over those edges, combined with the noise as a
 * % of amplitude, because the largest noisy sample sits one to three σ beyond the true peak (Type B).
 */
import type { MeasureResult } from '../../types/index.js';
import type { Transition } from '../timing/transitions.js';
import { measured, withheld } from '../measureResult.js';
import { median, rss, uncertaintyOfMedian } from '../stats.js';

export function aberration(ts: readonly Transition[], kind: 'overshoot' | 'undershoot', amplitude: number, noise: number): MeasureResult {
  let best: { value: number; u: number; n: number; word: string } | null = null;
  for (const dir of [1, -1] as const) {
    const v = ts.filter((t) => t.direction === dir).map((t) => t[kind]).filter((x): x is number => x !== null);
    if (v.length === 0) continue;
    const m = median(v);
    if (!best || m > best.value) best = { value: m, u: uncertaintyOfMedian(v), n: v.length, word: dir > 0 ? 'rising' : 'falling' };
  }
  if (!best) {
    return withheld('too-few-cycles', `no edge with a complete settling region in the capture; lengthen the timebase to hold at least two whole cycles`);
  }
  const u = rss(best.u, amplitude > 0 ? (100 * noise) / amplitude : 0);
  return measured(best.value, u, '%', `median ${kind} of ${best.n} ${best.word} edges (the worse edge direction), % of amplitude`);
}
