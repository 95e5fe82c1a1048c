/**
 * `inspect`: how a file was understood, as data. The capture as read (without its samples), the
 * opening lines of the file each with the role the reader gave it, and the first samples as parsed
 * (time and each channel in SI units), so that a user sees at once why a number looks wrong.
 */
import type { Capture, ReadCaptureOptions } from '../types/index.js';
import { readCaptureLines } from './readCapture.js';

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

export async function inspectCapture(path: string, options: ReadCaptureOptions = {}): Promise<Inspection> {
  const { capture, lines, sniffed } = await readCaptureLines(path, options);
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
  const shown = [...before, ...data].map((l) => ({ line: l.line, role: roleOf(l.line), text: l.text.length > TEXT_SHOWN ? `${l.text.slice(0, TEXT_SHOWN)}…` : l.text }));
  const n = Math.min(DATA_LINES_SHOWN, capture.length);
  const firstRows = Array.from({ length: n }, (_, i) => ({
    time: capture.startTime + i * capture.sampleInterval,
    values: capture.channels.map((ch) => (Number.isFinite(ch.samples[i]) ? ch.samples[i] : null)),
  }));
  const channels = capture.channels.map(({ samples: _samples, ...rest }) => rest);
  return { schemaVersion: 1, capture: { ...capture, channels }, lines: shown, firstRows };
}
