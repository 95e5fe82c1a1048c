/**
 * Likely causes in circuit terms, from the part attribution (circuitFit.ts): each step names the part
 * whose deviation explains the most of what the captures show, with its value on the board against
 * its tolerance, and lists the parts the captures cannot tell from it together with the measurement
 * that would separate them. Among parts the data cannot separate, one within or near its tolerance
 * is ranked before one far outside it (a part far out of tolerance is the rarer event; common
 * practice, no source).
 * A step is reported when the part's deviation is clear of its uncertainty (|θ| > 3·u(θ)), at least
 * 1 % (common practice, no source), and either outside its tolerance or, on a unit that did not pass,
 * in the outer half of it. These causes refine the pattern rules (frequencyRules, shapeRules,
 * edgeRules): a refined rule's facts move under the part that explains it, marked with the rule they came from.
 */
import type { Cause, CauseFact } from '../types/index.js';
import { derivedFact, quantity } from './causeFacts.js';
import type { Observation, PartFit, PartId } from './circuitFit.js';
import { attributeParts, observations } from './circuitFit.js';
import type { PartContext, PartReading } from './circuitParts.js';
import { PARTS } from './circuitParts.js';
import type { CoreReading } from './coreReadings.js';
import { scoreFrom } from './rule.js';
import type { UnitFacts } from './unitFacts.js';

/** Pattern-rule causes that each part's cause takes over, keeping their facts. */
export const REFINES: Readonly<Record<PartId, readonly string[]>> = {
  'timing-capacitor': ['timing-scale'],
  'reference-current': ['timing-scale'],
  'charge-source': ['current-mismatch'],
  'discharge-sink': ['current-mismatch'],
  'current-mirror': ['current-mismatch'],
  'threshold-divider': ['threshold-levels'],
  'threshold-centre': ['offset-bias'],
  'switching-delay': ['switching-delay'],
  'logic-loading': ['weak-logic-high'],
};

/**
 * Pattern-rule causes a part also accounts for without being what they name: any slope or swing
 * fault moves the frequency by one ratio at every condition, so "timing-scale" is its consequence.
 */
export const ACCOUNTS_FOR: Readonly<Record<PartId, readonly string[]>> = {
  'timing-capacitor': [],
  'reference-current': [],
  'charge-source': ['timing-scale'],
  'discharge-sink': ['timing-scale'],
  'current-mirror': ['timing-scale'],
  'threshold-divider': ['timing-scale'],
  'threshold-centre': [],
  'switching-delay': ['threshold-levels'],
  'logic-loading': [],
};

/** What was seen against the design, averaged over conditions, as relative deviations. */
function seen(obs: readonly Observation[]): CauseFact[] {
  const n = new Set(obs.map((o) => o.condition)).size;
  const mean = (kind: Observation['kind']): number | null => {
    const ys = obs.filter((o) => o.kind === kind).map((o) => o.y);
    return ys.length ? ys.reduce((s, y) => s + y, 0) / ys.length : null;
  };
  const fact = (part: string, percent: number): CauseFact => derivedFact(part, quantity(percent, '%'), { averagedOver: n });
  const out: CauseFact[] = [];
  const [rise, fall, top, bottom, swing, logic] = (['rise', 'fall', 'top', 'bottom', 'swing', 'logicHigh'] as const).map(mean);
  // Slopes, swing and logic high are observed as log ratios (circuitFit.ts): e^y − 1 is the relative change.
  if (rise !== null && fall !== null) out.push(fact('rising ramp slope against I/C', Math.expm1(rise) * 100), fact('falling ramp slope against I/C', Math.expm1(fall) * 100));
  if (top !== null && bottom !== null) out.push(fact('upper turn off its threshold, share of the swing', top * 100), fact('lower turn off its threshold, share of the swing', bottom * 100));
  if (swing !== null) out.push(fact('swing against design', Math.expm1(swing) * 100));
  if (logic !== null) out.push(fact('logic high against design', Math.expm1(logic) * 100));
  return out;
}

/** Charge and discharge currents compared through the slope ratio alone (C cancels): the largest difference. */
function balance(readings: readonly CoreReading[]): CauseFact | null {
  const ratios = readings.filter((r) => r.rise && r.fall).map((r) => r.fall!.value / r.rise!.value - 1);
  if (ratios.length === 0) return null;
  const worst = ratios.reduce((a, b) => (Math.abs(b) > Math.abs(a) ? b : a));
  return derivedFact('discharge against charge current, the largest difference over the conditions', quantity(worst * 100, '%'));
}

