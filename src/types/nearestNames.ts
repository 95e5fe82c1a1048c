/**
 * "Did you mean": the known names closest to a mistyped one, for spec fields and values, measurement
 * ids, outputs, serials and spec names alike. Closeness is the Levenshtein (1966) edit distance,
 * computed by fastest-levenshtein, with case ignored.
 *
 * One rule for every suggestion: a name is offered when it is at most a third of the typed length
 * away, rounded up, and at least one edit. A three-letter word gets one edit and a seven-character
 * serial three (a swapped pair of digits is two), so a short word is not "corrected" into an
 * unrelated one and a long name still finds its match. Common practice for command-line
 * suggestions (no source).
 */
import { distance } from 'fastest-levenshtein';

/** The largest edit distance at which a known name is offered for `typed`. */
export function suggestionReach(typed: string): number {
  return Math.max(1, Math.ceil(typed.length / 3));
}

/** Up to `max` known names within reach of `typed`, closest first; ties keep the order of `known`. */
export function nearestNames(typed: string, known: readonly string[], max = 3): string[] {
  const t = typed.toLowerCase();
  const reach = suggestionReach(typed);
  return known
    .map((name, order) => ({ name, order, d: distance(t, name.toLowerCase()) }))
    .filter((x) => x.d <= reach)
    .sort((a, b) => a.d - b.d || a.order - b.order)
    .slice(0, max)
    .map((x) => x.name);
}

/** The one closest known name within reach of `typed`, or null. */
export function nearestName(typed: string, known: readonly string[]): string | null {
  return nearestNames(typed, known, 1)[0] ?? null;
}
