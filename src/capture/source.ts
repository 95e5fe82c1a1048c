/**
 * The bytes of a capture file as a stream of text chunks: read once, in 1 MiB pieces, hashed
 * (SHA-256 of the file as stored) in the same pass, gunzipped transparently when the file starts
 * with the gzip magic bytes (RFC 1952 §2.3.1: 0x1f 0x8b). The file is only ever opened for reading.
 */
import { createHash } from 'node:crypto';
import { readSync } from 'node:fs';
import { open, stat } from 'node:fs/promises';
import type { FileHandle } from 'node:fs/promises';
import type { Readable } from 'node:stream';
import { isBenchError } from '../types/index.js';
import { captureError } from './errors.js';
import { unpackLimitBytes, unpackLimitError } from './readerLimits.js';

export const CHUNK_BYTES = 1 << 20;

export interface CaptureSource {
  readonly size: number;
  readonly compressed: boolean;
  /** Decompressed chunks; ends after the whole file has been read and hashed. */
  readonly chunks: AsyncIterable<Buffer>;
  /** Hex SHA-256 of the stored bytes, available once `chunks` has been read to the end. */
  digest(): string;
}

export interface SourceOptions {
  readonly onProgress?: (bytesRead: number, totalBytes: number) => void;
  /** Most unpacked megabytes (10^6 bytes) a .gz may give; by default UNPACK_RATIO × stored, with a floor. */
  readonly unpackLimitMB?: number;
}

export async function openSource(path: string, options: SourceOptions = {}): Promise<CaptureSource> {
  const { onProgress, unpackLimitMB } = options;
  const size = await fileSize(path);
  const handle = await open(path, 'r').catch((e: NodeJS.ErrnoException) => {
    throw unreadable(path, e);
  });
  const magic = Buffer.alloc(2);
  const { bytesRead } = await handle.read(magic, 0, 2, 0).catch(async (e: NodeJS.ErrnoException) => {
    await handle.close();
    throw unreadable(path, e);
  });
  const compressed = bytesRead === 2 && magic[0] === 0x1f && magic[1] === 0x8b;
  const hash = createHash('sha256');
  let read = 0;
  let hex: string | null = null;
  const tap = (chunk: Buffer): void => {
    hash.update(chunk);
    read += chunk.length;
    onProgress?.(read, size);
  };
  const finish = (): void => {
    hex = hash.digest('hex');
  };
  return {
    size,
    compressed,
    chunks: compressed ? gunzipped(handle, path, tap, finish, { stored: size, limit: unpackLimitBytes(size, unpackLimitMB), fromOption: unpackLimitMB !== undefined }) : plain(handle, path, tap, finish),
    digest: () => {
      if (hex === null) throw new Error('capture digest asked for before the file was read to the end');
      return hex;
    },
  };
}

/**
 * Reads into one reused buffer: fresh memory is slow to touch (MEASURED.md), so a 1 GB file does
 * not allocate 1 GB of chunks. Each chunk is valid only until the consumer asks for the next one.
 */
async function* plain(handle: FileHandle, path: string, tap: (c: Buffer) => void, finish: () => void): AsyncGenerator<Buffer> {
  const buf = Buffer.allocUnsafe(CHUNK_BYTES);
  try {
    for (;;) {
      // A synchronous read: from the page cache it is a copy, while an awaited read waits for a
      // thread-pool turn, which on a busy machine costs more than the copy (once per MiB).
      let bytesRead: number;
      try {
        bytesRead = readSync(handle.fd, buf, 0, CHUNK_BYTES, null);
      } catch (e) {
        throw unreadable(path, e as NodeJS.ErrnoException);
      }
      if (bytesRead === 0) break;
      const chunk = buf.subarray(0, bytesRead);
      tap(chunk);
      yield chunk;
    }
    finish();
  } finally {
    await handle.close();
  }
}

interface UnpackBound {
  readonly stored: number;
  readonly limit: number;
  readonly fromOption: boolean;
}

/**
 * zlib works on its input asynchronously, so the compressed bytes come from a stream of fresh buffers.
 * Reading stops once the unpacked text passes its bound (a gzip bomb unpacks about 1000× its size).
 */
async function* gunzipped(handle: FileHandle, path: string, tap: (c: Buffer) => void, finish: () => void, bound: UnpackBound): AsyncGenerator<Buffer> {
  // Loaded here, for compressed captures only: plain files, the common case, start faster without.
  const [{ Transform, pipeline }, { createGunzip }] = await Promise.all([import('node:stream'), import('node:zlib')]);
  const raw = handle.createReadStream({ start: 0, highWaterMark: CHUNK_BYTES, autoClose: true });
  const hashing = new Transform({
    transform(chunk: Buffer, _enc, done) {
      tap(chunk);
      done(null, chunk);
    },
    flush(done) {
      finish();
      done();
    },
  });
  const gunzip = createGunzip({ chunkSize: CHUNK_BYTES });
  // Errors reach the last stage, where the loop below sees them; the callback only silences the rest.
  const text: Readable = pipeline(raw, hashing, gunzip, () => {});
  try {
    let unpacked = 0;
    for await (const chunk of text) {
      unpacked += (chunk as Buffer).length;
      if (unpacked > bound.limit) throw unpackLimitError(path, bound.limit, bound.stored, bound.fromOption);
      yield chunk as Buffer;
    }
  } catch (e) {
    if (isBenchError(e)) throw e;
    const err = e as NodeJS.ErrnoException;
    if (err.code?.startsWith('Z_') || err.code === 'ERR_STREAM_PREMATURE_CLOSE') {
      throw captureError('corrupt-gzip', path, {
        problem: `the gzip stream is damaged or cut short (${err.message})`,
        expected: 'a complete .gz file, as written by gzip',
        fix: 'check the file with `gzip -t`, or copy the capture again from the instrument',
      });
    }
    throw unreadable(path, err);
  } finally {
    for (const s of [raw, hashing, gunzip]) s.destroy();
  }
}

async function fileSize(path: string): Promise<number> {
  const s = await stat(path).catch((e: NodeJS.ErrnoException) => {
    throw unreadable(path, e);
  });
  if (!s.isFile()) {
    // Refused from its type alone: a device or a pipe is never opened (a pipe would wait for a writer).
    const what = s.isDirectory() ? 'a folder' : s.isFIFO() ? 'a named pipe' : s.isSocket() ? 'a socket' : 'a device';
    throw captureError('unreadable', path, {
      problem: `this is ${what}, not a capture file`,
      expected: 'the path of one CSV file (.csv or .csv.gz)',
      fix: s.isDirectory() ? 'name a file inside the folder, e.g. with a wildcard: folder/*.csv' : 'save the capture as a file first, then name that file',
    });
  }
  return s.size;
}

function unreadable(path: string, e: NodeJS.ErrnoException) {
  const why =
    e.code === 'ENOENT' ? 'there is no file at this path'
    : e.code === 'EACCES' || e.code === 'EPERM' ? 'you have no permission to read it'
    : `it could not be read (${e.code ?? e.message})`;
  return captureError('unreadable', path, {
    problem: `cannot open the capture: ${why}`,
    expected: 'a readable CSV file (.csv or .csv.gz)',
    fix: e.code === 'ENOENT' ? 'check the spelling and the working folder (ls the path)' : 'check the permissions with ls -l',
  });
}
