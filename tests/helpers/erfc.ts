/**
 * Complementary error function for the closed-form heat-conduction references.
 *
 * erfc by the Maclaurin series of erf for x < 2 and by the Laplace continued fraction
 *   erfc x = e^{−x²}/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + …)))))
 * for x ≥ 2 (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, 7.1.5 and 7.1.14),
 * both to ~1e-15 relative; the repeated integral i²erfc x = ¼[(1 + 2x²) erfc x − (2/√π) x e^{−x²}]
 * (Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, Appendix II).
 */
export function erfc(x: number): number {
  if (x < 0) return 2 - erfc(-x);
  if (x < 2) {
    // erf x = 2/√π Σ (−1)^n x^{2n+1} / (n! (2n+1))
    let term = x, sum = x;
    for (let n = 1; n < 100; n++) {
      term *= (-x * x) / n;
      const add = term / (2 * n + 1);
      sum += add;
      if (Math.abs(add) < 1e-17 * Math.abs(sum)) break;
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * sum;
  }
  return Math.exp(-x * x) / Math.sqrt(Math.PI) / (x + laplaceTail(x));
}

/** erfcx(x) = e^{x²} erfc(x) for x ≥ 0 without overflow: directly below 2, by the same continued fraction above. */
export function erfcx(x: number): number {
  if (x < 2) return Math.exp(x * x) * erfc(x);
  return 1 / Math.sqrt(Math.PI) / (x + laplaceTail(x));
}

/** The tail f of Laplace's continued fraction erfc x = e^{−x²}/√π · 1/(x + f), evaluated from 60 terms down (x ≥ 2). */
function laplaceTail(x: number): number {
  let f = 0;
  for (let k = 60; k >= 1; k--) f = (k / 2) / (x + f);
  return f;
}

/** i²erfc x, the second repeated integral of erfc. */
export function i2erfc(x: number): number {
  return 0.25 * ((1 + 2 * x * x) * erfc(x) - (2 / Math.sqrt(Math.PI)) * x * Math.exp(-x * x));
}
