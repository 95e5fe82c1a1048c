/**
 * A watchFolder on a fresh temporary folder per test: `useFolderWatch()` registers the setup and
 * clean-up hooks and returns the folder and a `start` that records each settled file with its size.
 */
import { afterEach, beforeEach } from 'vitest';
import { statSync } from 'node:fs';
import { basename } from 'node:path';
import { watchFolder } from '../../../src/cli/watchFolder.js';
import type { FolderEventSource, FolderWatch } from '../../../src/cli/watchFolder.js';
import { makeTempDir, removeTempDir } from '../../records/helpers/tempData.js';

export interface StartOptions {
  readonly settleMs?: number;
  readonly includeExisting?: boolean;
  readonly poll?: boolean;
  readonly ignore?: (name: string) => boolean;
  readonly reconcileMs?: number;
  readonly source?: FolderEventSource;
}

export interface FolderWatchFixture {
  /** The temporary folder of the running test. */
  dir(): string;
  /** The watch started last in this test, if any. */
  current(): FolderWatch | undefined;
  /** Start watching; each settled file is recorded with its size at that moment. */
  start(options?: StartOptions): Promise<{ settled: { name: string; size: number }[]; errors: Error[] }>;
  /** Close the running watch (the next start opens another). */
  close(): Promise<void>;
}

export function useFolderWatch(): FolderWatchFixture {
  let dir = '';
  let watch: FolderWatch | undefined;
  beforeEach(() => {
    dir = makeTempDir('benchproof-folder-');
  });
  afterEach(async () => {
    await watch?.close();
    watch = undefined;
    removeTempDir(dir);
  });
  return {
    dir: () => dir,
    current: () => watch,
    close: async () => {
      await watch?.close();
      watch = undefined;
    },
    async start(options = {}) {
      const settled: { name: string; size: number }[] = [];
      const errors: Error[] = [];
      watch = watchFolder(dir, {
        settleMs: options.settleMs ?? 300,
        includeExisting: options.includeExisting ?? true,
        poll: options.poll ?? false,
        ignore: options.ignore ?? (() => false),
        onSettled: (path) => settled.push({ name: basename(path), size: statSync(path).size }),
        onError: (err) => errors.push(err),
        ...(options.reconcileMs === undefined ? {} : { reconcileMs: options.reconcileMs }),
        ...(options.source === undefined ? {} : { source: options.source }),
      });
      await watch.ready;
      return { settled, errors };
    },
  };
}
