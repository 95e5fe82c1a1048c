/**
 * Archived captures read back for the plots: the copy in the data folder (never the user's file),
 * read by the capture stage as `check` read it. The last capture read is kept, so the zoom steps of
 * one plot read the file once; one at a time, so memory stays at about one capture.
 */
import { resolve, sep } from 'node:path';
import { readCapture } from '../capture/index.js';
import { ARCHIVE_FOLDER } from '../records/index.js';
import type { Capture } from '../types/index.js';
import { BenchError, isBenchError } from '../types/index.js';

export interface CaptureCache {
  /** The archived capture at `archivePath` (relative to the data folder), its interval as a fallback. */
  get(archivePath: string, sha256: string, interval: number): Promise<Capture>;
}

export function createCaptureCache(dataDir: string): CaptureCache {
  let kept: { sha256: string; capture: Promise<Capture> } | undefined;
  return {
    get(archivePath, sha256, interval) {
      if (kept?.sha256 === sha256) return kept.capture;
      const file = insideArchive(dataDir, archivePath);
      const capture = readArchived(file, interval);
      kept = { sha256, capture };
      capture.catch(() => {
        if (kept?.capture === capture) kept = undefined;
      });
      return capture;
    },
  };
}

async function readArchived(file: string, interval: number): Promise<Capture> {
  try {
    return await readCapture(file);
  } catch (err) {
    // A file without a time base was checked with --interval or --sample-rate; the report kept it.
    if (isBenchError(err) && err.code === 'capture.no-time-base' && interval > 0) return readCapture(file, { interval });
    throw err;
  }
}

/** The archive path from the records, refused unless it stays inside the data folder's archive. */
export function insideArchive(dataDir: string, archivePath: string): string {
  const root = resolve(dataDir, ARCHIVE_FOLDER);
  const file = resolve(dataDir, archivePath);
  if (!file.startsWith(root + sep)) {
    throw new BenchError({ code: 'serve.outside-archive', file: archivePath, problem: 'a stored capture path points outside the capture archive', expected: `a path under ${ARCHIVE_FOLDER}/ in the data folder`, fix: 'check the records with benchproof units; the database may have been edited by hand' });
  }
  return file;
}
