/**
 * Outside references for the boundary parts (prescribed value, flux, convection).
 *
 * Sources (named per check): Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959
 * (§3.11 slab with surface heat transfer, §2.9 constant flux into a semi-infinite solid, §2.5
 * surface temperature rising linearly in time); the series thermal-resistance network of a
 * composite wall (common practice, derived below); a manufactured solution for the rates.
 * α = κ throughout, since the library's equation is ∂t u = ∇·(κ∇u) + f (unit heat capacity).
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, rectangleDomain, spaceTimeErrors } from '../../src/index';
import { erfc, i2erfc } from '../helpers/erfc';

/** n-th positive root of β tan β = Bi, in (nπ, nπ + π/2), by bisection. */
function slabEigenvalue(n: number, Bi: number): number {
  let lo = n * Math.PI + 1e-14, hi = n * Math.PI + Math.PI / 2 - 1e-14;
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (lo + hi);
    if (m * Math.tan(m) > Bi) hi = m;
    else lo = m;
  }
  return 0.5 * (lo + hi);
}

describe('slab −L < x < L convecting on both faces (Carslaw & Jaeger §3.11)', () => {
  // Bi = hL/κ = 1 with L = 1, κ = 1, h = 1; u_i = 1, u_∞ = 0; θ = Σ C_n e^{−β_n² Fo} cos(β_n x/L),
  // C_n = 4 sin β_n / (2β_n + sin 2β_n), Fo = κt/L².
  const Bi = 1;
  const betas = Array.from({ length: 300 }, (_, n) => slabEigenvalue(n, Bi));
  const coef = betas.map((b) => (4 * Math.sin(b)) / (2 * b + Math.sin(2 * b)));
  const theta = (Fo: number, x: number) => betas.reduce((s, b, n) => s + coef[n]! * Math.exp(-b * b * Fo) * Math.cos(b * x), 0);

  it('first eigenvalue and one-term coefficient match the handbook table (β₁ ≈ 0.8603, C₁ ≈ 1.1191)', () => {
    // Table values of one-term coefficients for Bi = 1, quoted from memory; recomputed here.
    expect(Math.abs(betas[0]! - 0.8603)).toBeLessThan(1e-4);
    expect(Math.abs(coef[0]! - 1.1191)).toBeLessThan(1e-4);
    // the series reproduces the initial state (a check of the reference itself)
    expect(Math.abs(theta(1e-4, 0) - 1)).toBeLessThan(1e-3);
  });

  it('probe values for Fo ≥ 0.2 within 1e-3 (sparse grid, L = 8)', () => {
    const domain = intervalDomain(-1, 1, 2, { boundary: [{ kind: 'convection', where: () => true, transferCoefficient: Bi, ambient: 0 }] });
    const { solution, pcg } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 8)).solve({ relTol: 1e-10 });
    expect(pcg.converged).toBe(true);
    const xs = [-1, -0.5, 0, 0.3, 0.7, 1];
    for (const Fo of [0.2, 0.5, 1]) {
      const v = solution.evaluate(Fo, xs);
      xs.forEach((x, i) => expect(Math.abs(v[i]! - theta(Fo, x))).toBeLessThan(1e-3));
    }
    // one-term approximation is accurate for Fo ≥ 0.2 (the usual rule): centre value
    const oneTerm = coef[0]! * Math.exp(-(betas[0]! ** 2) * 0.5);
    expect(Math.abs(solution.evaluate(0.5, [0])[0]! - oneTerm)).toBeLessThan(2e-3);
  });
});

describe('semi-infinite body, short times', () => {
  const T = 0.01; // penetration depth 2√(αT) = 0.2 ≪ 1, so the far end at x = 1 is not felt

  it('constant heat flux q into the surface (Carslaw & Jaeger §2.9): errors ≤ 1e-3 of the surface value', () => {
    const q = 3;
    const exact = (t: number, x: number) => 2 * q * Math.sqrt(t / Math.PI) * Math.exp(-(x * x) / (4 * t)) - q * x * erfc(x / (2 * Math.sqrt(t)));
    const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'flux', where: [[0]], flux: q }] });
    const { solution, pcg } = new SpaceTimeSystem(new HeatProblem({ domain, T }), DoubleTree.sparseGrid(domain, 10)).solve({ relTol: 1e-10 });
    expect(pcg.converged).toBe(true);
    const us = exact(T, 0);
    const xs = [0, 0.02, 0.05, 0.1, 0.2];
    for (const t of [T / 4, T / 2, T]) {
      const v = solution.evaluate(t, xs);
      xs.forEach((x, i) => expect(Math.abs(v[i]! - exact(t, x)) / us).toBeLessThan(1e-3));
    }
  });

  it('surface value rising linearly, u(t, 0) = a t (Carslaw & Jaeger §2.5): u = 4at·i²erfc(x / 2√(αt))', () => {
    const a = 50;
    const exact = (t: number, x: number) => 4 * a * t * i2erfc(x / (2 * Math.sqrt(t)));
    const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t) => a * t }] });
    const { solution, pcg } = new SpaceTimeSystem(new HeatProblem({ domain, T }), DoubleTree.sparseGrid(domain, 10)).solve({ relTol: 1e-10 });
    expect(pcg.converged).toBe(true);
    const xs = [0, 0.02, 0.05, 0.1, 0.2];
    for (const t of [T / 4, T / 2, T]) {
      const v = solution.evaluate(t, xs);
      xs.forEach((x, i) => expect(Math.abs(v[i]! - exact(t, x)) / (a * T)).toBeLessThan(1e-3));
    }
  });
});

