/** The Capture built from the rows read: time base, channels with their checks, warnings, provenance. */
import type { Capture, CaptureChannel, CaptureWarning, ReadCaptureOptions } from '../types/index.js';
import { detectClipping } from './clipping.js';
import { captureError } from './errors.js';
import type { SampleLines } from './lines.js';
import type { MetadataTiming } from './metadata.js';
import type { ColumnRoles } from './roles.js';
import type { RowSink } from './rowSink.js';
import type { Sniffed } from './sniff.js';
import type { CaptureSource } from './source.js';
import type { TimeAxis } from './timeAxis.js';
import { resolveTiming } from './timing.js';

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
  const channels = a.kept.map((col, k) => channelOf(a, col, k, timing.channels[k], warnings));
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
    },
    metadata: metadataRecord(sniffed.preamble),
    startTime: timing.startTime,
    sampleInterval: timing.sampleInterval,
    length: channels[0].samples.length,
    channels,
    warnings,
  };
}

/** One kept channel with its invalid-sample count and clipping check; their warnings go to `warnings`. */
function channelOf(a: AssembleInput, col: number, k: number, samples: Float64Array, warnings: CaptureWarning[]): CaptureChannel {
  const layout = a.roles.columns[col];
  const invalidCount = a.sink.invalid[k];
  const firstInvalidLine = a.sink.firstInvalid[k];
  if (invalidCount > 0) {
    warnings.push({
      code: 'invalid-samples',
      channel: layout.name,
      line: firstInvalidLine,
      message: `${invalidCount} invalid sample(s) in ${layout.name} (empty, NaN, infinite or overflow markers) are kept as gaps, first on line ${firstInvalidLine}`,
    });
  }
  const clipped = detectClipping(samples);
  if (clipped) {
    const where = [clipped.high ? `${clipped.high} at the top` : '', clipped.low ? `${clipped.low} at the bottom` : ''].filter(Boolean).join(' and ');
    warnings.push({ code: 'clipped', channel: layout.name, message: `${layout.name} is clipped: ${where} of the record sit pinned at its extreme; levels there are not measured` });
  }
  return {
    name: layout.name,
    unit: layout.siUnit,
    displayUnit: layout.unit,
    samples,
    invalidCount,
    ...(firstInvalidLine !== undefined ? { firstInvalidLine } : {}),
    ...(clipped ? { clipped } : {}),
  };
}

function fileWarnings(a: AssembleInput): CaptureWarning[] {
  const out: CaptureWarning[] = [];
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
