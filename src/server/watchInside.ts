/**
 * `serve --watch DIR`: the drop-folder watcher of `benchproof watch` running inside the server, so
 * captures the scope saves are checked and stored as `watch` stores them. Its lines go to the
 * terminal as `watch` prints them; each outcome also goes to the page (the board itself refreshes
 * from the store's change marker, like for any other writer).
 */
import type { CommandContext } from '../cli/context.js';
import { runWatchSession } from '../cli/watchSession.js';
import { checkEachCapture } from '../cli/watchCapture.js';
import type { CaptureOutcome } from '../cli/watchCapture.js';
import type { StoreFlags } from '../cli/store.js';
import { STATEMENT_WORDS, isBenchError, renderBenchError } from '../types/index.js';
import type { EventHub } from './eventHub.js';

export interface InsideWatch {
  /** Stop after the file in hand; resolves when the session has ended. */
  stop(): Promise<void>;
}

export function startInsideWatch(ctx: CommandContext, dir: string, specFile: string, flags: StoreFlags, hub: EventHub, settleMs: number): InsideWatch {
  const controller = new AbortController();
  const session = import('../report/index.js').then(({ createStyle: style }) =>
    runWatchSession(
      ctx,
      {
        dir,
        specFile,
        overrides: {},
        flags,
        settleMs,
        newOnly: false,
        json: false,
        timing: {},
        style: style(false),
        onCapture: (env) => {
          const handle = checkEachCapture(env);
          return async (file) => {
            const outcome = await handle(file);
            hub.publish('watch', outcomeEvent(outcome));
            return outcome;
          };
        },
      },
      controller.signal,
    ),
  );
  session.catch((err: unknown) => {
    ctx.io.stderr(`benchproof serve: the folder watch stopped:\n${isBenchError(err) ? renderBenchError(err) : String(err)}\n`);
    hub.publish('watch', { status: 'stopped', error: isBenchError(err) ? { ...err.toJSON(), message: renderBenchError(err) } : { message: 'internal error' } });
  });
  return {
    async stop() {
      controller.abort('stop');
      await session.catch(() => undefined);
    },
  };
}

function outcomeEvent(o: CaptureOutcome) {
  if (o.status === 'unmatched' || o.status === 'error') {
    const e = o.error;
    return { status: o.status, file: o.file, error: isBenchError(e) ? { ...e.toJSON(), message: renderBenchError(e) } : { message: e.message } };
  }
  if (o.status === 'checked') return { status: o.status, file: o.file, unit: o.unit, condition: o.condition, statement: o.runStatement, word: STATEMENT_WORDS[o.runStatement], runId: o.runId };
  if (o.status === 'recorded-already') return { status: o.status, file: o.file, unit: o.unit, runId: o.runId };
  return { status: o.status, file: o.file };
}
