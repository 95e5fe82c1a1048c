/** Progress on stderr, only when it is a terminal and the output is not JSON (cli-progress). */
import { createRequire } from 'node:module';
import type cliProgressModule from 'cli-progress';
import type { CommandContext } from './context.js';
import { terminalSafe } from './terminalText.js';

/**
 * cli-progress (CommonJS) is required when the first bar is drawn, not when this module loads:
 * most runs (--json, pipes, CI) never draw one, and every command imports this file.
 */
const requireCjs = createRequire(import.meta.url);
let cliProgress: typeof cliProgressModule | null = null;
const barLibrary = (): typeof cliProgressModule => (cliProgress ??= requireCjs('cli-progress') as typeof cliProgressModule);

export interface Progress {
  start(label: string, total: number): void;
  update(value: number): void;
  stop(): void;
}

const quiet: Progress = { start() {}, update() {}, stop() {} };

export function createProgress(ctx: CommandContext, json: boolean): Progress {
  if (!ctx.progressAllowed(json)) return quiet;
  let bar: cliProgressModule.SingleBar | null = null;
  return {
    start(label, total) {
      bar?.stop();
      const lib = barLibrary();
      bar = new lib.SingleBar(
        {
          stream: process.stderr,
          // The bar writes to stderr itself, past the io filter: the file name is made safe here.
          format: `${terminalSafe(label.length > 40 ? `…${label.slice(-39)}` : label, false)} [{bar}] {percentage}% | {value}/{total}`,
          hideCursor: true,
          clearOnComplete: true,
        },
        lib.Presets.shades_classic,
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
