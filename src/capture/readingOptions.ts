/**
 * Reading settings from flags, a reading profile file or a spec's `captures.reading`: checked here
 * once, so that every source gives the reader the same settings and the same errors.
 *
 * A profile is a small YAML (or JSON) map, written once per instrument:
 *
 *   reading: 1                 # the profile format
 *   name: bench scope, two header rows
 *   delimiter: tab             # comma | semicolon | tab | space
 *   decimal: comma             # point | comma
 *   skipRows: 0
 *   headerRows: 2
 *   timeColumn: 1              # number, name or none
 *   channelUnit: V             # or per channel: { CH1: V, CH2: mV }
 *   scale: { CH1: 0.0078125 }  # factor from the file's numbers to the unit
 *   interval: 2e-6             # or sampleRate: 500000
 *   segment: 1
 */
import type { DecimalMark, Delimiter, ReadCaptureOptions, ReadingSettings } from '../types/index.js';
import { BenchError } from '../types/index.js';

export type ReadingOptions = ReadCaptureOptions;

const DELIMITERS: Readonly<Record<string, Delimiter>> = { comma: ',', ',': ',', semicolon: ';', ';': ';', tab: '\t', '\t': '\t', '\\t': '\t', space: ' ', ' ': ' ' };
const MARKS: Readonly<Record<string, DecimalMark>> = { point: '.', dot: '.', '.': '.', period: '.', comma: ',', ',': ',' };
const FIELDS = ['reading', 'name', 'delimiter', 'decimal', 'skipRows', 'headerRows', 'timeColumn', 'channelUnit', 'scale', 'interval', 'sampleRate', 'segment'];

/** The setting for one channel: a single value for all, or the entry under its name or 1-based number. */
export function optionFor<T>(value: T | Readonly<Record<string, T>> | undefined, name: string, column: number): T | undefined {
  if (value === undefined || value === null) return undefined;
  if (typeof value !== 'object') return value as T;
  const map = value as Readonly<Record<string, T>>;
  const key = Object.keys(map).find((k) => k.toLowerCase() === name.toLowerCase()) ?? Object.keys(map).find((k) => k === String(column + 1));
  return key === undefined ? undefined : map[key];
}

export function delimiterOf(raw: string): Delimiter | undefined {
  return DELIMITERS[raw.toLowerCase()] ?? DELIMITERS[raw];
}

export function decimalMarkOf(raw: string): DecimalMark | undefined {
  return MARKS[raw.toLowerCase()];
}

interface Problem {
  readonly field: string;
  readonly problem: string;
  readonly expected: string;
}

/**
 * Checks a profile's map (already parsed from YAML or JSON, or taken from a spec) and returns its
 * settings; every mistake is listed at once in one BenchError (`capture.bad-profile`).
 */
