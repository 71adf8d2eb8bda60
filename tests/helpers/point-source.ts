/**
 * A unit point source switched on at t = 0 at x₀ in the rod (0, 1) held at 0 at both ends, starting
 * at rest (tests/system/curve-sources.test.ts, tests/cli/curve-sources.test.ts). Two closed forms:
 *   series:  u = G(x) − Σ_n 2 sin(nπx₀) sin(nπx) e^{−n²π²t} / (n²π²), with the steady
 *            G(x) = x(1 − x₀) for x ≤ x₀ and x₀(1 − x) beyond (Green's function of −u″ = δ;
 *            eigenfunction expansion, common practice);
 *   images:  u = Σ_k F(|x − x₀ − 2k|) − F(|x + x₀ − 2k|), F(r) = √(t/π) e^{−r²/4t} − (r/2) erfc(r/2√t),
 *            the free-space kernel integrated in time (derived: F(0) = √(t/π) = ∫₀ᵗ (4πs)^{−1/2} ds and
 *            ∂F/∂r = −½ erfc(r/2√t)), reflected in the held ends (method of images).
 * Each returns [u, ∂x u].
 */
import { erfc } from './erfc';

/** The rod's field and gradient by the eigenfunction series with the steady part in closed form. */
export function seriesForm(t: number, x: number, x0: number): [number, number] {
  let u = x <= x0 ? x * (1 - x0) : x0 * (1 - x);
  let g = x <= x0 ? 1 - x0 : -x0;
  for (let n = 1; n <= 400; n++) {
    const k = n * Math.PI;
    const decay = Math.exp(-k * k * t);
    if (decay < 1e-20) break;
    u -= (2 * Math.sin(k * x0) * Math.sin(k * x) * decay) / (k * k);
    g -= (2 * Math.sin(k * x0) * Math.cos(k * x) * decay) / k;
  }
  return [u, g];
}

/** The same by images of the free-space solution. */
export function imageForm(t: number, x: number, x0: number): [number, number] {
  const F = (r: number) => Math.sqrt(t / Math.PI) * Math.exp((-r * r) / (4 * t)) - (r / 2) * erfc(r / (2 * Math.sqrt(t)));
  const dF = (r: number) => -0.5 * erfc(r / (2 * Math.sqrt(t)));
  let u = 0, g = 0;
  for (let k = -4; k <= 4; k++) {
    for (const [c, sign] of [[x0 + 2 * k, 1], [-x0 + 2 * k, -1]] as const) {
      const r = Math.abs(x - c);
      u += sign * F(r);
      g += sign * Math.sign(x - c) * dF(r);
    }
  }
  return [u, g];
}

/** The series for t ≥ 0.02 (fast there), the images below. */
export const rod = (t: number, x: number, x0: number): [number, number] => (t < 0.02 ? imageForm(t, x, x0) : seriesForm(t, x, x0));