describe('two-layer wall with convection on both faces: steady state', () => {
  // Layers κ1 = 1 on (0, 0.4), κ2 = 3 on (0.4, 1); hot side h1 = 5 to 100, cold side h2 = 2 to 20.
  // Series thermal-resistance network (common practice): R = 1/h1 + L1/κ1 + L2/κ2 + 1/h2,
  // heat flux q = (u∞1 − u∞2)/R, surface and interface values by the drop q·(resistance) across
  // each element of the chain; u is linear within each layer.
  const k1 = 1, k2 = 3, L1 = 0.4, L2 = 0.6, h1 = 5, h2 = 2, hot = 100, cold = 20;
  const q = (hot - cold) / (1 / h1 + L1 / k1 + L2 / k2 + 1 / h2);
  const u0 = hot - q / h1;
  const ui = u0 - (q * L1) / k1;
  const steady = (x: number) => (x <= L1 ? u0 - (q * x) / k1 : ui - (q * (x - L1)) / k2);
  const parts = (left: (mx: number) => boolean, right: (mx: number) => boolean) => [
    { kind: 'convection' as const, where: left, transferCoefficient: h1, ambient: hot },
    { kind: 'convection' as const, where: right, transferCoefficient: h2, ambient: cold },
  ];
  const xs = [0, 0.2, 0.4, 0.7, 1];

  it('1D: steady start stays steady, cold start settles (relative 1e-5 of the drop)', () => {
    const domain = intervalDomain(0, 1, 5, { kappa: (x) => (x < L1 ? k1 : k2), boundary: parts((mx) => mx < 0.5, (mx) => mx > 0.5) });
    expect(Math.abs(steady(1) - (cold + q / h2))).toBeLessThan(1e-12); // the chain closes
    for (const [initial, T] of [[steady, 1], [() => cold, 6]] as const) {
      const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T, initial }), DoubleTree.sparseGrid(domain, 7)).solve({ relTol: 1e-11 });
      const v = solution.evaluate(T, xs);
      xs.forEach((x, i) => expect(Math.abs(v[i]! - steady(x)) / (hot - cold)).toBeLessThan(1e-5));
    }
  });

  it('2D strip with insulated top and bottom: the same profile', () => {
    const domain = rectangleDomain(0, 1, 0, 0.5, 5, 1, {
      kappa: (x) => (x < L1 ? k1 : k2),
      boundary: [...parts((mx) => mx < 1e-9, (mx) => mx > 1 - 1e-9), { kind: 'flux', where: (_mx, my) => my < 1e-9 || my > 0.5 - 1e-9 }],
    });
    const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: steady }), DoubleTree.sparseGrid(domain, 4)).solve({ relTol: 1e-11 });
    const pts = xs.flatMap((x) => [x, 0.17]);
    const v = solution.evaluate(1, pts);
    xs.forEach((x, i) => expect(Math.abs(v[i]! - steady(x)) / (hot - cold)).toBeLessThan(1e-5));
  });
});

describe('2D manufactured solution with all three kinds: sparse-grid rate as with zero boundary values', () => {
  // Square (0,1)²: x = 0 held at e^{−t}, x = 1 convective (h = 2), y = 0 and y = 1 insulated.
  // u = e^{−t} cos x + t sin(πx) cos(πy) meets the held value and the insulated faces exactly; the
  // ambient is u + (κ/h) ∂u/∂x on x = 1 and the source f = ∂t u − κΔu.
  const kap = 1, h = 2;
  const u = (t: number, x: number, y: number) => Math.exp(-t) * Math.cos(x) + t * Math.sin(Math.PI * x) * Math.cos(Math.PI * y);
  const ux = (t: number, x: number, y: number) => -Math.exp(-t) * Math.sin(x) + t * Math.PI * Math.cos(Math.PI * x) * Math.cos(Math.PI * y);
  const uy = (t: number, x: number, y: number) => -t * Math.PI * Math.sin(Math.PI * x) * Math.sin(Math.PI * y);
  const f = (t: number, x: number, y: number) =>
    -Math.exp(-t) * Math.cos(x) + Math.sin(Math.PI * x) * Math.cos(Math.PI * y) + kap * (Math.exp(-t) * Math.cos(x) + 2 * t * Math.PI ** 2 * Math.sin(Math.PI * x) * Math.cos(Math.PI * y));
  const domain = rectangleDomain(0, 1, 0, 1, 2, 2, {
    kappa: kap,
    boundary: [
      { kind: 'value', where: (mx) => mx < 1e-9, value: (t) => Math.exp(-t) },
      { kind: 'convection', where: (mx) => mx > 1 - 1e-9, transferCoefficient: h, ambient: (t, x, y) => u(t, x, y) + (kap / h) * ux(t, x, y) },
      { kind: 'flux', where: (_mx, my) => my < 1e-9 || my > 1 - 1e-9 },
    ],
  });
  const problem = new HeatProblem({ domain, T: 1, initial: (x, y) => u(0, x, y), source: f });

  it('L2(H¹) error ~ N^{-1/2} (slope within 0.1 of the zero-boundary case, tests/system/convergence.test.ts)', () => {
    const r = [3, 4, 5].map((L) => {
      const set = DoubleTree.sparseGrid(domain, L);
      const { solution, pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-10 });
      expect(pcg.converged).toBe(true);
      const e = spaceTimeErrors(solution, { value: u, gradient: (t, x, y, g) => { g[0] = ux(t, x, y); g[1] = uy(t, x, y); } });
      return { n: set.size, err: e.gradientL2 };
    });
    for (let i = 1; i < r.length; i++) {
      const slope = -Math.log(r[i]!.err / r[i - 1]!.err) / Math.log(r[i]!.n / r[i - 1]!.n);
      expect(Math.abs(slope - 0.5)).toBeLessThan(0.1);
    }
  });
});
