/**
 * Nearest-name suggestions for misspelt option keys: Levenshtein edit distance
 * (common practice; Wagner & Fischer, J. ACM 21 (1974) 168–173), two rolling rows.
 */

/** Edit distance (insertions, deletions, substitutions) between `a` and `b`, case-sensitive. */
export function editDistance(a: string, b: string): number {
  if (a === b) return 0;
  let prev = new Array<number>(b.length + 1);
  let cur = new Array<number>(b.length + 1);
  for (let j = 0; j <= b.length; j++) prev[j] = j;
  for (let i = 1; i <= a.length; i++) {
    cur[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const sub = prev[j - 1]! + (a.charCodeAt(i - 1) === b.charCodeAt(j - 1) ? 0 : 1);
      cur[j] = Math.min(sub, prev[j]! + 1, cur[j - 1]! + 1);
    }
    [prev, cur] = [cur, prev];
  }
  return prev[b.length]!;
}

/**
 * The candidate closest to `name` (case-insensitive edit distance), or undefined when even the
 * closest needs more than about a third of the name's letters changed.
 */
export function nearestName(name: string, candidates: readonly string[]): string | undefined {
  const lower = name.toLowerCase();
  let best: string | undefined;
  let bestD = Infinity;
  for (const c of candidates) {
    const d = editDistance(lower, c.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = c;
    }
  }
  return bestD <= Math.max(2, Math.ceil(name.length / 3)) ? best : undefined;
}
