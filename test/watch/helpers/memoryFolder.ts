/**
 * A drop folder in memory for the watch's settle and listing rules on fake timers: files have a
 * size and a modification time taken from the (faked) clock at each write, and a controlled event
 * source announces writes the way chokidar does (add, change, unlink) unless told to stay silent.
 * `useMemoryWatch()` registers fake timers and clean-up per test and starts `watchFolder` on it.
 */
import { afterEach, beforeEach, vi } from 'vitest';
import { join } from 'node:path';
import { watchFolder } from '../../../src/cli/watchFolder.js';
import type { FolderEventSource, FolderEvents, FolderFiles, FolderWatch, Version } from '../../../src/cli/watchFolder.js';

export const DIR = '/bench/drop';

type Listener = (arg: never) => void;

export interface MemoryFolder {
  readonly files: FolderFiles;
  /** Write (or overwrite) a file with `size` bytes now; announced unless `silent`. */
  write(name: string, size: number, opts?: { readonly silent?: boolean }): void;
  /** Append `bytes` to a file (created when missing). */
  append(name: string, bytes: number, opts?: { readonly silent?: boolean }): void;
  remove(name: string, opts?: { readonly silent?: boolean }): void;
  /** A subfolder entry: listed, never a file. */
  mkdir(name: string): void;
  /** A change notice with nothing changed (some file systems send them for attribute updates). */
  notice(name: string): void;
  /** Each look at a file takes this long from now on (a slow share), in ms. */
  slowLooks(ms: number): void;
  size(name: string): number | undefined;
  /**
   * An event source over this folder. `atStart` runs when the watch starts it (after the watch's
   * own first listing); `announce` lists names announced as added once it is ready; with `silent`
   * no write is ever announced (a share that sends no notices).
   */
  source(opts?: { readonly atStart?: () => void; readonly announce?: readonly string[]; readonly silent?: boolean }): FolderEventSource;
}

export function memoryFolder(): MemoryFolder {
  const entries = new Map<string, Version | 'dir'>();
  const listeners = new Map<string, Listener[]>();
  let announcing = true;
  let lookMs = 0;
  const emit = (event: string, name: string, silent = false): void => {
    if (silent || !announcing) return;
    for (const l of listeners.get(event) ?? []) (l as (p: string) => void)(join(DIR, name));
  };
  const put = (name: string, size: number, silent?: boolean): void => {
    const existed = entries.has(name);
    entries.set(name, { size, mtimeMs: Date.now() });
    emit(existed ? 'change' : 'add', name, silent);
  };
  const files: FolderFiles = {
    list: async (dir) => (dir === DIR ? [...entries.keys()] : []),
    version: async (path) => {
      if (lookMs > 0) await new Promise((r) => setTimeout(r, lookMs));
      const e = path.startsWith(`${DIR}/`) ? entries.get(path.slice(DIR.length + 1)) : undefined;
      return e === undefined || e === 'dir' ? undefined : { ...e };
    },
  };
  return {
    files,
    write: (name, size, opts = {}) => put(name, size, opts.silent),
    append: (name, bytes, opts = {}) => {
      const e = entries.get(name);
      put(name, (e && e !== 'dir' ? e.size : 0) + bytes, opts.silent);
    },
    remove: (name, opts = {}) => {
      entries.delete(name);
      emit('unlink', name, opts.silent);
    },
    mkdir: (name) => void entries.set(name, 'dir'),
    notice: (name) => emit('change', name),
    slowLooks: (ms) => void (lookMs = ms),
    size: (name) => {
      const e = entries.get(name);
      return e === undefined || e === 'dir' ? undefined : e.size;
    },
    source: ({ atStart, announce = [], silent = false } = {}) => () => {
      listeners.clear();
      announcing = !silent;
      atStart?.();
      const events: FolderEvents = {
        on: (event: string, listener: Listener) => void listeners.set(event, [...(listeners.get(event) ?? []), listener]),
        ready: Promise.resolve().then(() => {
          for (const name of announce) for (const l of listeners.get('add') ?? []) (l as (p: string) => void)(join(DIR, name));
        }),
        close: async () => void listeners.clear(),
      };
      return events;
    },
  };
}

export interface MemoryWatchStart {
  readonly settleMs?: number;
  readonly includeExisting?: boolean;
  readonly reconcileMs?: number;
  readonly ignore?: (name: string) => boolean;
  readonly source?: Parameters<MemoryFolder['source']>[0];
}

export interface MemoryWatch {
  folder(): MemoryFolder;
  /** Start watching; each settled file is recorded with its size at that moment. */
  start(opts?: MemoryWatchStart): Promise<{ settled: { name: string; size: number }[]; errors: Error[]; watch: FolderWatch }>;
  /** Let `ms` of fake time pass, running every timer and the promises they start. */
  advance(ms: number): Promise<void>;
}

export function useMemoryWatch(): MemoryWatch {
  let folder = memoryFolder();
  let watch: FolderWatch | undefined;
  beforeEach(() => {
    vi.useFakeTimers({ now: new Date('2026-03-02T09:00:00Z') });
    folder = memoryFolder();
  });
  afterEach(async () => {
    await watch?.close();
    watch = undefined;
    vi.useRealTimers();
  });
  return {
    folder: () => folder,
    advance: (ms) => vi.advanceTimersByTimeAsync(ms).then(() => undefined),
    async start(opts = {}) {
      await watch?.close();
      const settled: { name: string; size: number }[] = [];
      const errors: Error[] = [];
      const name = (path: string): string => path.slice(DIR.length + 1);
      watch = watchFolder(DIR, {
        settleMs: opts.settleMs ?? 300,
        includeExisting: opts.includeExisting ?? true,
        ignore: opts.ignore ?? (() => false),
        onSettled: (path) => settled.push({ name: name(path), size: folder.size(name(path)) ?? -1 }),
        onError: (err) => errors.push(err),
        reconcileMs: opts.reconcileMs ?? 2000,
        source: folder.source(opts.source),
        files: folder.files,
      });
      await vi.advanceTimersByTimeAsync(0);
      await watch.ready;
      return { settled, errors, watch };
    },
  };
}
