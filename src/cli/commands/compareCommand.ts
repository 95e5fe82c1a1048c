import { Option } from 'commander';
import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { BenchError } from '../../types/index.js';
import type { AttemptComparison, UnitRecord } from '../../types/index.js';
import { addDataOption, notice, quoteArg, resolveDataDir } from '../dataOptions.js';
import { checkOutputPath } from '../outputFile.js';
import type { StoreFlags } from '../dataOptions.js';
import { TOOL_VERSION } from '../version.js';

interface CompareOptions extends StoreFlags {
  format: 'text' | 'md' | 'html' | 'json';
  json?: boolean;
  out?: string;
}

const RENDERER = { text: 'renderComparisonText', md: 'renderComparisonMarkdown', html: 'renderComparisonHtml', json: 'renderComparisonJson' } as const;

export function registerCompare(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('compare')
    .description("two test attempts of a unit side by side: values, statements and likely causes, and what changed")
    .argument('<serial>', 'unit serial number, as `benchproof units` lists it')
    .argument('[attempts...]', 'the two attempt numbers to compare, before then after (default: the last two)')
    .addOption(new Option('--format <format>', 'text, md (Markdown), html or json').choices(['text', 'md', 'html', 'json']).default('text'))
    .option('--json', 'the same as --format json')
    .option('-o, --out <file>', 'write the comparison to this file instead of stdout');
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof compare FK-0106
  benchproof compare FK-0106 1 2 --format html --out FK-0106-compare.html
  benchproof compare FK-0106 --json`,
    )
    .action(async (serial: string, numbers: string[], opts: CompareOptions) => {
      const format = opts.json ? 'json' : opts.format;
      ctx.json = format === 'json';
      const [{ openVerifiedStore, writeReportFile }, records, report] = await Promise.all([
        import('../store.js'),
        import('../../records/index.js'),
        import('../../report/index.js'),
      ]);
      const location = resolveDataDir(ctx, opts);
      if (opts.out !== undefined) checkOutputPath(ctx, opts.out, { option: '--out', replace: true, dataDir: location.dir });
      const { store, audit } = openVerifiedStore(ctx, opts, 'read');
      let rec: UnitRecord | undefined;
      try {
        rec = store.unitRecord(serial);
      } finally {
        store.close();
      }
      if (!rec) throw new BenchError({ code: 'records.unknown-unit', file: location.shown, problem: `no unit ${serial} in the records`, expected: 'a unit that `benchproof check` has stored', fix: 'run `benchproof units` to list the stored serials' });
      const [a, b] = pickAttempts(rec, numbers);
      const doc: AttemptComparison = { ...records.compareAttempts(rec, a, b), source: { generatedAt: new Date().toISOString(), toolVersion: TOOL_VERSION, dataDir: location.shown, chainHead: audit.head } };
      const text = report[RENDERER[format]](doc);
      if (opts.out === undefined) {
        ctx.io.stdout(text);
        return;
      }
      writeReportFile(ctx, opts.out, text, location.dir);
      notice(ctx, `wrote the comparison of attempts #${a} and #${b} of ${rec.unit} to ${opts.out}`, `benchproof record ${quoteArg(rec.unit)} --format html --out ${quoteArg(`${rec.unit}-record.html`)}`);
    });
}

/** The two attempt numbers asked for, or the unit's last two; each must exist. */
function pickAttempts(rec: UnitRecord, numbers: readonly string[]): [number, number] {
  const known = (rec.attempts ?? []).map((x) => x.number);
  if (numbers.length === 0 && known.length >= 2) return [known[known.length - 2], known[known.length - 1]];
  const asked = numbers.map(Number);
  if (numbers.length === 2 && asked.every((n) => Number.isInteger(n) && known.includes(n))) return [asked[0], asked[1]];
  throw new BenchError({
    code: 'usage.bad-attempts',
    file: '-',
    problem: numbers.length === 0 ? `${rec.unit} has ${known.length} test attempt(s); a comparison needs two` : `"${numbers.join(' ')}" is not two attempt numbers of ${rec.unit}`,
    expected: known.length ? `two of its attempt numbers: ${known.join(', ')}` : 'a unit with at least two test attempts',
    fix: known.length >= 2 ? `e.g. benchproof compare ${rec.unit} ${known[0]} ${known[known.length - 1]}` : `test ${rec.unit} again (benchproof check … --note "what was changed"), then compare`,
  });
}
