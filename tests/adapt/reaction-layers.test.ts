/**
 * Estimator reliability where a strong reaction makes a boundary layer (docs/adaptivity.md §2.4).
 *
 * With −κu'' + cu = f near a held edge, the solution settles after a time of about 1/c to the
 * reduced state f/c away from the edge and leaves the held value in a layer of width √(κ/c), for the
 * rest of the run. Before the first set resolved it, on (0, 1) in two cells with c = 10⁴, f = 1,
 * u0 = 0, u = 0 at both ends, T = 0.5, E fell to a fifth of the true error (err/E up to 4.8 after
 * about 140 unknowns) and then rose 2.3-fold in one step.
 *
 * Reference (outside the project): the exact solution by separation of variables (common practice;
 * Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, §3.3 for the sine series of the
 * slab): u = w − Σ_{n odd} b_n e^{−(n²π² + c)t} sin nπx with the steady state
 * w = (1/c)(1 − cosh(√c(x − ½))/cosh(√c/2)) and b_n = 4/(nπ(n²π² + c)), the sine coefficients of w.
 * Checked below against the equations themselves before it is used.
 *
 * The same layer forms at a convection edge κ∂u/∂n = h(u∞ − u) where the reduced state differs from
 * the ambient: the surface stays near u∞ + (f/c − u∞)·√(κc)/(h + √(κc)), pulled off the reduced state
 * in a layer of width √(κ/c). Unresolved, with h = 1000, c = 10⁴, f = 1, u0 = u∞ = 0 on (0, 1) in two
 * cells, err/E rose step after step to 3.76 at step 25 while the error stalled at 7.4·10⁻⁵.
 * Reference there: the expansion in the slab's symmetric Robin modes cos(μ(x − ½)), μ tan(μ/2) = h
 * (separation of variables with surface heat transfer; Carslaw & Jaeger §3.11, section number from
 * memory), checked below against the equations.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, intervalDomain, solveAdaptive, type SpaceTimeSolution, type SpatialDomain } from '../../src/index';
import { gradedGauss } from '../helpers/graded-gauss';

const C = 1e4;
const T = 0.5;
const S = Math.sqrt(C);

/** u and ∂x u of the exact solution (module comment). */
function exact(t: number, x: number): [number, number] {
  const ch = Math.cosh(S / 2);
  let u = (1 / C) * (1 - Math.cosh(S * (x - 0.5)) / ch);
  let ux = -(S / C) * (Math.sinh(S * (x - 0.5)) / ch);
  for (let n = 1; ; n += 2) {
    const k = n * n * Math.PI * Math.PI + C;
    const e = Math.exp(-k * t);
    const b = 4 / (n * Math.PI * k);
    if (b * e * n * Math.PI < 1e-17) break;
    u -= b * e * Math.sin(n * Math.PI * x);
    ux -= b * e * n * Math.PI * Math.cos(n * Math.PI * x);
  }
  return [u, ux];
}

/** (∫∫ |∂x e|² + c e²)^{1/2}, the energy norm E measures, on panels graded toward the ends, the middle and t = 0. */
function energyError(sol: SpaceTimeSolution): number {
  const xs = gradedGauss([0, 0.5, 1], 14, 4), ts = gradedGauss([0, 2 * T], 14, 4, T);
  const dx = 1e-9;
  let sum = 0;
  ts.p.forEach((t, k) => {
    const pts: number[] = [];
    for (const x of xs.p) pts.push(x, x < 0.5 ? x + dx : x - dx);
    const v = sol.evaluate(t, pts);
    let g = 0;
    xs.p.forEach((x, i) => {
      const [u, ux] = exact(t, x);
      const d = (v[2 * i + 1]! - v[2 * i]!) / (pts[2 * i + 1]! - x) - ux;
      g += xs.w[i]! * (d * d + C * (v[2 * i]! - u) ** 2);
    });
    sum += ts.w[k]! * g;
  });
  return Math.sqrt(sum);
}

/** err/E at every step of the default loop on `domain` with u0 = 0, f = 1, over `steps` steps. */
function ratiosAlong(domain: SpatialDomain, steps: number, error: (sol: SpaceTimeSolution) => number): number[] {
  const ratios: number[] = [];
  solveAdaptive(new HeatProblem({ domain, T, initial: () => 0, source: () => 1 }), {
    maxSteps: steps,
    onStep: (s, sol) => { ratios.push(error(sol) / s.estimate); },
  });
  if (process.env.CHRONOMESH_VERBOSE) console.log(ratios.map((r) => r.toFixed(2)).join(' '));
  return ratios;
}

