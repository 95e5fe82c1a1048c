/**
 * CSV capture → Capture, in one streaming pass over the file: sniff the layout from the first
 * 64 KiB, then read every row with the byte scanner (or papaparse for quoted layouts), hashing the
 * stored bytes on the way. Only the channels asked for are kept; a uniform time column is not.
 */
import type { Capture, CaptureWarning, ReadCaptureOptions } from '../types/index.js';
import { assembleCapture } from './assemble.js';
import { ByteScanner } from './byteScanner.js';
import { ClockRewriter, rewriteChunks } from './clockTimes.js';
import { captureError } from './errors.js';
import { MAX_LINE_BYTES, sampleLines, SNIFF_BYTES } from './lines.js';
import type { SampleLines } from './lines.js';
import { readMetadata } from './metadata.js';
import type { ColumnRoles } from './roles.js';
import { columnRoles } from './roles.js';
import { RowSink, sampleLimit, SKIP, X_COLUMN } from './rowSink.js';
import { sniffLayout } from './sniff.js';
import type { Sniffed } from './sniff.js';
import { openSource } from './source.js';
import { PIECE_BYTES, planPieces, readPlainInPieces, slotRowsOf, startWorkerPool, workersFor } from './parallelRead.js';
import type { PieceHelpers } from './parallelRead.js';
import { TimeAxis } from './timeAxis.js';
import { givenInterval, noTimeBase } from './timing.js';

export async function readCapture(path: string, options: ReadCaptureOptions = {}, pieceOptions?: PieceOptions): Promise<Capture> {
  return (await readCaptureLines(path, options, pieceOptions)).capture;
}

/**
 * How a large plain file is read in pieces: by default worker threads started for the file, for
 * files from PARALLEL_MIN_BYTES on; the caller's helpers instead (a command that keeps worker
 * threads for other work too, or tests), or null to read in one thread (tests and the benchmark
 * compare the two).
 */
export interface PieceOptions {
  readonly helpers: (() => PieceHelpers) | null;
  readonly pieceBytes: number;
  /** Smaller files are read in one thread (default 0: any file of two pieces or more). */
  readonly minBytes?: number;
}

