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
 * edgeRules): a refined rule's evidence moves under the part that explains it.
 */
import type { Cause, CauseFact } from '../types/index.js';
import type { Observation, PartFit, PartId } from './circuitFit.js';
import { attributeParts, observations } from './circuitFit.js';
import type { PartContext, PartReading } from './circuitParts.js';
import { PARTS } from './circuitParts.js';
import type { CoreReading } from './coreReadings.js';
import { scoreFrom } from './rule.js';
import type { UnitFacts } from './unitFacts.js';

/** Pattern-rule causes that each part's cause takes over, keeping their evidence. */
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

const pm = (x: number): string => `${x >= -0.0005 ? '+' : '−'}${Math.abs(x * 100).toFixed(1)} %`;

/** What was seen against the design, averaged over conditions, in one line. */
function seen(obs: readonly Observation[]): string {
  const mean = (kind: Observation['kind']): number | null => {
    const ys = obs.filter((o) => o.kind === kind).map((o) => o.y);
    return ys.length ? ys.reduce((s, y) => s + y, 0) / ys.length : null;
  };
  const parts: string[] = [];
  const [rise, fall, top, bottom, swing, logic] = (['rise', 'fall', 'top', 'bottom', 'swing', 'logicHigh'] as const).map(mean);
  if (rise !== null && fall !== null) parts.push(`ramp slopes against I/C ${pm(Math.expm1(rise))} rising, ${pm(Math.expm1(fall))} falling`);
  if (top !== null && bottom !== null) parts.push(`turns ${pm(top)} / ${pm(bottom)} of the swing off the thresholds`);
  if (swing !== null) parts.push(`swing ${pm(Math.expm1(swing))}`);
  if (logic !== null) parts.push(`logic high ${pm(Math.expm1(logic))}`);
  return `seen against the design (mean over ${new Set(obs.map((o) => o.condition)).size} condition(s)): ${parts.join('; ')}`;
}

/** Charge and discharge currents compared through the slope ratio alone (C cancels). */
function balance(readings: readonly CoreReading[]): string | null {
  const ratios = readings.filter((r) => r.rise && r.fall).map((r) => r.fall!.value / r.rise!.value - 1);
  if (ratios.length === 0) return null;
  const worst = Math.max(...ratios.map(Math.abs));
  return worst < 0.01 ? `both currents within ${Math.max(0.1, worst * 100).toFixed(1)} % of each other (slope ratio; C cancels)` : `the currents differ by up to ${(worst * 100).toFixed(1)} % (slope ratio; C cancels)`;
}

interface Ranked {
  readonly fit: PartFit;
  readonly figure: string;
  readonly multiple: number;
  readonly observed?: PartReading['observed'];
}

/** Groups of causes, best step first; within a group, the parts the data cannot tell apart. */
export function circuitCauses(facts: UnitFacts, readings: readonly CoreReading[]): Cause[][] {
  const obs = observations(readings, facts.design);
  const ctx: PartContext = { design: facts.design, readings };
  const groups: Cause[][] = [];
  for (const step of attributeParts(obs)) {
    const ranked: Ranked[] = step.group
      .map((fit) => {
        const r = PARTS[fit.part].read(fit.theta, fit.uTheta, ctx);
        return { fit, figure: r.figure, multiple: r.toleranceMultiple ?? 1, observed: r.observed };
      })
      .sort((a, b) => a.multiple - b.multiple);
    const lead = ranked[0];
    const clear = Math.abs(lead.fit.theta) > 3 * lead.fit.uTheta && Math.abs(lead.fit.theta) >= 0.01;
    if (!clear || !(lead.multiple > 1 || (facts.statement !== 'pass' && lead.multiple >= 0.5))) continue;
    const score = Math.round(step.share * scoreFrom(lead.fit.theta, 0.01, 0.05) * 100) / 100;
    const common = (m: Ranked): string[] => [seen(obs), `${PARTS[m.fit.part].short} explains ${Math.round(step.share * 100)} % of that deviation (χ² of the captures against the design)`];
    groups.push(ranked.map((m, i) => causeFor(m, ranked, common(m), readings, Math.max(0.01, score - 0.01 * i), step.share)));
  }
  return groups;
}

function causeFor(m: Ranked, group: readonly Ranked[], common: readonly string[], readings: readonly CoreReading[], score: number, share: number): Cause {
  const part = PARTS[m.fit.part];
  const others = group.filter((o) => o !== m);
  const evidence = [m.figure, ...common];
  const bal = m.fit.part === 'timing-capacitor' || m.fit.part === 'reference-current' ? balance(readings) : null;
  if (bal) evidence.push(bal);
  for (const o of others) {
    evidence.push(`the captures cannot tell this from ${PARTS[o.fit.part].short} (${o.figure}): both fit what was measured equally well; to separate them, ${part.measure}, or ${PARTS[o.fit.part].measure}`);
  }
  return {
    id: m.fit.part,
    title: part.title,
    score,
    evidence,
    confirm: part.measure,
    where: part.where,
    ...(others.length ? { indistinguishableFrom: others.map((o) => o.fit.part) } : {}),
    ...(m.observed ? { facts: [factOf(part.short.replace(/^the /, ''), m.observed, share, part.measure)] } : {}),
  };
}

function factOf(partName: string, o: NonNullable<PartReading['observed']>, share: number, confirm: string): CauseFact {
  return {
    part: partName,
    observed: { value: o.value, unit: o.unit },
    ...(o.design ? { design: { ...o.design, unit: o.unit } } : {}),
    shareExplained: share,
    confirm,
  };
}

/**
 * The final ranking: each circuit group takes over the pattern-rule causes it refines (their evidence
 * is kept under the group's first cause, and their score if higher), then all are sorted by score.
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
    const extra = [
      ...refined.flatMap((p) => p.evidence.map((e) => `${e} (pattern: ${p.title})`)),
      ...accounted.map((p) => `this also accounts for the pattern "${p.title}": ${p.evidence[0]}`),
    ];
    return group.map((c, i) => ({ ...c, score: Math.max(0.01, Math.round((top - 0.01 * i) * 100) / 100), ...(i === 0 ? { evidence: [...c.evidence, ...extra] } : {}) }));
  });
  const rest = pattern.filter((p) => !taken.has(p.id));
  return [...merged.flat(), ...rest].sort((a, b) => b.score - a.score);
}
