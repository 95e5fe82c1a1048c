/**
 * Plot data for one view: the samples (or stored spectrum levels) inside the visible window,
 * reduced to min/max per pixel column by the analysis stage (plotDecimate). The page asks again at
 * each zoom or pan step; the whole record is never sent.
 */
import type { FastifyInstance, FastifyReply } from 'fastify';
import { plotDecimate, plotDecimateSeries } from '../analysis/index.js';
import type { PlotColumns } from '../analysis/index.js';
import type { ChannelReport, StoredCapture, StoredRun } from '../types/index.js';
import type { BenchSetup } from './benchSetup.js';
import type { CaptureCache } from './captureCache.js';
import { errorBody } from './errorBody.js';

interface PlotQuery {
  unit?: string;
  run?: string;
  sha?: string;
  channel?: string;
  from?: string;
  to?: string;
  width?: string;
}

const MAX_COLUMNS = 4096;

export function registerPlotRoutes(app: FastifyInstance, setup: BenchSetup, cache: CaptureCache): void {
  app.get<{ Querystring: PlotQuery }>('/api/plot/wave', async (req, reply) => {
    const found = await locate(setup, req.query, reply);
    if (!found) return reply;
    const { stored, channel } = found;
    try {
      const capture = await cache.get(stored.archivePath, stored.sha256, found.interval);
      const ch = capture.channels.find((c) => c.name === channel.name);
      if (!ch) return notFound(reply, `the archived capture has no channel "${channel.name}"`);
      const t0 = capture.startTime;
      const dt = capture.sampleInterval;
      const whole = { from: t0, to: t0 + (capture.length - 1) * dt };
      const view = windowOf(req.query, whole, reply);
      if (!view) return reply;
      const cols = plotDecimate(ch.samples, t0, dt, view.from, view.to, view.width);
      return { ...columnsJson(cols), from: view.from, to: view.to, whole, samples: capture.length, unit: ch.unit };
    } catch (err) {
      const body = errorBody(err);
      return reply.code(body.status).send(body);
    }
  });
  app.get<{ Querystring: PlotQuery }>('/api/plot/spectrum', async (req, reply) => {
    const found = await locate(setup, req.query, reply);
    if (!found) return reply;
    const s = found.channel.plot?.spectrum;
    if (!s) return notFound(reply, 'no spectrum was stored for this channel');
    const whole = { from: 0, to: (s.dbc.length - 1) * s.binWidth };
    const view = windowOf(req.query, whole, reply);
    if (!view) return reply;
    const cols = plotDecimateSeries(s.dbc, s.binWidth, view.from, view.to, view.width);
    return { ...columnsJson(cols), from: view.from, to: view.to, whole, samples: s.dbc.length, unit: 'dB' };
  });
}

function columnsJson(c: PlotColumns) {
  return { t: Array.from(c.t), min: Array.from(c.min, nullable), max: Array.from(c.max, nullable), first: c.first, end: c.end, step: c.step };
}

const nullable = (v: number): number | null => (Number.isFinite(v) ? v : null);

async function locate(setup: BenchSetup, q: PlotQuery, reply: FastifyReply): Promise<{ run: StoredRun; stored: StoredCapture; channel: ChannelReport; interval: number } | undefined> {
  const runId = Number(q.run);
  if (!q.unit || !Number.isInteger(runId) || !q.sha || !/^[0-9a-f]{64}$/.test(q.sha) || !q.channel) {
    void badRequest(reply, 'give unit, run, sha (64 hex digits) and channel');
    return undefined;
  }
  const { runs, audit } = await setup.follower.unitRuns(q.unit);
  setup.refuseUnverified(audit);
  const run = runs.find((r) => r.id === runId);
  const stored = run?.captures.find((c) => c.sha256 === q.sha);
  const report = run?.verdict.captures.find((c) => c.sha256 === q.sha)?.report;
  const channel = report?.channels.find((c) => c.name === q.channel);
  if (!run || !stored || !report || !channel) {
    void notFound(reply, 'no such run, capture or channel in the records');
    return undefined;
  }
  return { run, stored, channel, interval: report.sampleInterval };
}

function windowOf(q: PlotQuery, whole: { from: number; to: number }, reply: FastifyReply): { from: number; to: number; width: number } | undefined {
  const width = q.width === undefined ? 800 : Number(q.width);
  const from = q.from === undefined ? whole.from : Number(q.from);
  const to = q.to === undefined ? whole.to : Number(q.to);
  if (!Number.isInteger(width) || width < 8 || width > MAX_COLUMNS || !Number.isFinite(from) || !Number.isFinite(to) || !(to > from)) {
    void badRequest(reply, `from < to (finite numbers) and width an integer from 8 to ${MAX_COLUMNS}`);
    return undefined;
  }
  const view = { from: Math.max(whole.from, from), to: Math.min(whole.to, to), width };
  if (!(view.to > view.from)) {
    void badRequest(reply, `a window that overlaps the record (${whole.from} to ${whole.to})`);
    return undefined;
  }
  return view;
}

function badRequest(reply: FastifyReply, expected: string): FastifyReply {
  return reply.code(400).send({ error: { code: 'serve.bad-request', problem: 'the plot request is incomplete or out of range', expected } });
}

function notFound(reply: FastifyReply, problem: string): FastifyReply {
  return reply.code(404).send({ error: { code: 'serve.not-found', problem } });
}
