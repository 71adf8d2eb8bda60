/**
 * Three-point Gauss rules on panels graded geometrically toward both ends of every interval between
 * consecutive break points (2^-depth of the interval innermost), each panel split in `sub`; points at
 * or beyond `cut` are dropped (a rule graded toward t = 0 only). The panel ends are dyadic in each
 * interval, so they meet the kinks of dyadic meshes. For layers far thinner than any mesh the
 * solution under test may have (common practice: graded composite quadrature).
 */
export function gradedGauss(breaks: readonly number[], depth: number, sub: number, cut = Infinity): { p: number[]; w: number[] } {
  const G = [-Math.sqrt(3 / 5), 0, Math.sqrt(3 / 5)], W = [5 / 9, 8 / 9, 5 / 9];
  const p: number[] = [], w: number[] = [];
  for (let k = 0; k + 1 < breaks.length; k++) {
    const a = breaks[k]!, b = breaks[k + 1]!, L = b - a, ends = [a];
    for (let j = depth; j >= 1; j--) ends.push(a + L * 2 ** -(j + 1));
    ends.push(a + L / 2);
    for (let j = 1; j <= depth; j++) ends.push(b - L * 2 ** -(j + 1));
    ends.push(b);
    for (let i = 0; i + 1 < ends.length; i++) {
      for (let s = 0; s < sub; s++) {
        const lo = ends[i]! + ((ends[i + 1]! - ends[i]!) * s) / sub, hi = ends[i]! + ((ends[i + 1]! - ends[i]!) * (s + 1)) / sub;
        for (let q = 0; q < 3; q++) {
          const x = 0.5 * (lo + hi) + 0.5 * (hi - lo) * G[q]!;
          if (x < cut) { p.push(x); w.push(0.5 * (hi - lo) * W[q]!); }
        }
      }
    }
  }
  return { p, w };
}
