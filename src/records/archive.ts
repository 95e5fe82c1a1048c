/**
 * Content-addressed capture archive inside the data folder: `captures/<first two hex>/<sha256>.csv`
 * (`.csv.gz` for gzip bytes). A copy is written under a temporary name, flushed, made read-only and
 * renamed into place, so a file under its final name is always complete. The same bytes are stored
 * once. The user's own file is only read.
 */
import { closeSync, existsSync, fsyncSync, mkdirSync, openSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { BenchError } from '../types/index.js';
import type { NewCapture } from '../types/index.js';
import { sha256Hex } from './digest.js';

export const ARCHIVE_FOLDER = 'captures';
const TEMP_FOLDER = 'tmp';

/** Archive one capture; returns its path relative to the data folder (`/` separators). */
export function archiveCapture(dataDir: string, capture: NewCapture): string {
  const bytes = captureBytes(capture);
  const sha = sha256Hex(bytes);
  if (sha !== capture.sha256) {
    throw new BenchError({
      code: 'records.capture-changed',
      file: capture.path,
      problem: `the capture's bytes now hash to ${sha.slice(0, 12)}…, not ${capture.sha256.slice(0, 12)}… as when it was measured; nothing was stored`,
      expected: 'a capture file that stays unchanged while benchproof checks it',
      fix: 'wait until the scope or copy tool has finished writing the file, then run the check again',
    });
  }
  const gz = bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;
  const rel = `${ARCHIVE_FOLDER}/${sha.slice(0, 2)}/${sha}${gz ? '.csv.gz' : '.csv'}`;
  const target = join(dataDir, rel);
  if (existsSync(target) && statSync(target).size === bytes.length) return rel;
  mkdirSync(join(dataDir, ARCHIVE_FOLDER, sha.slice(0, 2)), { recursive: true });
  writeAtomically(dataDir, target, bytes);
  return rel;
}

function captureBytes(capture: NewCapture): Uint8Array {
  if (capture.bytes) return capture.bytes;
  if (capture.sourcePath === undefined) {
    throw new TypeError(`archiveCapture: capture ${capture.path} has neither bytes nor sourcePath`);
  }
  try {
    return readFileSync(capture.sourcePath);
  } catch (err) {
    throw new BenchError({
      code: 'records.capture-missing',
      file: capture.path,
      problem: `the capture could not be read again for the archive (${(err as { code?: string }).code ?? 'read error'}); nothing was stored`,
      expected: 'the capture file still in place until the check has been stored',
      fix: 'put the file back where it was and run the check again',
    });
  }
}

function writeAtomically(dataDir: string, target: string, bytes: Uint8Array): void {
  const tempDir = join(dataDir, TEMP_FOLDER);
  mkdirSync(tempDir, { recursive: true });
  const temp = join(tempDir, `${process.pid}-${Date.now()}-${randomBytes(6).toString('hex')}.part`);
  // Read-only from the start (0o444): nothing, not even this process, rewrites an archived capture.
  const fd = openSync(temp, 'wx', 0o444);
  try {
    let done = 0;
    while (done < bytes.length) done += writeSync(fd, bytes, done, bytes.length - done);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  renameSync(temp, target);
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
