/**
 * The streaming reader for plain numeric layouts (any delimiter, either decimal mark, at most
 * simple quotes around numbers): numbers are parsed straight from each chunk's bytes into the
 * row sink, with no strings, no split() and no per-row objects. A line cut by a chunk boundary is
 * carried over (bounded by MAX_LINE_BYTES). Blank lines and `#` comment lines are skipped.
 *
 * Why our own and not papaparse for these layouts: papaparse, which makes a string and an array per
 * row, read about 19 MB/s on a stream where a byte-level scanner reads about 190 MB/s (measured:
 * DEVELOPERS.md, "Reading"); papaparse stays for the quoted layouts, whose RFC 4180 rules it keeps.
 */
import type { DecimalMark, Delimiter } from '../types/index.js';
import { lineTooLong, MAX_LINE_BYTES } from './lines.js';
import { blankRunError, MAX_BLANK_RUN } from './readerLimits.js';
import { EMPTY, fastDecimal, MARKER, NUMBER, NumberScanner, TEXT } from './scanNumber.js';

const SPACE = 32;
const TAB = 9;
const CR = 13;
const QUOTE = 34;
const HASH = 35;
/** Rows the plain-row path may hand back to the general one before it stops being tried. */
const MAX_PLAIN_MISSES = 4096;

export interface ScannerLayout {
  readonly delimiter: Delimiter;
  readonly decimalMark: DecimalMark;
  readonly terminator: number;
  readonly columnCount: number;
  readonly firstLine: number;
  readonly file: string;
}

/** Where the scanner puts rows: the RowSink, or a piece reader's own sink (pieceReader.ts). */
export interface RowTarget {
  push(vals: Float64Array, kinds: Uint8Array, exps: Int32Array, fieldCount: number, line: number): boolean;
  readonly pending: { text: string } | null;
}

export class ByteScanner {
  private line: number;
  private leftover: Buffer | null = null;
  private readonly num: NumberScanner;
  private readonly delim: number;
  private readonly spaces: boolean;
  /** 1 for the bytes that pad fields: space, tab unless it delimits, CR unless it ends lines. */
  private readonly blank = new Uint8Array(256);
  private readonly term: number;
  private readonly vals: Float64Array;
  private readonly kinds: Uint8Array;
  private readonly exps: Int32Array;
  private readonly maxFields: number;
  private readonly columnCount: number;
  /** Whether to try plainRow first: not for space-delimited layouts, nor after many misses. */
  private plain: boolean;
  private plainMisses = 0;
  private readonly mark: number;
  /** Blank or comment lines since the last row, bounded by MAX_BLANK_RUN. */
  private blankRun = 0;

  constructor(
    private readonly layout: ScannerLayout,
    private readonly sink: RowTarget,
  ) {
    this.line = layout.firstLine;
    this.num = new NumberScanner(layout.decimalMark.charCodeAt(0));
    this.delim = layout.delimiter.charCodeAt(0);
    this.spaces = layout.delimiter === ' ';
    this.term = layout.terminator;
    this.blank[SPACE] = 1;
    if (layout.delimiter !== '\t') this.blank[TAB] = 1;
    if (layout.terminator !== CR) this.blank[CR] = 1;
    this.maxFields = layout.columnCount + 2;
    this.columnCount = layout.columnCount;
    this.plain = !this.spaces;
    this.mark = layout.decimalMark.charCodeAt(0);
    this.vals = new Float64Array(this.maxFields);
    this.kinds = new Uint8Array(this.maxFields);
    this.exps = new Int32Array(this.maxFields);
  }

  /** The number of the next line to read (lines read so far = nextLine − firstLine). */
  get nextLine(): number {
    return this.line;
  }

  feed(chunk: Buffer): void {
    const T = this.layout.terminator;
    let body = chunk;
    if (this.leftover !== null) {
      const end = chunk.indexOf(T);
      if (end < 0) return this.keep(Buffer.concat([this.leftover, chunk]));
      const joined = Buffer.concat([this.leftover, chunk.subarray(0, end + 1)]);
      this.leftover = null;
      this.lines(joined, joined.length);
      body = chunk.subarray(end + 1);
    }
    const last = body.lastIndexOf(T);
    if (last < 0) return this.keep(Buffer.from(body));
    this.lines(body, last + 1);
    if (last + 1 < body.length) this.keep(Buffer.from(body.subarray(last + 1)));
  }

  end(): void {
    if (this.leftover !== null) this.lines(this.leftover, this.leftover.length);
    this.leftover = null;
  }

  private keep(rest: Buffer): void {
    if (rest.length > MAX_LINE_BYTES) throw lineTooLong(this.layout.file, this.line);
    this.leftover = rest;
  }

  private lines(b: Buffer, end: number): void {
    // plainRow relies on a terminator at the end of the region (the last line may lack one).
    const plain = this.plain && b[end - 1] === this.term;
    let pos = 0;
    while (pos < end) {
      let stop = plain && this.plain ? this.plainRow(b, pos) : -1;
      if (stop < 0) stop = this.row(b, pos, end);
      if (stop - pos > MAX_LINE_BYTES) throw lineTooLong(this.layout.file, this.line);
      this.line++;
      pos = stop + 1;
    }
  }

