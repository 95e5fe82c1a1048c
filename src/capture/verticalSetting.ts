/**
 * The vertical setting a preamble states, entry by entry: volts per division, the number of
 * divisions, the vertical offset (volts) or position (divisions), a stated range or full scale, the
 * probe factor, and which channel each entry belongs to. Keys are recognised by the general words
 * bench instruments use (common practice, no source), never by one product's spelling:
 *
 * - a channel is named in the key (`CH1 Scale`, `Channel B offset`, `Ch2_Position`), in a label
 *   before the value (`Vertical scale,CH1:0.5`), by a `Source,CH2` line that opens a block of
 *   settings, or by position when one line lists a value per channel (`Volts/div,1.0,0.5`);
 * - values take units glued or spaced (`500mV`, `0.5 V/div`, `10 div`), a range `±10 V`,
 *   `-5 V to 5 V` or a plain `20 V`, a probe factor `10X`, `x10` or `10:1`.
 *
 * What the entries mean for a channel's full scale is decided in fullScale.ts.
 */
import type { DecimalMark } from '../types/index.js';
import { parseUnit } from './siUnits.js';

export type VerticalQuantity = 'volts-per-division' | 'divisions' | 'offset' | 'position' | 'range' | 'probe' | 'source';

/** One field of a vertical entry, in SI units (V, or divisions for `divisions` and `position`). */
export interface VerticalValue {
  /** The number, or the half-range for `range` when it was written with ±. */
  readonly value: number;
  /** A range written as its two ends (`-5 V to 5 V`). */
  readonly ends?: { readonly low: number; readonly high: number };
  /** A range written with ± (`±10 V`): `value` is half of it. */
  readonly symmetric?: boolean;
  /** Channel named by a label before the value (`CH1:0.5` → '1'), null without one. */
  readonly channel: string | null;
}

export interface VerticalEntry {
  readonly key: string;
  readonly quantity: VerticalQuantity;
  /** Channel named in the key ('1', '2'…), null when the key names none. */
  readonly channel: string | null;
  /** One per field after the key, null where a field is empty or not a value of this quantity. */
  readonly values: readonly (VerticalValue | null)[];
}

