/**
 * Edges, interference and logic levels.
 * - Overshoot/undershoot at each flip (IEEE Std 181-2011 aberrations): missing filtering or
 *   hysteresis at the comparator, or a long probe ground lead (which rings with the probe capacitance).
 * - Mains hum at 50/60 Hz or twice that (IEC 60038 frequencies; rectifier ripple at 2×, REFERENCES §10).
 * - Period jitter: a noisy supply or threshold moves each flip.
 * - A pulse high level short of the design logic high, with no flat clipping: loading of the pull-up
 *   or output divider.
 * Thresholds (common practice, no source): 5 % aberration, −50 dBc hum, jitter 0.5 % of the period,
 * logic high below its design tolerance; each also beyond the expanded uncertainty.
 */
import type { CauseRule } from './rule.js';
import { scoreFrom } from './rule.js';
import { checkOf, expandedOf, outputsShaped, valueOf } from './unitFacts.js';
import { derivedFact, expected, measuredFact, present, quantity } from './causeFacts.js';

export const edgeRinging: CauseRule = (f) => {
  const hits = outputsShaped(f, ['pulse', 'square'])
    .flatMap((o) => (['overshoot', 'undershoot'] as const).map((id) => ({ o, id, v: valueOf(o.channel, id), U: expandedOf(o.channel, id), k: checkOf(o, id) })))
    .filter((x) => x.v !== null && ((x.k && x.k.statement !== 'pass') || (x.v > 5 && x.v > x.U)));
  if (hits.length === 0) return null;
  const worst = Math.max(...hits.map((x) => x.v!));
  return {
    id: 'edge-ringing',
    title: 'overshoot or ringing at each flip: comparator filtering/hysteresis, or a long probe ground lead',
    score: scoreFrom(worst, 5, 25),
    evidence: [],
    confirm: 're-probe at the output jack with the short ground spring; if the ringing stays, look at the comparator hysteresis and the local decoupling',
    where: 'comparator feedback (hysteresis), supply decoupling at the comparator, probe grounding',
    facts: hits.map((x) => measuredFact(x.o, x.id)).filter(present),
  };
};

const MAINS = [50, 60, 100, 120];

export const mainsHum: CauseRule = (f) => {
  const hits = f.outputs
    .map((o) => ({ o, level: valueOf(o.channel, 'humLevel'), at: valueOf(o.channel, 'humFrequency'), k: checkOf(o, 'humLevel') }))
    .filter((x) => x.level !== null && x.at !== null && MAINS.some((m) => Math.abs(x.at! - m) < 2) && ((x.k && x.k.statement !== 'pass') || x.level > -50));
  if (hits.length === 0) return null;
  const worst = Math.max(...hits.map((x) => x.level!));
  return {
    id: 'mains-hum',
    title: 'mains hum: ground loop or probe grounding',
    // Levels are negative dBc: score by how far the hum stands above −50 dBc (full weight at −26 dBc).
    score: scoreFrom(worst + 50, 0, 24),
    evidence: [],
    confirm: 'capture again with the probe ground at the module’s ground point and the scope and module on one outlet; if the hum drops, it was a ground loop, else look at the supply filtering',
    where: 'ground return of the module and the scope probe; supply filtering',
    facts: hits.flatMap((x) => [measuredFact(x.o, 'humFrequency'), measuredFact(x.o, 'humLevel')]).filter(present),
  };
};

export const periodJitter: CauseRule = (f) => {
  const hits = f.outputs
    .map((o) => ({ o, j: valueOf(o.channel, 'jitter'), U: expandedOf(o.channel, 'jitter'), fr: valueOf(o.channel, 'frequency'), k: checkOf(o, 'jitter') }))
    .filter((x) => x.j !== null && x.fr !== null && ((x.k && x.k.statement !== 'pass') || (x.j * x.fr > 0.005 && x.j > x.U)));
  if (hits.length === 0) return null;
  const worst = Math.max(...hits.map((x) => x.j! * x.fr!));
  return {
    id: 'period-jitter',
    title: 'high jitter: noisy supply or noisy threshold',
    score: scoreFrom(worst, 0.005, 0.03),
    evidence: [],
    confirm: 'look at the supply rails and the comparator reference with AC coupling at a high gain; jitter that follows ripple or noise there is the cause',
    where: 'supply decoupling and regulators; comparator reference divider',
    facts: hits.flatMap((x) => [
      measuredFact(x.o, 'jitter'),
      // Jitter over the period, j·f; its U from the jitter's alone (the frequency's is far smaller).
      derivedFact('jitter, share of the period', quantity(x.j! * x.fr! * 100, '%', x.U * x.fr! * 100), { output: x.o.output, condition: x.o.condition }),
    ]).filter(present),
  };
};

export const weakLogicHigh: CauseRule = (f) => {
  const design = f.design.logicHigh;
  const hits = outputsShaped(f, ['pulse', 'square'])
    .filter((o) => !o.clipped)
    .map((o) => ({ o, v: valueOf(o.channel, 'highLevel'), U: expandedOf(o.channel, 'highLevel'), k: checkOf(o, 'highLevel') }))
    .filter((x) => x.v !== null && ((design && x.v < design.lower - x.U) || (x.k?.lower != null && x.k.statement !== 'pass' && x.v < x.k.lower)));
  if (hits.length === 0) return null;
  const nominal = design?.nominal ?? hits[0].k?.nominal ?? hits[0].v!;
  const worst = Math.min(...hits.map((x) => x.v!));
  return {
    id: 'weak-logic-high',
    title: 'low logic high: loading of the pull-up or output divider',
    score: scoreFrom(worst / nominal - 1, 0.02, 0.15),
    evidence: [],
    confirm: 'measure the high level with the output jack unplugged; if it recovers, the load or the pull-up divider is at fault',
    where: 'pull-up resistor and output divider of the pulse stage, and what the jack drives',
    facts: hits.map((x) => measuredFact(x.o, 'highLevel', expected(nominal, 'V', design ? 'design' : 'nominal'))).filter(present),
    remarks: ['no-flat-clipping'],
  };
};
