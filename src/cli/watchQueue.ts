/** The files of a `watch` session, handled strictly one after another in the order they settled. */
import type { CaptureHandler, CaptureOutcome } from './watchCapture.js';

export interface SerialQueue {
  /** Queue a file (once, however often it settles before its turn). */
  push(file: string): void;
  /** Files queued and not yet started. */
  waiting(): number;
  /** Let the file in hand end, and take no more. */
  finish(): Promise<void>;
}

/** Told when a file is taken in hand, and when nothing is in hand or waiting any more. */
export interface QueueActivity {
  busy?(): void;
  idle?(): void;
}

/** A handler that throws (it should not) still gives an error line, never a stopped watcher. */
export function serialQueue(handle: CaptureHandler, print: (o: CaptureOutcome) => void, activity: QueueActivity = {}): SerialQueue {
  const waiting: string[] = [];
  let busy: Promise<void> | null = null;
  let stopping = false;
  const drain = async (): Promise<void> => {
    while (!stopping && waiting.length > 0) {
      const file = waiting.shift() as string;
      activity.busy?.();
      print(await handle(file).catch((error: Error): CaptureOutcome => ({ status: 'error', file, error })));
    }
  };
  const kick = (): void => {
    if (busy || stopping || waiting.length === 0) return;
    busy = drain().finally(() => {
      busy = null;
      if (!stopping && waiting.length === 0) activity.idle?.();
      kick(); // a file may have arrived while the loop was ending
    });
  };
  return {
    push(file: string): void {
      if (!waiting.includes(file)) waiting.push(file);
      kick();
    },
    waiting: (): number => waiting.length,
    async finish(): Promise<void> {
      stopping = true;
      await busy;
    },
  };
}
