/**
 * The reading flags shared by the commands that read captures: --profile, --delimiter, --decimal,
 * --skip-rows, --header-rows, --time-column, --channel-unit, --scale, --segment. A flag overrides
 * the same setting of a profile; the profile's name (or path) is recorded with every capture read.
 */
import { readFile } from 'node:fs/promises';
import type { Command } from 'commander';
import type { CommandContext } from './context.js';
import { resolvePath } from './context.js';
import type { ReadCaptureOptions, ReadingSettings } from '../types/index.js';
import { BenchError, systemErrorWords } from '../types/index.js';
import { parsePositive } from './options.js';

export interface ReadingFlags {
  profile?: string;
  delimiter?: string;
  decimal?: string;
  skipRows?: string;
  headerRows?: string;
  timeColumn?: string;
  channelUnit?: string;
  scale?: string;
  segment?: string;
  sampleRate?: string;
  interval?: string;
  unpackLimit?: string;
}

export function addReadingOptions(cmd: Command): Command {
  return cmd
    .option('--sample-rate <Hz>', 'sample rate, when a file has no time column or interval metadata')
    .option('--interval <s>', 'sample interval in seconds (instead of --sample-rate)')
    .option('--profile <file>', 'reading profile: how this instrument writes its files (YAML; see README)')
    .option('--delimiter <d>', 'field delimiter: comma, semicolon, tab or space')
    .option('--decimal <mark>', 'decimal mark: point or comma')
    .option('--skip-rows <n>', 'lines to drop at the top of the file before reading')
    .option('--header-rows <n>', 'header rows just above the data: 0, 1 (names) or 2 (names, then units)')
    .option('--time-column <n|name>', 'the time (or index) column, by 1-based number or name; none for no time column')
    .option('--channel-unit <unit|NAME=unit,…>', 'unit of channels that state none (e.g. V, mV, counts)')
    .option('--scale <k|NAME=k,…>', 'factor from the numbers in the file to the unit (e.g. volts per converter count)')
    .option('--segment <n>', 'which acquisition to read when the file holds several (default 1)')
    .option('--unpack-limit <MB>', 'most megabytes a .csv.gz may unpack to (default 100× its size, at least 256 MiB)');
}

/** The flags (and the profile they name) as reader options. */
export async function readingOptionsFrom(ctx: CommandContext, flags: ReadingFlags): Promise<ReadCaptureOptions> {
  const capture = await import('../capture/index.js');
  let profile: (ReadingSettings & { name?: string }) | null = null;
  let profileName: string | undefined;
  if (flags.profile !== undefined) {
    const path = resolvePath(ctx.io.cwd, flags.profile);
    const text = await readFile(path, 'utf8').catch((e: NodeJS.ErrnoException) => {
      throw new BenchError({
        code: 'usage.profile-unreadable',
        file: flags.profile!,
        problem: `cannot read the reading profile: ${e.code ? systemErrorWords(e.code) : e.message}`,
        expected: 'the path of a YAML reading profile',
        fix: 'check the path given to --profile',
      });
    });
    profile = await capture.parseReadingProfile(text, flags.profile);
    profileName = profile.name ? `${profile.name} (${flags.profile})` : flags.profile;
  }
  const given: ReadCaptureOptions = {
    delimiter: flags.delimiter === undefined ? undefined : choice('--delimiter', flags.delimiter, capture.delimiterOf(flags.delimiter), 'comma, semicolon, tab or space'),
    decimalMark: flags.decimal === undefined ? undefined : choice('--decimal', flags.decimal, capture.decimalMarkOf(flags.decimal), 'point or comma'),
    skipRows: whole('--skip-rows', flags.skipRows, 0),
    headerRows: whole('--header-rows', flags.headerRows, 0, 2),
    segment: whole('--segment', flags.segment, 1),
    timeColumn: flags.timeColumn === undefined ? undefined : /^\d+$/.test(flags.timeColumn.trim()) ? Number(flags.timeColumn) : flags.timeColumn.trim().toLowerCase() === 'none' ? 'none' : flags.timeColumn.trim(),
    channelUnit: perChannel(flags.channelUnit, (v) => v),
    scale: perChannel(flags.scale, (v, k) => parsePositive(`--scale${k ? ` ${k}=` : ''}`, v)),
    sampleRate: parsePositive('--sample-rate', flags.sampleRate),
    interval: parsePositive('--interval', flags.interval),
    unpackLimitMB: parsePositive('--unpack-limit', flags.unpackLimit),
  };
  const merged = capture.mergeSettings(profile ?? {}, given);
  // The settings are checked once, whatever their source, with the reader's own rules.
  capture.readingSettings({ ...toProfileFields(merged) }, flags.profile ?? '-');
  return profileName ? { ...merged, profile: profileName } : merged;
}

function choice<T>(flag: string, raw: string, value: T | undefined, expected: string): T {
  if (value !== undefined) return value;
  throw new BenchError({ code: 'usage.bad-choice', file: '-', problem: `${flag} got "${raw}"`, expected, fix: `write ${flag} ${expected.split(',')[0]}` });
}

function whole(flag: string, raw: string | undefined, min: number, max = 1e9): number | undefined {
  if (raw === undefined) return undefined;
  const v = Number(raw.trim());
  if (Number.isInteger(v) && v >= min && v <= max) return v;
  throw new BenchError({ code: 'usage.bad-number', file: '-', problem: `${flag} got "${raw}", which is not a whole number from ${min}${max < 1e9 ? ` to ${max}` : ' up'}`, expected: `a whole number, e.g. ${flag} ${min + 1}`, fix: `write ${flag} with a whole number such as ${min + 1}` });
}

/** `V` for every channel, or `CH1=V,CH2=mV` per channel. */
function perChannel<T>(raw: string | undefined, value: (v: string, key?: string) => T | undefined): T | Record<string, T> | undefined {
  if (raw === undefined) return undefined;
  if (!raw.includes('=')) return value(raw.trim());
  const out: Record<string, T> = {};
  for (const part of raw.split(',')) {
    const [k, v = ''] = part.split('=');
    const parsed = value(v.trim(), k.trim());
    if (parsed !== undefined) out[k.trim()] = parsed;
  }
  return out;
}

/** Reader options back in the profile's field names, to check them with the profile's rules. */
function toProfileFields(o: ReadCaptureOptions): Record<string, unknown> {
  const fields: Record<string, unknown> = {};
  const names: Record<string, string> = { delimiter: 'delimiter', decimalMark: 'decimal', skipRows: 'skipRows', headerRows: 'headerRows', timeColumn: 'timeColumn', channelUnit: 'channelUnit', scale: 'scale', segment: 'segment', interval: 'interval', sampleRate: 'sampleRate' };
  for (const [k, name] of Object.entries(names)) {
    const v = (o as Record<string, unknown>)[k];
    if (v !== undefined) fields[name] = v;
  }
  return fields;
}
