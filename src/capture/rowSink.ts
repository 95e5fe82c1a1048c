/**
 * Where parsed rows go, from the byte scanner or the papaparse path alike: channels into growable
 * Float64Array columns (SI units), the x column into a TimeAxis. Invalid samples (empty, NaN, ±inf,
 * text, overflow markers) are stored as NaN and counted, never as zeros. A row of text, or with the
 * wrong number of fields, is an error unless only such rows follow it to the end of the file: then
 * it is a footer, reported as a warning.
 */
import { captureError } from './errors.js';
import { sampleMemoryBudget } from './readerLimits.js';
import { EMPTY, NUMBER, TEXT } from './scanNumber.js';
import type { TimeAxis } from './timeAxis.js';
import { SAME_SEGMENT } from './timeAxis.js';

/**
 * Values at or beyond 9.9e37 are instrument overflow markers: SCPI writes 9.9E37 for infinity and
 * 9.91E37 for not-a-number (SCPI-1999 Vol. 1 §7.2.1.5, from memory).
 */
export const OVERFLOW_MARKER = 9.9e37;

export interface SinkConfig {
  readonly file: string;
  readonly columnCount: number;
  readonly trailingDelimiter: boolean;
  /** Per file column: index of the kept channel, X_COLUMN, or SKIP. */
  readonly targets: Int32Array;
  /** Per file column: factor to SI units. */
  readonly scales: Float64Array;
  readonly axis: TimeAxis | null;
  readonly capacity: number;
  /** Most samples held over all kept channels (default MAX_SAMPLES; smaller in tests). */
  readonly maxSamples?: number;
  /** The column whose text marks a row as text (the x column, else the first data column). */
  readonly leadColumn?: number;
  /** Which acquisition to keep when the time restarts (1-based, default 1). */
  readonly segment?: number;
  /** Columns in SharedArrayBuffers, for reading pieces of the file in worker threads. */
  readonly shared?: boolean;
}

/**
 * Most samples a capture may hold in memory over all its kept channels: 2^28 values, 2 GiB of
 * Float64Array. A longer record (or a small .gz that unpacks to one) stops with `capture.too-large`
 * instead of exhausting the machine's memory.
 */
export const MAX_SAMPLES = 2 ** 28;

/** Samples one capture may hold here: MAX_SAMPLES, or fewer on a machine with less memory to give. */
export function sampleLimit(maxSamples?: number): number {
  return maxSamples ?? Math.min(MAX_SAMPLES, Math.floor(sampleMemoryBudget() / Float64Array.BYTES_PER_ELEMENT));
}

export const X_COLUMN = -2;
export const SKIP = -1;

interface Pending {
  readonly code: 'ragged-row' | 'text-in-data';
  readonly line: number;
  readonly fields: number;
  text: string;
  count: number;
}

export class RowSink {
  private columns: Float64Array[];
  length = 0;
  readonly invalid: number[];
  readonly firstInvalid: (number | undefined)[];
  firstLine = 0;
  lastLine = 0;
  pending: Pending | null = null;
  private capacity: number;
  private readonly maxRows: number;
  private readonly columnCount: number;
  private readonly trailingDelimiter: boolean;
  private readonly xColumn: number;
  /** File column and scale of each kept channel, in the order of `columns`. */
  private readonly channelColumns: Int32Array;
  private readonly channelScales: Float64Array;
  private readonly lead: number;
  /** Acquisitions seen (the time fell back to its first value) and the lines where each began. */
  segments = 1;
  readonly segmentLines: number[] = [];
  private readonly wanted: number;
  /** True while the rows belong to another acquisition than the one kept. */
  private skipping: boolean;
  private lastX = 0;
  private readonly maxSamples: number;

