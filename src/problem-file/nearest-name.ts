/** "Did you mean …?" suggestions: the candidate with the smallest edit distance. */

/** Optimal-string-alignment distance (Levenshtein plus adjacent transpositions; common practice). */
export function editDistance(a: string, b: string): number {
  const m = a.length, n = b.length;
  const d: number[][] = Array.from({ length: m + 1 }, (_, i) => Array.from({ length: n + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)));
  for (let i = 1; i <= m; i++) {
    for (let j = 1; j <= n; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let v = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, d[i - 2]![j - 2]! + 1);
      d[i]![j] = v;
    }
  }
  return d[m]![n]!;
}

/**
 * The candidate nearest to `name` (case-insensitive), or null when none is within about a third
 * of the name's length.
 *
 * @example
 * ```ts
 * import { nearestName } from 'chronomesh/problem-file';
 * console.log(nearestName('horizn', ['horizon', 'domain'])); // → horizon
 * ```
 */
export function nearestName(name: string, candidates: readonly string[]): string | null {
  let best: string | null = null;
  let bestD = Infinity;
  const lower = name.toLowerCase();
  for (const c of candidates) {
    const d = editDistance(lower, c.toLowerCase());
    if (d < bestD) { bestD = d; best = c; }
  }
  return best !== null && bestD <= Math.max(2, Math.ceil(name.length / 3)) ? best : null;
}
