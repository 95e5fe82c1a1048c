/**
 * Files landing in one folder, each reported once it has stopped growing: its size and modification
 * time unchanged over a whole settle time. Scopes and copy tools write slowly, and a file read
 * half-written would be checked as a short (or corrupt) capture. Only files directly in the folder
 * are watched, never its subfolders (a data folder kept inside it stays out of sight).
 *
 * Change notices (chokidar, or its polling on network shares) are only a hint of where to look.
 * They can miss a file: one written between the event source's first listing and its baseline is in
 * neither, and a share may drop notices altogether. So the folder is also listed by itself when the
 * source reports ready and every `reconcileMs` after that (names, sizes and times only), and every
 * file present that has not been reported at its current size and time is looked at. Each version
 * of a file (path, size, modification time) is reported exactly once, whichever path found it.
 */
import { readdir, stat } from 'node:fs/promises';
import { join, resolve } from 'node:path';
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
  /** How often the folder is listed to catch what the change notices missed, in ms. */
  readonly reconcileMs?: number;
  /** Where change notices come from; chokidar by default (tests pass a controlled one). */
  readonly source?: FolderEventSource;
  /** How the folder is listed and its files looked at; the file system by default (tests pass a folder in memory). */
  readonly files?: FolderFiles;
}

/**
 * The two questions the watch asks the file system. Timing comes from the global timers
 * (setTimeout), so tests run the settle and listing rules on fake timers over a folder in memory.
 */
export interface FolderFiles {
  /** Names directly in the folder; none when it cannot be listed. */
  list(dir: string): Promise<string[]>;
  /** Size and modification time of a regular file; undefined for anything else or when it cannot be read. */
  version(path: string): Promise<Version | undefined>;
}

/** Change notices for the files directly in one folder. */
export interface FolderEvents {
  on(event: 'add' | 'change' | 'unlink', listener: (path: string) => void): void;
  on(event: 'error', listener: (err: unknown) => void): void;
  /** Resolves once the source has scanned the folder and notices flow. */
  readonly ready: Promise<void>;
  close(): Promise<void>;
}

export type FolderEventSource = (dir: string, settings: { readonly poll: boolean; readonly ignore: (name: string) => boolean }) => FolderEvents;

export interface FolderWatch {
  /** Resolves once the folder has been listed and change notices flow. */
  readonly ready: Promise<void>;
  /** Files seen but not yet settled. */
  pending(): number;
  close(): Promise<void>;
}

const POLL_INTERVAL_MS = 500;
/** Four poll intervals: cheap (one listing), and a missed file waits at most this long. */
const RECONCILE_MS = 4 * POLL_INTERVAL_MS;

export interface Version {
  readonly size: number;
  readonly mtimeMs: number;
}

/** The real folder, through node:fs. */
export const diskFiles: FolderFiles = {
  list: (dir) => readdir(dir).catch(() => [] as string[]),
  version: async (path) => {
    const now = await stat(path).catch(() => undefined);
    return now?.isFile() ? { size: now.size, mtimeMs: now.mtimeMs } : undefined;
  },
};

interface Seen extends Version {
  readonly timer: NodeJS.Timeout;
}

