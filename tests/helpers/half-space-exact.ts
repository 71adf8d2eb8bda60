/**
 * Exact solutions next to a surface over short horizons (κ = 1), where the layer is far thinner than
 * the body and the half-space solutions apply.
 *
 * Cooling: a slab cooled at its surfaces, u0 ≡ 1 on (0, 1), convection κ ∂u/∂n = h (0 − u) at both
 * ends (Newton cooling into surroundings at 0).
 *
 * Source: H. S. Carslaw & J. C. Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, §2.7 (the
 * semi-infinite solid x > 0 at constant initial temperature, with heat transfer at its surface into
 * a medium at zero); the formula is quoted from memory and checked in tests/helpers/half-space-exact.test.ts
 * against the equation, the surface condition and the held-surface limit h → ∞:
 *
 *   w(t, x) = erf(X) + e^{hx + h²t} erfc(X + h√t),   X = x/(2√t),
 *   ∂w/∂x   = h e^{hx + h²t} erfc(X + h√t)            (the e^{−X²} terms cancel).
 *
 * With Y = X + h√t one has hx + h²t = Y² − X², so e^{hx + h²t} erfc(Y) = e^{−X²} erfcx(Y), which
 * neither overflows nor loses digits. On the slab the two surfaces' solutions superpose,
 * u = w(t, x) + w(t, 1 − x) − 1, with an error below erfc(1/(2√t)) (the method of images, common
 * practice), far below rounding for t ≤ 10⁻³.
 *
 * Heating by a flux: a constant flux q into the half-space x > 0 at 0 (Carslaw & Jaeger §2.9; from
 * memory, checked as above):
 *
 *   u(t, x) = 2q√t ierfc(X),   ∂u/∂x = −q erfc(X),   ierfc z = e^{−z²}/√π − z erfc z.
 */
import { erfc, erfcx } from './erfc';

export { erfcx };

/** w and ∂w/∂x of the semi-infinite solid (file comment), t > 0, x ≥ 0. */
export function cooledHalfSpace(h: number, t: number, x: number): [number, number] {
  const st = Math.sqrt(t), X = x / (2 * st);
  const g = Math.exp(-X * X) * erfcx(X + h * st);
  return [1 - erfc(X) + g, h * g];
}

/** u and ∂u/∂x on the slab (0, 1) cooled at both ends, for short horizons (t ≤ 10⁻³); u = 1 at t = 0. */
export function cooledSlab(h: number, t: number, x: number): [number, number] {
  if (t <= 0) return [1, 0];
  const a = cooledHalfSpace(h, t, x), b = cooledHalfSpace(h, t, 1 - x);
  return [a[0] + b[0] - 1, a[1] - b[1]];
}

/** u and ∂u/∂x in the half-space x > 0 at 0, heated by the constant flux q at x = 0 (file comment), t ≥ 0. */
export function heatedHalfSpace(q: number, t: number, x: number): [number, number] {
  if (t <= 0) return [0, 0];
  const st = Math.sqrt(t), X = x / (2 * st);
  const ierfc = Math.exp(-X * X) / Math.sqrt(Math.PI) - X * erfc(X);
  return [2 * q * st * ierfc, -q * erfc(X)];
}

/**
 * u and ∂u/∂x in the infinite solid with u0 = 1 on (a, b) and 0 outside (Carslaw & Jaeger §2.2, the
 * initial state given on a region; quoted from memory and checked in ./half-space-exact.test.ts
 * against the equation, the initial state, the heat content and the energy identity):
 *
 *   u = ½[erf((x − a)/(2√t)) − erf((x − b)/(2√t))],   ∂u/∂x = (e^{−(x−a)²/4t} − e^{−(x−b)²/4t}) / √(4πt).
 *
 * In a body held at 0 at a distance D from the band, the images change it by less than erfc(D/(2√t))
 * (common practice), far below rounding for D = 0.3 and t ≤ 10⁻⁴.
 */
export function warmBand(a: number, b: number, t: number, x: number): [number, number] {
  if (t <= 0) return [x > a && x < b ? 1 : 0, 0];
  const r = 2 * Math.sqrt(t);
  const u = 0.5 * (erfc((x - b) / r) - erfc((x - a) / r));
  const g = (Math.exp(-(((x - a) / r) ** 2)) - Math.exp(-(((x - b) / r) ** 2))) / Math.sqrt(4 * Math.PI * t);
  return [u, g];
}
