/**
 * The x column (time or sample index, in the file's units) checked for uniform steps while
 * streaming. A uniform column is not stored: only its start, end and count are kept.
 *
 * Rule: sample n must lie within tol of t0 + n·d, where d = (t_k − t0)/k is re-anchored at every
 * power of two k. With values printed to a resolution q (the last written digit), d_k is off by at
 * most q/k, so for k < n ≤ 2k the prediction is off by at most 3q: tol = 3q + 1e-4·d (timing errors
 * below 1e-4 of a sample are beneath anything resampling could correct), capped at d/2 so that one
 * missing sample is always caught. On the first miss the column switches to being stored: the rows
 * before it passed the check and are rebuilt as t0 + i·d.
 *
 * A time column printed with fewer digits than its step needs repeats stamps (`0.00001` twice or
 * more): such a column is stored too, and resolveTiming rebuilds the uniform grid from it. A time
 * that falls back to the first one (within a step) starts a new acquisition: push returns
 * NEW_SEGMENT and the caller decides what to keep.
 */
import { captureError } from './errors.js';

export type AxisResult =
  | { readonly uniform: true; readonly t0: number; readonly step: number; readonly count: number }
  | {
      readonly uniform: false;
      readonly times: Float64Array;
      readonly firstIrregularLine: number;
      /** Line of the first repeated stamp, when stamps repeat. */
      readonly firstRepeatLine?: number;
      /** Coarsest print resolution of the column (10^exponent of its last written digit). */
      readonly quantum: number;
    };

export const SAME_SEGMENT = 0;
export const NEW_SEGMENT = 1;

export class TimeAxis {
  private count = 0;
  private t0 = 0;
  private prev = 0;
  private prevLine = 0;
  private d = 0;
  private nextAnchor = 2;
  private maxQExp = -1000;
  private maxQ = 0;
  private times: Float64Array | null = null;
  private firstIrregularLine = 0;
  private firstRepeatLine = 0;

  constructor(
    private readonly file: string,
    private readonly label: string,
    /** Repeated stamps are a coarse print of time (true for a time column, not for an index). */
    private readonly repeatsAllowed = false,
  ) {}

  /** Forgets every row: the next push starts a new acquisition. */
  reset(): void {
    this.count = 0;
    this.nextAnchor = 2;
    this.times = null;
    this.firstIrregularLine = 0;
    this.firstRepeatLine = 0;
  }

  /** Whether a time falls back to the first one (within a step): a new acquisition starts there. */
  restartsAt(t: number): boolean {
    return this.count > 2 && t < this.prev && Math.abs(t - this.t0) <= Math.max(0.5 * Math.abs(this.d), this.maxQ);
  }

  /**
   * Takes src[at] (read from the array so that no boxed double is passed per row). Returns
   * NEW_SEGMENT, taking nothing, when the time falls back to the first one: a new acquisition.
   */
  push(src: Float64Array, at: number, quantumExp: number, line: number): number {
    const t = src[at];
    const n = this.count;
    if (quantumExp > this.maxQExp) {
      this.maxQExp = quantumExp;
      this.maxQ = 10 ** quantumExp;
    }
    if (n === 0) this.t0 = t;
    else {
      const step = t - this.prev;
      if (!(step > 0)) {
        if (step < 0 && this.restartsAt(t)) return NEW_SEGMENT;
        if (!(step === 0 && this.repeatsAllowed)) throw this.notIncreasing(t, line, step);
        if (this.firstRepeatLine === 0) this.firstRepeatLine = line;
        if (this.times === null) this.storeFrom(n, line);
      }
      // The check is written out here, not called, so that no boxed double is passed per row.
      if (this.times === null && n === 1) this.d = step;
      else if (this.times === null) {
        const d = this.d;
        const tol = Math.min(3 * this.maxQ + 1e-4 * d + 4e-16 * Math.abs(t), 0.5 * d);
        if (Math.abs(t - (this.t0 + n * d)) > tol) this.storeFrom(n, line);
        else if (n === this.nextAnchor) {
          this.d = (t - this.t0) / n;
          this.nextAnchor *= 2;
        }
      }
    }
    if (this.times !== null) {
      if (n === this.times.length) this.grow();
      this.times[n] = t;
    }
    this.prev = t;
    this.prevLine = line;
    this.count = n + 1;
    return SAME_SEGMENT;
  }

  finish(): AxisResult {
    if (this.times !== null) {
      return {
        uniform: false,
        times: this.times.subarray(0, this.count),
        firstIrregularLine: this.firstIrregularLine,
        ...(this.firstRepeatLine > 0 ? { firstRepeatLine: this.firstRepeatLine } : {}),
        quantum: this.maxQ,
      };
    }
    const step = this.count > 1 ? (this.prev - this.t0) / (this.count - 1) : NaN;
    return { uniform: true, t0: this.t0, step, count: this.count };
  }

  /** Rows 0…n−1 passed the check: rebuild them as t0 + i·d and store every row from here on. */
  private storeFrom(n: number, line: number): void {
    this.firstIrregularLine = line;
    this.times = new Float64Array(Math.max(1024, n * 2));
    for (let i = 0; i < n; i++) this.times[i] = this.t0 + i * this.d;
  }

  private grow(): void {
    const bigger = new Float64Array(this.times!.length * 2);
    bigger.set(this.times!);
    this.times = bigger;
  }

  private notIncreasing(t: number, line: number, step: number) {
    const backwards = step < 0;
    return captureError(backwards ? 'time-backwards' : 'time-repeated', this.file, {
      line,
      problem: `the ${this.label} column ${backwards ? 'goes backwards' : 'repeats a value'}: ${t} after ${this.prev} on line ${this.prevLine}`,
      expected: `a ${this.label} column that increases on every row`,
      fix: backwards
        ? 'the file may join several captures; split it at this line and measure each part'
        : 'export the time with more digits, or drop the time column and give --sample-rate',
    });
  }
}