export function watchFolder(dir: string, options: FolderWatchOptions): FolderWatch {
  const { settleMs, includeExisting, ignore, onSettled, onError, poll = false, reconcileMs = RECONCILE_MS, source = chokidarSource, files = diskFiles } = options;
  const seen = new Map<string, Seen>();
  /** The version of each file last reported (or, without includeExisting, found there at start). */
  const reported = new Map<string, Version>();
  let closed = false;
  let reconcileTimer: NodeJS.Timeout | undefined;
  const fail = (err: unknown): void => onError(err instanceof Error ? err : new Error(String(err)));
  const forget = (path: string): void => {
    clearTimeout(seen.get(path)?.timer);
    seen.delete(path);
  };
  const sameVersion = (a: Version | undefined, b: Version): boolean => a !== undefined && a.size === b.size && a.mtimeMs === b.mtimeMs;
  const wait = (path: string, now: Version): void => {
    const timer = setTimeout(() => void confirm(path, now).catch(fail), settleMs);
    seen.set(path, { size: now.size, mtimeMs: now.mtimeMs, timer });
  };
  // Each look (re)starts the clock with the file's size and time as they are now; when the clock
  // runs out and both are unchanged, the file has settled. Otherwise the clock starts again.
  const look = async (path: string): Promise<void> => {
    const now = await files.version(path);
    forget(path);
    if (closed || !now || sameVersion(reported.get(path), now)) return;
    wait(path, now);
  };
  const confirm = async (path: string, expected: Version): Promise<void> => {
    const now = await files.version(path);
    if (closed || !sameVersion(seen.get(path), expected)) return; // a newer look took over
    if (!now) return forget(path);
    if (!sameVersion(now, expected)) return wait(path, now);
    seen.delete(path);
    if (sameVersion(reported.get(path), now)) return; // found twice: by a notice and by a listing
    reported.set(path, { size: now.size, mtimeMs: now.mtimeMs });
    onSettled(path);
  };
  const list = async (): Promise<Map<string, Version>> => {
    const found = new Map<string, Version>();
    for (const name of await files.list(dir)) {
      if (ignore(name)) continue;
      const path = join(dir, name);
      const now = await files.version(path);
      if (now) found.set(path, now);
    }
    return found;
  };
  const reconcile = async (): Promise<void> => {
    const found = await list();
    if (closed) return;
    for (const path of reported.keys()) if (!found.has(path)) reported.delete(path);
    for (const [path, version] of found) {
      if (!seen.has(path) && !sameVersion(reported.get(path), version)) await look(path);
    }
  };
  const reconcileLater = (): void => {
    if (closed) return;
    reconcileTimer = setTimeout(() => {
      void reconcile()
        .catch(fail)
        .finally(reconcileLater);
    }, reconcileMs);
  };

  // The baseline is taken before the event source starts, so a file landing while it starts is
  // either in the baseline (and then, without includeExisting, not a new capture) or found later.
  const baseline = list();
  const events = baseline.then((found) => {
    if (!includeExisting) for (const [path, version] of found) reported.set(path, version);
    const started = source(dir, { poll, ignore });
    // The source is told what to ignore; the rule is applied here too, whatever the source does.
    const onEvent = (path: string): void => {
      if (!ignore(baseName(path))) void look(resolve(dir, path)).catch(fail);
    };
    started.on('add', onEvent);
    started.on('change', onEvent);
    started.on('unlink', (path) => forget(resolve(dir, path)));
    started.on('error', fail);
    return started;
  });
  const ready = events.then(async (started) => {
    await started.ready;
    await reconcile();
    reconcileLater();
  });
  ready.catch(fail);
  return {
    ready,
    pending: () => seen.size,
    close: async () => {
      closed = true;
      clearTimeout(reconcileTimer);
      for (const path of [...seen.keys()]) forget(path);
      await (await events).close();
    },
  };
}

/** chokidar on the folder itself (depth 0), polling when asked. */
export const chokidarSource: FolderEventSource = (dir, { poll, ignore }) => {
  const watcher = watch(dir, {
    depth: 0,
    // Files already there come from the watch's own listing, never from the source.
    ignoreInitial: true,
    ignored: (path, stats) => resolve(path) !== resolve(dir) && stats?.isDirectory() !== true && ignore(baseName(path)),
    persistent: true,
    // A share mounted from another computer sends no change notices for files that computer writes.
    usePolling: poll,
    interval: POLL_INTERVAL_MS,
    binaryInterval: POLL_INTERVAL_MS,
  });
  const ready = new Promise<void>((done) => watcher.once('ready', done));
  const on = (event: 'add' | 'change' | 'unlink' | 'error', listener: (arg: never) => void): void => {
    watcher.on(event, listener as (...args: unknown[]) => void);
  };
  return { on, ready, close: () => watcher.close() };
};

const baseName = (path: string): string => path.split(/[\\/]/).pop() ?? path;
