/**
 * spaceTimeErrors' energyL2 = (∫₀ᵀ ∫_Ω K∇e·∇e + c e² dx dt)^{1/2}, the error in the norm the
 * estimator measures, checked against outside references:
 * - the energy identity of the heat equation, ∫₀ᵀ ∫ κ|∇u|² dx dt = (‖u0‖² − ‖u(T)‖²)/2 for zero
 *   boundary values and f = 0 (multiply by u and integrate; common practice), with u for u0 ≡ 1
 *   from Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, §3.3
 *   (tests/helpers/heat-exact.ts); the zero function's error is u itself;
 * - a closed form with a tensor and a reaction term: for w = t sin πx sin πy on the unit square,
 *   ∫₀ᵀ∫ K∇w·∇w + c w² = (T³/3)((Kxx + Kyy)π²/4 + c/4) (the Kxy term integrates to zero),
 *   and in 1D for w = t sin πx, (T³/3)(κπ²/2 + c/2) (integrals by hand);
 * - the convection term h∫_Γ e² on boundary parts that exchange heat: for w = t,
 *   ∫₀ᵀ h∫_Γ w² = h|Γ|T³/3 (by hand), and the energy identity with that term,
 *   ∫₀ᵀ ∫ |u_x|² + h(u(t,0)² + u(t,1)²) dt = (‖u0‖² − ‖u(T)‖²)/2 (multiply by u and integrate; common
 *   practice) for the slab cooled at both ends (Carslaw & Jaeger §2.7, tests/helpers/half-space-exact.ts);
 * - two changes of variables on discrete solutions (common practice): time scaling (κ, T) →
 *   (1, κT) leaves the discrete solution unchanged up to the time map, so energyL2 for κ equals
 *   the L2(0,T;H¹) error for κ = 1; and the stretch y′ = y/√k of the unit square turns
 *   K = diag(1, k) into κ = 1 on (0, 1) × (0, 1/√k), so energyL2 there is k^{1/4} times the
 *   stretched problem's L2(0,T;H¹) error.
 */
import { describe, expect, it } from 'vitest';
import {
  DoubleTree, HeatProblem, SpaceTimeSolution, SpaceTimeSystem, intervalDomain, rectangleDomain, spaceTimeErrors,
  type KnownSolution, type SpatialDomain,
} from '../../src/index';
import { heatExact1D, heatExact2D } from '../helpers/heat-exact';
import { cooledSlab } from '../helpers/half-space-exact';

function zeroSolution(domain: SpatialDomain, set: DoubleTree, T: number): SpaceTimeSolution {
  return new SpaceTimeSolution(domain, set, new Float64Array(set.size), T);
}

