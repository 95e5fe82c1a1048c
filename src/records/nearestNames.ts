/** "Did you mean" for unit serials and spec names: the known names closest by edit distance (Levenshtein 1966). */

function distance(a: string, b: string): number {
  const prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0];
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const up = prev[j];
      prev[j] = Math.min(prev[j] + 1, prev[j - 1] + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = up;
    }
  }
  return prev[b.length];
}

/** Up to `max` known names within a third of the typed length (case ignored), closest first. */
export function nearestNames(typed: string, known: readonly string[], max = 3): string[] {
  const t = typed.toLowerCase();
  const limit = Math.max(2, Math.ceil(t.length / 3));
  return known
    .map((k) => ({ k, d: distance(t, k.toLowerCase()) }))
    .filter((x) => x.d <= limit)
    .sort((a, b) => a.d - b.d || a.k.localeCompare(b.k))
    .slice(0, max)
    .map((x) => x.k);
}
