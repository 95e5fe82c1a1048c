import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { addDataOption, folderOf } from '../dataOptions.js';
import type { StoreFlags } from '../dataOptions.js';
import { BenchError } from '../../types/index.js';

interface SyncOptions extends StoreFlags {
  json?: boolean;
}

export function registerSync(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('sync')
    .description('send the runs kept on this bench while the shared store could not be reached (each is stored there once)')
    .option('--json', 'print one JSON document (schemaVersion 1)');
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Runs checked while the shared store did not answer wait in the data folder; every command that opens
the shared store sends them first, and sync sends them now. Sending twice stores nothing twice.

Examples:
  benchproof sync --store postgres://bench@records.local/benchproof
  BENCHPROOF_STORE=postgres://bench@records.local/benchproof benchproof sync --json`,
    )
    .action(async (opts: SyncOptions) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      const { openDataStore, resolveDataDir, sendWaiting, waitingRuns } = await import('../store.js');
      const location = resolveDataDir(ctx, opts);
      if (!location.shared) {
        throw new BenchError({
          code: 'usage.missing-option',
          file: '-',
          problem: 'no shared store is set, so there is nothing to send runs to',
          expected: 'the shared store in --store URL or BENCHPROOF_STORE',
          fix: 'run benchproof sync --store postgres://USER@HOST/DATABASE',
        });
      }
      const before = waitingRuns(ctx, opts).length;
      // Opening sends what waits (store.ts); a failure there is retried here and reported as an error.
      const { store } = openDataStore(ctx, opts, 'read');
      try {
        sendWaiting(ctx, location, store, true);
      } finally {
        store.close();
      }
      const after = waitingRuns(ctx, opts).length;
      const sent = before - after;
      if (json) {
        ctx.io.stdout(`${JSON.stringify({ schemaVersion: 1, store: location.shown, dataDir: folderOf(location), sent, waiting: after }, null, 2)}\n`);
        return;
      }
      ctx.io.stdout(sent === 0 ? `nothing waiting on this bench (${folderOf(location)}) for ${location.shown}\n` : `sent ${sent} run(s) from ${folderOf(location)} to ${location.shown}; nothing waiting\n`);
    });
}
