import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { folderOf, resolveDataDir } from '../dataOptions.js';

interface CopyOptions {
  from: string;
  to: string;
  json?: boolean;
}

export function registerStore(program: Command, ctx: CommandContext): Command {
  const store = program.command('store').description('move records between stores');
  store
    .command('copy')
    .description("copy a bench's records and capture archive into the shared store, verifying every fingerprint and capture; running it again adds nothing")
    .requiredOption('--from <dir>', 'the data folder of the bench (its records.db and captures)')
    .requiredOption('--to <url>', 'the shared store, postgres://USER@HOST/DATABASE (the password from PGPASSWORD or ~/.pgpass)')
    .option('--json', 'print one JSON document (schemaVersion 1)')
    .addHelpText(
      'after',
      `
Examples:
  benchproof store copy --from benchproof-data --to postgres://bench@records.local/benchproof
  benchproof store copy --from /mnt/old-bench/benchproof-data --to postgres://bench@records.local/benchproof --json`,
    )
    .action(async (opts: CopyOptions) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      const { checkStoreUrl, openSharedCopy, shownStore } = await import('../../records/index.js');
      checkStoreUrl(opts.to, '--to');
      const from = resolveDataDir(ctx, { data: opts.from, store: false });
      const to = shownStore(opts.to);
      const tty = ctx.progressAllowed(json);
      const result = openSharedCopy(from.dir, folderOf(from), opts.to, (done, total) => {
        if (tty) ctx.io.stderr(`\rbenchproof: copying ${done}/${total}`);
      });
      if (tty) ctx.io.stderr('\n');
      if (json) {
        const { audit, ...counts } = result;
        ctx.io.stdout(`${JSON.stringify({ schemaVersion: 1, from: folderOf(from), to, ...counts, chainHead: audit.head, verified: { chained: audit.chained, captures: audit.archived } }, null, 2)}\n`);
        return;
      }
      const { runs, iterations, captures, audit } = result;
      ctx.io.stdout(
        `copied ${runs.copied} run(s) and ${iterations.copied} calibration iteration(s) from ${folderOf(from)} to ${to}` +
          ` (${runs.present + iterations.present} already there); ${captures} capture(s)\n` +
          `verified ${audit.chained} fingerprint(s) in the chain and ${audit.archived} capture(s); chain head ${audit.head}\n`,
      );
      ctx.io.stderr(`benchproof: the records of ${folderOf(from)} are in ${to}; next: benchproof units --store ${to.includes(' ') ? `"${to}"` : to}\n`);
    });
  return store;
}