/** Unknowns of the first adaptive set on `domain` with u0 ≡ u0v and f ≡ f. */
function firstSetSize(domain: SpatialDomain, u0v: number, f: number): number {
  let size = 0;
  solveAdaptive(new HeatProblem({ domain, T, initial: () => u0v, source: () => f }), {
    maxSteps: 1, onStep: (s) => { size = s.unknowns; },
  });
  return size;
}

describe('a reaction layer at held edges (c = 10⁴ on (0, 1) in two cells)', () => {
  it('the reference solves the problem: steady ODE, initial state, PDE and boundary values', () => {
    const h = 1e-4;
    for (const x of [0.003, 0.01, 0.3, 0.5]) {
      // −w'' + c w = 1 for the steady part (t large: the series has died out)
      const w = (y: number): number => exact(50, y)[0];
      expect(-(w(x + h) - 2 * w(x) + w(x - h)) / (h * h) + C * w(x)).toBeCloseTo(1, 3);
      // ∂t u = ∂xx u − c u + 1 at t = 1e-4
      const t = 1e-4, ht = 1e-8;
      const ut = (exact(t + ht, x)[0] - exact(t - ht, x)[0]) / (2 * ht);
      const uxx = (exact(t, x + h)[0] - 2 * exact(t, x)[0] + exact(t, x - h)[0]) / (h * h);
      expect(ut - (uxx - C * exact(t, x)[0] + 1)).toBeCloseTo(0, 2);
    }
    expect(Math.abs(exact(1e-12, 0.5)[0])).toBeLessThan(1e-8); // u0 = 0
    expect(Math.abs(exact(0.1, 0)[0])).toBeLessThan(1e-15); // held at 0
    // the analytic derivative against a difference quotient
    expect(exact(0.01, 0.02)[1]).toBeCloseTo((exact(0.01, 0.02 + 1e-7)[0] - exact(0.01, 0.02 - 1e-7)[0]) / 2e-7, 6);
  });

  it('err/E stays within [0.7, 2] over 30 steps (before: up to 4.8)', () => {
    const ratios = ratiosAlong(intervalDomain(0, 1, 2, { reaction: C }), 30, energyError);
    expect(ratios).toHaveLength(30);
    expect(Math.min(...ratios)).toBeGreaterThan(0.7);
    expect(Math.max(...ratios)).toBeLessThan(2);
  }, 60_000);

  it('the rule adds nothing where the reduced state meets the held value, or the layer is wider than the elements', () => {
    const first = (c: number, f: number, g: number): number =>
      firstSetSize(intervalDomain(0, 1, 2, { reaction: c, boundary: [{ kind: 'value', where: () => true, value: g }] }), g, f);
    const plain = first(1e4, 0, 0); // f = 0: nothing to balance, u ≡ 0
    expect(first(1e4, 1, 1e-4)).toBe(plain); // f/c = g: in balance
    expect(first(1, 1, 0)).toBe(first(1, 0, 0)); // √(κ/c) = 1, wider than the cells
    expect(first(1e4, 1, 0)).toBeGreaterThan(plain + 6); // the layer: bisected down to 4√(κ/c) = 0.04 at both ends
  }, 60_000);
});

