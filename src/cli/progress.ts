/** Progress on stderr, only when it is a terminal and the output is not JSON (cli-progress). */
import cliProgress from 'cli-progress';
import type { CommandContext } from './context.js';

export interface Progress {
  start(label: string, total: number): void;
  update(value: number): void;
  stop(): void;
}

const quiet: Progress = { start() {}, update() {}, stop() {} };

export function createProgress(ctx: CommandContext, json: boolean): Progress {
  if (!ctx.progressAllowed(json)) return quiet;
  let bar: cliProgress.SingleBar | null = null;
  return {
    start(label, total) {
      bar?.stop();
      bar = new cliProgress.SingleBar(
        {
          stream: process.stderr,
          format: `${label.length > 40 ? `…${label.slice(-39)}` : label} [{bar}] {percentage}% | {value}/{total}`,
          hideCursor: true,
          clearOnComplete: true,
        },
        cliProgress.Presets.shades_classic,
      );
      bar.start(total, 0);
    },
    update(value) {
      bar?.update(value);
    },
    stop() {
      bar?.stop();
      bar = null;
    },
  };
}
