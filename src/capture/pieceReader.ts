/**
 * One piece of a plain numeric capture, read where it lies in the file (in a worker thread, or in
 * this thread in tests): the piece is the lines that start within its byte range, parsed with the
 * same ByteScanner as the whole-file path, the channels written straight into the shared columns
 * from the piece's slot on, the x values and their print exponents kept for the main thread, which
 * runs the time-base rules over them in file order (RowSink.commitRows). A piece holding anything
 * but plain rows (a blank or comment line, text, an empty or non-finite field, a ragged row) is
 * given back unread: the main thread reads the file on from there in one thread, as before.
 */
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { ByteScanner } from './byteScanner.js';
import type { RowTarget, ScannerLayout } from './byteScanner.js';
import { MAX_LINE_BYTES } from './lines.js';
import { OVERFLOW_MARKER, SKIP, X_COLUMN } from './rowSink.js';
import { EMPTY, NUMBER } from './scanNumber.js';

export interface FileIdentity {
  readonly dev: number;
  readonly ino: number;
  readonly size: number;
  readonly mtimeMs: number;
}

export interface PieceSetup {
  readonly path: string;
  readonly identity: FileIdentity;
  readonly layout: Omit<ScannerLayout, 'firstLine' | 'file'>;
  readonly trailingDelimiter: boolean;
  /** Per file column: index of the kept channel, X_COLUMN, or SKIP (as RowSink's targets). */
  readonly targets: Int32Array;
  readonly scales: Float64Array;
  /** The sink's columns, over SharedArrayBuffers. */
  readonly columns: readonly Float64Array[];
  /** Byte offset of the first data line. */
  readonly dataStart: number;
}

export interface PieceTask {
  readonly index: number;
  readonly nominalStart: number;
  readonly nominalEnd: number;
  readonly slotStart: number;
  readonly slotRows: number;
}

export interface PieceResult {
  readonly index: number;
  /** False when the piece holds anything but plain rows (or could not be read): nothing of it counts. */
  readonly plain: boolean;
  /** Bytes [start, end) of the file: the lines of this piece. */
  readonly start: number;
  readonly end: number;
  readonly rows: number;
  readonly times: Float64Array;
  readonly exps: Int32Array;
}

const READ_BYTES = 1 << 20;

/** Thrown inside the scanner to stop at the first row that is not plain. */
const NOT_PLAIN = Symbol('not plain');

export function identityOf(fd: number): FileIdentity {
  const s = fstatSync(fd);
  return { dev: s.dev, ino: s.ino, size: s.size, mtimeMs: s.mtimeMs };
}

export class PieceReader {
  private readonly fd: number;
  private readonly buf: Buffer;
  private readonly sameFile: boolean;

  constructor(private readonly setup: PieceSetup) {
    this.fd = openSync(setup.path, 'r');
    const id = identityOf(this.fd);
    const want = setup.identity;
    // The file must be the one the main thread sniffed and hashes; if it changed, read nothing here.
    this.sameFile = id.dev === want.dev && id.ino === want.ino && id.size === want.size && id.mtimeMs === want.mtimeMs;
    // Read a megabyte at a time: fresh memory is slow to touch (MEASURED.md), and each thread has one.
    this.buf = Buffer.allocUnsafe(READ_BYTES);
  }

  close(): void {
    closeSync(this.fd);
  }