/** `CH1`, `Ch 2`, `Channel B`, `chan_3`, `Input 1`, `C1`: the channel's number (letters count from A = 1). */
const CHANNEL = /(?<![a-z0-9])(?:ch(?:an(?:nel)?)?|input|trace|c)[\s_#-]*([1-9]|[a-h])(?![a-z0-9])/i;
const KEYS: readonly (readonly [VerticalQuantity, RegExp])[] = [
  ['volts-per-division', /^(vertical\s*)?(scale|sensitivity)$|^volts?\s*(\/|per)\s*div(ision)?s?$|^v\s*\/\s*div$/],
  ['divisions', /^(vertical\s*|y\s*)?(grid\s*)?div(ision)?s?(\s*(count|number))?$|^(number|no\.?|num)\s*of\s*(vertical\s*)?(grid\s*)?div(ision)?s?$/],
  ['offset', /^(vertical|voltage|y|dc)?\s*offset$/],
  ['position', /^(vertical|y)?\s*position$/],
  ['range', /^(vertical|voltage|input|y)?\s*range$|^(vertical\s*|input\s*)?full[\s-]*scale(\s*range)?$/],
  ['probe', /^probe(\s*(attenuation|factor|ratio|multiplier|setting))?$|^(probe\s*)?attenuation$/],
  ['source', /^(source|channel|trace|waveform\s*source|signal\s*source)$/],
];

/** The entry a preamble line states about the vertical setting, or null when it states none. */
export function readVerticalEntry(key: string, rawValue: string, decimalMark: DecimalMark, keyUnit = ''): VerticalEntry | null {
  const lower = key.toLowerCase();
  const named = CHANNEL.exec(lower);
  const bare = (named ? lower.replace(named[0], ' ') : lower).replace(/[_\s]+/g, ' ').trim();
  const quantity = KEYS.find(([, re]) => re.test(bare))?.[0];
  if (quantity === undefined) return null;
  if (quantity === 'source') {
    const ch = channelOf(rawValue.trim().replace(/^"|"$/g, ''));
    return ch === null ? null : { key: key.trim(), quantity, channel: ch, values: [] };
  }
  const fields = rawValue.split(decimalMark === ',' ? /[;\t]/ : /[,;\t]/);
  // A unit in the key (`Offset (mV)`) scales the values written without one.
  const unitScale = keyUnit === '' || /^(div(ision)?s?|x)$/i.test(keyUnit) ? 1 : parseUnit(keyUnit)?.siUnit === 'V' ? parseUnit(keyUnit)!.scale : NaN;
  if (!Number.isFinite(unitScale)) return null;
  const values = fields.map((f) => fieldValue(f, quantity, decimalMark, unitScale));
  if (!values.some((v) => v !== null)) return null;
  return { key: key.trim(), quantity, channel: named ? channelNumber(named[1]) : null, values };
}

/** The channel a name or label refers to ('1'…), or null. A bare digit counts as a channel number. */
export function channelOf(text: string): string | null {
  const t = text.trim().toLowerCase();
  if (/^[1-9]$/.test(t)) return t;
  const m = CHANNEL.exec(t);
  return m ? channelNumber(m[1]) : null;
}

function channelNumber(s: string): string {
  return /\d/.test(s) ? s : String(s.charCodeAt(0) - 96);
}

function fieldValue(raw: string, quantity: VerticalQuantity, decimalMark: DecimalMark, unitScale: number): VerticalValue | null {
  let text = raw.trim().replace(/^"|"$/g, '').trim();
  let channel: string | null = null;
  const labelled = /^([A-Za-z][\w ]{0,15}?)\s*[:=]\s*(.+)$/.exec(text);
  if (labelled) {
    channel = channelOf(labelled[1]);
    if (channel === null) return null;
    text = labelled[2];
  }
  if (decimalMark === ',') text = text.replace(/(\d),(\d)/g, '$1.$2');
  const v = valueOf(text, quantity, unitScale);
  return v === null ? null : { ...v, channel };
}

function valueOf(text: string, quantity: VerticalQuantity, unitScale: number): Omit<VerticalValue, 'channel'> | null {
  const withUnit = (t: string): ReturnType<typeof numberWithUnit> => numberWithUnit(t, unitScale);
  switch (quantity) {
    case 'volts-per-division': {
      const q = withUnit(text);
      return q && q.value > 0 && (q.unit === 'V' || q.unit === '') ? { value: q.value } : null;
    }
    case 'divisions': {
      const q = withUnit(text);
      return q && (q.unit === 'div' || q.unit === '') && Number.isInteger(q.value) && q.value >= 2 && q.value <= 40 ? { value: q.value } : null;
    }
    case 'offset': {
      const q = withUnit(text);
      return q && (q.unit === 'V' || q.unit === '') ? { value: q.value } : null;
    }
    case 'position': {
      // A position is in divisions; one written in volts is not read (its sign convention varies).
      const q = withUnit(text);
      return q && (q.unit === 'div' || q.unit === '') ? { value: q.value } : null;
    }
    case 'range':
      return rangeOf(text, withUnit);
    case 'probe': {
      const m = /^(?:[x×*]\s*)?(\d+(?:\.\d+)?)\s*(?:[x×]|:\s*1)?$/i.exec(text);
      const p = m ? Number(m[1]) : NaN;
      return p > 0 ? { value: p } : null;
    }
    default:
      return null;
  }
}

function rangeOf(text: string, withUnit: (t: string) => ReturnType<typeof numberWithUnit>): Omit<VerticalValue, 'channel'> | null {
  const ends = /^(.+?)\s*(?:\bto\b|\.\.|…|~)\s*(.+)$/i.exec(text);
  if (ends) {
    const a = withUnit(ends[1]);
    const b = withUnit(ends[2]);
    const unit = b?.unit ?? '';
    if (!a || !b || (unit !== 'V' && unit !== '') || (a.unit !== '' && a.unit !== unit)) return null;
    const [low, high] = a.value < b.value ? [a.value, b.value] : [b.value, a.value];
    return high > low ? { value: (high - low) / 2, ends: { low, high } } : null;
  }
  const pm = /^(?:±|\+\/-|\+-)\s*(.+)$/.exec(text);
  const q = withUnit(pm ? pm[1] : text);
  if (!q || !(q.value > 0) || (q.unit !== 'V' && q.unit !== '')) return null;
  return pm ? { value: q.value, symmetric: true } : { value: q.value };
}

/**
 * A number with an optional unit (glued or spaced; `/div` dropped): volts, divisions or none. A
 * number without a unit is multiplied by `bareScale` (the key's unit), and then counts as volts.
 */
function numberWithUnit(raw: string, bareScale: number): { value: number; unit: 'V' | 'div' | '' } | null {
  const m = /^([+\-−]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([^\s\d][^\s]*)?$/.exec(raw.trim());
  if (!m) return null;
  const value = Number(m[1].replace('−', '-'));
  if (!Number.isFinite(value)) return null;
  const written = (m[2] ?? '').replace(/\/\s*div(ision)?s?$/i, '');
  if (written === '') return bareScale === 1 ? { value, unit: '' } : { value: value * bareScale, unit: 'V' };
  if (/^div(ision)?s?$/i.test(written)) return { value, unit: 'div' };
  const info = parseUnit(written);
  return info && info.siUnit === 'V' ? { value: value * info.scale, unit: 'V' } : null;
}
