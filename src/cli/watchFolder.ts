/**
 * Files landing in one folder (chokidar), each reported once it has stopped growing: its size and
 * modification time unchanged over a whole settle time. Scopes and copy tools write slowly, and a
 * file read half-written would be checked as a short (or corrupt) capture. Only files directly in
 * the folder are watched, never its subfolders (a data folder kept inside it stays out of sight).
 */
import { stat } from 'node:fs/promises';
import { resolve } from 'node:path';
import { watch } from 'chokidar';

export interface FolderWatchOptions {
  /** How long size and modification time must hold still, in ms. */
  readonly settleMs: number;
  /** Also report the files already in the folder when watching starts. */
  readonly includeExisting: boolean;
  /** Look at the folder every so often instead of waiting for change notices (network shares). */
  readonly poll?: boolean;
  /** True for a file name this watch should not look at (called with the base name). */
  readonly ignore: (name: string) => boolean;
  readonly onSettled: (path: string) => void;
  readonly onError: (err: Error) => void;
}

export interface FolderWatch {
  /** Resolves once the folder has been scanned and events flow. */
  readonly ready: Promise<void>;
  /** Files seen but not yet settled. */
  pending(): number;
  close(): Promise<void>;
}

const POLL_INTERVAL_MS = 500;

interface Seen {
  readonly size: number;
  readonly mtimeMs: number;
  readonly timer: NodeJS.Timeout;
}

export function watchFolder(dir: string, options: FolderWatchOptions): FolderWatch {
  const { settleMs, includeExisting, ignore, onSettled, onError, poll = false } = options;
  const seen = new Map<string, Seen>();
  let closed = false;
  const forget = (path: string): void => {
    clearTimeout(seen.get(path)?.timer);
    seen.delete(path);
  };
  // Each event (re)starts the clock with the file's size and time as they are now; when the clock
  // runs out and both are unchanged, the file has settled. Otherwise the clock starts again.
  const look = async (path: string): Promise<void> => {
    const now = await stat(path).catch(() => undefined);
    forget(path);
    if (closed || !now?.isFile()) return;
    const timer = setTimeout(() => void confirm(path, now.size, now.mtimeMs), settleMs);
    seen.set(path, { size: now.size, mtimeMs: now.mtimeMs, timer });
  };
  const confirm = async (path: string, size: number, mtimeMs: number): Promise<void> => {
    const now = await stat(path).catch(() => undefined);
    const current = seen.get(path);
    if (closed || current === undefined || current.size !== size || current.mtimeMs !== mtimeMs) return; // a newer event took over
    if (now?.isFile() && now.size === size && now.mtimeMs === mtimeMs) {
      seen.delete(path);
      onSettled(path);
      return;
    }
    if (!now?.isFile()) return forget(path);
    const timer = setTimeout(() => void confirm(path, now.size, now.mtimeMs), settleMs);
    seen.set(path, { size: now.size, mtimeMs: now.mtimeMs, timer });
  };
  const watcher = watch(dir, {
    depth: 0,
    ignoreInitial: !includeExisting,
    ignored: (path, stats) => resolve(path) !== resolve(dir) && stats?.isDirectory() !== true && ignore(baseName(path)),
    persistent: true,
    // A share mounted from another computer sends no change notices for files that computer writes.
    usePolling: poll,
    interval: POLL_INTERVAL_MS,
    binaryInterval: POLL_INTERVAL_MS,
  });
  const onEvent = (path: string): void => void look(path).catch(onError);
  watcher.on('add', onEvent).on('change', onEvent).on('unlink', forget).on('error', (err) => onError(err instanceof Error ? err : new Error(String(err))));
  const ready = new Promise<void>((done) => watcher.once('ready', done));
  return {
    ready,
    pending: () => seen.size,
    close: async () => {
      closed = true;
      for (const path of [...seen.keys()]) forget(path);
      await watcher.close();
    },
  };
}

const baseName = (path: string): string => path.split(/[\\/]/).pop() ?? path;