  constructor(private readonly cfg: SinkConfig) {
    const kept = [...cfg.targets.keys()].filter((c) => cfg.targets[c] >= 0).sort((a, b) => cfg.targets[a] - cfg.targets[b]);
    this.channelColumns = Int32Array.from(kept);
    this.channelScales = Float64Array.from(kept, (c) => cfg.scales[c]);
    this.xColumn = cfg.targets.indexOf(X_COLUMN);
    this.lead = cfg.leadColumn ?? 0;
    this.wanted = cfg.segment ?? 1;
    this.skipping = this.wanted !== 1;
    this.columnCount = cfg.columnCount;
    this.trailingDelimiter = cfg.trailingDelimiter;
    this.maxSamples = sampleLimit(cfg.maxSamples);
    this.maxRows = Math.floor(this.maxSamples / Math.max(1, kept.length));
    this.capacity = Math.min(this.maxRows, Math.max(16, cfg.capacity));
    const bytes = this.capacity * Float64Array.BYTES_PER_ELEMENT;
    this.columns = kept.map(() => new Float64Array(cfg.shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes)));
    this.invalid = new Array<number>(kept.length).fill(0);
    this.firstInvalid = new Array<number | undefined>(kept.length).fill(undefined);
  }

  /** Takes one row; returns false when the row was held back as a possible footer. */
  push(vals: Float64Array, kinds: Uint8Array, exps: Int32Array, fieldCount: number, line: number): boolean {
    const C = this.columnCount;
    let n = fieldCount;
    if (this.trailingDelimiter && n === C + 1 && kinds[C] === EMPTY) n = C;
    if (n !== C || kinds[this.lead] === TEXT || isTextRow(kinds, n)) return this.hold(n, line);
    if (this.pending) this.endPending(vals, kinds);
    const x = this.xColumn;
    if (x >= 0) {
      const t = vals[x];
      if (kinds[x] !== NUMBER || !(t < OVERFLOW_MARKER && t > -OVERFLOW_MARKER)) throw this.badTime(line);
      if (this.segments > this.wanted) return this.afterKept(t, line);
      if (this.cfg.axis!.push(vals, x, exps[x], line) !== SAME_SEGMENT && !this.newSegment(vals, x, exps[x], line)) return true;
      if (this.skipping) return true;
    }
    const row = this.length;
    if (row === this.capacity) this.grow();
    const { channelColumns, channelScales, columns } = this;
    for (let k = 0; k < channelColumns.length; k++) {
      const c = channelColumns[k];
      const v = vals[c];
      if (kinds[c] === NUMBER && v < OVERFLOW_MARKER && v > -OVERFLOW_MARKER) columns[k][row] = v * channelScales[k];
      else {
        columns[k][row] = NaN;
        if (this.invalid[k]++ === 0) this.firstInvalid[k] = line;
      }
    }
    if (row === 0) this.firstLine = line;
    this.lastLine = line;
    this.length = row + 1;
    return true;
  }

  /** The columns as allocated (shared when `shared`), for the piece readers to write into. */
  get buffers(): readonly Float64Array[] {
    return this.columns;
  }

  get rowCapacity(): number {
    return this.capacity;
  }

  /**
   * Takes `rows` rows that a piece reader has already checked (every field a number within the
   * overflow markers, the count of fields right) and written into the columns from row `from` on,
   * one per line from `firstLine`; the x values and their print exponents come in `times`/`exps`.
   * Each row goes through the same time-base and acquisition rules as push(), and kept rows move
   * down to the end of the rows so far, so the result is the one push() gives row by row.
   */
  commitRows(times: Float64Array, exps: Int32Array, rows: number, firstLine: number, from: number): void {
    const x = this.xColumn;
    let runSrc = from;
    let runLen = 0;
    for (let j = 0; j < rows; j++) {
      const line = firstLine + j;
      if (x >= 0) {
        let keep = true;
        if (this.segments > this.wanted) {
          this.afterKept(times[j], line);
          keep = false;
        } else if (this.cfg.axis!.push(times, j, exps[j], line) !== SAME_SEGMENT && !this.newSegment(times, j, exps[j], line)) keep = false;
        else if (this.skipping) keep = false;
        if (!keep) {
          this.moveRun(runSrc, runLen);
          runSrc = from + j + 1;
          runLen = 0;
          continue;
        }
      }
      if (this.length + runLen === this.maxRows) {
        this.moveRun(runSrc, runLen);
        throw this.tooLarge();
      }
      if (this.length + runLen === 0) this.firstLine = line;
      this.lastLine = line;
      runLen++;
    }
    this.moveRun(runSrc, runLen);
  }

  private moveRun(src: number, n: number): void {
    if (n === 0) return;
    if (src !== this.length) for (const c of this.columns) c.copyWithin(this.length, src, src + n);
    this.length += n;
  }

  /**
   * Text or short rows followed by more data are an error, unless the data after them starts the
   * time again: then they only separate two acquisitions (a repeated header, a segment title).
   */
  private endPending(vals: Float64Array, kinds: Uint8Array): void {
    const x = this.xColumn;
    const axis = this.cfg.axis;
    const restart = x >= 0 && axis !== null && kinds[x] === NUMBER && (this.segments > this.wanted ? vals[x] < this.lastX : axis.restartsAt(vals[x]));
    if (!restart) throw this.pendingError(this.pending!);
    this.pending = null;
  }

  /** The time fell back: a new acquisition starts on this row. Returns whether to keep the row. */
  private newSegment(vals: Float64Array, x: number, exp: number, line: number): boolean {
    this.segments++;
    this.segmentLines.push(line);
    this.lastX = vals[x];
    if (this.segments > this.wanted) return false;
    this.skipping = this.segments !== this.wanted;
    this.cfg.axis!.reset();
    this.cfg.axis!.push(vals, x, exp, line);
    return !this.skipping;
  }

  /** Rows after the kept acquisition: only counted, for the warning. */
  private afterKept(t: number, line: number): true {
    if (t < this.lastX) {
      this.segments++;
      this.segmentLines.push(line);
    }
    this.lastX = t;
    return true;
  }

  private hold(n: number, line: number): false {
    if (this.pending) this.pending.count++;
    else this.pending = { code: n !== this.columnCount ? 'ragged-row' : 'text-in-data', line, fields: n, text: '', count: 1 };
    return false;
  }

  /** The columns trimmed to the rows read (copied when much capacity would go unused). */
  trimmed(): Float64Array[] {
    return this.columns.map((c) => (c.length - this.length > this.length / 8 ? c.slice(0, this.length) : c.subarray(0, this.length)));
  }

  private grow(): void {
    if (this.capacity >= this.maxRows) throw this.tooLarge();
    this.capacity = Math.min(this.maxRows, Math.ceil(this.capacity * 1.5) + 16);
    this.columns = this.columns.map((c) => {
      const bigger = new Float64Array(this.capacity);
      bigger.set(c);
      return bigger;
    });
  }

  private pendingError(p: Pending) {
    const what = p.code === 'ragged-row' ? `has ${p.fields} field(s) where the data rows have ${this.cfg.columnCount}` : 'holds text where numbers were expected';
    return captureError(p.code, this.cfg.file, {
      line: p.line,
      problem: `this row ${what}${p.text ? `: "${p.text}"` : ''}, and data rows follow it`,
      expected: `every data row with ${this.cfg.columnCount} numeric field(s); text only before the data or at its end`,
      fix: 'delete or repair this line (it may join two exports), then measure again',
    });
  }

  private tooLarge() {
    const n = this.columns.length;
    return captureError('too-large', this.cfg.file, {
      line: this.lastLine + 1,
      problem: `the capture holds more than ${this.maxRows} rows of ${n} channel(s), over the ${this.maxSamples} samples benchproof keeps in memory on this machine`,
      expected: 'a record of at most a few hundred million samples over the channels measured',
      fix: n > 1 ? 'measure one channel at a time with --channel, or export a shorter record' : 'export a shorter record, or one at a lower sample rate',
    });
  }

  private badTime(line: number) {
    return captureError('invalid-time', this.cfg.file, {
      line,
      problem: 'the time (or sample index) of this row is empty or not a number',
      expected: 'a number in the first column of every data row',
      fix: 'repair or delete this row; if the column is not a time base, remove it and give --sample-rate',
    });
  }
}

/** Text and no number: a title or footer line. Rows of only empty fields or NaN words are data. */
function isTextRow(kinds: Uint8Array, n: number): boolean {
  let text = false;
  for (let i = 0; i < n; i++) {
    if (kinds[i] === NUMBER) return false;
    if (kinds[i] === TEXT) text = true;
  }
  return text;
}