  /**
   * The common row, read without the general path's checks: exactly columnCount unquoted numbers
   * joined by single delimiters, then the terminator (a CR before an LF allowed), each number within
   * the exact fast path of NumberScanner (the same grammar: sign, digits, decimal mark, exponent).
   * Such a row reads the same through row(). Returns the terminator's index, or −1 with nothing
   * pushed to leave the row to row(). `b[limit − 1]` must be the terminator, which stops every loop.
   */
  private plainRow(b: Buffer, s: number): number {
    const { vals, kinds, exps, delim, term, columnCount, mark } = this;
    let pos = s;
    let c = b[pos];
    for (let n = 0; ; n++) {
      const neg = c === 45;
      if (neg || c === 43) c = b[++pos];
      let mant = 0;
      let digits = pos;
      for (; c >= 48 && c <= 57; c = b[++pos]) mant = mant * 10 + (c - 48);
      digits = pos - digits;
      let frac = 0;
      if (c === mark) {
        const from = pos + 1;
        for (c = b[++pos]; c >= 48 && c <= 57; c = b[++pos]) mant = mant * 10 + (c - 48);
        frac = pos - from;
      }
      if (digits + frac === 0) return this.plainMiss();
      let exp = 0;
      if (c === 101 || c === 69) {
        c = b[++pos];
        const expNeg = c === 45;
        if (expNeg || c === 43) c = b[++pos];
        const from = pos;
        for (; c >= 48 && c <= 57 && exp < 1000; c = b[++pos]) exp = exp * 10 + (c - 48);
        if (pos === from) return this.plainMiss();
        if (expNeg) exp = -exp;
      }
      const v = fastDecimal(mant, exp - frac, neg);
      if (v !== v) return this.plainMiss();
      vals[n] = v;
      kinds[n] = NUMBER;
      exps[n] = exp - frac;
      if (n + 1 === columnCount) break;
      if (c !== delim) return this.plainMiss();
      c = b[++pos];
    }
    if (c === CR && term !== CR) c = b[++pos];
    if (c !== term) return this.plainMiss();
    return this.pushRow(b, s, pos, columnCount);
  }

  private plainMiss(): number {
    if (++this.plainMisses > MAX_PLAIN_MISSES) this.plain = false;
    return -1;
  }

  private isBlank(c: number): boolean {
    return this.blank[c] === 1;
  }

  /** Reads the line starting at `s` and returns the index of its terminator (or `limit`). */
  private row(b: Buffer, s: number, limit: number): number {
    const { vals, kinds, exps, num, delim, spaces, maxFields, term } = this;
    let pos = s;
    while (pos < limit && this.isBlank(b[pos])) pos++;
    if (pos >= limit || b[pos] === term) return this.blankLine(pos);
    if (b[pos] === HASH) return this.blankLine(this.lineEnd(b, pos, limit));
    let n = 0;
    for (;;) {
      while (pos < limit && this.isBlank(b[pos])) pos++;
      if (n === maxFields) return this.pushRow(b, s, this.lineEnd(b, pos, limit), n);
      const quoted = pos < limit && b[pos] === QUOTE;
      if (quoted) pos++;
      const start = pos;
      const c = b[pos];
      if (pos >= limit || c === term || (c === delim && !spaces) || (quoted && c === QUOTE)) {
        vals[n] = NaN;
        kinds[n] = EMPTY;
        exps[n] = 0;
      } else {
        num.scanInto(b, pos, limit, vals, n);
        kinds[n] = num.kind;
        exps[n] = num.quantumExp;
        pos = num.end;
      }
      if (quoted && pos < limit && b[pos] === QUOTE) pos++;
      // A token that goes on past its number ("1.5V", "12:30") or is a word is text (or a NaN word).
      if (pos < limit && !this.isBlank(b[pos]) && b[pos] !== term && (spaces || b[pos] !== delim)) pos = this.skipText(b, start, pos, limit, n);
      while (pos < limit && this.isBlank(b[pos])) pos++;
      if (!spaces && pos < limit && b[pos] !== delim && b[pos] !== term) pos = this.skipText(b, start, pos, limit, n);
      n++;
      if (pos >= limit || b[pos] === term) return this.pushRow(b, s, pos, n);
      if (!spaces) pos++;
    }
  }

  private blankLine(end: number): number {
    if (++this.blankRun > MAX_BLANK_RUN) throw blankRunError(this.layout.file, this.line - MAX_BLANK_RUN);
    return end;
  }

  private pushRow(b: Buffer, s: number, e: number, n: number): number {
    this.blankRun = 0;
    if (!this.sink.push(this.vals, this.kinds, this.exps, n, this.line)) this.holdText(b, s, e);
    return e;
  }

  private lineEnd(b: Buffer, pos: number, limit: number): number {
    const e = b.indexOf(this.term, pos);
    return e < 0 || e > limit ? limit : e;
  }

  private skipText(b: Buffer, start: number, pos: number, e: number, n: number): number {
    const { delim, spaces, term } = this;
    while (pos < e && b[pos] !== term && (spaces ? !this.isBlank(b[pos]) : b[pos] !== delim)) pos++;
    this.kinds[n] = isMarker(b, start, pos) ? MARKER : TEXT;
    this.vals[n] = NaN;
    return pos;
  }

  private holdText(b: Buffer, s: number, e: number): void {
    const p = this.sink.pending;
    if (p && p.text === '') p.text = b.toString('utf8', s, Math.min(e, s + 60)).trim();
  }
}

/** `nan`, `inf`, `infinity` with an optional sign, any case (and a closing quote). */
function isMarker(b: Buffer, s: number, e: number): boolean {
  while (e > s && (b[e - 1] === QUOTE || b[e - 1] === SPACE || b[e - 1] === TAB)) e--;
  if (b[s] === 43 || b[s] === 45) s++;
  const len = e - s;
  if (len !== 3 && len !== 8) return false;
  const word = b.toString('latin1', s, e).toLowerCase();
  return word === 'nan' || word === 'inf' || word === 'infinity';
}
