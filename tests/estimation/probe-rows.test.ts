/**
 * The rows of probeMisfit (sensor histories through src/spacetime/point-series.ts) against the
 * library's independent point evaluation (SpaceTimeSolution.evaluate: a leaf mesh of the functions
 * active at each time and the forward hierarchical-to-nodal transform), and Eᵀ against E by the
 * adjoint identity ⟨E u, r⟩ = ⟨u, Eᵀ r⟩ (common practice), on an adaptive set refined deep toward
 * t = 0, in 1D and 2D.
 */
import { describe, expect, it } from 'vitest';
import {
  HeatProblem, InvalidArgumentError, ResourceLimitError, SpaceTimeSolution, SpaceTimeSystem, combineFunctionals, intervalDomain, lShapeDomain, probeMisfit,
  setMemoryBudget, solveAdaptive,
} from '../../src/index';
import { seededRandom } from '../spacetime/reference';

describe('probeMisfit rows', () => {
  const rand = seededRandom(5);
  for (const [name, domain, points] of [
    ['1D rod', intervalDomain(0, 1, 2), [[0], [0.003], [0.25], [0.5], [0.91], [1]]],
    ['2D L-shape', lShapeDomain(1), [[0.5, 0.5], [-0.5, -0.5], [0, 0], [-0.99, 0.2], [0.3, 0.01], [-0.2, -0.7]]],
  ] as const) {
    it(`${name}: E u equals point evaluation at every reading, and Eᵀ is its transpose`, () => {
      const T = 0.5;
      const problem = new HeatProblem({ domain, T, initial: () => 1 });
      const { set } = solveAdaptive(problem, { maxUnknowns: 3000 });
      const system = new SpaceTimeSystem(problem, set);
      const times = [0, 1e-7, 2e-4, 0.01, 0.3, 0.5, ...Array.from({ length: 30 }, () => rand() * T)];
      const data = times.map(() => points.map(() => 0));
      const J = probeMisfit(system, { times, points: points.map((p) => [...p]), data });
      expect(J.rowCount).toBe(times.length * points.length);
      const u = Float64Array.from({ length: set.size }, () => rand() - 0.5);
      const Eu = J.evaluate(u);
      const sol = new SpaceTimeSolution(domain, set, u, T);
      let diff = 0, scale = 0;
      times.forEach((t, i) => {
        const want = sol.evaluate(t, points.flat());
        for (let k = 0; k < points.length; k++) {
          diff = Math.max(diff, Math.abs(Eu[i * points.length + k]! - want[k]!));
          scale = Math.max(scale, Math.abs(want[k]!));
        }
      });
      expect(diff / scale).toBeLessThan(1e-12);
      // ⟨E u, r⟩ = ⟨u, Eᵀ r⟩ through the gradient of J with unit weights and targets 0: ∇J(v) = Eᵀ E v
      const v = Float64Array.from({ length: set.size }, () => rand() - 0.5);
      const Ev = J.evaluate(v);
      const g = J.gradient(v);
      let lhs = 0, rhs = 0;
      for (let k = 0; k < Ev.length; k++) lhs += Eu[k]! * Ev[k]!;
      for (let k = 0; k < u.length; k++) rhs += u[k]! * g[k]!;
      expect(Math.abs(lhs - rhs)).toBeLessThan(1e-11 * Math.abs(lhs));
      // weights scale through combineFunctionals
      const J3 = combineFunctionals([[3, J]]);
      expect(Math.abs(J3.value(v) / (3 * J.value(v)) - 1)).toBeLessThan(1e-14);
    });
  }

  it('a sensor outside the domain is named before any work', () => {
    const domain = lShapeDomain(1);
    const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
    const { set } = solveAdaptive(problem, { maxUnknowns: 300 });
    const system = new SpaceTimeSystem(problem, set);
    let caught: unknown;
    try { probeMisfit(system, { times: [0.5], points: [[0.5, 0.5], [0.5, -0.5]], data: [[0, 0]] }); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(InvalidArgumentError);
    expect((caught as InvalidArgumentError).field).toBe('points[1]');
    expect(String(caught)).toMatch(/points\[1\] = \(0\.5, -0\.5\) lies outside the domain/);
    // the per-(function, sensor) work array is checked against the memory budget before it is made
    const previous = setMemoryBudget(1000);
    try {
      expect(() => probeMisfit(system, { times: [0.5], points: Array.from({ length: 100 }, () => [0.5, 0.5]), data: [new Array(100).fill(0)] }))
        .toThrow(ResourceLimitError);
    } finally {
      setMemoryBudget(previous);
    }
  });
});
