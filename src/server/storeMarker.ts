/**
 * Notices that the records changed, whoever wrote them: this server, `watch`, or `check` in another
 * terminal on the same data folder. Every commit to the SQLite database in WAL mode writes the
 * write-ahead log (and a checkpoint writes the database file), so the size and modification time of
 * the two files change with each commit. Two stat calls per look, a few per second, cost nothing
 * next to re-reading the records on every look.
 */
import { stat } from 'node:fs/promises';
import { join } from 'node:path';
import { DATABASE_FILE } from '../records/index.js';

export interface StoreMarker {
  /** Stop looking. */
  stop(): void;
  /** Look now (after this server stored something); calls onChange when the marker moved. */
  poke(): Promise<void>;
}

export const MARKER_INTERVAL_MS = 400;

async function marker(dataDir: string): Promise<string> {
  const parts = await Promise.all(
    [DATABASE_FILE, `${DATABASE_FILE}-wal`].map((name) =>
      stat(join(dataDir, name)).then((s) => `${s.size}@${s.mtimeMs}`, () => '-'),
    ),
  );
  return parts.join('|');
}

export function watchStoreMarker(dataDir: string, onChange: () => void, intervalMs = MARKER_INTERVAL_MS): StoreMarker {
  let last: string | undefined;
  let busy = false;
  const look = async (): Promise<void> => {
    if (busy) return;
    busy = true;
    try {
      const now = await marker(dataDir);
      if (last !== undefined && now !== last) onChange();
      last = now;
    } finally {
      busy = false;
    }
  };
  void look();
  const timer = setInterval(() => void look(), intervalMs);
  timer.unref();
  return { stop: () => clearInterval(timer), poke: look };
}