  read(task: PieceTask, times?: Float64Array, exps?: Int32Array): PieceResult {
    const t = times && times.length >= task.slotRows ? times : new Float64Array(task.slotRows);
    const e = exps && exps.length >= task.slotRows ? exps : new Int32Array(task.slotRows);
    const size = this.setup.identity.size;
    const start = this.lineStart(task.nominalStart);
    const end = task.nominalEnd >= size ? size : this.lineStart(task.nominalEnd);
    const none = { index: task.index, start: Math.max(start, 0), end: Math.max(end, 0), times: t, exps: e };
    if (!this.sameFile || start < 0 || end < 0) return { ...none, plain: false, rows: 0 };
    const sink = new PieceSink(this.setup, task, t, e);
    const scanner = new ByteScanner({ ...this.setup.layout, firstLine: 0, file: this.setup.path }, sink);
    try {
      for (let at = start; at < end; ) {
        const n = readSync(this.fd, this.buf, 0, Math.min(READ_BYTES, end - at), at);
        if (n <= 0) return { ...none, plain: false, rows: 0 };
        scanner.feed(this.buf.subarray(0, n));
        at += n;
      }
      scanner.end();
    } catch {
      // NOT_PLAIN, or any error the scanner raises (a line too long…): the main thread meets it again in order.
      return { ...none, plain: false, rows: 0 };
    }
    // Blank or comment lines shift the line numbers: such a piece is read in order instead.
    return { ...none, plain: scanner.nextLine === sink.rows, rows: sink.rows };
  }

  /** The first line that starts at or after `pos` (a line starts after a terminator, or at the data). */
  private lineStart(pos: number): number {
    const { dataStart, identity, layout } = this.setup;
    if (pos <= dataStart) return dataStart;
    const window = Math.min(this.buf.length, 1 << 16);
    for (let at = pos - 1; at < identity.size; at += window) {
      // A line longer than the limit: the in-order reader reports it.
      if (at - pos > MAX_LINE_BYTES) return -1;
      const n = readSync(this.fd, this.buf, 0, Math.min(window, identity.size - at), at);
      if (n <= 0) return -1;
      const i = this.buf.subarray(0, n).indexOf(layout.terminator);
      if (i >= 0) return at + i + 1;
    }
    return identity.size;
  }
}

/** Takes plain rows only, writing channels into the shared columns and x values aside. */
class PieceSink implements RowTarget {
  rows = 0;
  readonly pending = null;
  // The setup's fields held here, so that the row loop reads no nested property.
  private readonly x: number;
  private readonly kept: Int32Array;
  private readonly keptScale: Float64Array;
  private readonly columns: readonly Float64Array[];
  private readonly targets: Int32Array;
  private readonly columnCount: number;
  private readonly trailing: boolean;
  private readonly slotStart: number;
  private readonly slotRows: number;

  constructor(
    setup: PieceSetup,
    task: PieceTask,
    private readonly times: Float64Array,
    private readonly exps: Int32Array,
  ) {
    const t = setup.targets;
    const kept = [...t.keys()].filter((c) => t[c] >= 0).sort((a, b) => t[a] - t[b]);
    this.kept = Int32Array.from(kept);
    this.keptScale = Float64Array.from(kept, (c) => setup.scales[c]);
    this.x = t.indexOf(X_COLUMN);
    this.columns = setup.columns;
    this.targets = t;
    this.columnCount = setup.layout.columnCount;
    this.trailing = setup.trailingDelimiter;
    this.slotStart = task.slotStart;
    this.slotRows = task.slotRows;
  }

  push(vals: Float64Array, kinds: Uint8Array, exps: Int32Array, fieldCount: number): boolean {
    const C = this.columnCount;
    const targets = this.targets;
    let n = fieldCount;
    if (this.trailing && n === C + 1 && kinds[C] === EMPTY) n = C;
    if (n !== C || this.rows === this.slotRows) throw NOT_PLAIN;
    for (let c = 0; c < C; c++) {
      if (kinds[c] !== NUMBER) throw NOT_PLAIN;
      const v = vals[c];
      if (targets[c] !== SKIP && !(v < OVERFLOW_MARKER && v > -OVERFLOW_MARKER)) throw NOT_PLAIN;
    }
    const r = this.rows;
    const x = this.x;
    if (x >= 0) {
      this.times[r] = vals[x];
      this.exps[r] = exps[x];
    }
    const { kept, keptScale, columns } = this;
    const at = this.slotStart + r;
    for (let k = 0; k < kept.length; k++) columns[k][at] = vals[kept[k]] * keptScale[k];
    this.rows = r + 1;
    return true;
  }
}
