/**
 * Units written in column headers, unit rows and metadata values, converted to SI base units (SI
 * Brochure, 9th ed. 2019, §3: prefixes n = 1e-9, µ = 1e-6, m = 1e-3, k = 1e3, M = 1e6, G = 1e9).
 * `u` for µ is the common ASCII stand-in, and a capital `S` after a prefix (`uS`, `mS`) means
 * seconds in instrument exports, never siemens (common practice, no source).
 */
import type { ColumnLayout } from '../types/index.js';

export interface UnitInfo {
  readonly scale: number;
  readonly siUnit: string;
}

/** The unit of raw converter codes: no physical scale is known. */
export const COUNTS = 'counts';
/** Levels of a spectrum, which is not a waveform. */
export const DECIBELS = 'dB';

const PREFIX: Readonly<Record<string, number>> = {
  p: 1e-12, n: 1e-9, u: 1e-6, 'µ': 1e-6, 'μ': 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9,
};
const BASE: Readonly<Record<string, string>> = { s: 's', S: 's', V: 'V', A: 'A', Hz: 'Hz', 'S/s': 'Hz', 'Sa/s': 'Hz', 'pts/s': 'Hz' };
const WORDS: Readonly<Record<string, UnitInfo>> = {
  sec: { scale: 1, siUnit: 's' },
  secs: { scale: 1, siUnit: 's' },
  seconds: { scale: 1, siUnit: 's' },
  second: { scale: 1, siUnit: 's' },
  msec: { scale: 1e-3, siUnit: 's' },
  usec: { scale: 1e-6, siUnit: 's' },
  nsec: { scale: 1e-9, siUnit: 's' },
  volt: { scale: 1, siUnit: 'V' },
  volts: { scale: 1, siUnit: 'V' },
  millivolt: { scale: 1e-3, siUnit: 'V' },
  millivolts: { scale: 1e-3, siUnit: 'V' },
  amp: { scale: 1, siUnit: 'A' },
  amps: { scale: 1, siUnit: 'A' },
  ampere: { scale: 1, siUnit: 'A' },
  hertz: { scale: 1, siUnit: 'Hz' },
  counts: { scale: 1, siUnit: COUNTS },
  count: { scale: 1, siUnit: COUNTS },
  codes: { scale: 1, siUnit: COUNTS },
  lsb: { scale: 1, siUnit: COUNTS },
  adc: { scale: 1, siUnit: COUNTS },
  db: { scale: 1, siUnit: DECIBELS },
  dbm: { scale: 1, siUnit: DECIBELS },
  dbv: { scale: 1, siUnit: DECIBELS },
  dbu: { scale: 1, siUnit: DECIBELS },
  dbc: { scale: 1, siUnit: DECIBELS },
  'dbµv': { scale: 1, siUnit: DECIBELS },
  dbuv: { scale: 1, siUnit: DECIBELS },
};

/** Scale and SI unit of a written unit such as `mV`, `µs`, `us`, `uS`, `kHz`, `Volt`, or null when unknown. */
export function parseUnit(raw: string): UnitInfo | null {
  const u = raw.trim();
  if (u === '') return null;
  const word = WORDS[u.toLowerCase()];
  if (word) return word;
  for (const [base, si] of Object.entries(BASE)) {
    if (!u.endsWith(base)) continue;
    const prefix = u.slice(0, u.length - base.length);
    // A capital S alone is a sample count in `S/s`; as seconds it takes a prefix below one (`uS`, `mS`) or stands alone.
    if (base === 'S' && prefix !== '' && !/^[pnuµμm]$/.test(prefix)) continue;
    const scale = PREFIX[prefix];
    if (scale !== undefined) return { scale, siUnit: si };
  }
  // Lower-case spellings (`mv`, `us`, `v`) are accepted only for prefixes below one, where no
  // capital prefix could be meant (mV and MV differ; mv can only be millivolts in a capture).
  const lower = /^([pnuµμm]?)(s|v|a)$/.exec(u);
  if (lower) return { scale: PREFIX[lower[1]], siUnit: lower[2] === 's' ? 's' : lower[2].toUpperCase() };
  return null;
}

/**
 * A cell of a units row: `s`, `(ms)`, `[V]`, `Volt`, `Second`, `/ s`, `in V`. Returns the unit as
 * written without its brackets, or null when the cell is not a unit.
 */
export function parseUnitCell(cell: string): string | null {
  const s = cell.trim().replace(/^[([{]\s*(.*?)\s*[)\]}]$/, '$1').replace(/^(\/|in\s)\s*/i, '').trim();
  return parseUnit(s) ? s : null;
}

/**
 * Splits a header cell into a name and a unit: `Time (s)`, `t[ms]`, `CH1 (mV)`, `CH1 / V`,
 * `Time in s`, `C1 in V`, `time_s`, `ch1_mv`, `V(out)`, or a unit alone (`(s)`, `Volt`) with no
 * name. A suffix after `_` or ` in ` counts as a unit only when it is a known unit.
 */
export function parseHeaderCell(cell: string): { name: string; unit: string } {
  const s = cell.trim();
  // Circuit-simulator probes: V(node) is a voltage, I(part) a current; the whole cell is the name.
  const probe = /^([VI])\(([^()]+)\)$/.exec(s);
  if (probe && !parseUnit(probe[2])) return { name: s, unit: probe[1] === 'V' ? 'V' : 'A' };
  const bracket = /^(.*?)\s*[([{]\s*([^()[\]{}]*?)\s*[)\]}]\s*$/.exec(s);
  // Bracketed text is a unit when it reads as one; `Voltage (CH1)` keeps its brackets in the name.
  if (bracket && bracket[1] !== '' && (parseUnit(bracket[2]) || /^[^\d\s]{1,4}$/.test(bracket[2]))) {
    return { name: bracket[1], unit: bracket[2] };
  }
  const slash = /^(.*?\S)\s*\/\s*(\S+)$/.exec(s);
  if (slash && (slash[1].length >= 2 || /\s\/\s/.test(s)) && parseUnit(slash[2])) return { name: slash[1], unit: slash[2] };
  const inUnit = /^(.+?)\s+in\s+(\S+)$/i.exec(s);
  if (inUnit && parseUnit(inUnit[2])) return { name: inUnit[1], unit: inUnit[2] };
  const suffix = /^(.+?)_([A-Za-zµμ/]+)$/.exec(s);
  if (suffix && parseUnit(suffix[2])) return { name: suffix[1], unit: suffix[2] };
  const alone = parseUnitCell(s);
  // A unit in brackets alone names nothing (`(ms)`, `[V]`); a unit word (`Second`, `Volts`) is both
  // the column's name, as before, and its unit.
  if (alone !== null && alone !== s) return { name: '', unit: alone };
  if (alone !== null && /^[a-z]{4,}$/i.test(s)) return { name: s, unit: alone };
  return { name: s, unit: '' };
}

/** Column layout of one header cell, or of a missing header (`fallbackName`, unit from metadata). */
export function columnLayout(cell: string | null, fallbackName: string, defaultUnit = ''): ColumnLayout {
  const { name, unit } = cell === null ? { name: '', unit: defaultUnit } : parseHeaderCell(cell);
  const written = unit === '' ? defaultUnit : unit;
  const info = parseUnit(written);
  return {
    name: name === '' ? fallbackName : name,
    unit: written,
    scale: info?.scale ?? 1,
    siUnit: info?.siUnit ?? '',
  };
}