describe('energyL2 against outside references', () => {
  it('the convection term: h|Γ|T³/3 for w = t in 1D and 2D, and the energy identity of the cooled slab', () => {
    const T = 0.8, h = 3;
    const convective = { boundary: [{ kind: 'convection' as const, where: () => true, transferCoefficient: h, ambient: 0 }] };
    const w: KnownSolution = { value: (t) => t, gradient: (_t, _x, _y, g) => { g.fill(0); } };
    const sq = rectangleDomain(0, 1, 0, 1, 2, 2, convective);
    expect(spaceTimeErrors(zeroSolution(sq, DoubleTree.sparseGrid(sq, 3), T), w).energyL2 ** 2).toBeCloseTo((h * 4 * T ** 3) / 3, 12);
    const rod = intervalDomain(0, 1, 2, convective);
    expect(spaceTimeErrors(zeroSolution(rod, DoubleTree.sparseGrid(rod, 3), T), w).energyL2 ** 2).toBeCloseTo((2 * h * T ** 3) / 3, 12);
    // the held part of a mixed boundary adds nothing: only y = 1 convects
    const top = rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: [{ kind: 'convection', where: (_mx, my) => my > 0.999, transferCoefficient: h, ambient: 0 }] });
    expect(spaceTimeErrors(zeroSolution(top, DoubleTree.sparseGrid(top, 3), T), w).energyL2 ** 2).toBeCloseTo((h * T ** 3) / 3, 12);

    const hs = 5, Ts = 0.01;
    const slab: KnownSolution = { value: (t, x) => cooledSlab(hs, t, x)[0], gradient: (t, x, _y, g) => { g[0] = cooledSlab(hs, t, x)[1]; } };
    const cooled = intervalDomain(0, 1, 2, { boundary: [{ kind: 'convection', where: () => true, transferCoefficient: hs, ambient: 0 }] });
    const e2 = spaceTimeErrors(zeroSolution(cooled, DoubleTree.sparseGrid(cooled, 7), Ts), slab, { elementSplits: 8, timePoints: 6 }).energyL2 ** 2;
    // ‖u(T)‖² by composite Simpson on 2·10⁴ cells (the layer √T = 0.1 spans 2000 of them)
    const n = 20000;
    let uT2 = 0;
    for (let k = 0; k <= n; k++) uT2 += (k === 0 || k === n ? 1 : k % 2 ? 4 : 2) * cooledSlab(hs, Ts, k / n)[0] ** 2;
    uT2 /= 3 * n;
    expect(Math.abs(e2 / ((1 - uT2) / 2) - 1)).toBeLessThan(1e-9);
  });

  it('energy identity for u0 ≡ 1: ∫∫ κ|∇u|² = (‖u0‖² − ‖u(T)‖²)/2, 1D and 2D, κ ≠ 1 and a reaction-free body', () => {
    const T = 0.5;
    const cases: [SpatialDomain, ReturnType<typeof heatExact1D>, string][] = [
      [intervalDomain(-1, 2, 2, { kappa: 0.3 }), heatExact1D({ a: -1, b: 2, kappa: 0.3 }), '1D (−1, 2), κ = 0.3'],
      [rectangleDomain(0, 2, 0, 1, 4, 2, { kappa: 0.5 }), heatExact2D({ x1: 2, y1: 1, kappa: 0.5 }), '2D (0, 2) × (0, 1), κ = 0.5'],
    ];
    for (const [domain, u, name] of cases) {
      const kappa = domain.dim === 1 ? 0.3 : 0.5;
      const e = spaceTimeErrors(zeroSolution(domain, DoubleTree.sparseGrid(domain, domain.dim === 1 ? 5 : 3), T), u, { timePoints: 6 });
      // heat-exact's gradientEnergy is ∫∫|∇u|² = (‖u0‖² − ‖u(T)‖²)/(2κ)
      const rel = e.energyL2 ** 2 / (kappa * u.gradientEnergy(T)) - 1;
      console.log(`${name}: energy identity, relative error ${rel.toExponential(2)}`);
      expect(Math.abs(rel)).toBeLessThan(1e-6);
      expect(e.energyL2 / e.gradientL2).toBeCloseTo(Math.sqrt(kappa), 10);
    }
  }, 120_000);

  it('closed forms with a diffusion tensor and a reaction term (2D) and κ, c (1D)', () => {
    const T = 0.8;
    const PI = Math.PI;
    const K = { xx: 2, xy: 0.5, yy: 1 };
    const c = 3;
    const sq = rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: K, reaction: c });
    const w2: KnownSolution = {
      value: (t, x, y) => t * Math.sin(PI * x) * Math.sin(PI * y),
      gradient: (t, x, y, g) => {
        g[0] = t * PI * Math.cos(PI * x) * Math.sin(PI * y);
        g[1] = t * PI * Math.sin(PI * x) * Math.cos(PI * y);
      },
    };
    const e2 = spaceTimeErrors(zeroSolution(sq, DoubleTree.sparseGrid(sq, 3), T), w2, { elementSplits: 4 });
    const want2 = (T ** 3 / 3) * (((K.xx + K.yy) * PI * PI) / 4 + c / 4);
    console.log(`2D closed form: energyL2² ${e2.energyL2 ** 2} against ${want2}`);
    expect(e2.energyL2 ** 2 / want2 - 1).toBeLessThan(1e-9);
    expect(e2.energyL2 ** 2 / want2 - 1).toBeGreaterThan(-1e-9);

    const rod = intervalDomain(0, 1, 2, { kappa: 0.3, reaction: 2 });
    const w1: KnownSolution = {
      value: (t, x) => t * Math.sin(PI * x),
      gradient: (t, x, _y, g) => { g[0] = t * PI * Math.cos(PI * x); },
    };
    const e1 = spaceTimeErrors(zeroSolution(rod, DoubleTree.sparseGrid(rod, 4), T), w1, { elementSplits: 4 });
    const want1 = (T ** 3 / 3) * ((0.3 * PI * PI) / 2 + 2 / 2);
    console.log(`1D closed form: energyL2² ${e1.energyL2 ** 2} against ${want1}`);
    expect(Math.abs(e1.energyL2 ** 2 / want1 - 1)).toBeLessThan(1e-9);
  });

  it('time scaling: energyL2 with κ = 0.01 over T = 50 equals the L2(0,T;H¹) error with κ = 1 over T = 0.5 (discrete solutions, u0 ≡ 1)', () => {
    const ref = heatExact2D({ x1: 1, y1: 1 });
    const run = (kappa: number) => {
      const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { kappa });
      const problem = new HeatProblem({ domain, T: 0.5 / kappa, initial: () => 1 });
      const { solution } = new SpaceTimeSystem(problem, DoubleTree.sparseGrid(domain, 4)).solve({ relTol: 1e-12, maxIterations: 2000 });
      const exact: KnownSolution = { value: (t, x, y) => ref.value(kappa * t, x, y), gradient: (t, x, y, g) => ref.gradient(kappa * t, x, y, g) };
      return spaceTimeErrors(solution, exact);
    };
    const slow = run(0.01);
    const unit = run(1);
    console.log(`time scaling: energyL2 ${slow.energyL2} (κ = 0.01), gradientL2 ${unit.gradientL2} (κ = 1); gradientL2 for κ = 0.01: ${slow.gradientL2}`);
    expect(Math.abs(slow.energyL2 / unit.gradientL2 - 1)).toBeLessThan(1e-6);
    expect(Math.abs(unit.energyL2 / unit.gradientL2 - 1)).toBeLessThan(1e-12);
    // the unweighted gradient error is 1/√κ = 10 times larger: not the norm E measures
    expect(slow.gradientL2 / slow.energyL2).toBeCloseTo(10, 6);
  }, 120_000);

  it('stretch: K = diag(1, k) on the unit square against κ = 1 on (0, 1) × (0, 1/√k), smooth manufactured solution, exact inner solves', () => {
    const k = 0.04;
    const s = Math.sqrt(k);
    const PI = Math.PI;
    const T = 0.5;
    // u = e^{−t} sin πx sin πy on the unit square: f = e^{−t}((π²(1 + k) − 1) sin πx sin πy)
    const aniso = rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: { xx: 1, xy: 0, yy: k } });
    const uA: KnownSolution = {
      value: (t, x, y) => Math.exp(-t) * Math.sin(PI * x) * Math.sin(PI * y),
      gradient: (t, x, y, g) => {
        g[0] = PI * Math.exp(-t) * Math.cos(PI * x) * Math.sin(PI * y);
        g[1] = PI * Math.exp(-t) * Math.sin(PI * x) * Math.cos(PI * y);
      },
    };
    const fA = (t: number, x: number, y: number) => Math.exp(-t) * (PI * PI * (1 + k) - 1) * Math.sin(PI * x) * Math.sin(PI * y);
    // the same function of (x, y′ = y/√k) on the stretched rectangle, where κ = 1
    const Y = 1 / s;
    const stretched = rectangleDomain(0, 1, 0, Y, 2, 2);
    const uS: KnownSolution = {
      value: (t, x, y) => uA.value(t, x, s * y),
      gradient: (t, x, y, g) => {
        uA.gradient(t, x, s * y, g);
        g[1] = s * g[1]!;
      },
    };
    const fS = (t: number, x: number, y: number) => fA(t, x, s * y);
    const solveOn = (domain: SpatialDomain, f: typeof fA, u: KnownSolution) => {
      const problem = new HeatProblem({ domain, T, initial: (x, y) => u.value(0, x, y), source: f });
      const { solution } = new SpaceTimeSystem(problem, DoubleTree.sparseGrid(domain, 3), { inner: { kind: 'exact' } }).solve({ relTol: 1e-12, maxIterations: 2000 });
      return spaceTimeErrors(solution, u);
    };
    const a = solveOn(aniso, fA, uA);
    const b = solveOn(stretched, fS, uS);
    console.log(`stretch: energyL2 ${a.energyL2} (K = diag(1, ${k})), k^(1/4)·gradientL2 ${k ** 0.25 * b.gradientL2} (stretched, κ = 1)`);
    expect(Math.abs(a.energyL2 / (k ** 0.25 * b.gradientL2) - 1)).toBeLessThan(1e-6);
  }, 120_000);

  it('constant κ and c: energyL2² = κ·gradientL2² + c·valueL2² on a discrete solution (all quadrature paths)', () => {
    for (const dim of [1, 2] as const) {
      const opts = { kappa: 0.5, reaction: 2 };
      const domain = dim === 1 ? intervalDomain(0, 1, 2, opts) : rectangleDomain(0, 1, 0, 1, 2, 2, opts);
      const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 0.5, initial: () => 1 }), DoubleTree.sparseGrid(domain, dim === 1 ? 7 : 4)).solve({ relTol: 1e-10 });
      const exact = dim === 1 ? heatExact1D({ kappa: 0.5 }) : heatExact2D({ kappa: 0.5 });
      // u0 ≡ 1 with reaction c: u = e^{−ct}·(the solution without it)
      const known: KnownSolution = {
        value: (t, x, y) => Math.exp(-2 * t) * exact.value(t, x, y),
        gradient: (t, x, y, g) => {
          exact.gradient(t, x, y, g);
          for (let i = 0; i < dim; i++) g[i] = Math.exp(-2 * t) * g[i]!;
        },
      };
      const e = spaceTimeErrors(solution, known);
      const want = 0.5 * e.gradientL2 ** 2 + 2 * e.valueL2 ** 2;
      expect(Math.abs(e.energyL2 ** 2 / want - 1)).toBeLessThan(1e-9);
    }
  }, 120_000);
});
