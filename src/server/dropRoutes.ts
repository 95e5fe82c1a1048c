/**
 * The drop zone: captures sent from the page are written to a fresh temporary folder under the
 * names they had (a base name only, checked), then read, checked and stored by the very function
 * `benchproof check FILES --spec SPEC [--note …] [--new-attempt]` runs (checkAndStore in
 * src/cli/checkRun.ts), so what the page stores is what the command stores. Limits on size and count come from the command's options; the temporary folder
 * is removed afterwards whatever happened. Drops are handled one at a time.
 */
import { createWriteStream } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, sep } from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { FastifyInstance } from 'fastify';
import { BenchError, INCOMPLETE_WORD, STATEMENT_WORDS, isBenchError, waitingConditions } from '../types/index.js';
import type { BenchSetup } from './benchSetup.js';
import { workContext } from './benchSetup.js';
import { checkAndStore } from '../cli/checkRun.js';
import type { Progress } from '../cli/progress.js';
import { errorBody } from './errorBody.js';

/** Names a scope or copy tool gives: letters, digits and . _ - + ( ) and spaces; no folders. */
const SAFE_NAME = /^[A-Za-z0-9][A-Za-z0-9 ._+()-]{0,199}$/;

let queue: Promise<unknown> = Promise.resolve();
const oneAtATime = <T>(work: () => Promise<T>): Promise<T> => {
  const next = queue.then(work, work);
  queue = next.catch(() => undefined);
  return next;
};

export function registerDropRoutes(app: FastifyInstance, setup: BenchSetup): void {
  app.post('/api/drop', async (req, reply) => {
    const dropId = String(req.headers['x-drop-id'] ?? '').replace(/[^\w-]/g, '').slice(0, 40) || `drop-${Date.now()}`;
    const dir = await mkdtemp(join(tmpdir(), 'benchproof-drop-'));
    try {
      const names: string[] = [];
      const fields: DropFields = {};
      for await (const part of req.parts({ limits: { fileSize: setup.limits.maxFileBytes, files: setup.limits.maxFiles, fields: 2, fieldSize: 4096 } })) {
        if (part.type === 'field') {
          if (part.fieldname === 'note' && typeof part.value === 'string' && part.value.trim()) fields.note = part.value;
          if (part.fieldname === 'newAttempt' && part.value === 'true') fields.newAttempt = true;
          continue;
        }
        const name = safeName(part.filename);
        if (names.includes(name)) throw badName(part.filename, 'the same name twice in one drop');
        names.push(name);
        // 'wx': a new file in our own fresh folder; the name cannot leave it (checked above).
        await pipeline(part.file, createWriteStream(join(dir, name), { flags: 'wx', mode: 0o600 }));
      }
      if (names.length === 0) throw noFiles();
      const outcome = await oneAtATime(() => checkDrop(setup, dir, names, fields, dropId));
      setup.hub.publish('drop', { id: dropId, status: 'stored', units: outcome.units });
      return reply.send(outcome);
    } catch (err) {
      const body = errorBody(asDropped(err, dir));
      if (body.status === 500) setup.ctx.io.stderr(`benchproof serve: internal error in a drop: ${(err as Error).stack ?? String(err)}\n`);
      setup.hub.publish('drop', { id: dropId, status: 'error', error: body.error });
      // The rest of a refused upload may be unread: the connection closes instead of waiting for it.
      reply.header('Connection', 'close');
      return reply.code(body.status).send(body);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
}

interface DropFields {
  /** What was done to the unit before these captures (starts a new attempt), as `check --note`. */
  note?: string;
  /** As `check --new-attempt`. */
  newAttempt?: boolean;
}

/** `benchproof check NAMES --spec SPEC [--note …] [--new-attempt]` run in the drop's folder. */
async function checkDrop(setup: BenchSetup, dir: string, names: readonly string[], fields: DropFields, dropId: string) {
  if (setup.specFile === undefined) throw noSpec();
  const { ctx, notes } = workContext(setup, dir);
  const job = { specFile: setup.specFile, files: names, note: fields.note, newAttempt: fields.newAttempt, timing: {}, startedAt: new Date().toISOString() };
  // The spec's path is the command's, not the drop folder's: it is read through the server's own context.
  const { stored } = await checkAndStore(ctx, setup.flags, job, { progress: dropProgress(setup, dropId), loadSpec: (_ctx, file) => setup.loadSpec(setup.ctx, file) });
  return {
    units: stored.map((r) => {
      const waiting = waitingConditions(r.verdict);
      return waiting.length > 0
        ? { unit: r.unit, runId: r.id, statement: r.statement, state: 'incomplete', word: INCOMPLETE_WORD, waitingFor: waiting }
        : { unit: r.unit, runId: r.id, statement: r.statement, state: 'complete', word: STATEMENT_WORDS[r.statement], waitingFor: [] };
    }),
    notes,
  };
}

/** Reading progress of each file, as events to the page (at most about 20 per file). */
function dropProgress(setup: BenchSetup, id: string): Progress {
  let file = '';
  let total = 0;
  let shown = -1;
  return {
    start(label, t) {
      file = label;
      total = t;
      shown = -1;
    },
    update(done) {
      const step = total > 0 ? Math.floor((20 * done) / total) : 0;
      if (step === shown) return;
      shown = step;
      setup.hub.publish('drop', { id, status: 'reading', file, done, total });
    },
    stop() {},
  };
}

/** An error about a file in the drop's temporary folder names the file as it was dropped. */
function asDropped(err: unknown, dir: string): unknown {
  if (!isBenchError(err) || !err.file.startsWith(`${dir}${sep}`)) return err;
  return new BenchError({ ...err.toJSON(), file: err.file.slice(dir.length + 1) });
}

function safeName(given: string): string {
  const base = given.split(/[\\/]/).pop() ?? '';
  if (!SAFE_NAME.test(base) || base.includes('..')) throw badName(given, 'letters, digits, spaces and . _ - + ( ), no folders');
  return base;
}

function badName(given: string, expected: string): BenchError {
  return new BenchError({ code: 'serve.bad-file-name', file: given.slice(0, 200) || '-', problem: 'this file name cannot be taken from the page', expected, fix: 'rename the file as the spec pattern asks, e.g. FK-0101_mid.csv, and drop it again' });
}

function noFiles(): BenchError {
  return new BenchError({ code: 'serve.no-files', file: '-', problem: 'the drop held no files', expected: 'one or more capture files', fix: 'drag the CSV files the scope saved onto the page, or pick them' });
}

function noSpec(): BenchError {
  return new BenchError({ code: 'serve.no-spec', file: '-', problem: 'captures cannot be checked without a spec', expected: 'benchproof serve --spec FILE', fix: 'restart with --spec samples/fh210-spec.yaml (or your own spec)' });
}