/** The capture and the opening lines it was sniffed from (for `inspect`). */
export async function readCaptureLines(
  path: string,
  options: ReadCaptureOptions = {},
  pieceOptions?: PieceOptions,
): Promise<{ capture: Capture; lines: SampleLines; sniffed: Sniffed }> {
  checkOptions(options);
  const source = await openSource(path, { onProgress: options.onProgress, unpackLimitMB: options.unpackLimitMB });
  const chunks = source.chunks[Symbol.asyncIterator]();
  // The workers start loading now, while this thread sniffs the layout.
  const workers = pieceOptions || source.compressed || options.segment !== undefined ? 0 : workersFor(source.size);
  const given = pieceOptions && !source.compressed && options.segment === undefined && source.size >= (pieceOptions.minBytes ?? 0);
  let helpers: PieceHelpers | null = pieceOptions ? (given ? (pieceOptions.helpers?.() ?? null) : null) : workers > 0 ? startWorkerPool(workers) : null;
  try {
    const gathered = await gatherSample(chunks);
    const { done } = gathered;
    let sample = gathered.sample;
    let rest: AsyncIterable<Buffer> = { [Symbol.asyncIterator]: () => chunks };
    // Clock-time stamps (a logger's `10:00:01.250`) are read as seconds since the first one.
    const clock = sample.includes(':') ? ClockRewriter.forSample(sample.toString('latin1', 0, Math.min(sample.length, 1 << 16))) : null;
    if (clock) {
      const { StringDecoder } = await import('node:string_decoder');
      const decoder = new StringDecoder('utf8');
      sample = Buffer.from(clock.rewrite(decoder.write(sample), false) + (done ? clock.rewrite(decoder.end(), true) : ''), 'utf8');
      const remaining = rest;
      rest = done ? remaining : rewriteChunks(remaining, clock, decoder);
    }
    const lines = sampleLines(sample, done, path);
    const sniffed = sniffLayout(lines, path, options);
    const meta = readMetadata(sniffed.preamble, sniffed.decimalMark);
    const roles = columnRoles(sniffed, meta, options, path);
    const kept = selectChannels(roles, options.channel, path);
    const x = roles.timeColumn ?? roles.indexColumn;
    if (x === null && givenInterval(options, meta) === null) throw noTimeBase(path, sniffed.firstDataLine);
    if (!source.compressed) refuseBeyondMemory(lines, sniffed, source.size, kept.length, path);
    const axis = x === null ? null : new TimeAxis(path, x === roles.timeColumn ? 'time' : 'sample-index', x === roles.timeColumn);
    const shortest = shortestRowBytes(lines, sniffed);
    const pieces = helpers && !clock && sniffed.quotes !== 'complex' && Number.isFinite(shortest) ? planPieces(sniffed.dataOffset, source.size, pieceOptions?.pieceBytes ?? PIECE_BYTES, shortest) : null;
    const inPieces = pieces !== null && slotRowsOf(pieces) * Math.max(1, kept.length) <= sampleLimit();
    if (!inPieces && helpers) {
      await helpers.close();
      helpers = null;
    }
    const targets = Int32Array.from(roles.columns, (_, c) => (c === x ? X_COLUMN : kept.includes(c) ? kept.indexOf(c) : SKIP));
    const scales = Float64Array.from(roles.columns, (c) => c.scale);
    const sink = new RowSink({
      file: path,
      columnCount: sniffed.columnCount,
      trailingDelimiter: sniffed.trailingDelimiter,
      targets,
      scales,
      axis,
      capacity: inPieces ? slotRowsOf(pieces) : source.compressed ? 1 << 16 : estimateRows(shortest, sniffed, source.size),
      shared: inPieces,
      leadColumn: x ?? kept[0] ?? 0,
      ...(options.segment !== undefined ? { segment: options.segment } : {}),
    });
    const data = sample.subarray(sniffed.dataOffset);
    const layout = { ...sniffed, terminator: lines.terminator, firstLine: sniffed.firstDataLine, file: path };
    if (inPieces && helpers) {
      const h = helpers;
      helpers = null;
      await readPlainInPieces({ helpers: h, tasks: pieces!, sink, layout, targets, scales, trailingDelimiter: sniffed.trailingDelimiter, dataStart: sniffed.dataOffset, size: source.size, rest });
    } else if (sniffed.quotes === 'complex') {
      // papaparse loads only for the quoted layouts that need it, not at every start.
      const { readWithPapa } = await import('./papaRows.js');
      await readWithPapa(data, rest, { ...sniffed, lineEnding: lines.lineEnding, firstLine: sniffed.firstDataLine }, sink, path);
    } else {
      const scanner = new ByteScanner(layout, sink);
      scanner.feed(data);
      for await (const chunk of rest) scanner.feed(chunk);
      scanner.end();
    }
    const assembled = assembleCapture({ path, options, source, lines, sniffed, meta, roles, kept, sink, axis });
    const capture = clock ? { ...assembled, warnings: [clockWarning(sniffed.firstDataLine), ...assembled.warnings] } : assembled;
    return { capture, lines, sniffed };
  } finally {
    await helpers?.close();
    await chunks.return?.();
  }
}

function clockWarning(line: number): CaptureWarning {
  return { code: 'clock-times', line, message: 'the rows are stamped with clock times (hh:mm:ss, with or without a date); they were read as seconds since the first stamp' };
}

function checkOptions(o: ReadCaptureOptions): void {
  for (const [name, v] of [['interval', o.interval], ['sampleRate', o.sampleRate]] as const) {
    if (v !== undefined && !(v > 0 && Number.isFinite(v))) throw new RangeError(`readCapture: ${name} must be a positive number, got ${v}`);
  }
  if (o.interval !== undefined && o.sampleRate !== undefined && Math.abs(o.interval * o.sampleRate - 1) > 1e-9) {
    throw captureError('conflicting-options', '-', {
      problem: `--interval ${o.interval} and --sample-rate ${o.sampleRate} disagree`,
      expected: 'one of the two flags, or values with interval × rate = 1',
      fix: 'drop one of the two flags',
    });
  }
}

/**
 * The opening chunks: complete lines past the first 64 KiB, the whole file, or (to report it) a
 * line that has already run past the 1 MiB limit.
 */
