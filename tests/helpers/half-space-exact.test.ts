/**
 * The half-space references of ./half-space-exact.ts checked against what defines it (the heat equation,
 * the surface condition, the initial state) and against the held-surface limit, so that the formula
 * quoted from memory (Carslaw & Jaeger §2.2, §2.7 and §2.9) cannot carry a slip into the tests that use it.
 */
import { describe, expect, it } from 'vitest';
import { erfc } from './erfc';
import { cooledHalfSpace, cooledSlab, erfcx, heatedHalfSpace, warmBand } from './half-space-exact';
import { gradedGauss } from './graded-gauss';

/**
 * Checks ∂t u = ∂²u/∂x² at t = 1e-4 and three depths inside the layer by central differences, and
 * that the returned ∂u/∂x is the derivative of the returned u.
 */
function expectHeatEquation(u: (t: number, x: number) => [number, number]): void {
  const t = 1e-4, dt = 1e-9, dx = 1e-5;
  for (const x of [0.3e-2, 1e-2, 3e-2]) {
    const ut = (u(t + dt, x)[0] - u(t - dt, x)[0]) / (2 * dt);
    const uxx = (u(t, x + dx)[0] - 2 * u(t, x)[0] + u(t, x - dx)[0]) / (dx * dx);
    expect(Math.abs(ut - uxx)).toBeLessThan(1e-4 * Math.max(1, Math.abs(ut)));
    expect(u(t, x)[1]).toBeCloseTo((u(t, x + dx)[0] - u(t, x - dx)[0]) / (2 * dx), 5);
  }
}

describe('semi-infinite solid cooled at its surface (Carslaw & Jaeger §2.7 and §2.9)', () => {
  it('erfcx matches e^{x²} erfc(x) where both are representable', () => {
    for (const x of [0, 0.3, 1.9, 2, 2.1, 5, 12]) expect(erfcx(x)).toBeCloseTo(Math.exp(x * x) * erfc(x), 12);
    // large x: erfcx(x) ~ 1/(x√π) (1 − 1/(2x²)) (A&S 7.1.23)
    expect(erfcx(1e4) * 1e4 * Math.sqrt(Math.PI)).toBeCloseTo(1 - 0.5e-8, 12);
  });

  it.each([1, 30, 1000])('h = %d: satisfies ∂t w = ∂²w/∂x², ∂w/∂x = h w at x = 0 and w → 1 as t → 0', (h) => {
    const t = 1e-4;
    expectHeatEquation((s, x) => cooledHalfSpace(h, s, x));
    const [w0, g0] = cooledHalfSpace(h, t, 0);
    expect(g0).toBeCloseTo(h * w0, 10);
    expect(cooledHalfSpace(h, 1e-14, 0.01)[0]).toBeCloseTo(1, 12);
  });

  it('tends to the held surface, w = erf(x/(2√t)), as h → ∞', () => {
    for (const x of [1e-3, 1e-2, 2e-2]) expect(cooledHalfSpace(1e9, 1e-4, x)[0]).toBeCloseTo(1 - erfc(x / 2e-2), 6);
  });

  it('the slab superposes both surfaces and is symmetric', () => {
    expect(cooledSlab(50, 1e-5, 0.2)[0]).toBeCloseTo(cooledSlab(50, 1e-5, 0.8)[0], 14);
    expect(cooledSlab(50, 1e-5, 0.2)[1]).toBeCloseTo(-cooledSlab(50, 1e-5, 0.8)[1], 12);
    expect(cooledSlab(50, 1e-5, 0.5)[0]).toBeCloseTo(1, 14);
  });
});

describe('semi-infinite solid heated by a constant surface flux (Carslaw & Jaeger §2.9)', () => {
  it('satisfies ∂t u = ∂²u/∂x², −∂u/∂x = q at x = 0, u → 0 as t → 0, and takes in q·t', () => {
    const q = 3, t = 1e-4;
    expectHeatEquation((s, x) => heatedHalfSpace(q, s, x));
    expect(heatedHalfSpace(q, t, 0)[1]).toBeCloseTo(-q, 12);
    expect(heatedHalfSpace(q, 1e-14, 0.01)[0]).toBeCloseTo(0, 12);
    // heat balance: ∫₀^∞ u dx = q t (composite Simpson to x = 0.2, where u is below 1e-40)
    const n = 4000, L = 0.2;
    let s = 0;
    for (let k = 0; k <= n; k++) s += (k === 0 || k === n ? 1 : k % 2 ? 4 : 2) * heatedHalfSpace(q, t, (k * L) / n)[0];
    expect((s * L) / (3 * n)).toBeCloseTo(q * t, 10);
  });
});

describe('infinite solid with u0 = 1 on a band (Carslaw & Jaeger §2.2)', () => {
  const a = 0.3, b = 0.7;
  it('satisfies the heat equation at both fronts, starts from the band and keeps its heat content', () => {
    expectHeatEquation((t, x) => warmBand(a, b, t, a + x));
    expectHeatEquation((t, x) => { const [u, g] = warmBand(a, b, t, b - x); return [u, -g]; });
    for (const [x, want] of [[0.29, 0], [0.31, 1], [0.5, 1], [0.71, 0]] as const) expect(warmBand(a, b, 1e-14, x)[0]).toBeCloseTo(want, 12);
    const xs = gradedGauss([0, a, b, 1], 30, 4);
    let heat = 0;
    xs.p.forEach((x, i) => { heat += xs.w[i]! * warmBand(a, b, 1e-4, x)[0]; });
    expect(heat).toBeCloseTo(b - a, 8);
  });

  it('energy identity ∫₀ᵀ‖∂x u‖² dt = (‖u0‖² − ‖u(T)‖²)/2 = 2·√(T/2π) on the rules the tests integrate errors with', () => {
    // The identity follows from the equation (common practice); 2·√(T/2π) is ∫₀ᵀ 1/√(8πt) dt for each
    // of the two fronts (J = 1), exact up to their overlap e^{−(b−a)²/8T}.
    const T = 1e-6;
    const xs = gradedGauss([0, a, b, 1], 30, 4), ts = gradedGauss([0, 2 * T], 30, 4, T);
    let energy = 0;
    ts.p.forEach((t, k) => { let g = 0; xs.p.forEach((x, i) => { g += xs.w[i]! * warmBand(a, b, t, x)[1] ** 2; }); energy += ts.w[k]! * g; });
    let uT = 0;
    xs.p.forEach((x, i) => { uT += xs.w[i]! * warmBand(a, b, T, x)[0] ** 2; });
    // 2·10⁻⁶ low: the innermost time panel (2^-31 T) misses part of the 1/√t singularity
    expect(energy / (2 * Math.sqrt(T / (2 * Math.PI)))).toBeCloseTo(1, 5);
    expect(energy / ((b - a - uT) / 2)).toBeCloseTo(1, 5);
  });
});
