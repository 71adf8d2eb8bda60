/**
 * Gauss–Legendre rules on [0, 1], computed by Newton's method on the
 * Legendre recurrence (common practice; nodes agree with Abramowitz & Stegun,
 * Table 25.4). Cached per order.
 */
const cache = new Map<number, { nodes: Float64Array; weights: Float64Array }>();

/** Nodes and weights of the n-point Gauss–Legendre rule on [0, 1]. */
export function gaussLegendre01(n: number): { nodes: Float64Array; weights: Float64Array } {
  let rule = cache.get(n);
  if (rule) return rule;
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      if (n === 1) { p1 = x; p0 = 1; }
      dp = (n * (x * p1 - p0)) / (x * x - 1);
      const dx = p1 / dp;
      x -= dx;
      if (Math.abs(dx) < 1e-16) break;
    }
    nodes[n - 1 - i] = 0.5 * (1 + x);
    weights[n - 1 - i] = 1 / ((1 - x * x) * dp * dp);
  }
  rule = { nodes, weights };
  cache.set(n, rule);
  return rule;
}
