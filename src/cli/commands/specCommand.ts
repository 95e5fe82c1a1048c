import { existsSync } from 'node:fs';
import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { resolvePath } from '../context.js';
import type { GoldenCapture } from '../../design/index.js';
import { BenchError } from '../../types/index.js';
import { resolveDataDir } from '../dataOptions.js';
import { checkOutputPath, writeOutputFile } from '../outputFile.js';
import type { OutputRules } from '../outputFile.js';
import { readSpecFile } from '../specFile.js';

interface InitOptions {
  from: string[];
  tolerance: string;
  out: string;
  pattern?: string;
  name?: string;
  force?: boolean;
}

export function registerSpec(program: Command, ctx: CommandContext): Command {
  const spec = program
    .command('spec')
    .description('write and validate design specs')
    .addHelpText(
      'after',
      `
Examples:
  benchproof spec validate samples/fh210-spec.yaml
  benchproof spec init --from samples/captures/FK-0101_low.csv --from samples/captures/FK-0101_mid.csv --out my-spec.yaml`,
    );
  // `benchproof spec` alone, or with a misspelt command, is a usage mistake (exit 2).
  spec.argument('[command...]').action((words: string[]) => {
    const near = ['validate', 'init'].find((c) => words[0] !== undefined && c.startsWith(words[0].slice(0, 3)));
    throw new BenchError({
      code: words.length ? 'usage.unknown-command' : 'usage.missing-command',
      file: '-',
      problem: words.length ? `spec has no command "${words[0]}"` : 'spec needs a command: validate or init',
      expected: 'benchproof spec validate FILE, or benchproof spec init --from CAPTURE… -o FILE',
      fix: near ? `did you mean \`benchproof spec ${near}\`?` : 'run benchproof spec validate samples/fh210-spec.yaml (or benchproof spec --help)',
    });
  });
  spec
    .command('validate')
    .description('check a spec file and list every problem with its path and line')
    .argument('<file>', 'the spec (YAML or JSON)')
    .option('--json', 'print the validated spec as one JSON document')
    .addHelpText('after', '\nExample:\n  benchproof spec validate samples/fh210-spec.yaml')
    .action(async (file: string, opts: { json?: boolean }) => {
      ctx.json = Boolean(opts.json);
      // The spec stage (zod, yaml) loads here, not at start-up.
      const { parseSpec, SPEC_MAX_BYTES } = await import('../../design/index.js');
      const parsed = parseSpec(readSpecFile(ctx, file, SPEC_MAX_BYTES, 'benchproof spec validate samples/fh210-spec.yaml'), file);
      if (opts.json) {
        ctx.io.stdout(`${JSON.stringify({ schemaVersion: 1, valid: true, spec: parsed }, null, 2)}\n`);
        return;
      }
      const checks = parsed.conditions.reduce((n, c) => n + c.checks.length, 0);
      ctx.io.stdout(`${file}: valid: ${parsed.name} rev ${parsed.revision}, ${parsed.outputs.length} outputs, ${parsed.conditions.length} conditions, ${checks} checks (${parsed.decision} decisions)\n`);
    });
  spec
    .command('init')
    .description('draft a starter spec from captures of a known-good unit')
    .requiredOption('--from <captures...>', 'golden captures, one per condition (repeat --from or list several)')
    .option('-o, --output <file>', 'where to write the new spec (never overwritten without --force)')
    .option('--out <file>', 'the same as --output')
    .option('--tolerance <percent>', 'tolerance of every check, e.g. 2%', '2%')
    // No commander default: the spec stage owns it (DEFAULT_PATTERN) and is not loaded until the action.
    .option('--pattern <pattern>', 'file-name pattern of the captures (default: {unit}_{condition}.csv, the spec default)')
    .option('--name <text>', 'module name for the spec')
    .option('--force', 'overwrite the output file if it exists')
    .addHelpText('after', '\nExample:\n  benchproof spec init --from samples/captures/FK-0101_low.csv samples/captures/FK-0101_mid.csv samples/captures/FK-0101_high.csv --tolerance 2% -o kestrel.yaml')
    .action(async (opts: Omit<InitOptions, 'out'> & { output?: string; out?: string }) => {
      const out = opts.output ?? opts.out;
      if (out === undefined) {
        throw new BenchError({ code: 'usage.missing-output', file: '-', problem: 'spec init needs a file to write the spec to', expected: '-o FILE (or --out FILE)', fix: 'add -o my-spec.yaml' });
      }
      await init(ctx, { ...opts, out });
    });
  return spec;
}

async function init(ctx: CommandContext, opts: InitOptions): Promise<void> {
  const [{ readCapture }, { measureCapture }, spec] = await Promise.all([
    import('../../capture/index.js'),
    import('../../analysis/index.js'),
    import('../../design/index.js'),
  ]);
  const { parseSpec, planGolden, writeDraftSpec } = spec;
  const pattern = opts.pattern ?? spec.DEFAULT_PATTERN;
  const tolerance = parseTolerance(opts.tolerance, spec.parseQuantity);
  const target = resolvePath(ctx.io.cwd, opts.out);
  if (opts.from.some((f) => resolvePath(ctx.io.cwd, f) === target)) {
    throw new BenchError({ code: 'init.output-is-input', file: opts.out, problem: 'the output file is one of the --from captures', expected: 'a new file name for the spec', fix: 'write the spec elsewhere, e.g. -o my-spec.yaml' });
  }
  if (existsSync(target) && !opts.force) {
    throw new BenchError({ code: 'init.output-exists', file: opts.out, problem: 'the output file exists already and is left untouched', expected: 'a new file name, or --force to replace it', fix: `choose another name, or add --force to overwrite ${opts.out}` });
  }
  // The same rules as every output file (outputFile.ts), checked before any capture is read.
  const rules: OutputRules = { option: '-o', replace: Boolean(opts.force), inputs: opts.from, dataDir: resolveDataDir(ctx, {}).dir };
  checkOutputPath(ctx, opts.out, rules);
  const golden: GoldenCapture[] = [];
  for (const plan of planGolden(pattern, opts.from)) {
    const capture = await readCapture(resolvePath(ctx.io.cwd, plan.path));
    golden.push({ path: plan.path, condition: plan.condition, report: measureCapture({ ...capture, path: plan.path }) });
  }
  const text = writeDraftSpec(golden, { tolerance, pattern, ...(opts.name ? { name: opts.name } : {}) });
  const drafted = parseSpec(text, opts.out);
  writeOutputFile(ctx, opts.out, text, rules);
  const checks = drafted.conditions.reduce((n, c) => n + c.checks.length, 0);
  ctx.io.stderr(`wrote ${opts.out}: ${drafted.outputs.length} outputs, ${drafted.conditions.length} conditions, ${checks} checks. Edit names and limits, then: benchproof check <captures…> --spec ${opts.out}\n`);
}

function parseTolerance(raw: string, parseQuantity: (text: string) => { value: number; unit: string } | null): number {
  const q = parseQuantity(raw);
  if (q && q.unit === '%' && q.value > 0 && q.value < 100) return q.value / 100;
  throw new BenchError({ code: 'usage.bad-tolerance', file: '-', problem: `--tolerance got "${raw}", which is not a percentage between 0 and 100`, expected: 'a percentage such as 2% or 1.5 %', fix: 'write --tolerance 2%' });
}
