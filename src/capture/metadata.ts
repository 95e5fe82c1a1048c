/**
 * Timing and units read from a capture's preamble of `key,value` lines. Keys are recognised by the
 * general words instruments use (sample interval or period, sample rate, vertical unit, record
 * length, start or trigger time), never by one product's spelling. A unit may sit in the key
 * (`interval (us)`) or after the value (`20 µs`, `50 kS/s`); a bare number is taken in SI base units.
 */
import type { DecimalMark } from '../types/index.js';
import { parseHeaderCell, parseUnit } from './units.js';

export interface MetadataTiming {
  /** Sample interval in seconds and the key it came from. */
  readonly interval?: { readonly value: number; readonly key: string };
  readonly verticalUnit?: string;
  readonly recordLength?: number;
  /** Time of the first sample, seconds. */
  readonly startTime?: number;
}

const INTERVAL = /(sampl\w*|time)\s*(interval|period|step|spacing)|\binterval\b|\bdt\b|x\s*-?\s*incr|increment|time\s*(per|\/)\s*(sample|point|pt)|seconds?\s*per\s*(sample|point)/;
const RATE = /(sampl\w*|acquisition)\s*(rate|freq\w*)|\bfs\b|samples?\s*(per|\/)\s*s(ec\w*)?\b|\bsa\/s\b/;
const VERTICAL_UNIT = /(vertical|voltage|amplitude|y|signal)\s*-?\s*units?|^units?$/;
const RECORD_LENGTH = /record\s*(length|size)|(number|no\.?|num|count)\s*(of\s*)?(points|samples)|^(points|samples|length)$|memory\s*depth/;
const START_TIME = /start\s*time|first\s*sample(\s*time)?|^t0$|time\s*(offset|origin)|x\s*-?\s*(origin|offset|zero)|horizontal\s*offset/;
const TRIGGER_TIME = /trigger\s*(time|offset|delay)/;

export function readMetadata(entries: readonly (readonly [string, string])[], decimalMark: DecimalMark): MetadataTiming {
  let interval: MetadataTiming['interval'];
  let verticalUnit: string | undefined;
  let recordLength: number | undefined;
  let startTime: number | undefined;
  for (const [rawKey, value] of entries) {
    const { name, unit: keyUnit } = parseHeaderCell(rawKey.replace(/[:=]\s*$/, ''));
    const key = name.toLowerCase().trim();
    const q = quantity(value, keyUnit, decimalMark);
    if (interval === undefined && INTERVAL.test(key) && q && isUnit(q.unit, 's') && q.value > 0) {
      interval = { value: q.value, key: rawKey };
    } else if (interval === undefined && RATE.test(key) && q && isUnit(q.unit, 'Hz') && q.value > 0) {
      interval = { value: 1 / q.value, key: rawKey };
    } else if (verticalUnit === undefined && VERTICAL_UNIT.test(key) && parseUnit(value)) {
      verticalUnit = value.trim();
    } else if (recordLength === undefined && RECORD_LENGTH.test(key) && q && Number.isInteger(q.value)) {
      recordLength = q.value;
    } else if (startTime === undefined && START_TIME.test(key) && q && isUnit(q.unit, 's')) {
      startTime = q.value;
    } else if (startTime === undefined && TRIGGER_TIME.test(key) && q && q.unit === 's') {
      // A trigger time counts only with an explicit time unit: a bare number may be a date or a position.
      startTime = q.value;
    }
  }
  return { interval, verticalUnit, recordLength, startTime };
}

function isUnit(unit: string, si: string): boolean {
  return unit === '' || unit === si;
}

/** A value with an optional unit, converted to SI; `unit` is the SI unit or '' when none was written. */
function quantity(raw: string, keyUnit: string, decimalMark: DecimalMark): { value: number; unit: string } | null {
  const text = decimalMark === ',' ? raw.trim().replace(',', '.') : raw.trim();
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(\S*)$/.exec(text.replace(/^"|"$/g, ''));
  if (!m) return null;
  const written = m[2] !== '' ? m[2] : keyUnit;
  if (written === '') return { value: Number(m[1]), unit: '' };
  const info = parseUnit(written);
  return info ? { value: Number(m[1]) * info.scale, unit: info.siUnit } : null;
}
