/** The Capture built from the rows read: time base, channels with their checks, warnings, provenance. */
import type { Capture, CaptureChannel, CaptureReading, CaptureWarning, ReadCaptureOptions } from '../types/index.js';
import { captureError } from './errors.js';
import type { SampleLines } from './lines.js';
import type { MetadataTiming } from './metadata.js';
import type { ColumnRoles } from './roles.js';
import type { RowSink } from './rowSink.js';
import type { Sniffed } from './sniff.js';
import type { CaptureSource } from './source.js';
import type { TimeAxis } from './timeAxis.js';
import { channelFullScale } from './fullScale.js';
import { findSplice } from './splice.js';
import { resolveTiming } from './timing.js';
import type { Timing } from './timing.js';

export interface AssembleInput {
  readonly path: string;
  readonly options: ReadCaptureOptions;
  readonly source: CaptureSource;
  readonly lines: SampleLines;
  readonly sniffed: Sniffed;
  readonly meta: MetadataTiming;
  readonly roles: ColumnRoles;
  /** File columns of the kept channels, in the sink's order. */
  readonly kept: readonly number[];
  readonly sink: RowSink;
  readonly axis: TimeAxis | null;
}

export function assembleCapture(a: AssembleInput): Capture {
  const { path, sink, roles, sniffed } = a;
  const wanted = a.options.segment ?? 1;
  if (wanted > sink.segments) {
    throw captureError('unknown-segment', path, {
      problem: `acquisition ${wanted} was asked for, but the file holds ${sink.segments}`,
      expected: `--segment from 1 to ${sink.segments}`,
      fix: `give --segment ${sink.segments} or less, or leave it out to read the first`,
    });
  }
  if (sink.length < 2) {
    throw captureError('too-few-rows', path, {
      line: sniffed.firstDataLine,
      problem: `the capture holds ${sink.length} data row(s); at least 2 are needed for a time base`,
      expected: 'a capture with many samples (a few cycles of the signal)',
      fix: 'export the whole record from the instrument, not a single reading',
    });
  }
  const x = roles.timeColumn ?? roles.indexColumn;
  const timing = resolveTiming({
    file: path,
    axis: a.axis ? a.axis.finish() : null,
    xKind: roles.timeColumn !== null ? 'time' : roles.indexColumn !== null ? 'index' : null,
    xScale: x === null ? 1 : roles.columns[x].scale,
    meta: a.meta,
    options: a.options,
    channels: sink.trimmed(),
    firstDataLine: sniffed.firstDataLine,
  });
  const warnings: CaptureWarning[] = [...timing.warnings, ...fileWarnings(a)];
  applyOffsets(a, timing.channels);
  const cut = cutAtSplice(a, timing, warnings);
  const channels = a.kept.map((col, k) => channelOf(a, col, k, cut.channels[k], warnings));
  return {
    path,
    sha256: a.source.digest(),
    size: a.source.size,
    layout: {
      delimiter: sniffed.delimiter,
      decimalMark: sniffed.decimalMark,
      headerLine: sniffed.headerLine,
      firstDataLine: sink.firstLine,
      lastDataLine: sink.lastLine,
      columns: roles.columns,
      timeColumn: roles.timeColumn,
      indexColumn: roles.indexColumn,
      timing: timing.timing,
      resampled: timing.resampled,
      compressed: a.source.compressed,
      bom: a.lines.bom,
      lineEnding: a.lines.lineEnding,
      reading: readingOf(a, timing),
    },
    metadata: metadataRecord(sniffed.preamble),
    startTime: cut.startTime,
    sampleInterval: timing.sampleInterval,
    length: channels[0].samples.length,
    channels,
    warnings,
  };
}

/** One kept channel with its invalid-sample count and clipping check; their warnings go to `warnings`. */
function channelOf(a: AssembleInput, col: number, k: number, samples: Float64Array, warnings: CaptureWarning[]): CaptureChannel {
  const layout = a.roles.columns[col];
  const invalidInFile = a.sink.invalid[k];
  const firstInvalidLine = a.sink.firstInvalid[k];
  // The file's count describes its rows; the channel's count must describe `samples`, which a
  // resampled time base or a cut at a splice makes differ from the rows (a gap can widen or fall away).
  const invalidCount = invalidInFile > 0 ? countNotFinite(samples) : 0;
  if (invalidInFile > 0) {
    warnings.push({
      code: 'invalid-samples',
      channel: layout.name,
      line: firstInvalidLine,
      message: `${invalidInFile} invalid sample(s) in ${layout.name} (empty, NaN, infinite or overflow markers) are kept as gaps, first on line ${firstInvalidLine}`,
    });
  }
  return {
    name: layout.name,
    unit: layout.siUnit,
    displayUnit: layout.unit,
    samples,
    invalidCount,
    ...(firstInvalidLine !== undefined ? { firstInvalidLine } : {}),
    ...channelFullScale(a.meta, a.roles, col, samples, warnings),
  };
}

function countNotFinite(x: Float64Array): number {
  let n = 0;
  for (let i = 0; i < x.length; i++) if (!Number.isFinite(x[i])) n++;
  return n;
}

/** Converter codes with an origin: v = code·step + (origin − reference·step); the step was applied while reading. */
function applyOffsets(a: AssembleInput, channels: Float64Array[]): void {
  a.kept.forEach((col, k) => {
    const off = a.roles.offsets[col];
    if (off === 0) return;
    const x = channels[k];
    for (let i = 0; i < x.length; i++) x[i] += off;
  });
}

