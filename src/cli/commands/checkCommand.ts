import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import type { Spec } from '../../design/index.js';
import type { UnitCheck } from '../../report/index.js';
import { parseSerial } from '../options.js';
import { addRecordingOptions } from '../dataOptions.js';
import type { ReadingFlags } from '../readingFlags.js';
import { addReadingOptions, readingOptionsFrom } from '../readingFlags.js';
import type { StoreFlags } from '../dataOptions.js';
import { waitingConditions } from '../../types/index.js';
import { knownWidth, terminalWidth } from '../terminalWidth.js';

interface CheckOptions extends StoreFlags, ReadingFlags {
  spec: string;
  unit?: string;
  condition?: string;
  json?: boolean;
  summary?: boolean;
  detail?: boolean;
  strict?: boolean;
  note?: string;
  newAttempt?: boolean;
  forceUnit?: boolean;
}

/** Exit status when every unit checked so far passed but some still wait for a condition (README). */
export const EXIT_INCOMPLETE = 4;

export function registerCheck(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('check')
    .description('check captures against a design spec: a statement per check, likely causes, one line per unit')
    .argument('<captures...>', 'CSV captures named after the spec\'s pattern, e.g. FK-0101_mid.csv')
    .requiredOption('--spec <file>', 'the design spec (YAML or JSON)')
    .option('--unit <serial>', 'serial number of the unit, instead of the one in the file names', parseSerial)
    .option('--force-unit', 'store under --unit even when a file name names another unit')
    .option('--condition <name>', 'condition of every capture, instead of the one in the file names')
    .option('--json', 'print one JSON document (schemaVersion 1) instead of tables')
    .option('--summary', 'one line per unit (statement, checks not passed, first likely cause) instead of the tables')
    .option('--detail', 'every check in full tables, the notes, the evidence for each cause and the circuit view')
    .option('--strict', 'treat a conditional pass as a failure (exit 1)')
    .option('--note <text>', 'what was done to the unit before this check (a part replaced, a trimmer turned); starts a new test attempt')
    .option('--new-attempt', "start a new test attempt instead of continuing the unit's open one")
    .addHelpText(
      'after',
      `
Examples:
  benchproof check samples/captures/FK-0101_*.csv --spec samples/fh210-spec.yaml
  benchproof check samples/captures/FK-0104_*.csv --spec samples/fh210-spec.yaml --detail --no-store
  benchproof check samples/captures/FK-010*_*.csv --spec samples/fh210-spec.yaml --summary --no-store
  benchproof check samples/captures/FK-010*_*.csv --spec samples/fh210-spec.yaml --json
  benchproof check bench/scope-01.csv --spec samples/fh210-spec.yaml --unit FK-0107 --condition mid
  benchproof check samples/captures/FK-0106_*.csv --spec samples/fh210-spec.yaml --note "C3 replaced"

A unit's test attempt collects its captures until every condition of the spec is present; until
then it is INCOMPLETE and names the conditions it waits for. A later check of the same unit
continues its open attempt; --note or --new-attempt starts a new one.
Exit status: 0 every check passed (a conditional pass is allowed unless --strict),
1 a fail, conditional fail or not-measured check, 2 bad input,
4 INCOMPLETE: what was captured passed, but a condition is still waiting for its capture.
Every run is stored in the records (./benchproof-data/, or BENCHPROOF_DATA / --data) unless --no-store.`,
    );
  return addRecordingOptions(addReadingOptions(cmd))
    .action(async (files: string[], opts: CheckOptions, cmd: Command) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      const readOptions = await readingOptionsFrom(ctx, opts);
      const startedAt = new Date().toISOString();
      // The stages load here, not at start-up: `benchproof --help` should not wait for them.
      const [{ checkAndStore }, { createProgress }, { checkDocument, renderCheckBrief, renderCheckSummary, renderCheckText }] = await Promise.all([
        import('../checkRun.js'),
        import('../progress.js'),
        import('../../report/index.js'),
      ]);
      // The same function stores what the bench page's drop zone stores (src/server/dropRoutes.ts).
      const job = { specFile: opts.spec, files, unit: opts.unit, condition: opts.condition, forceUnit: Boolean(opts.forceUnit), note: opts.note, newAttempt: opts.newAttempt, timing: readOptions, startedAt };
      const { spec, units } = await checkAndStore(ctx, opts, job, { progress: createProgress(ctx, json) });

      // The default view fits the terminal (per unit a status line, what did not pass, the top causes).
      const width = terminalWidth(ctx.io);
      const style = ctx.styleFor(cmd);
      // --detail is fitted only to a width that is known (COLUMNS or a terminal): piped to a file it keeps its full tables.
      const text = (): string => (opts.summary ? renderCheckSummary(units, style, width) : opts.detail ? renderCheckText(units, style, knownWidth(ctx.io)) : renderCheckBrief(units, style, width));
      ctx.io.stdout(json ? `${JSON.stringify(checkDocument(spec, units), null, 2)}\n` : text());
      ctx.exitCode = exitCodeFor(units, Boolean(opts.strict));
      flagConditional(ctx, spec, units, Boolean(opts.strict));
    });
}

/**
 * 0 when every unit passed (a conditional pass too, unless strict); 1 when a unit failed, even while
 * it waits for other conditions (a fail found is final); EXIT_INCOMPLETE when all that was captured
 * passed but a unit still waits for a condition.
 */
function exitCodeFor(units: readonly UnitCheck[], strict: boolean): number {
  const accepted = (s: string): boolean => s === 'pass' || (!strict && s === 'conditional-pass');
  const waiting = (u: UnitCheck): boolean => waitingConditions(u.verdict).length > 0;
  if (units.some((u) => !accepted(waiting(u) ? (u.verdict.soFar ?? u.verdict.statement) : u.verdict.statement))) return 1;
  return units.some(waiting) ? EXIT_INCOMPLETE : 0;
}

function flagConditional(ctx: CommandContext, spec: Spec, units: readonly UnitCheck[], strict: boolean): void {
  const conditional = units.filter((u) => u.verdict.statement === 'conditional-pass').map((u) => u.verdict.unit);
  if (conditional.length === 0) return;
  ctx.io.stderr(
    `note: ${conditional.join(', ')} passed conditionally: a value lies within its uncertainty of a limit in ${spec.file}${strict ? ' (--strict: counted as a failure)' : '; --strict would fail it'}\n`,
  );
}
