/**
 * Timing, units and vertical scaling read from a capture's preamble of `key,value` entries. Keys
 * are recognised by the general words instruments use (sample interval or period, sample rate,
 * vertical unit, record length, start or trigger time, vertical scale and offset, probe factor, the
 * size of one converter step), never by one product's spelling. Keys may be padded with spaces, tabs
 * and colons; a value may carry a channel prefix (`CH1:0.000002`), a unit glued to it (`0.40uS`,
 * `20.00mV`) or after it (`1.0E-06 s`), or a unit in the key (`interval (us)`). A bare number is
 * taken in SI base units.
 */
import type { DecimalMark } from '../types/index.js';
import { parseHeaderCell, parseUnit } from './siUnits.js';
import { readVerticalEntry } from './verticalSetting.js';
import type { VerticalEntry } from './verticalSetting.js';

export interface MetadataTiming {
  /** Sample interval in seconds and the key it came from. */
  readonly interval?: { readonly value: number; readonly key: string };
  readonly verticalUnit?: string;
  readonly recordLength?: number;
  /** Time of the first sample, seconds. */
  readonly startTime?: number;
  /** Converter codes to volts, when the preamble states the size of one step: v = (code − reference)·step + origin. */
  readonly codeScale?: { readonly step: number; readonly origin: number; readonly reference: number; readonly key: string };
  /** Volts per division, as stated (display only: without codes per division it converts nothing). */
  readonly voltsPerDivision?: number;
  /** What the preamble states of the vertical setting (scale, divisions, offset, range, probe), in order (verticalSetting.ts). */
  readonly vertical?: readonly VerticalEntry[];
  /** Keys of the preamble that were understood, as written, with what they gave. */
  readonly recognised: readonly { readonly key: string; readonly meaning: string; readonly value: number | string }[];
}

const INTERVAL = /(sampl\w*|time)\s*(interval|period|step|spacing)|\binterval\b|\bdt\b|(x|time)\s*-?\s*incr|^xinc$|^increment$|^x\s*increment$|time\s*(per|\/)\s*(sample|point|pt)|seconds?\s*per\s*(sample|point)|horizontal\s*(interval|resolution)|^sampling\s*period$/;
const RATE = /(sampl\w*|acquisition)\s*(rate|freq\w*)|\bfs\b|samples?\s*(per|\/)\s*s(ec\w*)?\b|\bsa\/s\b/;
const VERTICAL_UNIT = /(vertical|voltage|amplitude|y|signal)\s*-?\s*units?|^units?$/;
const RECORD_LENGTH = /record\s*(length|size)|(number|no\.?|num|count)\s*(of\s*)?(points|samples)|^(points|samples|length|data\s*length|memory\s*length)$|memory\s*depth/;
const START_TIME = /start\s*time|first\s*sample(\s*time)?|^t0$|^start$|^x\s*start$|time\s*(offset|origin)|x\s*-?\s*(origin|offset|zero)|^xorg$|horizontal\s*offset/;
const TRIGGER_TIME = /trigger\s*(time|offset|delay)/;
const TRIGGER_INDEX = /trigger\s*(point|index|sample)/;
const CODE_STEP = /y\s*-?\s*incr\w*|^yinc$|volts?\s*per\s*(count|code|lsb|step)|\bv\s*\/\s*(count|code|lsb)\b/;
const CODE_ORIGIN = /y\s*-?\s*origin|^yorg$/;
const CODE_REFERENCE = /y\s*-?\s*ref(erence)?$|^yref$/;
const VOLTS_PER_DIV = /vertical\s*scale|volts?\s*(\/|per)\s*div|v\s*\/\s*div|^scale$/;

const VERTICAL_MEANING: Readonly<Record<VerticalEntry['quantity'], string>> = {
  'volts-per-division': 'volts per division',
  divisions: 'vertical divisions on screen',
  offset: 'vertical offset (V)',
  position: 'vertical position (divisions)',
  range: 'vertical range (V)',
  probe: 'probe factor',
  source: 'settings below are for',
};

interface Quantity {
  readonly value: number;
  /** SI unit, or '' when none was written. */
  readonly unit: string;
}