/** A record spliced from two: keep the longer continuous side of the break, and say so. */
function cutAtSplice(a: AssembleInput, timing: Timing, warnings: CaptureWarning[]): { channels: Float64Array[]; startTime: number } {
  const splice = findSplice(timing.channels);
  if (!splice) return { channels: timing.channels, startTime: timing.startTime };
  const n = timing.channels[0].length;
  const head = splice.at >= n - splice.at;
  const [from, to] = head ? [0, splice.at] : [splice.at, n];
  const { name, siUnit } = a.roles.columns[a.kept[splice.channel]];
  const size = `${splice.step.toPrecision(3)}${siUnit ? ` ${siUnit}` : ''}`;
  const what =
    splice.kind === 'step'
      ? `${name} jumps by ${size} between samples ${splice.at} and ${splice.at + 1}, far more than the signal moves anywhere else`
      : `${name} stops repeating itself from sample ${splice.at + 1} on (it differs by ${size} from one period earlier, where everywhere else it repeats)`;
  warnings.push({
    code: 'spliced',
    channel: name,
    ...(timing.resampled ? {} : { line: a.sink.firstLine + splice.at }),
    message: `${what}: the record looks spliced; samples ${from + 1}–${to} (the longer continuous part) were kept and ${n - (to - from)} dropped`,
  });
  return { channels: timing.channels.map((c) => c.subarray(from, to)), startTime: timing.startTime + from * timing.sampleInterval };
}

/** What the reader made of the file, for `inspect` and the record. */
function readingOf(a: AssembleInput, timing: Timing): CaptureReading {
  const { sniffed, roles, meta, options, sink } = a;
  const intervalSource =
    timing.timing === 'option' ? 'the --interval or --sample-rate setting'
    : timing.timing === 'metadata' ? `preamble key "${meta.interval?.key ?? ''}"`
    : roles.timeColumn !== null ? `time column "${roles.columns[roles.timeColumn].name}"`
    : 'time column';
  const settings: Record<string, unknown> = {};
  for (const k of ['delimiter', 'decimalMark', 'skipRows', 'headerRows', 'timeColumn', 'channelUnit', 'scale', 'segment', 'sampleRate', 'interval'] as const) {
    if (options[k] !== undefined) settings[k] = options[k];
  }
  return {
    profile: options.profile ?? null,
    settings,
    skippedLines: sniffed.skippedLines,
    preambleLines: sniffed.preambleLines,
    headerLines: sniffed.headerLines,
    unitsLine: sniffed.unitsLine,
    sharedLines: sniffed.sharedLines,
    ignoredColumns: roles.columns.map((_, c) => c).filter((c) => c !== roles.timeColumn && c !== roles.indexColumn && !roles.channelColumns.includes(c)),
    recognised: meta.recognised,
    xFoundBy: roles.xFoundBy,
    intervalSource,
    channels: a.kept.map((col) => ({ name: roles.columns[col].name, unitFrom: roles.unitSources[col], scale: roles.columns[col].scale, offset: roles.offsets[col] })),
    segments: sink.segments,
    segmentRead: options.segment ?? 1,
    weighed: sniffed.weighed,
  };
}

function fileWarnings(a: AssembleInput): CaptureWarning[] {
  const out: CaptureWarning[] = [];
  if (a.sink.segments > 1) {
    const k = a.options.segment ?? 1;
    out.push({
      code: 'segments',
      message: `the file holds ${a.sink.segments} acquisitions (the time starts again on line${a.sink.segmentLines.length > 1 ? 's' : ''} ${a.sink.segmentLines.slice(0, 5).join(', ')}${a.sink.segmentLines.length > 5 ? ', …' : ''}); acquisition ${k} was read; choose another with --segment N`,
    });
  }
  for (const col of a.kept) {
    if (a.roles.unitSources[col] === 'counts') {
      const name = a.roles.columns[col].name;
      const perDiv = a.meta.voltsPerDivision;
      out.push({
        code: 'raw-counts',
        channel: name,
        message: `${name} holds whole numbers with no unit and the file states no volts per converter step${perDiv !== undefined ? ` (only ${perDiv} V per division, which does not say how many steps a division holds)` : ''}: its values are converter counts, not volts; give --scale with volts per count (and --channel-unit V) to convert`,
      });
    }
  }
  const p = a.sink.pending;
  if (p) {
    const more = p.count > 1 ? ` and ${p.count - 1} line(s) after it` : '';
    out.push({ code: 'footer', line: p.line, message: `line ${p.line} ("${p.text}")${more} after the data ${p.count > 1 ? 'were' : 'was'} not read as samples` });
  }
  const n = a.sink.length;
  if (a.meta.recordLength !== undefined && a.meta.recordLength !== n) {
    out.push({ code: 'record-length-mismatch', message: `the preamble states ${a.meta.recordLength} samples but ${n} data rows were read; the file may be cut short` });
  }
  return out;
}

/** Preamble lines as a record, keys as written; a repeated key gets ` (2)`, ` (3)`… */
function metadataRecord(entries: readonly (readonly [string, string])[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of entries) {
    let key = k;
    for (let i = 2; key in out; i++) key = `${k} (${i})`;
    out[key] = v;
  }
  return out;
}