interface Ranked {
  readonly fit: PartFit;
  readonly reading: PartReading;
  readonly multiple: number;
}

/** Groups of causes, best step first; within a group, the parts the data cannot tell apart. */
export function circuitCauses(facts: UnitFacts, readings: readonly CoreReading[]): Cause[][] {
  const obs = observations(readings, facts.design);
  const ctx: PartContext = { design: facts.design, readings };
  const groups: Cause[][] = [];
  for (const step of attributeParts(obs)) {
    const ranked: Ranked[] = step.group
      .map((fit) => {
        const reading = PARTS[fit.part].read(fit.theta, fit.uTheta, ctx);
        return { fit, reading, multiple: reading.toleranceMultiple ?? 1 };
      })
      .sort((a, b) => a.multiple - b.multiple);
    const lead = ranked[0];
    const clear = Math.abs(lead.fit.theta) > 3 * lead.fit.uTheta && Math.abs(lead.fit.theta) >= 0.01;
    if (!clear || !(lead.multiple > 1 || (facts.statement !== 'pass' && lead.multiple >= 0.5))) continue;
    const score = Math.round(step.share * scoreFrom(lead.fit.theta, 0.01, 0.05) * 100) / 100;
    groups.push(ranked.map((m, i) => causeFor(m, ranked, seen(obs), readings, Math.max(0.01, score - 0.01 * i), step.share)));
  }
  return groups;
}

function causeFor(m: Ranked, group: readonly Ranked[], common: readonly CauseFact[], readings: readonly CoreReading[], score: number, share: number): Cause {
  const part = PARTS[m.fit.part];
  const others = group.filter((o) => o !== m);
  const [lead, ...more] = m.reading.facts;
  const facts: CauseFact[] = [{ ...lead, shareExplained: share, confirm: part.measure }, ...more, ...common];
  const bal = m.fit.part === 'timing-capacitor' || m.fit.part === 'reference-current' ? balance(readings) : null;
  if (bal) facts.push(bal);
  // What the parts the data cannot tell from this one would have to be, and how to separate them.
  for (const o of others) facts.push({ ...o.reading.facts[0], alternative: true, shareExplained: share, confirm: PARTS[o.fit.part].measure });
  return {
    id: m.fit.part,
    title: part.title,
    score,
    evidence: [],
    confirm: part.measure,
    where: part.where,
    ...(others.length ? { indistinguishableFrom: others.map((o) => o.fit.part) } : {}),
    facts,
    remarks: ['attribution', ...(bal ? (['slope-ratio-cancels-c'] as const) : [])],
  };
}

/**
 * The final ranking: each circuit group takes over the pattern-rule causes it refines (their facts
 * and remarks are kept under the group's first cause, and their score if higher), then all are sorted by score.
 */
export function mergeCauses(pattern: readonly Cause[], groups: readonly Cause[][]): Cause[] {
  const taken = new Set<string>();
  const merged = groups.map((group) => {
    const has = (table: typeof REFINES, p: Cause): boolean => !taken.has(p.id) && group.some((c) => table[c.id as PartId].includes(p.id));
    const refined = pattern.filter((p) => has(REFINES, p));
    refined.forEach((p) => taken.add(p.id));
    const accounted = pattern.filter((p) => has(ACCOUNTS_FOR, p));
    accounted.forEach((p) => taken.add(p.id));
    if (refined.length + accounted.length === 0) return group;
    const top = Math.max(group[0].score, ...refined.map((p) => p.score));
    // The pattern's own part estimates are superseded by the attribution's; its measurements stay.
    const from = (p: Cause): CauseFact[] => (p.facts ?? []).filter((x) => x.kind !== 'part').map((x) => ({ ...x, pattern: { id: p.id, title: p.title } }));
    const extraFacts = [...refined.flatMap(from), ...accounted.flatMap(from)];
    const extraRemarks = [...refined, ...accounted].flatMap((p) => p.remarks ?? []);
    return group.map((c, i) => {
      const merged = i === 0 ? { facts: [...(c.facts ?? []), ...extraFacts], remarks: [...new Set([...(c.remarks ?? []), ...extraRemarks])] } : {};
      return { ...c, score: Math.max(0.01, Math.round((top - 0.01 * i) * 100) / 100), ...merged };
    });
  });
  const rest = pattern.filter((p) => !taken.has(p.id));
  return [...merged.flat(), ...rest].sort((a, b) => b.score - a.score);
}
