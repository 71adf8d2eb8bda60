/**
 * Checks of the exact-solution helper against outside references:
 * erfc against Abramowitz & Stegun (1964) Table 7.1 and the asymptotic
 * expansion A&S 7.1.23; the two closed forms of Carslaw & Jaeger §3.3 against
 * each other; the PDE, boundary and initial conditions by finite differences;
 * the energy identity against direct quadrature of |∇u|².
 */
import { describe, expect, it } from 'vitest';
import { gaussLegendre01 } from '../../src/numerics/gauss-legendre';
import {
  erfc, heatExact1D, heatExact2D, slab, slabGradientEnergy, slabGradientEnergyImages, slabGradientEnergySeries,
  slabImages, slabSeries, unitInterval, unitSquare,
} from './heat-exact';

describe('erfc', () => {
  // A&S Table 7.1 (erf x to 15 decimals); values recalled from the table and
  // cross-checked against a 40-digit evaluation (mpmath) when this test was written.
  const table: [number, number][] = [
    [0.1, 0.112462916018285], [0.2, 0.222702589210478], [0.3, 0.328626759459127],
    [0.4, 0.428392355046668], [0.5, 0.520499877813047], [0.6, 0.603856090847926],
    [0.7, 0.677801193837418], [0.8, 0.742100964707661], [0.9, 0.796908212422832],
    [1.0, 0.842700792949715], [1.2, 0.910313978229635], [1.4, 0.952285119762649],
    [1.5, 0.966105146475311], [1.8, 0.989090501635731], [2.0, 0.995322265018953],
  ];
  it('matches A&S Table 7.1 to the table’s 15 decimals, for ±x', () => {
    for (const [x, erf] of table) {
      expect(Math.abs(erfc(x) - (1 - erf))).toBeLessThan(1e-15);
      expect(Math.abs(erfc(-x) - (1 + erf))).toBeLessThan(1.5e-15);
    }
    expect(erfc(0)).toBe(1);
  });

  it('matches the asymptotic expansion A&S 7.1.23 for x ≥ 6 to 2e-15 relative', () => {
    // √π x e^{x²} erfc x = 1 + Σ_{m≥1} (−1)^m (2m−1)!! / (2x²)^m, summed to its smallest term
    // (the remainder is below the first omitted term, < 1e-16 for x ≥ 6).
    for (const x of [6, 7, 8, 10, 15, 20, 25]) {
      let term = 1;
      let sum = 1;
      for (let m = 1; m < 200; m++) {
        const next = (-term * (2 * m - 1)) / (2 * x * x);
        if (Math.abs(next) >= Math.abs(term)) break;
        term = next;
        sum += term;
      }
      const expected = (sum * Math.exp(-x * x)) / (Math.sqrt(Math.PI) * x);
      expect(Math.abs(erfc(x) / expected - 1)).toBeLessThan(2e-15);
    }
  });

  it('matches recalled values at x = 3, 4, 5 (checked against mpmath, 40 digits)', () => {
    const ref: [number, number][] = [[3, 2.2090496998585441e-5], [4, 1.5417257900280019e-8], [5, 1.5374597944280349e-12]];
    for (const [x, v] of ref) expect(Math.abs(erfc(x) / v - 1)).toBeLessThan(1e-15);
  });

  it('is continuous across the joins of its three forms (derivative −(2/√π) e^{−x²})', () => {
    for (const x0 of [0.5, 0.5625, 1.0625, 2.9375, 3]) {
      const eps = 1e-9;
      const slope = (erfc(x0 + eps) - erfc(x0 - eps)) / (2 * eps);
      expect(Math.abs(slope / ((-2 / Math.sqrt(Math.PI)) * Math.exp(-x0 * x0)) - 1)).toBeLessThan(1e-6);
    }
  });
});

// Composite Gauss–Legendre (10 points per panel) on [0, 1] with panels graded
// geometrically toward both ends, for integrands with boundary layers.
function integrate01(f: (x: number) => number, layers = 45): number {
  const { nodes, weights } = gaussLegendre01(10);
  const br = [0];
  for (let k = layers; k >= 2; k--) br.push(2 ** -k);
  for (let k = 2; k <= layers; k++) br.push(1 - 2 ** -k);
  br.push(1);
  br.splice(br.indexOf(0.25) + 1, 0, 0.5);
  let s = 0;
  for (let i = 0; i + 1 < br.length; i++) {
    const a = br[i]!;
    const h = br[i + 1]! - a;
    for (let q = 0; q < nodes.length; q++) s += h * weights[q]! * f(a + h * nodes[q]!);
  }
  return s;
}

