/**
 * The one way any command writes a file the user named (`record --out`, `batch --out`,
 * `spec init -o`, `watch --report-dir`). The rules, the same for every command:
 * - the text goes to a temporary file created exclusively in the target's own folder (O_EXCL with
 *   O_NOFOLLOW: a name planted there, link or not, is never opened or reused), is flushed, and is
 *   renamed over the target, so a reader never sees half a file and an existing target's other hard
 *   links keep their old bytes;
 * - an existing target must be a regular file (a device, FIFO or folder is refused), and is replaced
 *   only when the command allows it (`spec init` needs --force);
 * - a symbolic link at the target is refused, never followed or replaced: remove the link or name
 *   its target directly;
 * - nothing inside the data folder (the record store and the capture archive) is ever an output,
 *   and neither is any file the command reads (its captures, its spec).
 * A link swapped in between these checks and the rename is replaced by the report, not followed.
 */
import { closeSync, constants, fsyncSync, lstatSync, openSync, realpathSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import type { Stats } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { basename, dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { BenchError, systemErrorWords, type ErrorCode } from '../types/index.js';
import type { CommandContext } from './context.js';

export interface OutputRules {
  /** The option the path came from, for messages (`--out`, `-o`, `--report-dir`). */
  readonly option: string;
  /** Replace an existing regular file; when false, an existing file is refused. */
  readonly replace: boolean;
  /** Files the command reads; the output may be none of them. */
  readonly inputs?: readonly string[];
  /** The data folder (absolute); no path inside it is an output. */
  readonly dataDir?: string;
}

/** Check that `file` may be written under `rules`, without writing; returns the resolved path. */
export function checkOutputPath(ctx: CommandContext, file: string, rules: OutputRules): string {
  const target = resolve(ctx.io.cwd, file);
  const folder = realFolder(file, dirname(target), rules);
  const real = join(folder, basename(target));
  const found = lstatOrNull(real);
  if (found?.isSymbolicLink()) {
    throw refusal(file, rules, 'output.is-link', 'the path is a symbolic link; benchproof never writes through a link or replaces one', 'a path to a regular file or a new name', 'give the path the link points to, or remove the link first');
  }
  if (found && !found.isFile()) {
    throw refusal(file, rules, 'output.not-a-file', `the path is ${kindOf(found)}, not a regular file; it is left untouched`, 'a path to a regular file or a new name', `choose another ${rules.option} path`);
  }
  if (rules.dataDir !== undefined && inside(real, realOrSelf(rules.dataDir))) {
    throw refusal(file, rules, 'output.in-data-folder', 'the path is inside the data folder, which holds the record store and the capture archive', 'a path outside the data folder', `write the report elsewhere, e.g. ${rules.option} ./${basename(target)}`);
  }
  if (rules.inputs?.some((input) => sameFile(real, found, resolve(ctx.io.cwd, input)))) {
    throw refusal(file, rules, 'output.is-input', 'the path is one of the files this command reads', 'a new file name for the output', `write the output elsewhere, e.g. ${rules.option} report-${basename(target)}`);
  }
  if (found && !rules.replace) {
    throw refusal(file, rules, 'output.exists', 'the file exists already and is left untouched', 'a new file name, or the option that allows replacing it', `choose another name for ${rules.option}`);
  }
  return real;
}

/** Write `text` to `file` whole under `rules`; returns the absolute path written. */
export function writeOutputFile(ctx: CommandContext, file: string, text: string, rules: OutputRules): string {
  const real = checkOutputPath(ctx, file, rules);
  const temp = join(dirname(real), `.${basename(real).slice(0, 100)}.${process.pid}-${randomBytes(6).toString('hex')}.part`);
  let created = false;
  try {
    const fd = openSync(temp, constants.O_WRONLY | constants.O_CREAT | constants.O_EXCL | constants.O_NOFOLLOW, 0o644);
    created = true;
    try {
      const bytes = Buffer.from(text);
      for (let done = 0; done < bytes.length; ) done += writeSync(fd, bytes, done, bytes.length - done);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    // Checked again just before the rename, so a file put there meanwhile is judged by the same rules.
    checkOutputPath(ctx, file, rules);
    renameSync(temp, real);
    created = false;
  } catch (err) {
    if (err instanceof BenchError) throw err;
    throw refusal(file, rules, 'output.cannot-write', `the file could not be written: ${systemErrorWords((err as { code?: string }).code)}`, 'a file path in an existing folder this user may write to', `choose another ${rules.option} path, or create its folder first`);
  } finally {
    // Only the temporary this call created exclusively is ever removed.
    if (created) rmSync(temp, { force: true });
  }
  return real;
}

function realFolder(file: string, folder: string, rules: OutputRules): string {
  try {
    const real = realpathSync(folder);
    if (!statSync(real).isDirectory()) throw Object.assign(new Error('not a folder'), { code: 'ENOTDIR' });
    return real;
  } catch (err) {
    throw refusal(file, rules, 'output.cannot-write', `the folder of the file cannot be used: ${systemErrorWords((err as { code?: string }).code)}`, 'a file path in an existing folder', `create the folder first, or choose another ${rules.option} path`);
  }
}

function lstatOrNull(path: string): Stats | null {
  try {
    return lstatSync(path);
  } catch {
    return null;
  }
}

function realOrSelf(path: string): string {
  try {
    return realpathSync(path);
  } catch {
    return resolve(path);
  }
}

function inside(path: string, folder: string): boolean {
  const rel = relative(folder, path);
  return rel === '' || (!rel.startsWith('..') && !isAbsolute(rel));
}

/** The same path after links, or the same file (device and inode) when both exist. */
function sameFile(real: string, found: Stats | null, input: string): boolean {
  if (realOrSelf(input) === real) return true;
  if (!found) return false;
  try {
    const s = statSync(input);
    return s.dev === found.dev && s.ino === found.ino;
  } catch {
    return false;
  }
}

function kindOf(s: Stats): string {
  if (s.isDirectory()) return 'a folder';
  if (s.isFIFO()) return 'a named pipe';
  if (s.isCharacterDevice() || s.isBlockDevice()) return 'a device';
  if (s.isSocket()) return 'a socket';
  return 'not a regular file';
}

function refusal(file: string, rules: OutputRules, code: ErrorCode, problem: string, expected: string, fix: string): BenchError {
  return new BenchError({ code, file, problem: `${rules.option}: ${problem}`, expected, fix });
}
