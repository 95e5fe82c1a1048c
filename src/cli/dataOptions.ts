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
import { terminalWidth, wrapNotice } from './terminalWidth.js';

export const DEFAULT_DATA_FOLDER = 'benchproof-data';

export interface StoreFlags {
  data?: string;
  operator?: string;
  /** false with --no-store; the shared store's address with --store URL. */
  store?: boolean | string;
  /** --allow-unverified: read the records even when some fail verification, those marked. */
  allowUnverified?: boolean;
}

export interface DataLocation {
  /** The bench's data folder (with a shared store: its outbox and the captures it has read). */
  readonly dir: string;
  /** How the user would write it: relative to the working directory when inside it; the shared store's address without its password. */
  readonly shown: string;
  readonly source: '--data' | 'BENCHPROOF_DATA' | 'default' | '--store' | 'BENCHPROOF_STORE';
  /** The shared store, when one is set (--store URL or BENCHPROOF_STORE). */
  readonly shared?: SharedLocation;
  /** With a shared store: the data folder as shown (`shown` names the store then); see folderOf. */
  readonly folder?: string;
}

/** The data folder as shown, whether or not a shared store is set. */
export const folderOf = (location: DataLocation): string => location.folder ?? location.shown;

export interface SharedLocation {
  /** As given, password included: only ever handed to the driver. */
  readonly url: string;
  /** Without the password (and any password parameter): how every message names it. */
  readonly shown: string;
  readonly source: '--store' | 'BENCHPROOF_STORE';
}

export function addDataOption(cmd: Command): Command {
  return cmd
    .option('--data <dir>', `data folder of the records (default: BENCHPROOF_DATA, else ./${DEFAULT_DATA_FOLDER})`)
    .option('--store <url>', 'the shared store several benches write to, postgres://USER@HOST/DATABASE (default: BENCHPROOF_STORE; the password from PGPASSWORD or ~/.pgpass)')
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
  const folder = rel === '' ? '.' : !rel.startsWith('..') && !isAbsolute(rel) ? `./${rel}` : dir;
  const shared = resolveSharedStore(ctx, flags);
  if (shared) return { dir, shown: shared.shown, source: shared.source, shared, folder };
  return { dir, shown: folder, source };
}

/** The shared store from --store URL, else BENCHPROOF_STORE (empty means none); undefined for the embedded store. */
export function resolveSharedStore(ctx: CommandContext, flags: StoreFlags): SharedLocation | undefined {
  const env = ctx.io.env.BENCHPROOF_STORE?.trim();
  const [url, source] = typeof flags.store === 'string' ? [flags.store, '--store' as const] : env ? [env, 'BENCHPROOF_STORE' as const] : [undefined, undefined];
  if (url === undefined || source === undefined) return undefined;
  return { url, shown: maskStoreUrl(url), source };
}

const SECRET_PARAMS = new Set(['password', 'sslpassword', 'sslkey']);

/**
 * The store's address as it may be printed: the password and password-like parameters replaced.
 * Read by hand rather than with URL, which refuses libpq's socket form with no host
 * (`postgres://bench@/benchproof?host=/var/run/postgresql`, PostgreSQL docs 34.1.1.2).
 */
export function maskStoreUrl(url: string): string {
  const m = /^([a-z][a-z0-9+.-]*):\/\/(?:([^@/?#]*)@)?([^/?#]*)([^?#]*)(?:\?([^#]*))?/i.exec(url.trim());
  if (!m) return 'the shared store (its address could not be read)';
  const [, scheme, userinfo, host, path, query] = m;
  const user = userinfo === undefined ? '' : `${userinfo.split(':')[0]}@`;
  const params = query === undefined ? '' : `?${query.split('&').map((pair) => (SECRET_PARAMS.has(safeDecode(pair.split('=')[0]).toLowerCase()) ? `${pair.split('=')[0]}=***` : pair)).join('&')}`;
  return safeDecode(`${scheme}://${user}${host}${path}${params}`);
}

function safeDecode(text: string): string {
  try {
    return decodeURIComponent(text);
  } catch {
    return text;
  }
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
  const text = `benchproof: ${what}; next: ${next}`;
  // On a terminal the notice is wrapped to its width; piped, it stays one line for scripts to read.
  ctx.io.stderr(`${ctx.io.stderrIsTTY ? wrapNotice(text, terminalWidth(ctx.io)) : text}\n`);
}

export const quoteArg = (s: string): string => (/^[\w./:@%+-]+$/.test(s) ? s : `"${s.replace(/(["\\$`])/g, '\\$1')}"`);
