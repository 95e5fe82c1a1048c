/**
 * `spec init`: the condition of each golden capture, read from its file name with the pattern the new
 * spec will use. The conditions are not known yet, so any text in the {condition} place is taken.
 */
import { BenchError } from '../types/index.js';
import { matchCaptureName, patternTokens } from './capturePattern.js';
import { DEFAULT_CONDITION } from './specTypes.js';

export interface GoldenPlan {
  readonly path: string;
  readonly unit: string;
  readonly condition: string;
}

export function planGolden(pattern: string, paths: readonly string[]): GoldenPlan[] {
  const tokens = patternTokens(pattern);
  if (tokens.includes('output')) {
    throw new BenchError({ code: 'init.output-pattern', file: '-', problem: `spec init reads one capture per condition with every output in it, but the pattern "${pattern}" has {output}`, expected: 'a pattern with {unit} and {condition}, e.g. "{unit}_{condition}.csv"', fix: 'draft from captures holding all channels, then add {output} to the spec by hand' });
  }
  const plans = paths.map((path) => {
    const base = path.split(/[\\/]/).pop() ?? path;
    const m = matchCaptureName(pattern, base, [], []);
    if (!m || m.unit === undefined) {
      throw new BenchError({ code: 'init.name-unmatched', file: path, problem: `the file name "${base}" does not match the pattern "${pattern}"`, expected: `a name like "${pattern.replace('{unit}', 'FK-0101').replace('{condition}', 'mid')}"`, fix: 'rename the golden captures, or give --pattern to describe their names' });
    }
    return { path, unit: m.unit, condition: m.condition ?? DEFAULT_CONDITION };
  });
  const units = [...new Set(plans.map((p) => p.unit))];
  if (units.length > 1) {
    throw new BenchError({ code: 'init.several-units', file: '-', problem: `spec init drafts from one known-good unit, but the captures come from ${units.join(', ')}`, expected: 'captures of a single unit, one per condition', fix: `give only the captures of ${units[0]} (or another single unit)` });
  }
  const seen = new Map<string, string>();
  for (const p of plans) {
    const first = seen.get(p.condition);
    if (first !== undefined) {
      throw new BenchError({ code: 'init.duplicate-condition', file: p.path, problem: `two captures for condition "${p.condition}": ${first} and ${p.path}`, expected: 'one capture per condition', fix: tokens.includes('condition') ? 'leave one of them out' : 'add {condition} to --pattern so each capture names its condition' });
    }
    seen.set(p.condition, p.path);
  }
  return plans;
}
