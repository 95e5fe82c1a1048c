/**
 * Decimal numbers read straight from bytes, exact to the double.
 *
 * Fast path (Clinger, "How to read floating point numbers accurately", PLDI 1990, §3): when the
 * significant digits form an integer m < 10^15 (< 2^53, so exact) and the decimal exponent k has
 * |k| ≤ 22 (10^k exact in binary64), m·10^k or m/10^−k is one correctly rounded IEEE operation and
 * so equals what `Number()` returns. Every other token is handed to `Number()` on its text.
 */

/** Token kinds, shared by the byte scanner and the text parser. */
export const NUMBER = 0;
export const EMPTY = 1;
/** NaN or infinity written as a word. */
export const MARKER = 2;
export const TEXT = 3;
export type TokenKind = typeof NUMBER | typeof EMPTY | typeof MARKER | typeof TEXT;

const POW10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));
const MAX_FAST_DIGITS = 15;

/** Reads one number token from bytes; results land in the fields so the hot loop allocates nothing. */
export class NumberScanner {
  /** Index just past the token. */
  end = 0;
  /** NUMBER, or TEXT when the bytes at the start do not begin a number. */
  kind: TokenKind = NUMBER;
  /** Decimal exponent of the last written digit: the resolution the number was printed with. */
  quantumExp = 0;

  constructor(private readonly decimalMark: number) {}

  /**
   * Parses digits at `pos` (before `limit`) into out[at]; stops at the first byte that cannot
   * continue a number. Writing into the array (not returning) keeps the hot loop free of boxed doubles.
   */
  scanInto(b: Uint8Array, pos: number, limit: number, out: Float64Array, at: number): void {
    const start = pos;
    let neg = false;
    let c = b[pos];
    if (c === 45 || c === 43) {
      neg = c === 45;
      pos++;
    }
    let mant = 0;
    let sig = 0;
    let frac = 0;
    let digits = 0;
    let seenPoint = false;
    for (; pos < limit; pos++) {
      c = b[pos];
      const d = c - 48;
      if (d >= 0 && d <= 9) {
        digits++;
        if (seenPoint) frac++;
        if (sig > 0 || d !== 0) sig++;
        if (sig <= MAX_FAST_DIGITS) mant = mant * 10 + d;
      } else if (c === this.decimalMark && !seenPoint) {
        seenPoint = true;
      } else break;
    }
    if (digits === 0) return this.text(pos, out, at);
    let exp = 0;
    if (pos < limit && (b[pos] === 101 || b[pos] === 69)) {
      let p = pos + 1;
      const expNeg = b[p] === 45;
      if (b[p] === 45 || b[p] === 43) p++;
      const expStart = p;
      while (p < limit && b[p] >= 48 && b[p] <= 57) {
        if (exp < 100000) exp = exp * 10 + (b[p] - 48);
        p++;
      }
      if (p === expStart) return this.text(p, out, at);
      if (expNeg) exp = -exp;
      pos = p;
    }
    this.end = pos;
    this.kind = NUMBER;
    const k = exp - frac;
    this.quantumExp = k;
    if (sig > MAX_FAST_DIGITS || k < -22 || k > 22) {
      out[at] = this.slow(b, start, pos);
      return;
    }
    const v = k >= 0 ? mant * POW10[k] : mant / POW10[-k];
    out[at] = neg ? -v : v;
  }

  /** The value of the number at `pos` (NaN when the bytes do not begin one). */
  scan(b: Uint8Array, pos: number, limit: number): number {
    this.scanInto(b, pos, limit, this.one, 0);
    return this.one[0];
  }

  private readonly one = new Float64Array(1);

  private text(pos: number, out: Float64Array, at: number): void {
    this.end = pos;
    this.kind = TEXT;
    out[at] = NaN;
  }

  private slow(b: Uint8Array, start: number, end: number): number {
    let s = '';
    for (let i = start; i < end; i++) s += String.fromCharCode(b[i] === this.decimalMark ? 46 : b[i]);
    return Number(s);
  }
}

const NUMBER_TEXT = /^[+-]?(?:(\d+)(?:[.](\d*))?|[.](\d+))(?:[eE]([+-]?\d+))?$/;
const MARKER_TEXT = /^[+-]?(?:nan|inf|infinity)$/i;

export interface ParsedText {
  readonly kind: TokenKind;
  readonly value: number;
  readonly quantumExp: number;
}

/** The same reading for a field given as text (header sniffing, the papaparse path). */
export function parseNumberText(raw: string, decimalMark: '.' | ','): ParsedText {
  let s = raw.trim();
  if (s.length >= 2 && s.startsWith('"') && s.endsWith('"')) s = s.slice(1, -1).trim();
  if (s === '') return { kind: EMPTY, value: NaN, quantumExp: 0 };
  if (MARKER_TEXT.test(s)) return { kind: MARKER, value: NaN, quantumExp: 0 };
  if (decimalMark === ',') {
    if (s.includes('.')) return { kind: TEXT, value: NaN, quantumExp: 0 };
    s = s.replace(',', '.');
  }
  const m = NUMBER_TEXT.exec(s);
  if (!m) return { kind: TEXT, value: NaN, quantumExp: 0 };
  const frac = (m[2] ?? m[3] ?? '').length;
  return { kind: NUMBER, value: Number(s), quantumExp: Number(m[4] ?? 0) - frac };
}