// ∫₀ᵀ g(t) dt for g ~ t^{−1/2}: t = s², panels in s graded toward 0.
function integrateTime(g: (t: number) => number, T: number): number {
  const { nodes, weights } = gaussLegendre01(10);
  const S = Math.sqrt(T);
  const br = [0];
  for (let k = 30; k >= 1; k--) br.push(S * 2 ** -k);
  br.push(S);
  let s = 0;
  for (let i = 0; i + 1 < br.length; i++) {
    const a = br[i]!;
    const h = br[i + 1]! - a;
    for (let q = 0; q < nodes.length; q++) {
      const u = a + h * nodes[q]!;
      s += h * weights[q]! * 2 * u * g(u * u);
    }
  }
  return s;
}

describe('unit slab (0, 1), κ = 1 (Carslaw & Jaeger §3.3)', () => {
  it('series and images forms agree where both converge (0.002 ≤ t ≤ 0.3)', () => {
    const a = new Float64Array(2);
    const b = new Float64Array(2);
    let worstV = 0;
    let worstG = 0;
    for (const t of [0.002, 0.005, 0.01, 0.03, 0.05, 0.1, 0.3]) {
      for (let i = 0; i <= 200; i++) {
        const x = i / 200 + (i > 0 && i < 200 ? 1e-3 * Math.sin(i) : 0);
        slabSeries(t, x, a);
        slabImages(t, x, b);
        worstV = Math.max(worstV, Math.abs(a[0]! - b[0]!));
        worstG = Math.max(worstG, Math.abs(a[1]! - b[1]!) / (1 + Math.abs(a[1]!)));
      }
    }
    expect(worstV).toBeLessThan(1e-14);
    expect(worstG).toBeLessThan(1e-13);
  });

  it('both forms of E(τ) = ∫₀^τ ‖v_x‖² agree (0.002 ≤ τ ≤ 0.3), and E(∞) = 1/2', () => {
    for (const tau of [0.002, 0.01, 0.05, 0.1, 0.3]) {
      expect(Math.abs(slabGradientEnergySeries(tau) / slabGradientEnergyImages(tau) - 1)).toBeLessThan(1e-13);
    }
    expect(slabGradientEnergy(50)).toBe(0.5);
  });

  it('satisfies the PDE, boundary and initial conditions (finite differences)', () => {
    const o = new Float64Array(2);
    for (const t of [1e-4, 0.01, 0.04, 0.06, 0.2]) {
      const h = 1e-4 * Math.sqrt(t);
      const k = 1e-3 * t;
      for (const x of [0.1, 0.37, 0.5, 0.9]) {
        const ut = (slab(t + k, x, o)[0]! - slab(t - k, x, o)[0]!) / (2 * k);
        const uxx = (slab(t, x + h, o)[1]! - slab(t, x - h, o)[1]!) / (2 * h);
        const ux = (slab(t, x + h, o)[0]! - slab(t, x - h, o)[0]!) / (2 * h);
        const scale = 1 + Math.abs(ut);
        expect(Math.abs(ut - uxx) / scale).toBeLessThan(1e-5);
        expect(Math.abs(ux - slab(t, x, o)[1]!) / (1 + Math.abs(ux))).toBeLessThan(1e-6);
      }
      expect(Math.abs(slab(t, 0, o)[0]!)).toBeLessThan(1e-15);
      expect(Math.abs(slab(t, 1, o)[0]!)).toBeLessThan(1e-15);
    }
    expect(slab(1e-10, 0.3, o)[0]).toBeCloseTo(1, 14);
  });

  it('energy identity: E(T) equals direct quadrature of ∫₀ᵀ∫₀¹ v_x² (relative 1e-11)', () => {
    const o = new Float64Array(2);
    for (const T of [0.001, 0.05, 0.5]) {
      const direct = integrateTime((t) => integrate01((x) => slab(t, x, o)[1]! ** 2), T);
      expect(Math.abs(direct / unitInterval.gradientEnergy(T) - 1)).toBeLessThan(1e-11);
      // and ‖v(T)‖² by quadrature of v²
      const l2 = integrate01((x) => slab(T, x, o)[0]! ** 2);
      expect(Math.abs(l2 - unitInterval.l2NormSquared(T))).toBeLessThan(1e-13);
    }
  });
});