export function readMetadata(entries: readonly (readonly [string, string])[], decimalMark: DecimalMark): MetadataTiming {
  const out: {
    interval?: MetadataTiming['interval'];
    verticalUnit?: string;
    recordLength?: number;
    startTime?: number;
    voltsPerDivision?: number;
  } = {};
  let step: { value: number; key: string } | undefined;
  let origin = 0;
  let reference = 0;
  let triggerIndex: number | undefined;
  const recognised: { key: string; meaning: string; value: number | string }[] = [];
  const vertical: VerticalEntry[] = [];
  const note = (key: string, meaning: string, value: number | string): void => void recognised.push({ key: key.trim(), meaning, value });
  for (const [rawKey, rawValue] of entries) {
    const { name, unit: keyUnit } = parseHeaderCell(cleanKey(rawKey));
    const key = name.toLowerCase().trim();
    const value = cleanValue(rawValue);
    const q = quantity(value, keyUnit, decimalMark);
    // The vertical setting, per channel (its keys name no time quantity, so they are read first).
    const v = readVerticalEntry(name, rawValue, decimalMark, keyUnit);
    if (v) {
      vertical.push(v);
      const first = v.values.find((x) => x !== null);
      note(rawKey, `${VERTICAL_MEANING[v.quantity]}${v.channel ? ` (channel ${v.channel})` : ''}`, first ? first.value : `channel ${v.channel}`);
      if (v.quantity === 'volts-per-division' && out.voltsPerDivision === undefined && first) out.voltsPerDivision = first.value;
      continue;
    }
    if (out.interval === undefined && INTERVAL.test(key) && q && isUnit(q.unit, 's') && q.value > 0) {
      out.interval = { value: q.value, key: rawKey.trim() };
      note(rawKey, 'sample interval (s)', q.value);
    } else if (out.interval === undefined && RATE.test(key) && q && isUnit(q.unit, 'Hz') && q.value > 0) {
      out.interval = { value: 1 / q.value, key: rawKey.trim() };
      note(rawKey, 'sample rate (Hz)', q.value);
    } else if (out.verticalUnit === undefined && VERTICAL_UNIT.test(key) && parseUnit(value)) {
      out.verticalUnit = value.trim();
      note(rawKey, 'vertical unit', out.verticalUnit);
    } else if (out.recordLength === undefined && RECORD_LENGTH.test(key) && q && Number.isInteger(q.value) && q.value > 0) {
      out.recordLength = q.value;
      note(rawKey, 'record length (samples)', q.value);
    } else if (out.startTime === undefined && START_TIME.test(key) && q && isUnit(q.unit, 's')) {
      out.startTime = q.value;
      note(rawKey, 'time of the first sample (s)', q.value);
    } else if (out.startTime === undefined && TRIGGER_TIME.test(key) && q && q.unit === 's') {
      // A trigger time counts only with an explicit time unit: a bare number may be a date or a position.
      out.startTime = q.value;
      note(rawKey, 'time of the first sample (s)', q.value);
    } else if (triggerIndex === undefined && TRIGGER_INDEX.test(key) && q && q.unit === '' && Number.isInteger(q.value)) {
      triggerIndex = q.value;
      note(rawKey, 'trigger at sample', q.value);
    } else if (step === undefined && CODE_STEP.test(key) && q && isUnit(q.unit, 'V') && q.value > 0) {
      step = { value: q.value, key: rawKey.trim() };
      note(rawKey, 'volts per converter step', q.value);
    } else if (CODE_ORIGIN.test(key) && q && isUnit(q.unit, 'V')) {
      origin = q.value;
      note(rawKey, 'volts at the reference code', q.value);
    } else if (CODE_REFERENCE.test(key) && q && q.unit === '') {
      reference = q.value;
      note(rawKey, 'reference code', q.value);
    } else if (out.voltsPerDivision === undefined && VOLTS_PER_DIV.test(key) && q && isUnit(q.unit, 'V') && q.value > 0) {
      out.voltsPerDivision = q.value;
      note(rawKey, 'volts per division', q.value);
    }
  }
  // A trigger given as a sample number puts the first sample that many intervals before it.
  if (out.startTime === undefined && triggerIndex !== undefined && out.interval) out.startTime = -triggerIndex * out.interval.value;
  return {
    ...out,
    ...(step ? { codeScale: { step: step.value, origin, reference, key: step.key } } : {}),
    ...(vertical.length > 0 ? { vertical } : {}),
    recognised,
  };
}

/** A key without padding, tabs, a leading `#` or trailing colons and equals signs. */
export function cleanKey(raw: string): string {
  return raw.replace(/^[\s#%]+/, '').replace(/[\s:=]+$/, '').replace(/\s+/g, ' ');
}

/** A value without quotes, padding or a label before a colon (`CH1:0.000002`, `Analog:140000`). */
function cleanValue(raw: string): string {
  const v = raw.trim().replace(/^"|"$/g, '').replace(/^[:=]\s*/, '').trim();
  const labelled = /^[A-Za-z][\w ]{0,15}:\s*([+-]?[\d.,].*)$/.exec(v);
  return labelled ? labelled[1] : v;
}

function isUnit(unit: string, si: string): boolean {
  return unit === '' || unit === si;
}

/** A value with an optional unit (glued or spaced, `/div` dropped), converted to SI. */
function quantity(raw: string, keyUnit: string, decimalMark: DecimalMark): Quantity | null {
  const text = decimalMark === ',' ? raw.replace(',', '.') : raw;
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([^\s\d][^\s]*)?$/.exec(text.trim());
  if (!m) return null;
  const written = (m[2] ?? '').replace(/\/div$/i, '').replace(/^x$/i, '') || keyUnit;
  if (written === '') return { value: Number(m[1]), unit: '' };
  const info = parseUnit(written);
  return info ? { value: Number(m[1]) * info.scale, unit: info.siUnit } : null;
}
