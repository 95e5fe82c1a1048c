/**
 * The light half of the records helpers: the `--data`/`--operator`/`--no-store` options, where the
 * data folder is, who ran the test, and the one-line notices. Nothing here loads the records stage
 * (SQLite and its helpers), so a command can register these options at start-up and import
 * `./store.js` inside its action. store.ts re-exports every name, so either import works.
 */
import { hostname, userInfo } from 'node:os';
import { relative, isAbsolute, resolve } from 'node:path';
import type { Command } from 'commander';
import type { CommandContext } from './context.js';

export const DEFAULT_DATA_FOLDER = 'benchproof-data';

export interface StoreFlags {
  data?: string;
  operator?: string;
  /** false with --no-store. */
  store?: boolean;
  /** --allow-unverified: read the records even when some fail verification, those marked. */
  allowUnverified?: boolean;
}

export interface DataLocation {
  readonly dir: string;
  /** How the user would write it: relative to the working directory when inside it. */
  readonly shown: string;
  readonly source: '--data' | 'BENCHPROOF_DATA' | 'default';
}

export function addDataOption(cmd: Command): Command {
  return cmd
    .option('--data <dir>', `data folder of the records (default: BENCHPROOF_DATA, else ./${DEFAULT_DATA_FOLDER})`)
    .option('--allow-unverified', 'read the records even when some runs fail verification (changed, damaged or deleted); those runs are named and marked');
}

/** For `check`: --data, --operator and --no-store. */
export function addRecordingOptions(cmd: Command): Command {
  return addDataOption(cmd)
    .option('--operator <name>', 'who ran the test (default: BENCHPROOF_OPERATOR, else the login name)')
    .option('--no-store', 'do not store this run in the records');
}

export function resolveDataDir(ctx: CommandContext, flags: StoreFlags): DataLocation {
  const env = ctx.io.env.BENCHPROOF_DATA;
  const [raw, source] = flags.data ? [flags.data, '--data' as const] : env ? [env, 'BENCHPROOF_DATA' as const] : [DEFAULT_DATA_FOLDER, 'default' as const];
  const dir = resolve(ctx.io.cwd, raw);
  const rel = relative(ctx.io.cwd, dir);
  const shown = rel === '' ? '.' : !rel.startsWith('..') && !isAbsolute(rel) ? `./${rel}` : dir;
  return { dir, shown, source };
}

export function resolveOperator(ctx: CommandContext, flags: StoreFlags): string {
  const given = flags.operator?.trim() || ctx.io.env.BENCHPROOF_OPERATOR?.trim();
  if (given) return given;
  try {
    return userInfo().username || 'unknown';
  } catch {
    return 'unknown';
  }
}

export function stationName(): string {
  return hostname() || 'unknown';
}

/** Say on stderr, in one line, what was written where and what to run next. */
export function notice(ctx: CommandContext, what: string, next: string): void {
  ctx.io.stderr(`benchproof: ${what}; next: ${next}\n`);
}

export const quoteArg = (s: string): string => (/^[\w./:@%+-]+$/.test(s) ? s : `"${s.replace(/(["\\$`])/g, '\\$1')}"`);
