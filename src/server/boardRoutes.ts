/**
 * The bench board's data and the live stream: the units of the current spec (every unit when the
 * spec cannot be read) with their state as the records hold it, newest first; the event stream the
 * page listens to; and the spec page's data, validated as `spec validate` does.
 */
import type { FastifyInstance } from 'fastify';
import { INCOMPLETE_WORD, STATEMENT_WORDS } from '../types/index.js';
import type { UnitSummary } from '../types/index.js';
import type { Spec } from '../design/index.js';
import type { BenchSetup } from './benchSetup.js';
import { errorBody } from './errorBody.js';

export function registerBoardRoutes(app: FastifyInstance, setup: BenchSetup): void {
  // The follower has verified the records up to the chain head it last saw; each answer verifies only
  // what was stored since (records/followStore.ts), and lists from light per-run heads.
  // The rows of the last listing: an unchanged store gives the same listing, so the rows are kept.
  let kept: { from: readonly UnitSummary[]; rows: ReturnType<typeof boardRow>[] } | undefined;
  app.get('/api/board', async () => {
    const current = currentSpec(setup);
    const spec = current.ok ? current.spec : undefined;
    const followed = await setup.follower.catchUp();
    setup.refuseUnverified(followed.audit);
    const units = followed.units(spec?.name);
    if (kept?.from !== units) kept = { from: units, rows: [...units].sort(newestFirst).map(boardRow) };
    return {
      spec: spec ? { name: spec.name, revision: spec.revision, file: setup.specFile } : null,
      specProblem: current.ok ? null : current.error,
      data: setup.location.shown,
      canDrop: Boolean(spec),
      units: kept.rows,
    };
  });
  app.get('/api/events', (req, reply) => setup.hub.attach(req, reply));
  app.get('/api/spec', async () => {
    const current = currentSpec(setup);
    if (!current.ok) return { file: setup.specFile ?? null, valid: false, error: current.error };
    const { spec, text } = current;
    const checks = spec.conditions.reduce((n, c) => n + c.checks.length, 0);
    return {
      file: setup.specFile,
      valid: true,
      // The line `benchproof spec validate FILE` prints for a valid spec.
      summary: `${setup.specFile}: valid: ${spec.name} rev ${spec.revision}, ${spec.outputs.length} outputs, ${spec.conditions.length} conditions, ${checks} checks (${spec.decision} decisions)`,
      spec,
      text,
    };
  });
}

type Current = { ok: true; spec: Spec; text: string } | { ok: false; error: ReturnType<typeof errorBody>['error'] | null };

function currentSpec(setup: BenchSetup): Current {
  if (setup.specFile === undefined) return { ok: false, error: null };
  try {
    const { spec, text } = setup.loadSpec(setup.ctx, setup.specFile);
    return { ok: true, spec, text };
  } catch (err) {
    return { ok: false, error: errorBody(err).error };
  }
}

const newestFirst = (a: UnitSummary, b: UnitSummary): number => (a.lastTestedAt < b.lastTestedAt ? 1 : a.lastTestedAt > b.lastTestedAt ? -1 : 0);

/** A unit's state as the `units` listing gives it: INCOMPLETE with what it waits for, else its statement. */
function boardRow(u: UnitSummary) {
  const waiting = u.state === 'incomplete';
  return {
    unit: u.unit,
    status: waiting ? 'incomplete' : u.status,
    word: waiting ? INCOMPLETE_WORD : STATEMENT_WORDS[u.status],
    waitingFor: waiting ? (u.waitingFor ?? []) : [],
    soFar: u.status,
    runs: u.runs,
    attempts: u.attempts ?? null,
    unverified: (u.unverifiedRuns ?? []).length,
    lastTestedAt: u.lastTestedAt,
    spec: u.spec,
  };
}