describe('scaled solutions', () => {
  it('interval (a, b) with κ ≠ 1 solves u_t = κ u_xx with zero boundary values', () => {
    const u = heatExact1D({ a: -1, b: 2, kappa: 0.3 });
    const g = new Float64Array(2);
    for (const t of [0.01, 0.2, 1.5]) {
      const h = 1e-4;
      const k = 1e-3 * t;
      for (const x of [-0.7, 0.4, 1.9]) {
        const ut = (u.value(t + k, x) - u.value(t - k, x)) / (2 * k);
        u.gradient(t, x + h, 0, g);
        const gp = g[0]!;
        u.gradient(t, x - h, 0, g);
        const uxx = (gp - g[0]!) / (2 * h);
        expect(Math.abs(ut - 0.3 * uxx) / (1 + Math.abs(ut))).toBeLessThan(1e-5);
      }
      expect(Math.abs(u.value(t, -1))).toBeLessThan(1e-15);
      expect(Math.abs(u.value(t, 2))).toBeLessThan(1e-15);
    }
    expect(u.initialNormSquared).toBe(3);
    // energy identity by direct quadrature (x = −1 + 3ξ)
    const T = 0.8;
    const direct = integrateTime((t) => 3 * integrate01((xi) => { u.gradient(t, -1 + 3 * xi, 0, g); return g[0]! ** 2; }), T);
    expect(Math.abs(direct / u.gradientEnergy(T) - 1)).toBeLessThan(1e-11);
    expect(Math.abs((u.initialNormSquared - u.l2NormSquared(T)) / (2 * 0.3) / u.gradientEnergy(T) - 1)).toBeLessThan(1e-13);
  });

  it('rectangle with κ ≠ 1 solves u_t = κ Δu; gradient matches differences; energy identity by quadrature', () => {
    const u = heatExact2D({ x0: 0, x1: 2, y0: -0.5, y1: 0.5, kappa: 2 });
    const g = new Float64Array(2);
    const gp = new Float64Array(2);
    for (const t of [0.002, 0.05]) {
      const h = 1e-4;
      const k = 1e-3 * t;
      for (const [x, y] of [[0.3, 0.1], [1.2, -0.4], [1.9, 0.0]] as [number, number][]) {
        const ut = (u.value(t + k, x, y) - u.value(t - k, x, y)) / (2 * k);
        u.gradient(t, x + h, y, gp);
        u.gradient(t, x - h, y, g);
        const uxx = (gp[0]! - g[0]!) / (2 * h);
        u.gradient(t, x, y + h, gp);
        u.gradient(t, x, y - h, g);
        const uyy = (gp[1]! - g[1]!) / (2 * h);
        expect(Math.abs(ut - 2 * (uxx + uyy)) / (1 + Math.abs(ut))).toBeLessThan(1e-5);
        u.gradient(t, x, y, g);
        expect(Math.abs((u.value(t, x + h, y) - u.value(t, x - h, y)) / (2 * h) - g[0]!)).toBeLessThan(1e-6 * (1 + Math.abs(g[0]!)));
        expect(Math.abs((u.value(t, x, y + h) - u.value(t, x, y - h)) / (2 * h) - g[1]!)).toBeLessThan(1e-6 * (1 + Math.abs(g[1]!)));
      }
      expect(Math.abs(u.value(t, 0, 0.2))).toBeLessThan(1e-15);
      expect(Math.abs(u.value(t, 1, 0.5))).toBeLessThan(1e-15);
    }
    // ‖∇u‖² separates: ‖∂x u‖² = ‖∂x vx‖²‖vy‖², so one-dimensional quadratures suffice.
    const T = 0.1;
    const l2 = (L: number, f: (s: number) => number) => L * integrate01(f);
    const vx = heatExact1D({ a: 0, b: 2, kappa: 2 });
    const vy = heatExact1D({ a: -0.5, b: 0.5, kappa: 2 });
    const g1 = new Float64Array(1);
    const direct = integrateTime((t) => {
      const dxx = l2(2, (s) => { vx.gradient(t, 2 * s, 0, g1); return g1[0]! ** 2; });
      const dyy = l2(1, (s) => { vy.gradient(t, -0.5 + s, 0, g1); return g1[0]! ** 2; });
      const nx = l2(2, (s) => vx.value(t, 2 * s) ** 2);
      const ny = l2(1, (s) => vy.value(t, -0.5 + s) ** 2);
      return dxx * ny + nx * dyy;
    }, T);
    expect(Math.abs(direct / u.gradientEnergy(T) - 1)).toBeLessThan(1e-10);
    expect(Math.abs(unitSquare.gradientEnergy(0.5) - (1 - unitSquare.l2NormSquared(0.5)) / 2)).toBeLessThan(1e-15);
  });
});
