/**
 * Quadrature rules on the reference simplex, as (barycentric coordinates, weight) with weights
 * summing to 1 (multiply by the element measure).
 *
 * Triangle: the 7-point symmetric rule exact for degree 5 (Radon's rule; tabulated by Strang & Fix,
 * An Analysis of the Finite Element Method, 1973, and by Dunavant, 1985). Interval: 3-point
 * Gauss–Legendre, exact for degree 5.
 */

const s15 = Math.sqrt(15);
const a1 = (6 - s15) / 21, b1 = 1 - 2 * a1, w1 = (155 - s15) / 1200;
const a2 = (6 + s15) / 21, b2 = 1 - 2 * a2, w2 = (155 + s15) / 1200;

/** Barycentric coordinates (λ0, λ1, λ2) per point, flat. */
export const TRIANGLE_POINTS = Float64Array.from([
  1 / 3, 1 / 3, 1 / 3,
  a1, a1, b1, a1, b1, a1, b1, a1, a1,
  a2, a2, b2, a2, b2, a2, b2, a2, a2,
]);
export const TRIANGLE_WEIGHTS = Float64Array.from([9 / 40, w1, w1, w1, w2, w2, w2]);

const g = Math.sqrt(3 / 5) / 2;
/** Barycentric coordinates (λ0, λ1) per point on an interval, flat. */
export const INTERVAL_POINTS = Float64Array.from([0.5 + g, 0.5 - g, 0.5, 0.5, 0.5 - g, 0.5 + g]);
export const INTERVAL_WEIGHTS = Float64Array.from([5 / 18, 8 / 18, 5 / 18]);
