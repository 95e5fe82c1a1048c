import { Option } from 'commander';
import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { BenchError, STATEMENT_WORDS } from '../../types/index.js';
import type { UnitRecord } from '../../types/index.js';
import { addDataOption, notice, quoteArg, resolveDataDir } from '../dataOptions.js';
import { checkOutputPath } from '../outputFile.js';
import type { DataLocation, StoreFlags } from '../dataOptions.js';
import { TOOL_VERSION } from '../version.js';

interface RecordOptions extends StoreFlags {
  format: 'md' | 'html' | 'json' | 'csv';
  decimalMark: 'point' | 'comma' | 'locale';
  json?: boolean;
  out?: string;
  output?: string;
}

const RENDERER = { md: 'renderRecordMarkdown', html: 'renderRecordHtml', json: 'renderRecordJson', csv: 'renderRecordCsv' } as const;
const FORMAT_NAME = { md: 'Markdown', html: 'HTML', json: 'JSON', csv: 'CSV' } as const;

/** The decimal mark of the machine's locale (Intl), for `--decimal-mark locale`. */
function localeMark(): '.' | ',' {
  return new Intl.NumberFormat().formatToParts(1.5).find((p) => p.type === 'decimal')?.value === ',' ? ',' : '.';
}

export function registerRecord(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('record')
    .description("a unit's test record: status, results per condition, causes, every run and its captures")
    .argument('<serial>', 'unit serial number, as `benchproof units` lists it')
    .addOption(new Option('--format <format>', 'md (Markdown), html (printable, with plots), json, or csv (one row per attempt, condition and measurement)').choices(['md', 'html', 'json', 'csv']).default('md'))
    .addOption(new Option('--decimal-mark <mark>', "with --format csv: point, comma (fields then separated by ';'), or locale (this computer's)").choices(['point', 'comma', 'locale']).default('point'))
    .option('--json', 'the same as --format json')
    .option('-o, --out <file>', 'write the record to this file instead of stdout')
    .addOption(new Option('--output <file>', 'the same as --out').hideHelp());
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof record FK-0103
  benchproof record FK-0103 --format html --out FK-0103-record.html
  benchproof record FK-0103 --json --data /mnt/bench/benchproof-data
  benchproof record FK-0103 --format csv --decimal-mark locale --out FK-0103.csv`,
    )
    .action(async (serial: string, opts: RecordOptions) => {
      const format = opts.json ? 'json' : opts.format;
      ctx.json = format === 'json';
      // The records stage (SQLite) and the report load here, not at start-up.
      const [{ openVerifiedStore, writeReportFile }, { nearestNames }, report] = await Promise.all([
        import('../store.js'),
        import('../../records/index.js'),
        import('../../report/index.js'),
      ]);
      const out = opts.out ?? opts.output;
      const location = resolveDataDir(ctx, opts);
      // Refused before the records are read: a link, a device, a path in the data folder (outputFile.ts).
      if (out !== undefined) checkOutputPath(ctx, out, { option: '--out', replace: true, dataDir: location.dir });
      const { store, audit } = openVerifiedStore(ctx, opts, 'read');
      let rec: UnitRecord | undefined;
      try {
        rec = store.unitRecord(serial);
        if (!rec) throw unknownUnit(serial, store.unitSerials(), location, nearestNames);
      } finally {
        store.close();
      }
      const doc: UnitRecord = { ...rec, source: { generatedAt: new Date().toISOString(), toolVersion: TOOL_VERSION, dataDir: location.shown, chainHead: audit.head } };
      const mark = opts.decimalMark === 'comma' ? ',' : opts.decimalMark === 'locale' ? localeMark() : '.';
      const text = format === 'csv' ? report.renderRecordCsv(doc, mark) : report[RENDERER[format]](doc);
      const changed = doc.runs.filter((r) => !r.intact);
      if (changed.length) {
        ctx.io.stderr(`benchproof: warning: run ${changed.map((r) => `#${r.id}`).join(', ')} of ${doc.unit} no longer match(es) the fingerprint taken when stored; do not rely on it\n`);
      }
      if (out === undefined) {
        ctx.io.stdout(text);
        return;
      }
      writeReportFile(ctx, out, text, location.dir);
      const warn = changed.length ? `, ${changed.length} run(s) CHANGED since stored` : '';
      notice(
        ctx,
        `wrote the test record of ${doc.unit} (${STATEMENT_WORDS[doc.status]}, ${doc.runs.length} run(s)${warn}, ${FORMAT_NAME[format]}) to ${out}`,
        `benchproof batch --spec ${quoteArg(doc.spec.name)} --format html --out batch-report.html`,
      );
    });
}

function unknownUnit(serial: string, known: readonly string[], location: DataLocation, nearestNames: (name: string, known: readonly string[]) => string[]): BenchError {
  const near = nearestNames(serial, known);
  return new BenchError({
    code: 'records.unknown-unit',
    file: location.shown,
    problem: `no unit ${serial} in the records`,
    expected: known.length ? `one of the ${known.length} stored serials${near.length ? `, e.g. ${near.join(', ')}` : ''}` : 'a unit that `benchproof check` has stored',
    fix: near.length ? `did you mean ${near[0]}? \`benchproof units\` lists every serial` : 'run `benchproof units` to list the stored serials',
  });
}
