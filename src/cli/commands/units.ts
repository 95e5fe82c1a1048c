import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { addDataOption } from '../dataOptions.js';
import type { StoreFlags } from '../dataOptions.js';

interface UnitsOptions extends StoreFlags {
  spec?: string;
  json?: boolean;
}

export function registerUnits(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('units')
    .description('list the stored units with their current status (the latest run decides) and last test')
    .option('--spec <name>', 'only units checked against this spec name')
    .option('--json', 'print one JSON document (schemaVersion 1)');
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof units
  benchproof units --spec "FH-210 Kestrel VCO" --json
  BENCHPROOF_DATA=/mnt/bench/benchproof-data benchproof units`,
    )
    .action(async (opts: UnitsOptions, command: Command) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      // The records stage (SQLite) and the report load here, not at start-up.
      const [{ openVerifiedStore, unknownSpec }, { renderUnitsText }] = await Promise.all([import('../store.js'), import('../../report/index.js')]);
      const { store, location } = openVerifiedStore(ctx, opts, 'read');
      let units;
      try {
        if (opts.spec !== undefined && !store.specNames().includes(opts.spec)) throw unknownSpec(opts.spec, store.specNames(), location);
        units = store.listUnits({ spec: opts.spec });
      } finally {
        store.close();
      }
      if (json) {
        ctx.io.stdout(`${JSON.stringify({ schemaVersion: 1, dataDir: location.shown, units }, null, 2)}\n`);
        return;
      }
      if (units.length === 0) {
        ctx.io.stderr(`benchproof: no units stored in ${location.shown} yet; store one with benchproof check CAPTURES --spec SPEC\n`);
        return;
      }
      ctx.io.stdout(renderUnitsText(units, ctx.styleFor(command)));
    });
}
