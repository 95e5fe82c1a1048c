/**
 * The unit page's data: the unit's runs with their captures and the marks the analysis stored
 * (levels, crossings, ramp fits, harmonics), without the plot arrays; the record itself as the
 * report stage renders it (the printed unit page); and the unit's JSON and Markdown records.
 */
import type { FastifyInstance, FastifyReply } from 'fastify';
import { nearestNames } from '../records/index.js';
import type { ChannelReport, StoredRun, UnitRecord } from '../types/index.js';
import { BenchError, INCOMPLETE_WORD, STATEMENT_WORDS } from '../types/index.js';
import { TOOL_VERSION } from '../cli/version.js';
import type { BenchSetup } from './benchSetup.js';
import { errorBody } from './errorBody.js';
import { VIEW_CSP } from './security.js';

export function registerUnitRoutes(app: FastifyInstance, setup: BenchSetup): void {
  app.get<{ Params: { serial: string } }>('/api/units/:serial', async (req, reply) => {
    const rec = await findRecord(setup, req.params.serial, reply);
    if (!rec) return reply;
    const waiting = rec.state === 'incomplete';
    return {
      unit: rec.unit,
      status: waiting ? 'incomplete' : rec.status,
      word: waiting ? INCOMPLETE_WORD : STATEMENT_WORDS[rec.status],
      waitingFor: waiting ? (rec.waitingFor ?? []) : [],
      spec: rec.spec,
      runs: rec.runs.map(runView).reverse(),
      attempts: (rec.attempts ?? []).map((a) => ({ number: a.number, state: a.state, statement: a.statement, word: a.state === 'incomplete' ? INCOMPLETE_WORD : STATEMENT_WORDS[a.statement], notes: a.notes, startedAt: a.startedAt })),
      calibrations: rec.calibrations?.length ?? 0,
    };
  });
  app.get<{ Params: { serial: string } }>('/view/units/:serial/record.html', async (req, reply) => {
    const rec = await findRecord(setup, req.params.serial, reply);
    if (!rec) return reply;
    const { renderRecordHtml } = await import('../report/index.js');
    return reply.header('Content-Security-Policy', VIEW_CSP).type('text/html; charset=utf-8').send(renderRecordHtml({ ...rec, source: source(setup) }));
  });
  // Two test attempts side by side, as `benchproof compare SERIAL A B --format html` renders them.
  app.get<{ Params: { serial: string }; Querystring: { a?: string; b?: string } }>('/view/units/:serial/compare.html', async (req, reply) => {
    const rec = await findRecord(setup, req.params.serial, reply);
    if (!rec) return reply;
    const known = (rec.attempts ?? []).map((x) => x.number);
    const a = Number(req.query.a);
    const b = Number(req.query.b);
    if (!known.includes(a) || !known.includes(b) || a === b) return reply.code(400).send({ error: { code: 'serve.bad-request', problem: `choose two different attempts of ${rec.unit} (${known.join(', ') || 'none'})` } });
    const [{ compareAttempts }, { renderComparisonHtml }] = await Promise.all([import('../records/index.js'), import('../report/index.js')]);
    const html = renderComparisonHtml({ ...compareAttempts(rec, a, b), source: source(setup) });
    return reply.header('Content-Security-Policy', VIEW_CSP).type('text/html; charset=utf-8').send(html);
  });
  app.get<{ Params: { serial: string; format: string } }>('/download/units/:serial/record.:format', async (req, reply) => {
    const rec = await findRecord(setup, req.params.serial, reply);
    if (!rec) return reply;
    const report = await import('../report/index.js');
    const name = `${rec.unit.replace(/[^\w.-]/g, '_')}-record`;
    const full = { ...rec, source: source(setup) };
    if (req.params.format === 'md') return attach(reply, `${name}.md`, 'text/markdown; charset=utf-8', report.renderRecordMarkdown(full));
    if (req.params.format === 'json') return attach(reply, `${name}.json`, 'application/json', report.renderRecordJson(full));
    if (req.params.format === 'html') return attach(reply, `${name}.html`, 'text/html; charset=utf-8', report.renderRecordHtml(full));
    return reply.code(404).send({ error: { code: 'serve.not-found', problem: 'no such record format' } });
  });
}

export function source(setup: BenchSetup) {
  return { generatedAt: new Date().toISOString(), toolVersion: TOOL_VERSION, dataDir: setup.location.shown };
}

export function attach(reply: FastifyReply, name: string, type: string, text: string): FastifyReply {
  return reply.header('Content-Disposition', `attachment; filename="${name}"`).header('Content-Security-Policy', VIEW_CSP).type(type).send(text);
}

/** The unit's record, verified as `record` verifies it (through the follower: only what changed is re-checked). */
async function findRecord(setup: BenchSetup, serial: string, reply: FastifyReply): Promise<UnitRecord | undefined> {
  const { record, audit } = await setup.follower.unitRecord(serial);
  setup.refuseUnverified(audit);
  if (record) return record;
  const known = (await setup.follower.catchUp()).units().map((u) => u.unit);
  const near = nearestNames(serial, known);
  const body = errorBody(
    new BenchError({
      code: 'serve.unknown-unit',
      file: setup.location.shown,
      problem: `no runs recorded for a unit "${serial}"`,
      expected: 'a serial the records hold',
      fix: near.length ? `did you mean ${near[0]}?` : 'drop the unit\'s captures on the bench board first',
    }),
  );
  void reply.code(404).send(body);
  return undefined;
}

function runView(run: StoredRun) {
  return {
    id: run.id,
    startedAt: run.startedAt,
    operator: run.operator,
    station: run.station,
    statement: run.statement,
    word: STATEMENT_WORDS[run.statement],
    intact: run.intact,
    captures: run.captures.map((c) => {
      const checked = run.verdict.captures.find((k) => k.sha256 === c.sha256);
      const report = checked?.report;
      return {
        sha256: c.sha256,
        path: c.path,
        condition: c.condition,
        size: c.size,
        samples: report?.samples ?? null,
        sampleInterval: report?.sampleInterval ?? null,
        duration: report?.duration ?? null,
        outputs: checked?.outputs.map((o) => ({ output: o.output, channel: o.channel })) ?? [],
        channels: report?.channels.map(channelView) ?? [],
      };
    }),
  };
}

/** Marks only; the arrays behind the report's small plots stay on the server. */
function channelView(ch: ChannelReport) {
  const w = ch.plot?.waveform;
  const s = ch.plot?.spectrum;
  return {
    name: ch.name,
    unit: ch.unit,
    shape: ch.shape,
    marks: {
      highLevel: w?.highLevel ?? null,
      lowLevel: w?.lowLevel ?? null,
      midReference: w?.midReference ?? null,
      crossings: w?.crossings ?? [],
      slopeFits: w?.slopeFits ?? [],
      excerpt: w ? { from: w.t0, to: w.t0 + (w.values.length - 1) * w.dt } : null,
    },
    harmonics: ch.harmonics.map((h) => ({ n: h.n, frequency: h.frequency, dbc: h.dbc })),
    spectrum: s ? { binWidth: s.binWidth, bins: s.dbc.length, window: s.window, reference: s.reference ?? 'fundamental' } : null,
  };
}
