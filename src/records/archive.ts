/**
 * Content-addressed capture archive inside the data folder: `captures/<first two hex>/<sha256>.csv`
 * (`.csv.gz` for gzip bytes). A copy is written under a temporary name (read-only), flushed and
 * renamed into place, so a file under its final name is always complete. The same bytes are stored
 * once. The user's own file is only read.
 */
import { closeSync, existsSync, fsyncSync, mkdirSync, openSync, readdirSync, readSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { createHash, randomBytes } from 'node:crypto';
import { BenchError } from '../types/index.js';
import type { NewCapture } from '../types/index.js';

export const ARCHIVE_FOLDER = 'captures';
const TEMP_FOLDER = 'tmp';

/** The archive path (relative to the data folder) of bytes with this SHA-256; gzip bytes keep `.csv.gz`. */
export function archiveName(sha256: string, bytes: Uint8Array): string {
  const gz = bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;
  return `${ARCHIVE_FOLDER}/${sha256.slice(0, 2)}/${sha256}${gz ? '.csv.gz' : '.csv'}`;
}

/** Archive one capture; returns its path relative to the data folder (`/` separators). */
export function archiveCapture(dataDir: string, capture: NewCapture): string {
  const first = eachPiece(capture, () => {});
  if (first.sha !== capture.sha256) throw changedError(capture, first.sha);
  const rel = `${ARCHIVE_FOLDER}/${first.sha.slice(0, 2)}/${first.sha}${first.gz ? '.csv.gz' : '.csv'}`;
  const target = join(dataDir, rel);
  if (existsSync(target) && statSync(target).size === first.size) return rel;
  mkdirSync(join(dataDir, ARCHIVE_FOLDER, first.sha.slice(0, 2)), { recursive: true });
  const tempDir = join(dataDir, TEMP_FOLDER);
  mkdirSync(tempDir, { recursive: true });
  const temp = join(tempDir, `${process.pid}-${Date.now()}-${randomBytes(6).toString('hex')}.part`);
  try {
    // Read-only from the start (0o444): nothing, not even this process, rewrites an archived capture.
    const out = openSync(temp, 'wx', 0o444);
    let copied: Hashed;
    try {
      copied = eachPiece(capture, (chunk) => {
        for (let done = 0; done < chunk.length; ) done += writeSync(out, chunk, done, chunk.length - done);
      });
      fsyncSync(out);
    } finally {
      closeSync(out);
    }
    if (copied.sha !== capture.sha256) throw changedError(capture, copied.sha);
    renameSync(temp, target);
    return rel;
  } finally {
    // Whatever went wrong (a full disk, a capture changed between the passes), no partial copy stays.
    rmSync(temp, { force: true });
  }
}

interface Hashed {
  readonly sha: string;
  readonly size: number;
  readonly gz: boolean;
}

/**
 * The capture's bytes in 1 MiB pieces (a capture of any size is archived without being held in
 * memory whole), hashed on the way; `use` sees each piece before the next is read.
 */
function eachPiece(capture: NewCapture, use: (chunk: Uint8Array) => void): Hashed {
  const hash = createHash('sha256');
  let size = 0;
  let gz: boolean | null = null;
  const put = (chunk: Uint8Array): void => {
    gz ??= chunk.length >= 2 && chunk[0] === 0x1f && chunk[1] === 0x8b;
    hash.update(chunk);
    use(chunk);
    size += chunk.length;
  };
  if (capture.bytes) put(capture.bytes);
  else readInPieces(capture, put);
  return { sha: hash.digest('hex'), size, gz: gz ?? false };
}

const PIECE = 1 << 20;

function readInPieces(capture: NewCapture, put: (chunk: Uint8Array) => void): void {
  if (capture.sourcePath === undefined) {
    throw new TypeError(`archiveCapture: capture ${capture.path} has neither bytes nor sourcePath`);
  }
  let fd: number;
  try {
    fd = openSync(capture.sourcePath, 'r');
  } catch (err) {
    throw missingCapture(capture, err);
  }
  try {
    const buf = Buffer.allocUnsafe(PIECE);
    for (;;) {
      let n: number;
      try {
        n = readSync(fd, buf, 0, PIECE, null);
      } catch (err) {
        throw missingCapture(capture, err);
      }
      if (n === 0) break;
      put(buf.subarray(0, n));
    }
  } finally {
    closeSync(fd);
  }
}

function missingCapture(capture: NewCapture, err: unknown): BenchError {
  return new BenchError({
    code: 'records.capture-missing',
    file: capture.path,
    problem: `the capture could not be read again for the archive (${(err as { code?: string }).code ?? 'read error'}); nothing was stored`,
    expected: 'the capture file still in place until the check has been stored',
    fix: 'put the file back where it was and run the check again',
  });
}

function changedError(capture: NewCapture, sha: string): BenchError {
  return new BenchError({
    code: 'records.capture-changed',
    file: capture.path,
    problem: `the capture's bytes now hash to ${sha.slice(0, 12)}…, not ${capture.sha256.slice(0, 12)}… as when it was measured; nothing was stored`,
    expected: 'a capture file that stays unchanged while benchproof checks it',
    fix: 'wait until the scope or copy tool has finished writing the file, then run the check again',
  });
}

/** Remove temporary files left by processes that no longer run (a killed check). */
export function removeStaleTemps(dataDir: string): void {
  const tempDir = join(dataDir, TEMP_FOLDER);
  if (!existsSync(tempDir)) return;
  for (const name of readdirSync(tempDir)) {
    const pid = Number(name.split('-')[0]);
    if (Number.isInteger(pid) && pid > 0 && !processAlive(pid)) rmSync(join(tempDir, name), { force: true });
  }
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as { code?: string }).code === 'EPERM';
  }
}
