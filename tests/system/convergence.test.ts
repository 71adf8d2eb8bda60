/**
 * Convergence of the space-time solver against a smooth manufactured
 * solution u = (1 + t²) Π_i sin(π x_i) on (0,1)^d, T = 1, u = 0 on ∂Ω.
 *
 * Expected rates in the L2(0,T; H¹) norm for piecewise-linear trial functions
 * in space and time (facts of the trade, e.g. Griebel & Oeltz, Computing 2007,
 * for sparse space-time grids; common practice for full grids):
 * full grids N^{-1/(d+1)}; sparse grids N^{-1/d} up to a logarithm — in d = 1
 * the error behaves like log N / N, so that slope is measured against N / log₂ N.
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, rectangleDomain, spaceTimeErrors } from '../../src/index';

const PI = Math.PI;

function errorFor(dim: 1 | 2, grid: 'sparse' | 'full', L: number): { n: number; err: number } {
  const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
  const bump = (x: number, y: number) => (dim === 1 ? Math.sin(PI * x) : Math.sin(PI * x) * Math.sin(PI * y));
  const problem = new HeatProblem({
    domain, T: 1, initial: bump,
    source: [{ time: (t) => 2 * t + dim * PI * PI * (1 + t * t), space: bump }],
  });
  const set = grid === 'sparse' ? DoubleTree.sparseGrid(domain, L) : DoubleTree.fullGrid(domain, L, L);
  const { solution, pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-10 });
  expect(pcg.converged).toBe(true);
  const e = spaceTimeErrors(solution, {
    value: (t, x, y) => (1 + t * t) * bump(x, y),
    gradient: (t, x, y, g) => {
      const a = (1 + t * t) * PI;
      if (dim === 1) g[0] = a * Math.cos(PI * x);
      else {
        g[0] = a * Math.cos(PI * x) * Math.sin(PI * y);
        g[1] = a * Math.sin(PI * x) * Math.cos(PI * y);
      }
    },
  });
  return { n: set.size, err: e.gradientL2 };
}

function slope(a: { n: number; err: number }, b: { n: number; err: number }, logCorrected = false): number {
  const w = (n: number) => (logCorrected ? n / Math.log2(n) : n);
  return -Math.log(b.err / a.err) / Math.log(w(b.n) / w(a.n));
}

describe('convergence on a smooth manufactured solution (L2(H¹) error)', () => {
  it('d = 1 sparse grids: error ~ log N / N', () => {
    const r = [6, 7, 8].map((L) => errorFor(1, 'sparse', L));
    expect(Math.abs(slope(r[1]!, r[2]!, true) - 1)).toBeLessThan(0.1);
    expect(Math.abs(slope(r[0]!, r[1]!, true) - 1)).toBeLessThan(0.1);
  });
  it('d = 1 full grids: error ~ N^{-1/2}', () => {
    const r = [3, 4, 5].map((L) => errorFor(1, 'full', L));
    expect(Math.abs(slope(r[1]!, r[2]!) - 0.5)).toBeLessThan(0.1);
  });
  it('d = 2 sparse grids: error ~ N^{-1/2}', () => {
    const r = [3, 4, 5].map((L) => errorFor(2, 'sparse', L));
    expect(Math.abs(slope(r[1]!, r[2]!) - 0.5)).toBeLessThan(0.1);
  });
  it('d = 2 full grids: error ~ N^{-1/3}', () => {
    const r = [1, 2, 3].map((L) => errorFor(2, 'full', L));
    expect(Math.abs(slope(r[1]!, r[2]!) - 1 / 3)).toBeLessThan(0.1);
  });
});
