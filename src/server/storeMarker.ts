/**
 * Notices that the records changed, whoever wrote them: this server, `watch`, or `check` in another
 * terminal on the same data folder, or (with a shared store) another bench.
 *
 * The embedded store: every commit to the SQLite database in WAL mode writes the write-ahead log (and
 * a checkpoint writes the database file), so the size and modification time of the two files change
 * with each commit. Two stat calls per look, a few per second, cost nothing next to re-reading the
 * records on every look.
 *
 * The shared store has no file here to watch: every run another bench stores appends to the hash
 * chain, so its head (one indexed query) is the marker, looked at less often (a round trip to the
 * server each time); a failed look is a marker too, so the page hears when the store answers again.
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
/** How often the shared store's chain head is asked for, in ms. */
export const SHARED_MARKER_INTERVAL_MS = 1_500;

/** What to look at: the data folder of the embedded store, or a function giving the shared store's marker. */
export type MarkerSource = string | { readonly look: () => string; readonly intervalMs: number };

async function fileMarker(dataDir: string): Promise<string> {
  const parts = await Promise.all(
    [DATABASE_FILE, `${DATABASE_FILE}-wal`].map((name) =>
      stat(join(dataDir, name)).then((s) => `${s.size}@${s.mtimeMs}`, () => '-'),
    ),
  );
  return parts.join('|');
}

function lookAt(source: Exclude<MarkerSource, string>): string {
  try {
    return `head:${source.look()}`;
  } catch (err) {
    return `failed:${(err as { code?: string }).code ?? 'error'}`;
  }
}

export function watchStoreMarker(source: MarkerSource, onChange: () => void, intervalMs?: number): StoreMarker {
  const every = intervalMs ?? (typeof source === 'string' ? MARKER_INTERVAL_MS : source.intervalMs);
  let last: string | undefined;
  let busy = false;
  const look = async (): Promise<void> => {
    if (busy) return;
    busy = true;
    try {
      const now = typeof source === 'string' ? await fileMarker(source) : lookAt(source);
      if (last !== undefined && now !== last) onChange();
      last = now;
    } finally {
      busy = false;
    }
  };
  void look();
  const timer = setInterval(() => void look(), every);
  timer.unref();
  return { stop: () => clearInterval(timer), poke: look };
}
