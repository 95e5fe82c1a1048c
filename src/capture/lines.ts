/**
 * The opening bytes of a capture as numbered lines, for sniffing its layout: byte-order mark,
 * encoding and binary checks, line endings, and the line length limit.
 */
import type { CaptureLayout } from '../types/index.js';
import { captureError } from './errors.js';

/** Longest line accepted anywhere in a capture. */
export const MAX_LINE_BYTES = 1 << 20;
/** How much of the file the layout is sniffed from. */
export const SNIFF_BYTES = 64 << 10;

export interface SampleLine {
  /** 1-based line number in the file. */
  readonly line: number;
  /** Byte offset of the line's first byte in the sample. */
  readonly start: number;
  readonly text: string;
}

export interface SampleLines {
  readonly bom: boolean;
  readonly lineEnding: CaptureLayout['lineEnding'];
  /** The byte that ends a line: LF, or CR for files with CR line ends only. */
  readonly terminator: number;
  /** Non-blank lines of the sniffed part, in order. */
  readonly lines: readonly SampleLine[];
  /** True when the sniffed lines reach the end of the file. */
  readonly wholeFile: boolean;
}

export function sampleLines(sample: Buffer, endOfFile: boolean, file: string): SampleLines {
  checkEncoding(sample, file);
  const bom = sample[0] === 0xef && sample[1] === 0xbb && sample[2] === 0xbf;
  const from = bom ? 3 : 0;
  const hasLf = sample.indexOf(10, from) >= 0;
  const terminator = !hasLf && sample.indexOf(13, from) >= 0 ? 13 : 10;
  let limit = sample.length;
  if (limit > SNIFF_BYTES || !endOfFile) {
    const cut = sample.indexOf(terminator, Math.min(SNIFF_BYTES, sample.length - 1));
    const last = sample.lastIndexOf(terminator);
    limit = cut >= 0 ? cut + 1 : last >= from ? last + 1 : from;
  }
  // The reader stops gathering once a line runs past the limit, so an unfinished line this long is too long.
  const unfinished = !endOfFile && sample.length - limit > MAX_LINE_BYTES;
  const lines: SampleLine[] = [];
  let crlf = 0;
  let lf = 0;
  let lineNo = 1;
  for (let pos = from; pos < limit; lineNo++) {
    let end = sample.indexOf(terminator, pos);
    if (end < 0 || end >= limit) end = limit;
    if (end - pos > MAX_LINE_BYTES) throw lineTooLong(file, lineNo);
    if (terminator === 10 && end < limit) {
      if (end > pos && sample[end - 1] === 13) crlf++;
      else lf++;
    }
    const text = decodeLine(sample, pos, end);
    if (text.trim() !== '') lines.push({ line: lineNo, start: pos, text });
    pos = end + 1;
  }
  if (unfinished) throw lineTooLong(file, lineNo);
  const lineEnding = terminator === 13 ? 'cr' : crlf > 0 && lf > 0 ? 'mixed' : crlf > 0 ? 'crlf' : 'lf';
  return { bom, lineEnding, terminator, lines, wholeFile: endOfFile && limit === sample.length };
}

/** UTF-8 text, or Latin-1 for older exports that write `µ` as the single byte 0xB5. */
function decodeLine(b: Buffer, start: number, end: number): string {
  const utf8 = b.toString('utf8', start, end);
  return (utf8.includes('\uFFFD') ? b.toString('latin1', start, end) : utf8).replace(/\r+$/, '');
}

export function lineTooLong(file: string, line: number) {
  return captureError('line-too-long', file, {
    line,
    problem: `a line is longer than ${MAX_LINE_BYTES} bytes, the limit for one row`,
    expected: 'one sample per line, each line ending in a line break',
    fix: 'check that the file is a CSV export (not a single-line dump), or re-export it with one row per sample',
  });
}

/** Bytes below 32 other than tab, line feed, form feed and carriage return, as the loop counts them. */
// eslint-disable-next-line no-control-regex -- control bytes are exactly what this looks for
const CONTROL_BYTE = /[\x00-\x08\x0b\x0e-\x1f]/;

function checkEncoding(b: Buffer, file: string): void {
  if ((b[0] === 0xff && b[1] === 0xfe) || (b[0] === 0xfe && b[1] === 0xff)) {
    throw captureError('unsupported-encoding', file, {
      line: 1,
      problem: 'the file is UTF-16 text (it starts with a UTF-16 byte-order mark)',
      expected: 'UTF-8 or plain ASCII text',
      fix: 'save the capture again as UTF-8 CSV (most instruments and spreadsheets offer it)',
    });
  }
  const n = Math.min(b.length, SNIFF_BYTES);
  // Nearly every export holds no control byte at all: one regular-expression scan (native code)
  // settles that, where the byte loop below would run cold over 64 KiB.
  if (!CONTROL_BYTE.test(b.toString('latin1', 0, n))) return;
  let control = 0;
  for (let i = 0; i < n; i++) {
    const c = b[i];
    if (c === 0 || (c < 32 && c !== 9 && c !== 10 && c !== 13 && c !== 12)) control++;
    if (c === 0 || control > n / 100) {
      throw captureError('binary', file, {
        problem: 'this looks like a binary file, not text (it holds control bytes)',
        expected: 'a text CSV export from a scope, logger or simulator',
        fix: "export the capture from the instrument as CSV text; a scope's own binary format cannot be read",
      });
    }
  }
}
