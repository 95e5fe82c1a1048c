import type { Command } from 'commander';
import { stat } from 'node:fs/promises';
import type { CommandContext } from '../context.js';
import { resolvePath } from '../context.js';
import type { MeasureReport } from '../../types/index.js';
import { measurementLabelsOf } from '../../types/index.js';
import { createProgress } from '../progress.js';
import type { ReadingFlags } from '../readingFlags.js';
import { addReadingOptions, readingOptionsFrom } from '../readingFlags.js';

interface MeasureOptions extends ReadingFlags {
  channel?: string;
  json?: boolean;
  plotData?: boolean;
}

export function registerMeasure(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('measure')
    .description('measure every channel of one or more CSV captures')
    .argument('<captures...>', 'CSV exports from a scope, logger or simulator (.csv or .csv.gz)')
    .option('-c, --channel <name|N>', 'measure only this channel (name, or 1-based number)')
    .option('--json', 'print one JSON document (schemaVersion 1) instead of tables')
    .option('--plot-data', 'include waveform and spectrum excerpts for plotting in the JSON');
  return addReadingOptions(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof measure samples/captures/FK-0101_mid.csv
  benchproof measure samples/captures/FK-0104_high.csv --json
  benchproof measure samples/captures/*.csv --channel 1`,
    )
    .action(async (files: string[], opts: MeasureOptions, cmd: Command) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      const readOptions = { ...(await readingOptionsFrom(ctx, opts)), channel: opts.channel };
      // The stages load here, not at start-up (only what this command needs: no spec, records or report).
      const [{ readCapture }, { measureCapture }, { startMeasureWorkers }] = await Promise.all([
        import('../../capture/index.js'),
        import('../../analysis/index.js'),
        import('../measureWorkers.js'),
      ]);
      // Large captures are read and measured on every core; the workers start loading now.
      const sizes = await fileSizes(files.map((f) => resolvePath(ctx.io.cwd, f)));
      const workers = startMeasureWorkers(Math.max(0, ...sizes), undefined, ctx.io.env);
      const progress = createProgress(ctx, json);
      const reports: MeasureReport[] = [];
      try {
        for (const [i, file] of files.entries()) {
          let started = false;
          const readWith = {
            ...readOptions,
            onProgress: (done: number, total: number) => {
              if (!started) progress.start(file, total);
              started = true;
              progress.update(done);
            },
          };
          const capture = { ...(await readCapture(resolvePath(ctx.io.cwd, file), readWith, workers?.pieceOptions(sizes[i]))), path: file };
          const measureOptions = { plotData: Boolean(opts.plotData) };
          reports.push(workers ? await workers.measure(capture, measureOptions, measureCapture) : measureCapture(capture, measureOptions));
        }
      } finally {
        progress.stop();
        await workers?.close();
      }
      if (json) {
        // Each measurement id's display name rides along (the label table; no report stage needed for JSON).
        const labels = measurementLabelsOf(reports.flatMap((r) => r.channels.flatMap((c) => Object.keys(c.measurements))));
        const doc = reports.length === 1 ? { ...reports[0], labels } : { schemaVersion: 1, files: reports, labels };
        ctx.io.stdout(`${JSON.stringify(doc, null, 2)}\n`);
      } else {
        const { renderMeasureText } = await import('../../report/index.js');
        ctx.io.stdout(renderMeasureText(reports, ctx.styleFor(cmd)));
      }
    });
}


/** Sizes of the files in bytes (0 for those that cannot be read: the reader reports them). */
function fileSizes(paths: readonly string[]): Promise<number[]> {
  return Promise.all(paths.map((p) => stat(p).then((s) => (s.isFile() ? s.size : 0), () => 0)));
}
