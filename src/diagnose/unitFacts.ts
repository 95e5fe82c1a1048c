/**
 * What the likely-cause rules read: per condition and output, the measured channel and its checks,
 * plus the frequency error at each condition against the spec's nominal, ordered by frequency.
 * Rules look at the whole pattern across conditions, not at one failed check.
 */
import type { ChannelReport, CheckVerdict, FlatTop, MeasurementId, Shape, UnitVerdict } from '../types/index.js';
import type { DesignSection, Spec } from '../design/index.js';

export interface OutputAt {
  readonly condition: string;
  readonly output: string;
  readonly shape: Shape;
  readonly channel: ChannelReport;
  readonly checks: readonly CheckVerdict[];
  /** Clipped at the scope's full scale: its levels were withheld. */
  readonly clipped: boolean;
  /** Flat tops inside the scope's range: the circuit saturating (values kept). */
  readonly saturated: readonly FlatTop[];
}

export interface FrequencyPoint {
  readonly condition: string;
  /** The output whose frequency check this is. */
  readonly output?: string;
  readonly nominal: number;
  readonly measured: number;
  /** Expanded uncertainty of the measured value (0 when none was given). */
  readonly U: number;
  /** Relative error, measured/nominal − 1. */
  readonly error: number;
}

export interface UnitFacts {
  readonly unit: string;
  readonly outputs: readonly OutputAt[];
  /** One point per condition with a frequency check that was measured, lowest nominal first. */
  readonly frequency: readonly FrequencyPoint[];
  /** Half-width of the frequency tolerance relative to nominal (0.015 for ±1.5 %), or null. */
  readonly frequencyTolerance: number | null;
  readonly design: DesignSection;
  readonly conditionOrder: readonly string[];
  /** The spec's nominal frequency at each condition that has one (measured or not). */
  readonly nominalFrequency: Readonly<Record<string, number>>;
  /** The unit's overall statement. */
  readonly statement: UnitVerdict['statement'];
}

export function unitFacts(spec: Spec, verdict: UnitVerdict): UnitFacts {
  const outputs: OutputAt[] = [];
  for (const cap of verdict.captures) {
    for (const o of cap.outputs) {
      const channel = cap.report.channels.find((c) => c.name === o.channel);
      if (!channel) continue;
      const checks = verdict.conditions.find((c) => c.condition === cap.condition)?.checks.filter((k) => k.output === o.output) ?? [];
      const saturated = (channel.flatTops ?? []).filter((t) => t.cause === 'circuit');
      const clipped =
        (channel.flatTops ?? []).some((t) => t.cause === 'scope-range') ||
        channel.warnings.some((w) => w.code === 'clipped') ||
        cap.report.warnings.some((w) => w.code === 'clipped' && (w.channel === undefined || w.channel === channel.name)) ||
        Object.values(channel.measurements).some((m) => m?.reason === 'clipped');
      outputs.push({ condition: cap.condition, output: o.output, shape: o.expectedShape ?? channel.shape, channel, checks, clipped, saturated });
    }
  }
  const conditionOrder = spec.conditions.map((c) => c.name);
  const frequency = frequencyPoints(verdict);
  const nominalFrequency: Record<string, number> = {};
  for (const c of verdict.conditions) {
    const k = c.checks.find((x) => x.measurement === 'frequency' && x.nominal !== null && x.nominal > 0);
    if (k) nominalFrequency[c.condition] = k.nominal!;
  }
  return { unit: verdict.unit, outputs, frequency, frequencyTolerance: frequencyTolerance(verdict), design: spec.design ?? {}, conditionOrder, nominalFrequency, statement: verdict.statement };
}

function frequencyChecks(verdict: UnitVerdict): CheckVerdict[] {
  // One output is enough (all outputs of one core share the frequency); take the first with values.
  const all = verdict.conditions.flatMap((c) => c.checks.filter((k) => k.measurement === 'frequency' && k.nominal !== null));
  const outputs = [...new Set(all.map((k) => k.output))];
  const best = outputs.find((o) => all.filter((k) => k.output === o && k.value !== null).length > 0);
  return all.filter((k) => k.output === best);
}

function frequencyPoints(verdict: UnitVerdict): FrequencyPoint[] {
  return frequencyChecks(verdict)
    .filter((k) => k.value !== null && k.nominal !== null && k.nominal > 0)
    .map((k) => ({ condition: k.condition, output: k.output, nominal: k.nominal!, measured: k.value!, U: k.expandedUncertainty ?? 0, error: k.value! / k.nominal! - 1 }))
    .sort((a, b) => a.nominal - b.nominal);
}

function frequencyTolerance(verdict: UnitVerdict): number | null {
  const k = frequencyChecks(verdict).find((c) => c.lower !== null && c.upper !== null && c.nominal);
  return k ? (k.upper! - k.lower!) / 2 / k.nominal! : null;
}

/** The value of a measurement on a channel, or null when it is absent or withheld. */
export function valueOf(channel: ChannelReport, id: MeasurementId): number | null {
  return channel.measurements[id]?.value ?? null;
}

/** Expanded uncertainty (k = 2) of a measurement, 0 when none was given. */
export function expandedOf(channel: ChannelReport, id: MeasurementId): number {
  return 2 * (channel.measurements[id]?.uncertainty ?? 0);
}

/** Outputs of a given shape family, in condition order. */
export function outputsShaped(facts: UnitFacts, shapes: readonly Shape[]): OutputAt[] {
  const order = (c: string): number => facts.conditionOrder.indexOf(c);
  return facts.outputs.filter((o) => shapes.includes(o.shape)).sort((a, b) => order(a.condition) - order(b.condition));
}

/** The check of a measurement on an output at its condition, if the spec has one. */
export function checkOf(o: OutputAt, id: MeasurementId): CheckVerdict | undefined {
  return o.checks.find((k) => k.measurement === id);
}
