/**
 * Builders for a cause's facts: measured quantities with their expanded uncertainty (U = 2u, k = 2,
 * GUM §6.2.1), figures derived from them, and the frequency points of the checks. Data only; report
 * writes the words.
 */
import type { CauseFact, ExpectedBasis, FactQuantity, MeasurementId } from '../types/index.js';
import { measurementLabel } from '../types/index.js';
import type { FrequencyPoint, OutputAt } from './unitFacts.js';

/** A quantity with its expanded uncertainty, leaving U out when none is known. */
export function quantity(value: number, unit: string, expandedUncertainty?: number | null): FactQuantity {
  return { value, unit, ...(expandedUncertainty && expandedUncertainty > 0 ? { expandedUncertainty } : {}) };
}

/** An expected value for `expected`. */
export function expected(value: number, unit: string, basis: ExpectedBasis): FactQuantity & { basis: ExpectedBasis } {
  return { value, unit, basis };
}

/** A measurement of an output at its condition, with U (k = 2); null when withheld or absent. */
export function measuredFact(o: OutputAt, id: MeasurementId, against?: FactQuantity & { basis: ExpectedBasis }): CauseFact | null {
  const m = o.channel.measurements[id];
  if (!m || m.value === null) return null;
  return {
    kind: 'measured',
    part: measurementLabel(id),
    measurement: id,
    output: o.output,
    condition: o.condition,
    observed: quantity(m.value, m.unit, m.uncertainty === null ? null : 2 * m.uncertainty),
    ...(against ? { expected: against } : {}),
  };
}

/** The measured frequency at a condition against the spec's nominal there. */
export function frequencyFact(p: FrequencyPoint): CauseFact {
  return {
    kind: 'measured',
    part: measurementLabel('frequency'),
    measurement: 'frequency',
    ...(p.output ? { output: p.output } : {}),
    condition: p.condition,
    observed: quantity(p.measured, 'Hz', p.U),
    expected: expected(p.nominal, 'Hz', 'nominal'),
  };
}

/** A figure computed from measured ones (a delay, a current, a ratio), at a condition when it has one. */
export function derivedFact(part: string, observed: FactQuantity, extra: Partial<Omit<CauseFact, 'part' | 'observed' | 'kind'>> = {}): CauseFact {
  return { kind: 'derived', part, observed, ...extra };
}

export const present = <T>(x: T | null | undefined): x is T => x !== null && x !== undefined;
