import { Option } from 'commander';
import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { BenchError } from '../../types/index.js';
import type { BatchReport } from '../../types/index.js';
import { addDataOption, notice, quoteArg, resolveDataDir } from '../dataOptions.js';
import { checkOutputPath } from '../outputFile.js';
import type { StoreFlags } from '../dataOptions.js';
import { TOOL_VERSION } from '../version.js';

interface BatchOptions extends StoreFlags {
  spec?: string;
  since?: string;
  format: 'md' | 'html' | 'json' | 'csv';
  json?: boolean;
  out?: string;
  output?: string;
}

const RENDERER = { md: 'renderBatchMarkdown', html: 'renderBatchHtml', json: 'renderBatchJson', csv: 'renderBatchCsv' } as const;
const FORMAT_NAME = { md: 'Markdown', html: 'HTML', json: 'JSON', csv: 'CSV' } as const;

export function registerBatch(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('batch')
    .description('batch statistics per spec: first-pass and final yield; per measurement n, mean, s, min, max, Cp, Cpk')
    .option('--spec <name>', 'only this spec name (default: every spec in the records)')
    .option('--since <date>', 'only units first tested on or after this date (YYYY-MM-DD, UTC, or an ISO 8601 time)')
    .addOption(new Option('--format <format>', 'md (Markdown), html (with histograms), json or csv (for spreadsheets)').choices(['md', 'html', 'json', 'csv']).default('md'))
    .option('--json', 'the same as --format json')
    .option('-o, --out <file>', 'write the report to this file instead of stdout')
    .addOption(new Option('--output <file>', 'the same as --out').hideHelp());
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof batch
  benchproof batch --spec "FH-210 Kestrel VCO" --since 2026-03-01 --format html --out batch-report.html
  benchproof batch --format csv --out batch.csv`,
    )
    .action(async (opts: BatchOptions) => {
      const format = opts.json ? 'json' : opts.format;
      ctx.json = format === 'json';
      const since = parseSince(opts.since);
      // The records stage (SQLite) and the report load here, not at start-up.
      const [{ openVerifiedStore, unknownSpec, writeReportFile }, { summarizeBatch }, reportStage] = await Promise.all([
        import('../store.js'),
        import('../../records/index.js'),
        import('../../report/index.js'),
      ]);
      const out = opts.out ?? opts.output;
      const location = resolveDataDir(ctx, opts);
      // Refused before the records are read: a link, a device, a path in the data folder (outputFile.ts).
      if (out !== undefined) checkOutputPath(ctx, out, { option: '--out', replace: true, dataDir: location.dir });
      const { store, audit } = openVerifiedStore(ctx, opts, 'read', 'listing');
      let report: BatchReport;
      try {
        const specs = store.specNames();
        if (opts.spec !== undefined && !specs.includes(opts.spec)) throw unknownSpec(opts.spec, specs, location);
        const filter = { ...(opts.spec !== undefined ? { spec: opts.spec } : {}), ...(since !== undefined ? { since } : {}) };
        // From the runs' verified summaries; runs that failed verification (only read with
        // --allow-unverified) count in no yield or statistic.
        const runs = store.batchRuns(opts.spec !== undefined ? { spec: opts.spec } : {}).filter((r) => r.intact);
        report = { ...summarizeBatch(runs, filter), source: { generatedAt: new Date().toISOString(), toolVersion: TOOL_VERSION, dataDir: location.shown, chainHead: audit.head } };
      } finally {
        store.close();
      }
      const text = reportStage[RENDERER[format]](report);
      if (out === undefined) {
        ctx.io.stdout(text);
        return;
      }
      writeReportFile(ctx, out, text, location.dir);
      const units = report.specs.flatMap((s) => s.units);
      const worst = units.find((u) => u.latest !== 'pass' && u.latest !== 'conditional-pass') ?? units[0];
      notice(
        ctx,
        `wrote the batch report (${report.specs.length} spec(s), ${units.length} unit(s), ${FORMAT_NAME[format]}) to ${out}`,
        worst ? `benchproof record ${quoteArg(worst.unit)} --format html --out ${quoteArg(`${worst.unit}-record.html`)}` : 'benchproof units',
      );
    });
}

/** `YYYY-MM-DD` is midnight UTC; a full ISO 8601 time is taken as written. */
export function parseSince(raw: string | undefined): string | undefined {
  if (raw === undefined) return undefined;
  const text = raw.trim();
  const ms = /^\d{4}-\d{2}-\d{2}$/.test(text) ? Date.parse(`${text}T00:00:00Z`) : /^\d{4}-\d{2}-\d{2}T/.test(text) ? Date.parse(text) : NaN;
  if (Number.isNaN(ms)) {
    throw new BenchError({
      code: 'usage.bad-date',
      file: '-',
      problem: `--since got "${raw}", which is not a date`,
      expected: 'a date as YYYY-MM-DD (UTC), or an ISO 8601 time such as 2026-03-01T08:00:00Z',
      fix: 'write the date as --since 2026-03-01',
    });
  }
  return new Date(ms).toISOString();
}
