/**
 * The adaptive loop on a held value incompatible with the initial state: a body at 0 whose surface
 * is suddenly held at 1. Outside reference: semi-infinite solid, u = erfc(x / (2√(αt)))
 * (Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, §2.5), valid here because
 * T = 0.01 keeps the far end x = 1 out of reach (erfc(5) ≈ 1.5e-12). The jump between u0 and the
 * held value at t = 0 is the case adaptivity exists for: uniform sparse grids barely converge,
 * the adaptive loop does.
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSystem, enlargeDoubleTree, intervalDomain, residualIndicators, solveAdaptive } from '../../src/index';
import { erfc } from '../helpers/erfc';

const T = 0.01;
const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: 1 }] });
const problem = new HeatProblem({ domain, T });
const slope = (n0: number, e0: number, n1: number, e1: number) => -Math.log(e1 / e0) / Math.log(n1 / n0);

describe('suddenly held surface value (incompatible with u0)', () => {
  it('adaptive estimator decreases much faster than on sparse grids, and probes match erfc', () => {
    const res = solveAdaptive(problem, { maxUnknowns: 2500 });
    const h = res.history.filter((s) => s.unknowns >= 200);
    const first = h[0]!, last = h[h.length - 1]!;
    const adaptive = slope(first.unknowns, first.estimate, last.unknowns, last.estimate);
    const sparse = [6, 9].map((L) => {
      const set = DoubleTree.sparseGrid(domain, L);
      const { pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-8 });
      return { n: set.size, e: residualIndicators(new SpaceTimeSystem(problem, enlargeDoubleTree(domain, set)), set, pcg.solution).estimate };
    });
    const uniform = slope(sparse[0]!.n, sparse[0]!.e, sparse[1]!.n, sparse[1]!.e);
    // measured when written: adaptive ≈ 0.7, sparse grids ≈ 0.15
    expect(adaptive).toBeGreaterThan(0.5);
    expect(uniform).toBeLessThan(0.3);
    const xs = [0.01, 0.02, 0.05, 0.1, 0.2];
    for (const t of [T / 10, T / 2, T]) {
      const v = res.solution.evaluate(t, xs);
      xs.forEach((x, i) => expect(Math.abs(v[i]! - erfc(x / (2 * Math.sqrt(t))))).toBeLessThan(3e-3));
    }
    // the held value is returned exactly at the surface
    expect(res.solution.evaluate(T / 3, [0])[0]).toBe(1);
  });
});
