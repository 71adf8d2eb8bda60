/**
 * Estimator reliability where the initial state jumps inside the domain, on horizons far shorter
 * than the diffusion time of the initial elements (docs/adaptivity.md §2.5).
 *
 * Before the first set resolved such fronts (src/space/front-resolution.ts), the jump's layer of
 * width √(κt) held nearly all of the solution's energy while the first set and its candidates could
 * not represent it: on (0, 1) in two cells, u0 = 1 on (0.3, 0.7), err/E was 3.3 (κT = 10⁻⁶) and
 * 10.5 (κT = 10⁻⁸) at the first step; on the 2 × 2 unit square err/E ≥ 9.1 for u0 = 1 on the square
 * (0.3, 0.7)² and ≥ 5.5 for a disc of radius 0.2, κT = 10⁻⁶, with E rising over the next five steps.
 *
 * References (outside the project): the infinite solid with u0 = 1 on a band, Carslaw & Jaeger,
 * Conduction of Heat in Solids, 2nd ed., 1959, §2.2 (tests/helpers/half-space-exact.ts, checked
 * there); its product in 2D (separation of variables); the energy of a straight front,
 * ∫₀ᵀ∫|∇u|² = J²·√(T/2π) per unit length (from the same solution; common practice).
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, intervalDomain, rectangleDomain, solveAdaptive, spaceTimeErrors, type SpaceTimeSolution } from '../../src/index';
import { frontResolvedSet } from '../../src/space/front-resolution';
import { elementDiameter } from '../../src/space/diffusion-time';
import { warmBand } from '../helpers/half-space-exact';
import { gradedGauss } from '../helpers/graded-gauss';
import { energyError1D } from '../helpers/energy-error-1d';

const A = 0.3, B = 0.7;
const band = (x: number): number => (x > A && x < B ? 1 : 0);

/** ‖∇u_δ‖ in L2(0,T;L2): the library's energy norm of the solution against zero (its own piecewise polynomials, integrated exactly). */
function solutionEnergy(sol: SpaceTimeSolution): number {
  return spaceTimeErrors(sol, { value: () => 0, gradient: (_t, _x, _y, g) => { g[0] = 0; g[1] = 0; } }).energyL2;
}

