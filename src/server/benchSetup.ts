/**
 * What every route of the bench page shares: where the records are, which spec is current, who is
 * at the bench, the upload limits, and the one open read connection to the records. The spec file
 * is read again on each use, so an edited spec shows on the page (and its problems) without a
 * restart.
 */
import { mkdirSync } from 'node:fs';
import type { CommandContext } from '../cli/context.js';
import { createContext } from '../cli/context.js';
import type { CliIo } from '../cli/io.js';
import { openDataStore } from '../cli/store.js';
import type { DataLocation, StoreFlags } from '../cli/store.js';
import { followRecordStore, followStore, openPgStore, unverifiedError } from '../records/index.js';
import type { RecordStore, StoreAudit, StoreFollower } from '../records/index.js';
import { SPEC_MAX_BYTES, parseSpec } from '../design/index.js';
import type { LoadedSpec } from '../cli/checkRun.js';
import { readSpecFile } from '../cli/specFile.js';
import type { EventHub } from './eventHub.js';
import { SHARED_MARKER_INTERVAL_MS } from './storeMarker.js';
import type { MarkerSource } from './storeMarker.js';

export interface UploadLimits {
  /** Largest single capture accepted, in bytes. */
  readonly maxFileBytes: number;
  /** Most files in one drop. */
  readonly maxFiles: number;
}

export const DEFAULT_LIMITS: UploadLimits = { maxFileBytes: 512 * 1024 * 1024, maxFiles: 24 };

export interface BenchSetup {
  /** The command's own context: its io (stderr is the terminal), working directory and environment. */
  readonly ctx: CommandContext;
  readonly flags: StoreFlags;
  readonly location: DataLocation;
  /** The spec file as given to --spec, if any. */
  readonly specFile?: string;
  readonly limits: UploadLimits;
  /** The records as of the last change; reads are verified (hash chain, fingerprints) per handle. */
  readonly store: RecordStore;
  readonly hub: EventHub;
  /**
   * The records as verified so far (records/followStore.ts): the board, the unit pages and the plots
   * read through it, so an answer after a change verifies only what was stored since.
   */
  readonly follower: StoreFollower;
  /** What tells the server the records changed: the data folder's database files, or the shared store's chain head. */
  readonly changeMarker: MarkerSource;
  /** Throws the records error `check` would print when the audit found problems (unless --allow-unverified). */
  refuseUnverified(audit: StoreAudit): void;
  /** Open the records again after they changed, so the next read verifies what was added. */
  refresh(): void;
  /**
   * The spec as `check` loads it, read again on each call; parsed again only when its text changed
   * (the same text always parses the same way), so the board answers without re-parsing.
   */
  loadSpec(ctx: CommandContext, file: string): LoadedSpec;
  close(): void;
}

/** Opens the records for writing (creating the data folder as `check` would) and keeps them open. */
export function openBench(ctx: CommandContext, flags: StoreFlags, hub: EventHub, specFile: string | undefined, limits: UploadLimits): BenchSetup {
  const first = openDataStore(ctx, flags, 'write');
  const location = first.location;
  let store = first.store;
  const { follower, changeMarker } = chooseFollower(location);
  // Later calls resolve the data folder from other working directories (a drop's temporary folder).
  const absolute: StoreFlags = { ...flags, data: location.dir };
  let parsed: { file: string; text: string; result: { spec: LoadedSpec['spec'] } | { error: unknown } } | undefined;
  const loadSpec = (ctx: CommandContext, file: string): LoadedSpec => {
    const text = readSpecFile(ctx, file, SPEC_MAX_BYTES, '--spec samples/fh210-spec.yaml');
    if (parsed?.file !== file || parsed.text !== text) {
      try {
        parsed = { file, text, result: { spec: parseSpec(text, file) } };
      } catch (error) {
        parsed = { file, text, result: { error } };
      }
    }
    if ('error' in parsed.result) throw parsed.result.error;
    return { spec: parsed.result.spec, text };
  };
  return {
    loadSpec,
    ctx,
    flags: absolute,
    location,
    ...(specFile !== undefined ? { specFile } : {}),
    limits,
    hub,
    follower,
    changeMarker,
    refuseUnverified(audit) {
      if (audit.problems.length > 0 && !flags.allowUnverified) throw unverifiedError(location.shown, audit);
    },
    get store() {
      return store;
    },
    // The store verifies itself once per open handle; a long-running server opens a fresh one after
    // every change, so what another process added is verified before the page shows it.
    refresh() {
      const next = openDataStore(ctx, absolute, 'read').store;
      store.close();
      store = next;
    },
    close() {
      follower.close();
      store.close();
    },
  };
}

/**
 * The embedded store is followed through its SQLite file (followStore.ts: incremental, and watched
 * by the files' size and time); a shared store through its public interface (followRecordStore.ts),
 * opened in 'mark' mode so the routes refuse by the same rule as the CLI (refuseUnverified), and
 * watched by its chain head together with what the follower's background re-checks found (through
 * the follower's own handle: the server's writing handle may be this bench's outbox while the shared
 * store is out of reach).
 */
function chooseFollower(location: DataLocation): { follower: StoreFollower; changeMarker: MarkerSource } {
  const shared = location.shared;
  if (!shared) return { follower: followStore(location.dir), changeMarker: location.dir };
  // The data folder keeps the page's access token and the captures read back; the shared store does
  // not make it (it makes it, with its parents, only when it first keeps a capture: engines/pgStore.ts).
  mkdirSync(location.dir, { recursive: true });
  const follower = followRecordStore(() => openPgStore(shared.url, { cacheDir: location.dir, unverified: 'mark' }));
  return { follower, changeMarker: { look: () => follower.marker(), intervalMs: SHARED_MARKER_INTERVAL_MS } };
}

/** A context for one piece of work: its own working directory, its notices collected. */
export function workContext(setup: BenchSetup, cwd: string): { ctx: CommandContext; notes: string[] } {
  const notes: string[] = [];
  const io: CliIo = {
    stdout: () => {},
    stderr: (s) => {
      if (s.trim()) notes.push(s.trimEnd());
    },
    stdoutIsTTY: false,
    stderrIsTTY: false,
    env: setup.ctx.io.env,
    cwd,
  };
  return { ctx: createContext(io), notes };
}
