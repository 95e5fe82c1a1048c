/**
 * The captures a `watch` session has checked, kept for the same unit's next files. Each landed file
 * is checked together with its open attempt's earlier captures, read back from the archive; without
 * this, every capture of a three-condition attempt would be read and measured up to three times
 * (a third of a batch's time went there, bench/watch.js). The analysis is pure, so a result is
 * reused only for the same bytes (SHA-256, as the archive files them) and the same plan (unit,
 * condition, file name, outputs and channels); spec and reading settings are fixed for a session.
 *
 * Bounded: at most `entries` results, the least recently used dropped first, and none kept of a
 * capture larger than `maxBytes`, so the memory of a large capture is free once its file is done.
 */
import type { CheckedCapture } from '../types/index.js';
import type { CheckedReuse, SourcedPlan } from './checkRun.js';

export interface CheckedCacheOptions {
  /** Results kept at most (default 64: the open attempts of some 20 units of three conditions). */
  readonly entries?: number;
  /** Captures larger than this many bytes are not kept (default 16 MiB). */
  readonly maxBytes?: number;
}

export interface CheckedCache {
  /** The hooks for one check whose companion plans are read from these archive paths (SHA-256 → path). */
  forCheck(sources: ReadonlyMap<string, string> | undefined): CheckedReuse;
  /** Results kept now. */
  size(): number;
  /** Forget every result (the watch is idle and gives its memory back). */
  clear(): void;
}

export function checkedCache(options: CheckedCacheOptions = {}): CheckedCache {
  const { entries = 64, maxBytes = 16 * 2 ** 20 } = options;
  if (!(entries >= 0) || !(maxBytes >= 0)) throw new RangeError(`checkedCache: entries ${entries} and maxBytes ${maxBytes} must be ≥ 0`);
  const kept = new Map<string, CheckedCapture>();
  return {
    size: () => kept.size,
    clear: () => kept.clear(),
    forCheck(sources) {
      const shaByPath = new Map<string, string>();
      for (const [sha, path] of sources ?? []) shaByPath.set(path, sha);
      return {
        reused(plan) {
          const sha = plan.readFrom === undefined ? undefined : shaByPath.get(plan.readFrom);
          if (sha === undefined) return undefined;
          const key = keyOf(sha, plan);
          const hit = kept.get(key);
          if (hit === undefined) return undefined;
          // Most recently used last: Map keeps insertion order.
          kept.delete(key);
          kept.set(key, hit);
          return hit;
        },
        checked(plan, capture) {
          if (capture.size > maxBytes || entries === 0) return;
          const key = keyOf(capture.sha256, plan);
          kept.delete(key);
          kept.set(key, capture);
          while (kept.size > entries) kept.delete(kept.keys().next().value as string);
        },
      };
    },
  };
}

function keyOf(sha256: string, plan: SourcedPlan): string {
  const { path, unit, condition, outputs, perOutput } = plan;
  return `${sha256}\u0000${JSON.stringify({ path, unit, condition, outputs, perOutput })}`;
}
