/**
 * One `watch` session: load the spec, open the records, watch the folder, and hand each settled
 * capture to the per-file handler one at a time, printing its line. Stops when `stop` is aborted:
 * the file in hand is finished (and stored, in its own transaction), files still landing or queued
 * are left for the next start, and a one-line summary goes to stderr.
 */
import { existsSync, mkdirSync, readdirSync, statSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';
import type { PlanOverrides, Spec } from '../design/index.js';
import type { TextStyle } from '../report/index.js';
import { BenchError, isBenchError } from '../types/index.js';
import type { CommandContext } from './context.js';
import { loadSpec, planCapture } from './checkRun.js';
import type { TimingOptions } from './checkRun.js';
import { openVerifiedStore, resolveOperator, stationName } from './store.js';
import type { StoreFlags } from './store.js';
import { checkEachCapture } from './watchCapture.js';
import type { CaptureHandlerFactory, CaptureOutcome, WatchEnv } from './watchCapture.js';
import { serialQueue } from './watchQueue.js';
import { fullCollection, memoryRelease } from './watchMemory.js';
import { checkedCache } from './watchReuse.js';
import type { AttemptRequest } from './attemptNotice.js';
import { watchFolder } from './watchFolder.js';
import { countOutcome, emptyTally, outcomeLines, summaryLine } from './watchLines.js';
import type { WatchTally } from './watchLines.js';

export interface WatchSettings {
  /** The folder as the user wrote it. */
  readonly dir: string;
  readonly specFile: string;
  readonly overrides: PlanOverrides;
  readonly flags: StoreFlags;
  readonly settleMs: number;
  readonly newOnly: boolean;
  /** Poll the folder (network shares) instead of relying on change notices. */
  readonly poll?: boolean;
  readonly reportDir?: string;
  readonly json: boolean;
  readonly timing: TimingOptions;
  readonly style: TextStyle;
  /** The per-file strategy; checking each capture by default (a calibration mode gives its own). */
  readonly onCapture?: CaptureHandlerFactory;
  /** --note / --new-attempt: each unit's first file in the session opens a new test attempt. */
  readonly attempt?: AttemptRequest;
  /** --force-unit: a file naming another unit than --unit is recorded under --unit. */
  readonly forceUnit?: boolean;
}

export async function runWatchSession(ctx: CommandContext, settings: WatchSettings, stop: AbortSignal): Promise<WatchTally> {
  const dir = resolve(ctx.io.cwd, settings.dir);
  checkFolder(dir, settings.dir);
  const { spec, text } = loadSpec(ctx, settings.specFile);
  checkOverrides(spec, settings.overrides);
  const reportDir = settings.reportDir === undefined ? undefined : makeReportDir(ctx, settings.reportDir);
  // The records are verified once at the start: watch looks up what is recorded already.
  const { store, location } = openVerifiedStore(ctx, settings.flags, 'write');
  try {
    const env: WatchEnv = {
      ctx, spec, specText: text, store, location, overrides: settings.overrides, timing: settings.timing, reportDir,
      author: { operator: resolveOperator(ctx, settings.flags), station: stationName() },
      ...(settings.attempt ? { attempt: settings.attempt } : {}),
      started: new Set<string>(),
      forceUnit: Boolean(settings.forceUnit),
      earlierChecks: checkedCache(),
    };
    const tally = emptyTally();
    const print = (o: CaptureOutcome): void => {
      countOutcome(tally, o);
      const lines = outcomeLines(o, settings.json, settings.style, ctx.io.env.BENCHPROOF_DEBUG === '1');
      if (lines.stdout) ctx.io.stdout(lines.stdout);
      if (lines.stderr) ctx.io.stderr(lines.stderr);
    };
    for (const bad of namesNotUtf8(dir)) print({ status: 'error', file: join(settings.dir, bad.shown), error: badNameError(bad.shown) });
    // Memory taken by a large capture is given back once the queue has gone quiet (watchMemory.ts).
    const collect = fullCollection();
    // The results kept for the next files of open attempts go too: they only save reading them again.
    const release = (): void => {
      env.earlierChecks?.clear();
      collect?.();
    };
    const memory = collect ? memoryRelease({ rss: () => process.memoryUsage.rss(), collect: release }) : undefined;
    const queue = serialQueue((settings.onCapture ?? checkEachCapture)(env), print, { busy: () => memory?.busy(), idle: () => memory?.idle() });
    const folder = watchFolder(dir, {
      settleMs: settings.settleMs,
      includeExisting: !settings.newOnly,
      poll: settings.poll,
      ignore: notACapture(spec, resolve(location.dir) === dir),
      onSettled: (path) => queue.push(join(settings.dir, basename(path))),
      onError: (err) => print(folderErrorOutcome(settings.dir, err)),
    });
    const stopped = new Promise<void>((done) => (stop.aborted ? done() : stop.addEventListener('abort', () => done(), { once: true })));
    await Promise.race([folder.ready, stopped]);
    if (!stop.aborted) ctx.io.stderr(startLine(settings, spec, location.shown));
    await stopped;
    await queue.finish();
    memory?.close();
    const waiting = folder.pending() + queue.waiting();
    await folder.close();
    ctx.io.stderr(summaryLine(tally, settings.json, { waiting, data: location.shown }));
    return tally;
  } finally {
    store.close();
  }
}

function startLine(settings: WatchSettings, spec: Spec, data: string): string {
  const what = `${settings.dir} for captures named "${spec.pattern}" (${spec.name} rev ${spec.revision}; settle ${settings.settleMs} ms${settings.newOnly ? '; new files only' : ''})`;
  if (settings.json) return `${JSON.stringify({ schemaVersion: 1, event: 'watching', dir: settings.dir, pattern: spec.pattern, spec: spec.name, revision: spec.revision, data })}\n`;
  return `benchproof: watching ${what}; runs stored in ${data}; Ctrl-C stops\n`;
}

/**
 * Names `watch` never treats as captures: hidden and temporary files, files without the pattern's
 * extension (scope screenshots, our own HTML records), and the record database when the data folder
 * is the watched folder itself.
 */
function notACapture(spec: Spec, dataHere: boolean): (name: string) => boolean {
  const ext = /(\.[A-Za-z0-9]+)$/.exec(spec.pattern.slice(spec.pattern.lastIndexOf('}') + 1))?.[1]?.toLowerCase();
  return (name) => {
    const lower = name.toLowerCase();
    if (name.startsWith('.') || /(\.part|\.tmp|\.crdownload|~)$/.test(lower) || lower.endsWith('-record.html')) return true;
    if (dataHere && lower.startsWith('records.db')) return true;
    return ext !== undefined && !lower.endsWith(ext) && !(ext === '.csv' && lower.endsWith('.csv.gz'));
  };
}

function checkFolder(dir: string, shown: string): void {
  if (existsSync(dir) && statSync(dir).isDirectory()) return;
  throw new BenchError({
    code: 'watch.no-folder',
    file: shown,
    problem: existsSync(dir) ? 'this is a file, not a folder to watch' : 'no such folder',
    expected: 'the folder the scope or copy tool saves captures into',
    fix: 'give an existing folder, e.g. benchproof watch /media/usb-stick --spec samples/fh210-spec.yaml',
  });
}

/** A --condition the spec does not know is refused at start, not at the first file. */
function checkOverrides(spec: Spec, overrides: PlanOverrides): void {
  if (overrides.condition === undefined) return;
  try {
    planCapture(spec, 'any-name', overrides);
  } catch (err) {
    if ((err as BenchError).code === 'check.unknown-condition') throw err;
  }
}

function makeReportDir(ctx: CommandContext, shown: string): string {
  try {
    mkdirSync(resolve(ctx.io.cwd, shown), { recursive: true });
    return shown;
  } catch (err) {
    throw new BenchError({
      code: 'output.cannot-write',
      file: shown,
      problem: `the report folder could not be created (${(err as { code?: string }).code ?? 'write error'})`,
      expected: 'a folder this user may write to',
      fix: 'choose another --report-dir, or create it first',
    });
  }
}

/**
 * Names in the folder that are not valid UTF-8: Node would hand them on with U+FFFD in place of the
 * bad bytes, a name no file has, so they could never be read. Each is reported at the start (its bad
 * bytes shown as \xNN), never skipped in silence.
 */
function namesNotUtf8(dir: string): { shown: string }[] {
  let names: Buffer[];
  try {
    names = readdirSync(dir, { encoding: 'buffer' });
  } catch {
    return [];
  }
  const decoder = new TextDecoder('utf-8', { fatal: true });
  const out: { shown: string }[] = [];
  for (const raw of names) {
    try {
      decoder.decode(raw);
    } catch {
      out.push({ shown: [...raw].map((b) => (b >= 0x20 && b < 0x7f ? String.fromCharCode(b) : `\\x${b.toString(16).padStart(2, '0')}`)).join('') });
    }
  }
  return out;
}

function badNameError(shown: string): BenchError {
  return new BenchError({
    code: 'watch.bad-file-name',
    file: shown,
    problem: 'the file name is not valid UTF-8, so it cannot be opened by name; it was not recorded',
    expected: 'file names in UTF-8 (letters, digits, - and _ are safe everywhere)',
    fix: 'rename the file (e.g. on the scope, or with a file manager), then it is checked on landing',
  });
}

/**
 * What the folder watcher reports about one entry (a link that loops, an entry that vanished or
 * cannot be read) names that entry as a BenchError, so it is a line about a file, not an internal
 * error; anything else stays as it was.
 */
function folderErrorOutcome(dir: string, err: Error): CaptureOutcome {
  const { code, path } = err as NodeJS.ErrnoException;
  if (isBenchError(err) || typeof path !== 'string' || !['ELOOP', 'EACCES', 'EPERM', 'ENOENT', 'ENAMETOOLONG', 'EIO'].includes(code ?? '')) return { status: 'error', file: dir, error: err };
  const file = join(dir, basename(path));
  return {
    status: 'error',
    file,
    error: new BenchError({
      code: 'watch.unreadable',
      file,
      problem: `the entry cannot be read (${code === 'ELOOP' ? 'a symbolic link that loops' : code}); it was not recorded`,
      expected: 'a capture file saved in the watched folder',
      fix: 'save the capture as a regular file in the folder (not a link), then it is checked on landing',
    }),
  };
}
