/**
 * One conformity decision, per ILAC-G8:09/2019 "Guidelines on Decision Rules and Statements of
 * Conformity" §4.2 (definitions as in JCGM 106:2012), with the guard band w equal to the expanded
 * uncertainty U (k = 2), the common choice named in ILAC-G8 §4.1:
 * - `simple` (§4.2.1): w = 0; pass inside the tolerance limits (limits included), fail outside.
 * - `guarded-binary` (§4.2.2): acceptance limit AL = TL − w; pass inside AL (included), fail outside.
 * - `guarded` (§4.2.3, the default): pass when further than w inside; conditional pass within w inside,
 *   the limit itself included ([TL − w, TL]); conditional fail within w outside; fail beyond.
 * Each side of a two-sided limit is decided alone and the worse statement wins. Distances within
 * 1e-12 of the scale count as equal, so a value written exactly at a limit is not decided by rounding.
 */
import type { DecisionRule, Statement } from '../types/index.js';

export interface Decision {
  readonly statement: Exclude<Statement, 'not-measured'>;
  /** Guard band applied on each side (0 with simple acceptance). */
  readonly guard: number;
  /** Signed distance to the nearest tolerance limit, positive inside. */
  readonly margin: number;
}

const SEVERITY: readonly Statement[] = ['pass', 'conditional-pass', 'not-measured', 'conditional-fail', 'fail'];

/** The worse of several statements: fail > conditional fail > not measured > conditional pass > pass. */
export function worstStatement(statements: readonly Statement[]): Statement {
  return statements.reduce<Statement>((w, s) => (SEVERITY.indexOf(s) > SEVERITY.indexOf(w) ? s : w), 'pass');
}

export function decideCheck(
  value: number,
  expandedUncertainty: number,
  limit: { readonly lower: number | null; readonly upper: number | null },
  rule: DecisionRule,
): Decision {
  if (!Number.isFinite(value)) throw new RangeError(`decideCheck: value ${value} is not finite`);
  if (!(expandedUncertainty >= 0)) throw new RangeError(`decideCheck: expanded uncertainty ${expandedUncertainty} is not ≥ 0`);
  if (limit.lower === null && limit.upper === null) throw new RangeError('decideCheck: a limit needs at least one side');
  const guard = rule === 'simple' ? 0 : expandedUncertainty;
  const distances: number[] = [];
  if (limit.upper !== null) distances.push(limit.upper - value);
  if (limit.lower !== null) distances.push(value - limit.lower);
  const eps = 1e-12 * Math.max(Math.abs(value), Math.abs(limit.upper ?? 0), Math.abs(limit.lower ?? 0), guard);
  const statement = distances
    .map((d) => sideStatement(d, guard, rule, eps))
    .reduce<Statement>((w, s) => worstStatement([w, s]), 'pass') as Decision['statement'];
  return { statement, guard, margin: Math.min(...distances) };
}

/** Statement for one limit, given the distance d inside it (negative outside). */
function sideStatement(d: number, w: number, rule: DecisionRule, eps: number): Decision['statement'] {
  const cmp = (a: number, b: number): number => (Math.abs(a - b) <= eps ? 0 : Math.sign(a - b));
  if (rule !== 'guarded') return cmp(d, w) >= 0 ? 'pass' : 'fail';
  if (cmp(d, w) > 0) return 'pass';
  if (cmp(d, 0) >= 0) return 'conditional-pass';
  if (cmp(d, -w) >= 0) return 'conditional-fail';
  return 'fail';
}

/**
 * A decision on a one-sided bound instead of a value (nothing detected above an upper bound B, or
 * below a lower one). The bound is the far end of the interval the quantity lies in, already on the
 * safe side of its uncertainty, so it is read as ILAC-G8 §4.2 reads a value whose whole interval
 * lies on one side of a limit, under every rule: an upper bound at or inside an upper limit is a pass,
 * one below a lower limit a fail; a bound that reaches past a limit it cannot settle decides nothing
 * (null: not measured). Margin is the signed distance from the bound to the limit it was decided on.
 */
export function decideBound(
  bound: { readonly kind: 'upper' | 'lower'; readonly value: number },
  limit: { readonly lower: number | null; readonly upper: number | null },
): { readonly statement: 'pass' | 'fail'; readonly margin: number } | null {
  if (!Number.isFinite(bound.value)) throw new RangeError(`decideBound: bound ${bound.value} is not finite`);
  if (limit.lower === null && limit.upper === null) throw new RangeError('decideBound: a limit needs at least one side');
  const b = bound.value;
  const eps = 1e-12 * Math.max(Math.abs(b), Math.abs(limit.upper ?? 0), Math.abs(limit.lower ?? 0));
  if (bound.kind === 'upper') {
    if (limit.lower !== null && b < limit.lower - eps) return { statement: 'fail', margin: b - limit.lower };
    if (limit.lower === null && limit.upper !== null && b <= limit.upper + eps) return { statement: 'pass', margin: limit.upper - b };
    return null;
  }
  if (limit.upper !== null && b > limit.upper + eps) return { statement: 'fail', margin: limit.upper - b };
  if (limit.upper === null && limit.lower !== null && b >= limit.lower - eps) return { statement: 'pass', margin: b - limit.lower };
  return null;
}
