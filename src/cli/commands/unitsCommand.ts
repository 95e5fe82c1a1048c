import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { addDataOption } from '../dataOptions.js';
import { knownWidth } from '../terminalWidth.js';
import type { StoreFlags } from '../dataOptions.js';
import type { UnitSummary } from '../../types/index.js';

interface UnitsOptions extends StoreFlags {
  spec?: string;
  json?: boolean;
  waiting?: boolean;
  failed?: boolean;
  passed?: boolean;
}

/** Which units a state filter keeps; no filter keeps all. Several filters keep any unit one of them keeps. */
function stateFilter(opts: UnitsOptions): (u: UnitSummary) => boolean {
  const accepted = (u: UnitSummary): boolean => u.status === 'pass' || u.status === 'conditional-pass';
  const tests: ((u: UnitSummary) => boolean)[] = [];
  if (opts.waiting) tests.push((u) => u.state === 'incomplete');
  if (opts.failed) tests.push((u) => u.state !== 'incomplete' && !accepted(u));
  if (opts.passed) tests.push((u) => u.state !== 'incomplete' && accepted(u));
  return tests.length ? (u) => tests.some((t) => t(u)) : () => true;
}

export function registerUnits(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('units')
    .description('list the stored units with their current state (the latest test attempt decides), what each still waits for, and last test')
    .option('--spec <name>', 'only units checked against this spec name')
    .option('--waiting', 'only units whose latest test attempt still waits for a condition (INCOMPLETE)')
    .option('--failed', 'only units whose latest complete attempt did not pass')
    .option('--passed', 'only units whose latest complete attempt passed (COND. PASS included)')
    .option('--json', 'print one JSON document (schemaVersion 1)');
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof units
  benchproof units --waiting
  benchproof units --spec "FH-210 Kestrel VCO" --json
  BENCHPROOF_DATA=/mnt/bench/benchproof-data benchproof units`,
    )
    .action(async (opts: UnitsOptions, command: Command) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      // The records stage (SQLite) and the report load here, not at start-up.
      const [{ openVerifiedStore, unknownSpec, waitingRuns, describeWaiting }, { renderUnitsText }] = await Promise.all([import('../store.js'), import('../../report/index.js')]);
      const { store, location } = describeWaiting(ctx, opts, () => openVerifiedStore(ctx, opts, 'read', 'listing'));
      const unsent = waitingRuns(ctx, opts);
      let units;
      try {
        if (opts.spec !== undefined && !store.specNames().includes(opts.spec)) throw unknownSpec(opts.spec, store.specNames(), location);
        units = store.listUnits({ spec: opts.spec }).filter(stateFilter(opts));
      } finally {
        store.close();
      }
      if (json) {
        ctx.io.stdout(`${JSON.stringify({ schemaVersion: 1, dataDir: location.shown, units, ...(location.shared ? { unsent } : {}) }, null, 2)}\n`);
        return;
      }
      if (unsent.length) ctx.io.stderr(`benchproof: ${unsent.length} run(s) still waiting on this bench to be sent: ${unsent.map((u) => `${u.unit} (${u.kind} #${u.rowId})`).join(', ')}; benchproof sync sends them\n`);
      if (units.length === 0) {
        const filtered = opts.waiting || opts.failed || opts.passed;
        ctx.io.stderr(
          filtered
            ? `benchproof: no unit in ${location.shown} matches ${[opts.waiting && '--waiting', opts.failed && '--failed', opts.passed && '--passed'].filter(Boolean).join(' or ')}; benchproof units lists them all\n`
            : `benchproof: no units stored in ${location.shown} yet; store one with benchproof check CAPTURES --spec SPEC\n`,
        );
        return;
      }
      ctx.io.stdout(renderUnitsText(units, ctx.styleFor(command), knownWidth(ctx.io)));
    });
}
