/**
 * A channel's full scale from the vertical setting its preamble states (verticalSetting.ts), so the
 * analysis can tell a trace the scope clipped at its screen edge from a circuit that saturated inside
 * it (flatTops.ts). Common practice (no source); the rule:
 *
 * - Half the range is volts per division × divisions / 2, or a stated range: `±R` is ±R, `a to b` is
 *   a…b, and a plain `R` is read both as a span (±R/2) and as ±R, since instruments write it both ways.
 * - The centre is 0, moved by a position of P divisions to −P × volts per division (a trace moved up
 *   shows the voltage below the centre), and by a vertical offset O to +O or −O: scopes differ on
 *   whether the offset is the voltage at the centre or what is added to the trace, so both are kept.
 * - A probe factor p other than 1 keeps the window as stated and p times it: the setting may be
 *   written at the probe's tip or at the scope's input.
 * Each reading is a candidate window. The samples must fit a true one: a digitiser records at most a
 * little past the screen (8-bit converters with 25 codes a division on an 8-division screen digitise
 * ±5.12 div, 28 % of the half range past ±4 div, from memory), so a window is kept when no sample
 * lies more than 15 % of its span past either edge. The full scale is the intersection of the windows
 * kept: its edges are the nearest edge any consistent reading allows, so a flat run at either is
 * taken for the scope's (withheld, never passed) rather than the circuit's. No window kept: the
 * preamble does not describe this trace (a warning says so) and nothing changes.
 */
import type { CaptureChannel, CaptureWarning } from '../types/index.js';
import type { MetadataTiming } from './metadata.js';
import type { ColumnRoles } from './roles.js';
import type { VerticalEntry, VerticalQuantity, VerticalValue } from './verticalSetting.js';
import { channelOf } from './verticalSetting.js';

/** How far past a window's edge samples may lie, as a share of its span (see above). */
const OVERRANGE = 0.15;

export interface ChannelPlace {
  readonly name: string;
  /** 0-based file column. */
  readonly column: number;
  /** 1-based rank among the file's channel columns. */
  readonly ordinal: number;
  readonly channelCount: number;
  readonly columnCount: number;
}

export interface StatedFullScale {
  readonly fullScale?: { readonly low: number; readonly high: number };
  /** Preamble keys the full scale came from. */
  readonly keys: readonly string[];
  readonly warning?: CaptureWarning;
}

/**
 * The full-scale fields of the channel in file column `column`, when its preamble states a vertical
 * setting that fits the trace; a setting that does not fit adds a warning to `warnings`. Channels in
 * converter counts, or rescaled by --scale, are left alone: the stated volts do not describe them.
 */
export function channelFullScale(meta: MetadataTiming, roles: ColumnRoles, column: number, samples: Float64Array, warnings: CaptureWarning[]): Pick<CaptureChannel, 'fullScale' | 'fullScaleFrom' | 'fullScaleKeys'> {
  const layout = roles.columns[column];
  const source = roles.unitSources[column];
  if (!meta.vertical || (layout.siUnit !== 'V' && layout.siUnit !== '') || source === 'counts' || source === 'scale-option') return {};
  const place = { name: layout.name, column, ordinal: roles.channelColumns.indexOf(column) + 1, channelCount: roles.channelColumns.length, columnCount: roles.columns.length };
  const stated = statedFullScale(meta.vertical, place, samples);
  if (stated.warning) warnings.push(stated.warning);
  return stated.fullScale ? { fullScale: stated.fullScale, fullScaleFrom: 'preamble', fullScaleKeys: stated.keys } : {};
}

type Settings = Map<VerticalQuantity, { readonly value: VerticalValue; readonly key: string }>;

export function statedFullScale(entries: readonly VerticalEntry[], place: ChannelPlace, samples: Float64Array): StatedFullScale {
  const settings = settingsFor(entries, place);
  const windows = candidateWindows(settings);
  if (windows.length === 0) return { keys: [] };
  const keys = [...settings.values()].map((s) => s.key);
  const { min, max } = finiteRange(samples);
  if (!(max >= min)) return { keys: [] };
  const kept = windows.filter((w) => min >= w.low - OVERRANGE * (w.high - w.low) && max <= w.high + OVERRANGE * (w.high - w.low));
  const low = Math.max(...kept.map((w) => w.low));
  const high = Math.min(...kept.map((w) => w.high));
  if (kept.length === 0 || !(high > low)) {
    const w = windows[0];
    return {
      keys,
      warning: {
        code: 'full-scale-mismatch',
        channel: place.name,
        message: `the preamble's vertical setting for ${place.name} (${keys.join(', ')}) gives a range of ${fmt(w.low)} V to ${fmt(w.high)} V${windows.length > 1 ? ' (or another reading of it)' : ''}, but the trace spans ${fmt(min)} V to ${fmt(max)} V; the range was not used to tell the scope's clipping from the circuit's`,
      },
    };
  }
  return { fullScale: { low, high }, keys };
}

