/**
 * The batch page: yields, capability with histograms and the units table as the report stage
 * renders them (`benchproof batch --format html`), and the CSV and Markdown downloads, all from
 * the runs of one spec (every spec when none is named), read from their verified summaries as the
 * `batch` command reads them.
 */
import type { FastifyInstance, FastifyReply } from 'fastify';
import { summarizeBatch } from '../records/index.js';
import type { BatchReport } from '../types/index.js';
import type { BenchSetup } from './benchSetup.js';
import { VIEW_CSP } from './security.js';
import { attach, source } from './unitRoutes.js';

export function registerBatchRoutes(app: FastifyInstance, setup: BenchSetup): void {
  app.get('/api/batch', async () => ({ specs: setup.store.specNames() }));
  app.get<{ Querystring: { spec?: string } }>('/view/batch.html', async (req, reply) => {
    const report = batchReport(setup, req.query.spec, reply);
    if (!report) return reply;
    const { renderBatchHtml } = await import('../report/index.js');
    return reply.header('Content-Security-Policy', VIEW_CSP).type('text/html; charset=utf-8').send(renderBatchHtml(report));
  });
  app.get<{ Params: { format: string }; Querystring: { spec?: string } }>('/download/batch.:format', async (req, reply) => {
    const report = batchReport(setup, req.query.spec, reply);
    if (!report) return reply;
    const r = await import('../report/index.js');
    if (req.params.format === 'csv') return attach(reply, 'batch.csv', 'text/csv; charset=utf-8', r.renderBatchCsv(report));
    if (req.params.format === 'md') return attach(reply, 'batch.md', 'text/markdown; charset=utf-8', r.renderBatchMarkdown(report));
    return reply.code(404).send({ error: { code: 'serve.not-found', problem: 'no such batch format' } });
  });
}

function batchReport(setup: BenchSetup, spec: string | undefined, reply: FastifyReply): BatchReport | undefined {
  if (spec !== undefined && !setup.store.specNames().includes(spec)) {
    void reply.code(404).send({ error: { code: 'serve.not-found', problem: `no runs checked against a spec named "${spec}"` } });
    return undefined;
  }
  const filter = spec !== undefined ? { spec } : {};
  // From the runs' verified summaries, as `benchproof batch` reads them (not every full verdict);
  // runs that failed verification (read only with --allow-unverified) count in no yield or statistic.
  return { ...summarizeBatch(setup.store.batchRuns(filter).filter((r) => r.intact), filter), source: source(setup) };
}
