/**
 * Giving memory back while `watch` waits. A large capture takes its sample columns, spectrum and
 * file buffers (about 490 MiB of resident memory for a 1 GB capture); once it is done they are
 * garbage, but V8 collects only when the program allocates again, and a watcher that waits for the
 * next file allocates nothing: it kept about 490 MiB for as long as it waited (bench/watch.js and
 * issue 22 measured 490–700 MiB). So when the queue has been idle for a quiet time and the process
 * holds `marginBytes` more than after its last collection (or its start), one full collection runs;
 * on the bench machine that brought 487 MiB back to 83 MiB (77 MiB at start) for a 1 GB capture.
 * A batch of files is never interrupted: collection waits for the queue to be empty, and a file that
 * starts within the quiet time cancels it.
 */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

export interface MemoryReleaseOptions {
  /** Resident memory now, in bytes. */
  readonly rss: () => number;
  /** One full garbage collection. */
  readonly collect: () => void;
  /** How long the queue must stay idle first, in ms (default 1 000). */
  readonly quietMs?: number;
  /** Growth over the floor that is worth a collection, in bytes (default 64 MiB). */
  readonly marginBytes?: number;
}

export interface MemoryRelease {
  /** A file was taken in hand: no collection now. */
  busy(): void;
  /** Nothing in hand and nothing waiting. */
  idle(): void;
  /** The resident memory the next growth is measured from. */
  floor(): number;
  /** Collections run so far. */
  collections(): number;
  close(): void;
}

export function memoryRelease(options: MemoryReleaseOptions): MemoryRelease {
  const { rss, collect, quietMs = 1000, marginBytes = 64 * 2 ** 20 } = options;
  let floor = rss();
  let timer: NodeJS.Timeout | undefined;
  let runs = 0;
  let closed = false;
  const cancel = (): void => {
    clearTimeout(timer);
    timer = undefined;
  };
  return {
    busy: cancel,
    idle() {
      if (closed || timer !== undefined) return;
      timer = setTimeout(() => {
        timer = undefined;
        if (closed || rss() - floor < marginBytes) return;
        collect();
        runs += 1;
        // What stays after a full collection is what the session needs (code loaded, the store's
        // caches): the next collection waits until memory grows by the margin again from here.
        floor = rss();
      }, quietMs);
      // Never what keeps the process alive.
      timer.unref();
    },
    floor: () => floor,
    collections: () => runs,
    close() {
      closed = true;
      cancel();
    },
  };
}

/**
 * A full garbage collection: `gc` when node runs with --expose-gc, otherwise the same function
 * made available at run time (V8's --expose-gc flag installs `gc` in contexts created after it is
 * set). Undefined when neither works, and then nothing is collected by hand.
 */
export function fullCollection(): (() => void) | undefined {
  const given = (globalThis as { gc?: () => void }).gc;
  if (typeof given === 'function') return given;
  try {
    setFlagsFromString('--expose-gc');
    const gc = runInNewContext('gc') as unknown;
    return typeof gc === 'function' ? (gc as () => void) : undefined;
  } catch {
    return undefined;
  }
}
