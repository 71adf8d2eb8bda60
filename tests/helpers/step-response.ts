/**
 * Reference outside the project: the rod 0 < x < 1 with u0 = 0, u(t, 1) = 0 and u(t, 0) = 1 has
 * u = S(t, x) = (1 − x) − Σ_{n≥1} (2/(nπ)) e^{−n²π²t} sin nπx (Carslaw & Jaeger, Conduction of Heat
 * in Solids, 2nd ed., 1959, §3.4, from memory; it solves the equation term by term, and at t = 0
 * the sum is the sine series of 1 − x). Held at 1 until t_s and at 0 after, the rod has
 * u = S(t, x) − S(t − t_s, x) for t > t_s (superposition). tests/system/held-value-jumps.test.ts
 * checks S against the equation by finite differences.
 */
export function stepResponse(t: number, x: number): number {
  if (t <= 0) return 0;
  let s = 1 - x;
  for (let n = 1; n <= 5000; n++) {
    const e = Math.exp(-n * n * Math.PI * Math.PI * t);
    if (e < 1e-17) break;
    s -= (2 / (n * Math.PI)) * e * Math.sin(n * Math.PI * x);
  }
  return s;
}