async function gatherSample(chunks: AsyncIterator<Buffer>): Promise<{ sample: Buffer; done: boolean }> {
  const parts: Buffer[] = [];
  let total = 0;
  let lastBreak = -1;
  // One part (the usual case: the first chunk holds the sample) is not copied a second time.
  const joined = (): Buffer => (parts.length === 1 ? parts[0] : Buffer.concat(parts));
  for (;;) {
    const r = await chunks.next();
    if (r.done) return { sample: joined(), done: true };
    parts.push(Buffer.from(r.value)); // the source reuses its buffer for the next chunk
    const lf = Math.max(r.value.lastIndexOf(10), r.value.lastIndexOf(13));
    if (lf >= 0) lastBreak = total + lf;
    total += r.value.length;
    if (lastBreak >= SNIFF_BYTES || total - lastBreak - 1 > MAX_LINE_BYTES) return { sample: joined(), done: false };
  }
}

/**
 * Rows the file will hold, so that the columns are allocated once. It errs high: the shortest
 * sniffed row, less its minus signs (later rows may lose theirs: times and levels change sign), sets
 * the bytes per row. Capacity never written costs no memory (the pages are never touched), while
 * a short guess costs a second, larger set of columns and a copy. `shortest` is shortestRowBytes.
 */
function estimateRows(shortest: number, s: Sniffed, size: number): number {
  return Number.isFinite(shortest) ? Math.ceil((size - s.dataOffset) / shortest) + 16 : 1024;
}

/** The shortest sniffed row less its minus signs (at least 2 bytes), or Infinity with fewer than two rows. */
function shortestRowBytes(lines: SampleLines, s: Sniffed): number {
  const data = lines.lines.filter((l) => l.line >= s.firstDataLine);
  let shortest = Infinity;
  for (let i = 0; i + 1 < data.length; i++) {
    const bytes = data[i + 1].start - data[i].start - minusSigns(data[i].text);
    if (bytes < shortest) shortest = bytes;
  }
  return Math.max(2, shortest);
}

function minusSigns(text: string): number {
  let n = 0;
  for (let at = text.indexOf('-'); at >= 0; at = text.indexOf('-', at + 1)) n++;
  return n;
}

/**
 * Refuses, before any column is allocated, a file whose rows cannot fit: the rows are counted low,
 * as the data bytes over twice the longest sniffed row, so that a file whose later rows are longer
 * than its first ones is not refused wrongly; a file between that count and the limit still stops
 * with the same error once its rows pass the limit (RowSink), before more memory is taken.
 */
function refuseBeyondMemory(lines: SampleLines, s: Sniffed, size: number, channels: number, file: string): void {
  const data = lines.lines.filter((l) => l.line >= s.firstDataLine);
  let longest = 0;
  for (let i = 0; i + 1 < data.length; i++) longest = Math.max(longest, data[i + 1].start - data[i].start);
  if (longest === 0 || lines.wholeFile) return;
  const rows = Math.floor((size - s.dataOffset) / (2 * longest));
  const limit = sampleLimit();
  if (rows * Math.max(1, channels) <= limit) return;
  throw captureError('too-large', file, {
    line: s.firstDataLine,
    problem: `the file is ${(size / 1e9).toFixed(1)} GB: at most ${longest} bytes per row in its first rows, it holds at least ${rows} rows of ${channels} channel(s), over the ${limit} samples benchproof can keep in memory on this machine`,
    expected: 'a record of at most a few hundred million samples over the channels measured',
    fix: channels > 1 ? 'measure one channel at a time with --channel, or export a shorter record' : 'export a shorter record, or one at a lower sample rate',
  });
}

/** File columns of the channels to keep: all, or the one named by --channel (name or 1-based number). */
function selectChannels(roles: ColumnRoles, wanted: string | undefined, file: string): number[] {
  const all = roles.channelColumns;
  if (wanted === undefined) return [...all];
  const key = wanted.trim().toLowerCase();
  const byName = all.find((c) => roles.columns[c].name.toLowerCase() === key);
  if (byName !== undefined) return [byName];
  const n = Number(key);
  if (Number.isInteger(n) && n >= 1 && n <= all.length) return [all[n - 1]];
  const list = all.map((c, i) => `${i + 1} = ${roles.columns[c].name}`).join(', ');
  throw captureError('unknown-channel', file, {
    problem: `there is no channel "${wanted}" in this capture`,
    expected: `one of its channels: ${list}`,
    fix: `give --channel with a name or number from that list, e.g. --channel ${roles.columns[all[0]].name}`,
  });
}