export function readingSettings(raw: unknown, file: string, where = ''): ReadingSettings & { name?: string } {
  const problems: Problem[] = [];
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) {
    throw badProfile(file, [{ field: where || '(top)', problem: 'the reading profile is not a map of settings', expected: `a map with some of: ${FIELDS.join(', ')}` }]);
  }
  const o = raw as Record<string, unknown>;
  const at = (k: string): string => (where ? `${where}.${k}` : k);
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(o)) {
    if (!FIELDS.includes(k)) problems.push({ field: at(k), problem: `"${k}" is not a reading setting`, expected: `one of: ${FIELDS.join(', ')}` });
  }
  if (o.reading !== undefined && o.reading !== 1) problems.push({ field: at('reading'), problem: `format ${String(o.reading)} is not known`, expected: 'reading: 1' });
  if (o.name !== undefined) {
    if (typeof o.name === 'string') out.name = o.name;
    else problems.push({ field: at('name'), problem: 'the name is not text', expected: 'a short text naming the instrument' });
  }
  if (o.delimiter !== undefined) {
    const d = typeof o.delimiter === 'string' ? delimiterOf(o.delimiter) : undefined;
    if (d) out.delimiter = d;
    else problems.push({ field: at('delimiter'), problem: `"${String(o.delimiter)}" is not a delimiter`, expected: 'comma, semicolon, tab or space' });
  }
  if (o.decimal !== undefined) {
    const m = typeof o.decimal === 'string' ? decimalMarkOf(o.decimal) : undefined;
    if (m) out.decimalMark = m;
    else problems.push({ field: at('decimal'), problem: `"${String(o.decimal)}" is not a decimal mark`, expected: 'point or comma' });
  }
  for (const [k, max] of [['skipRows', 100000], ['headerRows', 2], ['segment', 1e9]] as const) {
    const v = o[k];
    if (v === undefined) continue;
    const min = k === 'segment' ? 1 : 0;
    if (typeof v === 'number' && Number.isInteger(v) && v >= min && v <= max) out[k] = v;
    else problems.push({ field: at(k), problem: `${String(v)} is not a whole number from ${min} to ${max}`, expected: `${k}: a whole number, e.g. ${k}: ${min + 1}` });
  }
  for (const k of ['interval', 'sampleRate'] as const) {
    const v = o[k];
    if (v === undefined) continue;
    if (typeof v === 'number' && v > 0 && Number.isFinite(v)) out[k] = v;
    else problems.push({ field: at(k), problem: `${String(v)} is not a positive number`, expected: `${k} in SI base units, e.g. ${k === 'interval' ? '2e-6' : '500000'}` });
  }
  if (o.timeColumn !== undefined) {
    const v = o.timeColumn;
    if ((typeof v === 'number' && Number.isInteger(v) && v >= 1) || (typeof v === 'string' && v.trim() !== '')) out.timeColumn = v;
    else problems.push({ field: at('timeColumn'), problem: `${String(v)} names no column`, expected: 'a 1-based column number, a column name, or none' });
  }
  const perChannel = <T>(k: string, ok: (v: unknown) => v is T, expected: string): void => {
    const v = o[k];
    if (v === undefined) return;
    if (ok(v)) out[k] = v;
    else if (v !== null && typeof v === 'object' && !Array.isArray(v) && Object.values(v).every(ok)) out[k] = v;
    else problems.push({ field: at(k), problem: `${JSON.stringify(v)} is not ${expected}`, expected: `${k}: ${expected}, or a map from channel name or number to it` });
  };
  perChannel('channelUnit', (v): v is string => typeof v === 'string' && v.trim() !== '', 'a unit such as V, mV, A or counts');
  perChannel('scale', (v): v is number => typeof v === 'number' && Number.isFinite(v) && v !== 0, 'a non-zero number');
  if (out.interval !== undefined && out.sampleRate !== undefined && Math.abs((out.interval as number) * (out.sampleRate as number) - 1) > 1e-9) {
    problems.push({ field: at('sampleRate'), problem: 'interval and sampleRate disagree', expected: 'one of the two, or values with interval × rate = 1' });
  }
  if (problems.length > 0) throw badProfile(file, problems);
  return out as ReadingSettings & { name?: string };
}

/** A profile file's text (YAML or JSON) → its settings; yaml is loaded only when a profile is used. */
export async function parseReadingProfile(text: string, file: string): Promise<ReadingSettings & { name?: string }> {
  const { parse } = await import('yaml');
  let data: unknown;
  try {
    data = parse(text, { logLevel: 'error', maxAliasCount: 16 });
  } catch (e) {
    throw badProfile(file, [{ field: '(file)', problem: `the profile is not valid YAML (${(e as Error).message.split('\n')[0]})`, expected: 'a YAML map of reading settings' }]);
  }
  return readingSettings(data, file);
}

/** Flags over the profile: a flag given on the command line wins. */
export function mergeSettings(profile: ReadingSettings, flags: ReadCaptureOptions): ReadCaptureOptions {
  const out: Record<string, unknown> = { ...profile };
  for (const [k, v] of Object.entries(flags)) if (v !== undefined) out[k] = v;
  if (flags.interval !== undefined) delete out.sampleRate;
  if (flags.sampleRate !== undefined) delete out.interval;
  delete out.name;
  return out as ReadCaptureOptions;
}

function badProfile(file: string, problems: readonly Problem[]) {
  const fields = problems.map((p) => ({
    code: 'capture.bad-profile' as const,
    file,
    problem: `${p.field}: ${p.problem}`,
    expected: p.expected,
    fix: 'correct the reading profile (README, "Reading profiles", shows every setting)',
  }));
  return new BenchError({ ...fields[0], ...(fields.length > 1 ? { issues: fields.slice(1) } : {}) });
}