/** Per quantity, the value for this channel: one naming it beats one for every channel. */
function settingsFor(entries: readonly VerticalEntry[], place: ChannelPlace): Settings {
  const id = channelOf(place.name) ?? String(place.ordinal);
  const named = new Set(entries.flatMap((e) => [e.channel, ...e.values.map((v) => v?.channel ?? null)]).filter((c): c is string => c !== null));
  // A file with one channel column whose preamble names one channel: that is this one.
  const ids = new Set([id, ...(place.channelCount === 1 && named.size === 1 ? named : [])]);
  const specific: Settings = new Map();
  const general: Settings = new Map();
  let current: string | null = null;
  for (const e of entries) {
    if (e.quantity === 'source') {
      current = e.channel;
      continue;
    }
    const pick = valueFor(e, current, ids, place);
    if (!pick) continue;
    const slot = pick.specific ? specific : general;
    if (!slot.has(e.quantity)) slot.set(e.quantity, { value: pick.value, key: e.key });
  }
  return new Map([...general, ...specific]);
}

function valueFor(e: VerticalEntry, current: string | null, ids: ReadonlySet<string>, place: ChannelPlace): { value: VerticalValue; specific: boolean } | null {
  const given = e.values.filter((v): v is VerticalValue => v !== null);
  if (e.channel !== null) return ids.has(e.channel) && given.length > 0 ? { value: given[0], specific: true } : null;
  if (given.some((v) => v.channel !== null)) {
    const mine = given.find((v) => v.channel !== null && ids.has(v.channel));
    return mine ? { value: mine, specific: true } : null;
  }
  if (given.length === 1) {
    if (current === null) return { value: given[0], specific: false };
    return ids.has(current) ? { value: given[0], specific: true } : null;
  }
  // Several values on one line: one per channel column in order, or one under each file column.
  const at = e.values.length === place.channelCount ? place.ordinal - 1 : e.values.length === place.columnCount - 1 ? place.column - 1 : -1;
  const v = at >= 0 ? e.values[at] : null;
  return v ? { value: v, specific: true } : null;
}

interface Window {
  readonly low: number;
  readonly high: number;
}

function candidateWindows(s: Settings): Window[] {
  const get = (q: VerticalQuantity): VerticalValue | undefined => s.get(q)?.value;
  const [perDiv, divisions, offset, position, range, probe] = (['volts-per-division', 'divisions', 'offset', 'position', 'range', 'probe'] as const).map(get);
  const halves: number[] = [];
  const explicit: Window[] = [];
  if (range?.ends) explicit.push(range.ends);
  else if (range) halves.push(...(range.symmetric ? [range.value] : [range.value / 2, range.value]));
  else if (perDiv && divisions) halves.push((perDiv.value * divisions.value) / 2);
  else return [];
  // A trace moved by a position in divisions cannot be placed without the volts per division.
  if (position && position.value !== 0 && !perDiv) return [];
  let centres = [position && perDiv ? -position.value * perDiv.value : 0];
  if (offset && offset.value !== 0) centres = centres.flatMap((c) => [c + offset.value, c - offset.value]);
  const factors = probe && probe.value !== 1 ? [1, probe.value] : [1];
  const out: Window[] = [];
  for (const f of factors) {
    for (const h of halves) for (const c of centres) out.push({ low: f * (c - h), high: f * (c + h) });
    for (const w of explicit) out.push({ low: f * w.low, high: f * w.high });
  }
  // A setting written past the range of doubles (`1e308 V/div` × 10) states no usable window.
  return out.filter((w) => Number.isFinite(w.low) && Number.isFinite(w.high) && w.high > w.low);
}

function finiteRange(x: Float64Array): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

function fmt(v: number): string {
  return String(Number(v.toPrecision(4)));
}
