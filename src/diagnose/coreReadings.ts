/**
 * What the circuit view reads at each condition: the triangle's ramp slopes and peaks, the pulse or
 * square output's state levels, the measured frequency, and the design currents carried to that
 * condition. By convention the rising ramp is the charge current (into the timing capacitor) and the
 * falling ramp the discharge current (the sink). A side of the triangle that sits flat (the output
 * saturating) gives no turn: its peak is left out, so no threshold is judged from it.
 */
import type { ChannelReport, CircuitGap, MeasurementId } from '../types/index.js';
import type { DesignValue } from '../design/index.js';
import type { Estimate } from './circuitFormulas.js';
import { designEstimate, scaleToCondition } from './circuitFormulas.js';
import type { UnitFacts } from './unitFacts.js';
import { outputsShaped } from './unitFacts.js';

export interface CoreReading {
  readonly condition: string;
  /** The spec's nominal frequency here, null when the spec gives none. */
  readonly fNominal: number | null;
  readonly frequency: Estimate | null;
  /** Magnitudes of the rising and falling ramp slopes, V/s. */
  readonly rise: Estimate | null;
  readonly fall: Estimate | null;
  /** Triangle peaks (median per-cycle extremes), i.e. where the comparator flipped. */
  readonly top: Estimate | null;
  readonly bottom: Estimate | null;
  readonly swing: Estimate | null;
  readonly logicHigh: Estimate | null;
  readonly logicLow: Estimate | null;
  /** Design charge and discharge currents at this condition (tolerance read as rectangular). */
  readonly charge: Estimate | null;
  readonly discharge: Estimate | null;
  /** Why a design current could not be placed at this condition. */
  readonly gaps: readonly CircuitGap[];
}

function estimate(channel: ChannelReport | undefined, ...ids: MeasurementId[]): Estimate | null {
  for (const id of ids) {
    const m = channel?.measurements[id];
    if (m && m.value !== null && Number.isFinite(m.value)) return { value: m.value, u: m.uncertainty ?? 0 };
  }
  return null;
}

/**
 * A design current at a condition. With `at`, it scales by the ratio of nominal frequencies (1 V/octave);
 * without, it holds as given only when every condition has the same nominal frequency.
 */
export function designCurrentAt(design: DesignValue | undefined, key: string, condition: string, nominal: Readonly<Record<string, number>>): { current: Estimate | null; gap?: CircuitGap } {
  if (!design) return { current: null };
  const f = nominal[condition];
  if (design.at !== undefined) {
    const fAt = nominal[design.at];
    if (fAt === undefined || f === undefined) {
      return { current: null, gap: { code: 'current-not-carried', key, at: design.at } };
    }
    return { current: scaleToCondition(designEstimate(design), fAt, f) };
  }
  const distinct = new Set(Object.values(nominal));
  if (distinct.size > 1) {
    return { current: null, gap: { code: 'current-no-condition', key } };
  }
  return { current: designEstimate(design) };
}

export function coreReadings(facts: UnitFacts): CoreReading[] {
  const tri = outputsShaped(facts, ['triangle']).filter((o) => !o.clipped);
  const pulse = outputsShaped(facts, ['pulse', 'square']).filter((o) => !o.clipped);
  const conditions = facts.conditionOrder.filter((c) => tri.some((o) => o.condition === c) || pulse.some((o) => o.condition === c));
  return conditions.map((condition) => {
    const at = tri.find((o) => o.condition === condition);
    const t = at?.channel;
    // A side that sits flat is where the output stage saturated, not where the comparator turned.
    const flat = (side: 'high' | 'low'): boolean => at?.saturated.some((f) => f.side === side) ?? false;
    const p = pulse.find((o) => o.condition === condition)?.channel;
    const charge = designCurrentAt(facts.design.chargeCurrent, 'chargeCurrent', condition, facts.nominalFrequency);
    const discharge = designCurrentAt(facts.design.dischargeCurrent ?? facts.design.chargeCurrent, facts.design.dischargeCurrent ? 'dischargeCurrent' : 'chargeCurrent', condition, facts.nominalFrequency);
    return {
      condition,
      fNominal: facts.nominalFrequency[condition] ?? null,
      frequency: estimate(t, 'frequency') ?? estimate(p, 'frequency'),
      rise: estimate(t, 'riseSlope'),
      fall: estimate(t, 'fallSlope'),
      top: flat('high') ? null : estimate(t, 'highLevel', 'maximum'),
      bottom: flat('low') ? null : estimate(t, 'lowLevel', 'minimum'),
      swing: flat('high') || flat('low') ? null : estimate(t, 'amplitude', 'peakToPeak'),
      logicHigh: estimate(p, 'highLevel'),
      logicLow: estimate(p, 'lowLevel'),
      charge: charge.current,
      discharge: discharge.current,
      gaps: [charge.gap, discharge.gap].filter((g, i, all): g is CircuitGap => g !== undefined && all.findIndex((x) => x?.code === g.code && x?.key === g.key) === i),
    };
  });
}
