/**
 * `inspect`: how a file was understood, as data. The capture as read (without its samples), the
 * opening lines of the file each with the role the reader gave it, and the first samples as parsed
 * (time and each channel in SI units), so that a user sees at once why a number looks wrong.
 */
import type { BenchErrorFields, Capture, ReadCaptureOptions } from '../types/index.js';
import { isBenchError } from '../types/index.js';
import { sampleLines } from './lines.js';
import type { SampleLines } from './lines.js';
import { readCaptureLines } from './readCapture.js';
import { sniffLayout } from './sniff.js';
import type { Sniffed } from './sniff.js';
import { openSource } from './source.js';

export type LineRole = 'skipped' | 'preamble' | 'header' | 'units' | 'data and preamble' | 'data' | 'other';

export interface InspectedLine {
  readonly line: number;
  readonly role: LineRole;
  readonly text: string;
}

export interface Inspection {
  readonly schemaVersion: 1;
  readonly capture: Omit<Capture, 'channels'> & { readonly channels: readonly Omit<Capture['channels'][number], 'samples'>[] };
  /** The opening lines up to a few data rows past the first, with their roles (blank lines left out). */
  readonly lines: readonly InspectedLine[];
  /** The first samples as read: time (s) and one value per channel, in SI units. */
  readonly firstRows: readonly { readonly time: number; readonly values: readonly (number | null)[] }[];
}

const DATA_LINES_SHOWN = 5;
const LINES_BEFORE_DATA = 40;
const TEXT_SHOWN = 100;

/** What could be seen of a file that cannot be read: its opening lines (with roles when the layout was found) and the error. */
export interface FailedInspection {
  readonly schemaVersion: 1;
  readonly path: string;
  readonly lines: readonly InspectedLine[];
  readonly error: BenchErrorFields;
}

export async function inspectCapture(path: string, options: ReadCaptureOptions = {}): Promise<Inspection> {
  const { capture, lines, sniffed } = await readCaptureLines(path, options);
  const shown = linesWithRoles(lines, sniffed);
  const n = Math.min(DATA_LINES_SHOWN, capture.length);
  const firstRows = Array.from({ length: n }, (_, i) => ({
    time: capture.startTime + i * capture.sampleInterval,
    values: capture.channels.map((ch) => (Number.isFinite(ch.samples[i]) ? ch.samples[i] : null)),
  }));
  const channels = capture.channels.map(({ samples: _samples, ...rest }) => rest);
  return { schemaVersion: 1, capture: { ...capture, channels }, lines: shown, firstRows };
}

/**
 * The opening lines of a file that could not be read, with the roles the reader gave them when
 * its layout was found before the error, so that the user sees where reading went wrong.
 * Returns null when the file cannot even be opened.
 */
export async function inspectFailure(path: string, options: ReadCaptureOptions, error: unknown): Promise<FailedInspection | null> {
  if (!isBenchError(error)) return null;
  let source;
  try {
    source = await openSource(path);
  } catch {
    return null;
  }
  const it = source.chunks[Symbol.asyncIterator]();
  try {
    const first = await it.next();
    if (first.done) return null;
    const buf = Buffer.from(first.value);
    let lines: SampleLines;
    try {
      lines = sampleLines(buf, buf.length < 1 << 20, path);
    } catch {
      return null;
    }
    let sniffed: Sniffed | null = null;
    try {
      sniffed = sniffLayout(lines, path, options);
    } catch {
      sniffed = null;
    }
    const shown = sniffed ? linesWithRoles(lines, sniffed) : lines.lines.slice(0, LINES_BEFORE_DATA).map((l) => ({ line: l.line, role: 'other' as const, text: clip(l.text) }));
    const { code, file, line, problem, expected, fix } = error;
    return { schemaVersion: 1, path, lines: shown, error: { code, file, ...(line !== undefined ? { line } : {}), problem, expected, fix } };
  } finally {
    await it.return?.();
  }
}

const clip = (t: string): string => (t.length > TEXT_SHOWN ? `${t.slice(0, TEXT_SHOWN)}…` : t);

function linesWithRoles(lines: SampleLines, sniffed: Sniffed): InspectedLine[] {
  const header = new Set(sniffed.headerLines);
  const preamble = new Set(sniffed.preambleLines);
  const shared = new Set(sniffed.sharedLines);
  const roleOf = (line: number): LineRole =>
    line <= sniffed.skippedLines ? 'skipped'
    : shared.has(line) ? 'data and preamble'
    : line === sniffed.unitsLine ? 'units'
    : header.has(line) ? 'header'
    : preamble.has(line) ? 'preamble'
    : line >= sniffed.firstDataLine ? 'data'
    : 'other';
  const before = lines.lines.filter((l) => l.line < sniffed.firstDataLine).slice(-LINES_BEFORE_DATA);
  const data = lines.lines.filter((l) => l.line >= sniffed.firstDataLine).slice(0, DATA_LINES_SHOWN);
  return [...before, ...data].map((l) => ({ line: l.line, role: roleOf(l.line), text: clip(l.text) }));
}
