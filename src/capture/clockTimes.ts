/**
 * Data loggers stamp rows with a clock time (`10:00:01.250`) or a date and time
 * (`2026-03-01 10:00:01.250`, `01.03.2026 10:00:01,250`) instead of seconds. Such stamps are
 * rewritten, line by line as the file streams, into seconds since the first stamp of the file
 * (the same digits after the decimal mark, so the print resolution is kept), and a date standing
 * alone in its own field into an empty field (its column is then ignored). The file itself is never
 * changed and its SHA-256 is of the bytes as stored. Dates: ISO 8601 (year-month-day), day.month.year,
 * and month/day/year unless a first number above 12 shows day/month/year.
 */

const DATE = String.raw`(\d{4})-(\d{1,2})-(\d{1,2})|(\d{1,2})([./])(\d{1,2})\5(\d{4})`;
const CLOCK = String.raw`(\d{1,2}):(\d{2}):(\d{2})(?:([.,])(\d{1,9}))?`;
/** A date and a clock time in one field, or a clock time alone. */
const STAMP = new RegExp(String.raw`(?<![\d:.])(?:(?:${DATE})[ T])?${CLOCK}(?:Z|[+-]\d{2}:?\d{2})?(?![\d:])`, 'g');
/** A date alone in its field (between delimiters or line ends). */
const LONE_DATE = new RegExp(String.raw`(^|[;,\t ])(?:${DATE})(?=$|[;,\t \r])`, 'gm');
/** Share of the data lines that must carry a stamp for the file to be read this way. */
const MIN_SHARE = 0.8;

export class ClockRewriter {
  private origin: number | null = null;
  private readonly dayFirst: boolean;
  private carry = '';

  private constructor(dayFirst: boolean) {
    this.dayFirst = dayFirst;
  }

  /**
   * A rewriter when most of the sample's lines after its first quarter carry a clock stamp and no
   * line holds a plain number where the stamp would be; null for every other file (the common case).
   */
  static forSample(text: string): ClockRewriter | null {
    if (!/\d:\d\d:\d\d/.test(text)) return null;
    const lines = text.split(/\r?\n|\r/).filter((l) => l.trim() !== '');
    const tail = lines.slice(Math.floor(lines.length / 4));
    if (tail.length < 2) return null;
    const stamped = tail.filter((l) => new RegExp(STAMP.source).test(l)).length;
    if (stamped < MIN_SHARE * tail.length) return null;
    const slashFirst = [...text.matchAll(/(?<!\d)(\d{1,2})\/(\d{1,2})\/\d{4}/g)].map((m) => Number(m[1]));
    return new ClockRewriter(slashFirst.some((d) => d > 12));
  }

  /** The text of whole lines with every stamp rewritten; a partial last line waits for the next call. */
  rewrite(chunk: string, final = false): string {
    const text = this.carry + chunk;
    const cut = final ? text.length : Math.max(text.lastIndexOf('\n'), text.lastIndexOf('\r')) + 1;
    this.carry = text.slice(cut);
    return text
      .slice(0, cut)
      .replace(STAMP, (...g: string[]) => this.seconds(g))
      .replace(LONE_DATE, (_m, lead: string) => lead);
  }

  private seconds(g: readonly string[]): string {
    const [, y1, mo1, d1, a, sep, b, y2, hh, mm, ss, mark, frac = ''] = g;
    let days = 0;
    if (y1 !== undefined) days = Date.UTC(Number(y1), Number(mo1) - 1, Number(d1)) / 86_400_000;
    else if (y2 !== undefined) {
      const dayFirst = sep === '.' || this.dayFirst;
      const [d, m] = dayFirst ? [a, b] : [b, a];
      days = Date.UTC(Number(y2), Number(m) - 1, Number(d)) / 86_400_000;
    }
    // Whole seconds and the fraction apart, so that the digits written are the digits read.
    const whole = days * 86_400 + Number(hh) * 3600 + Number(mm) * 60 + Number(ss);
    this.origin ??= whole;
    const rel = whole - this.origin;
    return frac === '' ? String(rel) : `${rel}${mark}${frac}`;
  }
}

/** The rest of the file's chunks with every stamp rewritten, decoded as UTF-8 across chunk borders. */
export async function* rewriteChunks(chunks: AsyncIterable<Buffer>, clock: ClockRewriter, decoder: { write(b: Buffer): string; end(): string }): AsyncGenerator<Buffer> {
  for await (const chunk of chunks) yield Buffer.from(clock.rewrite(decoder.write(chunk)), 'utf8');
  yield Buffer.from(clock.rewrite(decoder.end(), true), 'utf8');
}
