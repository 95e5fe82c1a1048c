/**
 * `serve --watch DIR`: the drop-folder watcher of `benchproof watch` running inside the server, so
 * captures the scope saves are checked and stored as `watch` stores them. Its lines go to the
 * terminal as `watch` prints them; each outcome also goes to the page (the board itself refreshes
 * from the store's change marker, like for any other writer).
 *
 * When the watch cannot go on (the folder is missing or unreadable at the start, or is removed,
 * unmounted or made unreadable while serving), `failed` resolves with the BenchError that says so:
 * `serve` then stops, after the capture in hand, and exits 2 with that message, so a bench never
 * goes on believing captures are being recorded while none are. The folder is looked at once a
 * second for that; the watcher's own errors about single files stay lines about those files.
 */
import { accessSync, constants, readdirSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import type { CommandContext } from '../cli/context.js';
import { runWatchSession } from '../cli/watchSession.js';
import { checkEachCapture } from '../cli/watchCapture.js';
import type { CaptureOutcome } from '../cli/watchCapture.js';
import type { StoreFlags } from '../cli/store.js';
import { BenchError, STATEMENT_WORDS, isBenchError, renderBenchError } from '../types/index.js';
import type { EventHub } from './eventHub.js';

export interface InsideWatch {
  /** Stop after the file in hand; resolves when the session has ended. */
  stop(): Promise<void>;
  /** Resolves when the watch cannot go on, with what to tell the user; never rejects. */
  readonly failed: Promise<BenchError>;
}

/** How often the watched folder is looked at, in ms. */
export const FOLDER_LOOK_MS = 1000;

/** The folder as `watch` needs it: there, a folder, and listable; else the error that says which. */
export function watchFolderProblem(ctx: CommandContext, dir: string, running = false): BenchError | undefined {
  const path = resolve(ctx.io.cwd, dir);
  let code: string | undefined;
  try {
    if (!statSync(path).isDirectory()) return folderError(dir, 'this is a file, not a folder to watch', running);
    accessSync(path, constants.R_OK | constants.X_OK);
    readdirSync(path);
    return undefined;
  } catch (err) {
    code = (err as { code?: string }).code;
  }
  if (code === 'ENOENT' || code === 'ENOTDIR') return folderError(dir, running ? 'the watched folder is gone (removed or unmounted while serving)' : 'no such folder', running);
  return new BenchError({
    code: 'watch.unreadable',
    file: dir,
    problem: `the ${running ? 'watched ' : ''}folder cannot be read (${code ?? 'read error'})${running ? '; captures landing there are no longer recorded' : ''}`,
    expected: 'a folder this user may list and read',
    fix: `give the folder read permission (e.g. chmod u+rx ${dir}), then start benchproof serve --watch again`,
  });
}

function folderError(dir: string, problem: string, running: boolean): BenchError {
  return new BenchError({
    code: 'watch.no-folder',
    file: dir,
    problem: running ? `${problem}; captures landing there are no longer recorded` : problem,
    expected: 'the folder the scope or copy tool saves captures into',
    fix: running ? 'put the stick or share back (or recreate the folder), then start benchproof serve --watch again' : 'give an existing folder, e.g. benchproof serve --spec samples/fh210-spec.yaml --watch /media/usb-stick',
  });
}

export function startInsideWatch(ctx: CommandContext, dir: string, specFile: string, flags: StoreFlags, hub: EventHub, settleMs: number, lookMs = FOLDER_LOOK_MS): InsideWatch {
  const controller = new AbortController();
  let fail: (err: BenchError) => void = () => {};
  const failed = new Promise<BenchError>((done) => (fail = done));
  const look = setInterval(() => {
    const problem = watchFolderProblem(ctx, dir, true);
    if (problem) {
      clearInterval(look);
      fail(problem);
    }
  }, lookMs);
  look.unref();
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
  session.then(
    () => clearInterval(look),
    (err: unknown) => {
      clearInterval(look);
      // A session that could not start or went down: serve stops with its error (an internal one
      // becomes an internal error of serve, with its stack on the terminal).
      if (isBenchError(err)) fail(err);
      else {
        ctx.io.stderr(`benchproof serve: the folder watch stopped: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
        fail(new BenchError({ code: 'serve.internal', file: dir, problem: 'the folder watch stopped on an internal error (see the lines above)', expected: 'a watch that runs until Ctrl-C', fix: 'start benchproof serve --watch again; if it happens again, report the lines above' }));
      }
    },
  );
  void failed.then((err) => hub.publish('watch', { status: 'stopped', file: dir, error: { ...err.toJSON(), message: renderBenchError(err) } }));
  return {
    failed,
    async stop() {
      clearInterval(look);
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
