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
/** 10^15: mantissas below it have at most 15 significant digits (exact in binary64). */
const FAST_LIMIT = 1e15;

/**
 * m·10^k as one correctly rounded operation when that is exact (Clinger's fast path: m < 10^15,
 * |k| ≤ 22), else NaN, for callers that then read the number the slow way.
 */
export function fastDecimal(mant: number, k: number, neg: boolean): number {
  if (mant >= FAST_LIMIT || k < -22 || k > 22) return NaN;
  const v = k >= 0 ? mant * POW10[k] : mant / POW10[-k];
  return neg ? -v : v;
}

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
    const sign = b[pos];
    if (sign === 45 || sign === 43) pos++;
    // All digits go into the mantissa, leading zeros included (they add nothing). It holds more than
    // 15 significant digits exactly when it reaches 1e15: below that every step is exact, and
    // rounding cannot take a larger value back under 1e15. Such numbers take the slow path.
    let mant = 0;
    const intStart = pos;
    for (let d = b[pos] - 48; pos < limit && d >= 0 && d <= 9; d = b[++pos] - 48) mant = mant * 10 + d;
    const intDigits = pos - intStart;
    let frac = 0;
    if (pos < limit && b[pos] === this.decimalMark) {
      const fracStart = ++pos;
      for (let d = b[pos] - 48; pos < limit && d >= 0 && d <= 9; d = b[++pos] - 48) mant = mant * 10 + d;
      frac = pos - fracStart;
    }
    if (intDigits + frac === 0) return this.text(pos, out, at);
    this.end = pos;
    const exp = pos < limit && (b[pos] === 101 || b[pos] === 69) ? this.exponent(b, pos + 1, limit) : 0;
    if (exp !== exp) return this.text(this.end, out, at);
    this.kind = NUMBER;
    this.quantumExp = exp - frac;
    out[at] = this.value(b, start, mant, exp - frac, sign === 45);
  }

  /** mant·10^k, correctly rounded: one exact operation in the fast case, Number() on the text otherwise. */
  private value(b: Uint8Array, start: number, mant: number, k: number, neg: boolean): number {
    if (mant >= FAST_LIMIT || k < -22 || k > 22) return this.slow(b, start, this.end);
    const v = k >= 0 ? mant * POW10[k] : mant / POW10[-k];
    return neg ? -v : v;
  }

  /**
   * The exponent's digits from `p` (just past the e or E), with its sign; sets `end` past them.
   * NaN when no digit follows (then `end` is where the digits should have been). Kept out of
   * scanInto so that scanInto stays small enough for V8 to inline into the row loop.
   */
  private exponent(b: Uint8Array, p: number, limit: number): number {
    let exp = 0;
    const expNeg = b[p] === 45;
    if (b[p] === 45 || b[p] === 43) p++;
    const expStart = p;
    while (p < limit && b[p] >= 48 && b[p] <= 57) {
      if (exp < 100000) exp = exp * 10 + (b[p] - 48);
      p++;
    }
    this.end = p;
    if (p === expStart) return NaN;
    return expNeg ? -exp : exp;
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
  const plain = plainNumberText(s, decimalMark === ',' ? 44 : 46);
  if (plain !== null) return plain;
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

/**
 * The common case of parseNumberText without regular expressions (sniffing reads some 10 000 fields
 * per file): the whole text is a number as NUMBER_TEXT reads it, with the given decimal mark, that
 * the Clinger fast path reads exactly. Anything else gives null and takes the general path.
 */
function plainNumberText(s: string, mark: number): ParsedText | null {
  const n = s.length;
  let i = 0;
  let c = s.charCodeAt(0);
  const neg = c === 45;
  if (c === 45 || c === 43) c = s.charCodeAt(++i);
  let mant = 0;
  let digits = 0;
  for (; c >= 48 && c <= 57; c = s.charCodeAt(++i), digits++) mant = mant * 10 + (c - 48);
  let frac = 0;
  if (c === mark) {
    for (c = s.charCodeAt(++i); c >= 48 && c <= 57; c = s.charCodeAt(++i), frac++) mant = mant * 10 + (c - 48);
  }
  if (digits + frac === 0) return null;
  let exp = 0;
  if (c === 101 || c === 69) {
    c = s.charCodeAt(++i);
    const expNeg = c === 45;
    if (c === 45 || c === 43) c = s.charCodeAt(++i);
    const start = i;
    for (; c >= 48 && c <= 57 && exp < 100000; c = s.charCodeAt(++i)) exp = exp * 10 + (c - 48);
    if (i === start) return null;
    // As Number("-0") in the general path: an exponent of "-0" is −0.
    if (expNeg) exp = -exp;
  }
  const k = exp - frac;
  if (i !== n || mant >= FAST_LIMIT || k < -22 || k > 22) return null;
  const v = k >= 0 ? mant * POW10[k] : mant / POW10[-k];
  return { kind: NUMBER, value: neg ? -v : v, quantumExp: k };
}
