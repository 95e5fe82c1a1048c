import type { Command } from 'commander';
import type { CliIo } from './io.js';
import { colorWanted, createStyle } from '../report/index.js';
import type { TextStyle } from '../report/index.js';

/** Shared by every command: the io, and the exit code the run will end with. */
export interface CommandContext {
  readonly io: CliIo;
  exitCode: number;
  /** Set by a command that prints JSON, so an error is printed as JSON too. */
  json: boolean;
  /** Style for stdout, honouring --no-color, NO_COLOR, TERM and TTY. */
  styleFor(cmd: Command): TextStyle;
  /** True when progress may be drawn on stderr (a TTY and not --json). */
  progressAllowed(json: boolean): boolean;
}

export function createContext(io: CliIo): CommandContext {
  return {
    io,
    exitCode: 0,
    json: false,
    styleFor(cmd: Command): TextStyle {
      const opts = cmd.optsWithGlobals() as { color?: boolean };
      return createStyle(colorWanted(io.stdoutIsTTY, io.env, opts.color !== false));
    },
    progressAllowed(json: boolean): boolean {
      return io.stderrIsTTY && !json && io.env.CI !== 'true';
    },
  };
}

/** Resolve a path the user gave against the working directory of the run. */
export { resolve as resolvePath } from 'node:path';
