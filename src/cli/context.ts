import type { Command } from 'commander';
import type { CliIo } from './io.js';
import type { TextStyle } from '../report/index.js';

/** Shared by every command: the io, and the exit code the run will end with. */
export interface CommandContext {
  readonly io: CliIo;
  exitCode: number;
  /** Set by a command that prints JSON, so an error is printed as JSON too. */
  json: boolean;
  /** Style for stdout, honouring --no-color, NO_COLOR, TERM and TTY (after loadTextStyle()). */
  styleFor(cmd: Command): TextStyle;
  /** True when progress may be drawn on stderr (a TTY and not --json). */
  progressAllowed(json: boolean): boolean;
}

type TextStyleKit = Pick<typeof import('../report/index.js'), 'colorWanted' | 'createStyle'>;

let kit: TextStyleKit | null = null;

/**
 * Loads text styling: the report stage with chalk, some 60 ms of start-up that `measure --json`
 * does without. main.ts awaits this before the action of every command that may print styled text.
 */
export async function loadTextStyle(): Promise<void> {
  kit ??= await import('../report/index.js');
}

export function createContext(io: CliIo): CommandContext {
  return {
    io,
    exitCode: 0,
    json: false,
    styleFor(cmd: Command): TextStyle {
      if (kit === null) throw new Error('styleFor was called before loadTextStyle() (main.ts loads it before each action that prints text)');
      const opts = cmd.optsWithGlobals() as { color?: boolean };
      return kit.createStyle(kit.colorWanted(io.stdoutIsTTY, io.env, opts.color !== false));
    },
    progressAllowed(json: boolean): boolean {
      return io.stderrIsTTY && !json && io.env.CI !== 'true';
    },
  };
}

/** Resolve a path the user gave against the working directory of the run. */
export { resolve as resolvePath } from 'node:path';
