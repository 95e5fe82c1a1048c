/**
 * Turns what the file system and SQLite report about the data folder into BenchErrors a technician
 * can act on. Anything not recognised is returned unchanged and ends as an internal error (exit 3).
 */
import { accessSync, constants, statfsSync } from 'node:fs';
import { BenchError } from '../types/index.js';
import type { StoreAudit } from './auditStore.js';

const OVERRIDE = 'give another folder with --data DIR or BENCHPROOF_DATA';

function codeOf(err: unknown): string {
  if (typeof err === 'object' && err !== null && 'code' in err) return String((err as { code: unknown }).code);
  return '';
}

/** Map a low-level error met while using the data folder `dir` to a BenchError, or return it as it was. */
export function storeError(err: unknown, dir: string): unknown {
  if (err instanceof BenchError) return err;
  const code = codeOf(err);
  if (code === 'SQLITE_BUSY' || code.startsWith('SQLITE_BUSY_') || code === 'SQLITE_LOCKED') return lockedError(dir);
  if (code.startsWith('SQLITE_READONLY') || code === 'EACCES' || code === 'EPERM' || code === 'EROFS') {
    return readOnlyError(dir);
  }
  if (code === 'SQLITE_CORRUPT' || code === 'SQLITE_NOTADB') {
    return new BenchError({
      code: 'records.damaged',
      file: dir,
      problem: 'the record database in this data folder is damaged or is not a benchproof database',
      expected: 'a benchproof-data folder written by benchproof',
      fix: `do not delete it; copy the folder somewhere safe and restore records.db from your last backup, or ${OVERRIDE}`,
    });
  }
  if (code.startsWith('SQLITE_IOERR') && !diskIsFull(dir)) return ioError(dir, code);
  if (code === 'SQLITE_FULL' || code === 'ENOSPC' || code.startsWith('SQLITE_IOERR')) {
    return new BenchError({
      code: 'records.disk-full',
      file: dir,
      problem: 'the disk holding the data folder is full; nothing was stored',
      expected: 'free space for the run and its captures',
      fix: 'free some space on that disk and run the command again',
    });
  }
  if (code === 'SQLITE_CANTOPEN' || code === 'ENOENT' || code === 'ENOTDIR') return missingError(dir);
  return err;
}

/** A database file that cannot be a store (empty, not a regular file): never taken as a new one. */
export function damagedFileError(dir: string, what: string): BenchError {
  return new BenchError({
    code: 'records.damaged',
    file: dir,
    problem: `${what}; benchproof will not start a new store over it`,
    expected: 'the records.db benchproof wrote in this data folder',
    fix: `do not delete it; restore records.db from your last backup, or ${OVERRIDE}`,
  });
}

const SHOWN_PROBLEMS = 6;

/** The verification problems of a store in one line: each row named with what is wrong with it. */
export function describeProblems(audit: StoreAudit): string {
  const rows = audit.problems.map((p) => `${p.kind === 'chain' ? 'the hash chain' : `${p.kind === 'run' ? 'run' : 'calibration iteration'} #${p.id}${p.unit !== null ? ` of ${p.unit}` : ''}`}: ${p.detail}`);
  const more = rows.length > SHOWN_PROBLEMS ? `; and ${rows.length - SHOWN_PROBLEMS} more` : '';
  return `${audit.problems.length} verification problem(s) in the records: ${rows.slice(0, SHOWN_PROBLEMS).join('; ')}${more}`;
}

/** Reading refused: `records.damaged` when every problem is a row that no longer parses, else `records.tampered`. */
export function unverifiedError(dir: string, audit: StoreAudit): BenchError {
  const onlyDamaged = audit.problems.every((p) => p.problem === 'damaged');
  return new BenchError({
    code: onlyDamaged ? 'records.damaged' : 'records.tampered',
    file: dir,
    problem: describeProblems(audit),
    expected: 'records that still match their fingerprints, the hash chain and their archived captures',
    fix: 'keep a copy of the data folder as it is and restore records.db and captures/ from your last backup; to read the other runs anyway, with these marked, add --allow-unverified',
  });
}

export function lockedError(dir: string): BenchError {
  return new BenchError({
    code: 'records.locked',
    file: dir,
    problem: 'the record database stayed locked by another program; nothing was stored',
    expected: 'a data folder no other program holds open for writing',
    fix: 'close the other program that has records.db open (a database browser, a stuck benchproof) and run the command again',
  });
}

export function readOnlyError(dir: string): BenchError {
  return new BenchError({
    code: 'records.read-only',
    file: dir,
    problem: 'the data folder cannot be written (read-only or no permission); nothing was stored',
    expected: 'a data folder this user may write to',
    fix: `make the folder writable for this user, or ${OVERRIDE}`,
  });
}

export function missingError(dir: string): BenchError {
  return new BenchError({
    code: 'records.data-missing',
    file: dir,
    problem: 'the data folder does not exist, or a part of its path is not a folder',
    expected: 'an existing folder, or a new folder name inside an existing one',
    fix: `check the path for a typo, create its parent folder, or ${OVERRIDE}`,
  });
}

export function noRecordsError(dir: string): BenchError {
  return new BenchError({
    code: 'records.empty',
    file: dir,
    problem: 'there are no stored records here: the data folder or its records.db does not exist yet',
    expected: 'a data folder that `benchproof check` has stored runs in',
    fix: `run \`benchproof check\` on a unit's captures first, or ${OVERRIDE}`,
  });
}

/**
 * SQLite reports a full disk as an I/O error when its shared-memory file cannot grow
 * (SQLITE_IOERR_SHMSIZE on tmpfs, found by the hardening tests); under 64 KiB free counts as full.
 */
function diskIsFull(dir: string): boolean {
  try {
    const s = statfsSync(dir);
    return s.bavail * s.bsize < 64 * 1024;
  } catch {
    return false;
  }
}

function ioError(dir: string, code: string): BenchError {
  return new BenchError({
    code: 'records.io-error',
    file: dir,
    problem: `the disk holding the data folder reported an error while the records were written (${code}); nothing was stored`,
    expected: 'a data folder on a working, mounted disk',
    fix: `check that the disk is still connected and healthy, then run the command again, or ${OVERRIDE}`,
  });
}

/**
 * Opening the database failed: as storeError, except that SQLite's "cannot open" on a folder that
 * exists but cannot be written is a read-only disk (a WAL database needs its -shm file beside it
 * even to be read: sqlite.org/wal.html, "Read-Only Databases"), not a missing folder.
 */
export function openError(err: unknown, dir: string, label: string, mode: 'read' | 'write'): unknown {
  if ((err as { code?: unknown } | null)?.code !== 'SQLITE_CANTOPEN' || writable(dir)) return storeError(err, label);
  if (mode === 'write') return readOnlyError(label);
  return new BenchError({
    code: 'records.read-only',
    file: label,
    problem: 'the records are on a read-only disk or folder, and SQLite must write a small index file beside records.db even to read them',
    expected: 'a data folder this user may write to',
    fix: 'copy the data folder to a writable disk and give the copy with --data DIR',
  });
}

function writable(dir: string): boolean {
  try {
    accessSync(dir, constants.W_OK);
    return true;
  } catch {
    return false;
  }
}