describe('estimator reliability at jumps of the initial state inside the domain (short horizons)', () => {
  it.each([1e-6, 1e-8])('(0, 1), two cells, held at 0, u0 = 1 on (0.3, 0.7), κT = %s: err/E within [0.2, 2] over 6 steps', (T) => {
    const ratios: number[] = [];
    solveAdaptive(new HeatProblem({ domain: intervalDomain(0, 1, 2), T, initial: band }), {
      maxSteps: 6,
      onStep: (s, sol) => { ratios.push(energyError1D(sol, (t, x) => warmBand(A, B, t, x), T, { breaks: [0, A, 0.5, B, 1] }) / s.estimate); },
    });
    if (process.env.CHRONOMESH_VERBOSE) console.log(T, ratios.map((r) => r.toFixed(2)).join(' '));
    expect(ratios).toHaveLength(6);
    // E may exceed the error at first (0.26 at κT = 1e-8: conservative); it must never fall far below it
    for (const r of ratios) {
      expect(r).toBeGreaterThan(0.2);
      expect(r).toBeLessThan(2);
    }
  }, 120_000);

  // In 2D, a lower bound of the error: ‖∇(u − u_δ)‖ ≥ ‖∇u‖ − ‖∇u_δ‖ (triangle inequality), with
  // ‖∇u‖ from the closed forms. Before the front rule it exceeded 9 E (square) and 5 E (disc).
  it.each([
    ['the square (0.3, 0.7)²', (x: number, y: number) => band(x) * band(y), () => {
      // ∫∫|∇(v(x)v(y))|² = 2 (∫v′²dx)(∫v²dy) per time, both factors by the graded rules
      const T = 1e-6, xs = gradedGauss([0, A, 0.5, B, 1], 30, 4), ts = gradedGauss([0, 2 * T], 30, 4, T);
      let sum = 0;
      ts.p.forEach((t, k) => {
        let g = 0, v = 0;
        xs.p.forEach((x, i) => { const [u, d] = warmBand(A, B, t, x); g += xs.w[i]! * d * d; v += xs.w[i]! * u * u; });
        sum += ts.w[k]! * 2 * g * v;
      });
      return Math.sqrt(sum);
    }],
    // a thin layer along a circle of radius R: 2πR·√(T/2π), up to O(√(κT)/R) = 0.5 % (taken 2 % lower)
    ['the disc of radius 0.2', (x: number, y: number) => ((x - 0.5) ** 2 + (y - 0.5) ** 2 < 0.04 ? 1 : 0), () => 0.98 * Math.sqrt(2 * Math.PI * 0.2 * Math.sqrt(1e-6 / (2 * Math.PI)))],
  ] as const)('unit square 2 × 2, held at 0, u0 = 1 on %s, κT = 1e-6: E is not a fraction of the error', (_name, u0, exactEnergy) => {
    const norm = exactEnergy();
    const bounds: number[] = [];
    solveAdaptive(new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 1e-6, initial: u0 }), {
      maxSteps: 2,
      onStep: (s, sol) => { bounds.push((norm - solutionEnergy(sol)) / s.estimate); },
    });
    if (process.env.CHRONOMESH_VERBOSE) console.log(_name, norm, bounds.map((r) => r.toFixed(2)).join(' '));
    expect(bounds).toHaveLength(2);
    for (const b of bounds) expect(b).toBeLessThan(1);
  }, 120_000);

  it('resolves jumps only: smooth or wide fronts, small jumps and long horizons add nothing', () => {
    const created = (u0: (x: number, y: number) => number, T: number, kappa = 1): number => {
      const d = rectangleDomain(0, 1, 0, 1, 2, 2, { kappa });
      const before = d.forest.vertexCount;
      frontResolvedSet(d.vertexClosure(), u0, T);
      return d.forest.vertexCount - before; // vertices the rule bisected into the forest
    };
    expect(created((x, y) => Math.sin(Math.PI * x) * Math.sin(Math.PI * y), 1e-6)).toBe(0);
    // steep but linear (neighbour differences exactly halve with the spacing), at the shortest horizons
    expect(created((x, y) => 1e3 * (x + 2 * y), 1e-12)).toBe(0);
    expect(created((x) => 5 * x * x, 1e-12)).toBe(0);
    // a front of width 0.05, far wider than √(κT) = 10⁻³: the loop resolves it from its candidates
    expect(created((x) => Math.tanh((x - 0.3) / 0.05), 1e-6)).toBe(0);
    expect(created((x, y) => 5e-4 * band(x) * band(y) + x, 1e-6)).toBe(0); // jump below 10⁻³ of u0's size
    expect(created((x, y) => band(x) * band(y), 1)).toBe(0); // √(κT) = 1 > the elements
    expect(created((x, y) => band(x) * band(y), 1e-2, 1e-4)).toBeGreaterThan(0); // κT = 10⁻⁶ by κ
    expect(created((x) => Math.tanh((x - 0.3) / 1e-4), 1e-6)).toBeGreaterThan(0); // narrower than the layer
  });

  it('bisects the elements at the jump down to 4√(κT), and no further', () => {
    const d = intervalDomain(0, 1, 2);
    const T = 1e-6, width = 4 * Math.sqrt(T);
    frontResolvedSet(d.vertexClosure(), band, T);
    const f = d.forest;
    for (let e = 0; e < f.elementCount; e++) {
      if (f.eChild[e]! >= 0) continue; // leaves only
      const x0 = f.vCoord[f.eVert[2 * e]!]!, x1 = f.vCoord[f.eVert[2 * e + 1]!]!;
      const h = elementDiameter(f, e);
      if (Math.min(x0, x1) <= A && A <= Math.max(x0, x1)) {
        expect(h).toBeLessThanOrEqual(width);
        expect(h).toBeGreaterThan(width / 2);
      }
    }
    // one chain of bisections per front, ⌈log2(0.5/width)⌉ generations each
    expect(f.vertexCount - 3).toBe(2 * Math.ceil(Math.log2(0.5 / width)));
  });
});
