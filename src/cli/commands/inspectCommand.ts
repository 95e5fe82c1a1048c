import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { resolvePath } from '../context.js';
import type { ReadingFlags } from '../readingFlags.js';
import { addReadingOptions, readingOptionsFrom } from '../readingFlags.js';

interface InspectOptions extends ReadingFlags {
  json?: boolean;
}

export function registerInspect(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('inspect')
    .description('show how capture files are understood: layout, preamble, header and unit rows, time base, channels, warnings and the first samples')
    .argument('<captures...>', 'CSV exports from a scope, logger or simulator (.csv or .csv.gz)')
    .option('--json', 'print one JSON document (schemaVersion 1) instead of text');
  return addReadingOptions(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof inspect samples/captures/FK-0101_mid.csv
  benchproof inspect samples/captures/FK-0104_high.csv --json
  benchproof inspect samples/captures/FK-0101_mid.csv --header-rows 1 --time-column 1`,
    )
    .action(async (files: string[], opts: InspectOptions, command: Command) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      const readOptions = await readingOptionsFrom(ctx, opts);
      const { inspectCapture, inspectFailure } = await import('../../capture/index.js');
      const docs = [];
      for (const file of files) {
        const path = resolvePath(ctx.io.cwd, file);
        try {
          const doc = await inspectCapture(path, readOptions);
          docs.push({ ...doc, capture: { ...doc.capture, path: file } });
        } catch (e) {
          // A file that cannot be read still shows its opening lines and where reading stopped (stderr: no result).
          const failed = json ? null : await inspectFailure(path, readOptions, e);
          if (failed) {
            const { renderInspectFailure } = await import('../../report/index.js');
            ctx.io.stderr(renderInspectFailure({ ...failed, path: file }, ctx.styleFor(command)));
          }
          throw e;
        }
      }
      if (json) {
        ctx.io.stdout(`${JSON.stringify(docs.length === 1 ? docs[0] : { schemaVersion: 1, files: docs }, null, 2)}\n`);
      } else {
        const { renderInspectText } = await import('../../report/index.js');
        ctx.io.stdout(renderInspectText(docs, ctx.styleFor(command)));
      }
    });
}