describe('a reaction layer at convection edges (c = 10⁴, h = 1000, ambient 0, on (0, 1) in two cells)', () => {
  const H = 1000;
  // steady state w = 1/c − a·cosh(√c(x − ½))/cosh(√c/2) with w'(0) = h·w(0); written with
  // exponentials of non-positive arguments (cosh(√c/2) overflows nothing, but the difference would cancel)
  const a = H / C / (S * Math.tanh(S / 2) + H);
  const ch = (y: number): number => (Math.exp(S * (Math.abs(y) - 0.5)) + Math.exp(-S * (Math.abs(y) + 0.5))) / (1 + Math.exp(-S));
  const sh = (y: number): number => Math.sign(y) * (Math.exp(S * (Math.abs(y) - 0.5)) - Math.exp(-S * (Math.abs(y) + 0.5))) / (1 + Math.exp(-S));
  // symmetric Robin modes: μ_m in (2mπ, 2mπ + π) by bisection on μ tan(μ/2) = h; coefficient of w
  // in mode m: ⟨1, φ⟩ / ((μ² + c)⟨φ, φ⟩), since (−∂xx + c) is self-adjoint under the Robin condition
  const modes: { mu: number; b: number }[] = [];
  for (let m = 0; m < 20_000; m++) {
    let lo = 2 * m * Math.PI + 1e-15, hi = 2 * m * Math.PI + Math.PI - 1e-12;
    for (let it = 0; it < 200; it++) {
      const mid = 0.5 * (lo + hi);
      if (mid * Math.tan(mid / 2) < H) lo = mid; else hi = mid;
    }
    const mu = 0.5 * (lo + hi);
    modes.push({ mu, b: (2 * Math.sin(mu / 2)) / mu / ((mu * mu + C) * (0.5 + Math.sin(mu) / (2 * mu))) });
  }
  const robinExact = (t: number, x: number): [number, number] => {
    const y = x - 0.5;
    let u = 1 / C - a * ch(y), ux = -a * S * sh(y);
    for (const { mu, b } of modes) {
      const k = mu * mu + C;
      if (k * t > 40) break;
      const e = Math.exp(-k * t);
      u -= b * e * Math.cos(mu * y);
      ux += b * e * mu * Math.sin(mu * y);
    }
    return [u, ux];
  };
  /** (∫∫ |∂x e|² + c e² + h (e(t,0)² + e(t,1)²))^{1/2}, the energy E measures with the convection term. */
  const robinError = (sol: SpaceTimeSolution): number => {
    const xs = gradedGauss([0, 0.5, 1], 14, 4), ts = gradedGauss([0, 2 * T], 14, 4, T);
    const dx = 1e-9;
    let sum = 0;
    ts.p.forEach((t, k) => {
      const pts: number[] = [0, 1];
      for (const x of xs.p) pts.push(x, x < 0.5 ? x + dx : x - dx);
      const v = sol.evaluate(t, pts);
      const u0 = robinExact(t, 0)[0];
      let g = H * ((v[0]! - u0) ** 2 + (v[1]! - u0) ** 2);
      xs.p.forEach((x, i) => {
        const [u, ux] = robinExact(t, x);
        const d = (v[2 * i + 3]! - v[2 * i + 2]!) / (pts[2 * i + 3]! - x) - ux;
        g += xs.w[i]! * (d * d + C * (v[2 * i + 2]! - u) ** 2);
      });
      sum += ts.w[k]! * g;
    });
    return Math.sqrt(sum);
  };
  const robin = (ambient: number) => ({ reaction: C, boundary: [{ kind: 'convection' as const, where: () => true, transferCoefficient: H, ambient }] });

  it('the reference solves the problem: steady ODE, Robin condition, PDE and initial state', () => {
    const h = 1e-5;
    for (const x of [0.001, 0.02, 0.3]) {
      const w = (y: number): number => robinExact(1e3, y)[0];
      expect(-(w(x + h) - 2 * w(x) + w(x - h)) / (h * h) + C * w(x)).toBeCloseTo(1, 3);
      const t = 1e-4, ht = 1e-8, hx = 1e-4;
      const ut = (robinExact(t + ht, x)[0] - robinExact(t - ht, x)[0]) / (2 * ht);
      const uxx = (robinExact(t, x + hx)[0] - 2 * robinExact(t, x)[0] + robinExact(t, x - hx)[0]) / (hx * hx);
      expect(ut - (uxx - C * robinExact(t, x)[0] + 1)).toBeCloseTo(0, 2);
    }
    for (const t of [1e-3, 0.1]) {
      const [u, ux] = robinExact(t, 0);
      expect(Math.abs(ux - H * u)).toBeLessThan(1e-9 * H * Math.abs(u)); // κ∂u/∂n = h(0 − u) at x = 0 (n = −x)
      expect(ux).toBeCloseTo((robinExact(t, 1e-7)[0] - robinExact(t, 0)[0]) / 1e-7, 4);
    }
    // u0 = 0: at t ≪ 1/c the interior is (1 − e^{−ct})/c ≈ t
    expect(robinExact(1e-8, 0.3)[0]).toBeCloseTo(1e-8, 12);
    // the surface value of the steady state: (f/c)·√(κc)/(h + √(κc)) (common practice)
    expect(robinExact(1e3, 0)[0]).toBeCloseTo((1 / C) * S / (H + S), 12);
  });

  it('err/E stays within [0.7, 2] over 25 steps (before: rising to 3.76)', () => {
    const ratios = ratiosAlong(intervalDomain(0, 1, 2, robin(0)), 25, robinError);
    expect(ratios).toHaveLength(25);
    expect(Math.min(...ratios)).toBeGreaterThan(0.7);
    expect(Math.max(...ratios)).toBeLessThan(2);
  }, 60_000);

  it('adds nothing where the ambient is the reduced state', () => {
    const first = (f: number, ambient: number): number => firstSetSize(intervalDomain(0, 1, 2, robin(ambient)), ambient, f);
    const plain = first(0, 0);
    expect(first(1, 1 / C)).toBe(plain); // f/c = u∞ = u0: in balance
    expect(first(1, 0)).toBeGreaterThan(plain + 6); // the layer at both ends
  }, 60_000);
});
