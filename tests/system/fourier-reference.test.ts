/**
 * Outside reference: the heat equation on (0,1) with u0 ≡ 1 and u = 0 at both
 * ends has the Fourier-series solution
 *   u(t, x) = Σ_{n odd} 4/(nπ) sin(nπx) e^{−n²π²t}
 * (Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, §3.3;
 * Crank, The Mathematics of Diffusion, 2nd ed., 1975, eq. 4.17 — equation
 * numbers from memory). The data are incompatible (u0 ≠ 0 on the boundary).
 * On the unit square the solution is the product of two such series
 * (separation of variables, same sources).
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, rectangleDomain } from '../../src/index';

function series1d(t: number, x: number): number {
  let s = 0;
  for (let n = 1; n < 4001; n += 2) s += (4 / (n * Math.PI)) * Math.sin(n * Math.PI * x) * Math.exp(-n * n * Math.PI * Math.PI * t);
  return s;
}

describe('heat equation with u0 ≡ 1 against the Fourier series', () => {
  it('d = 1, sparse grid L = 10: |u − u_series| ≤ 1e-4 for t ≥ 0.05', () => {
    const domain = intervalDomain(0, 1, 2);
    const sys = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 10));
    const { solution, pcg } = sys.solve({ relTol: 1e-9 });
    expect(pcg.converged).toBe(true);
    const xs = [0.1, 0.25, 0.5, 0.8];
    let worst = 0;
    for (const t of [0.05, 0.1, 0.2, 0.5, 1]) {
      const v = solution.evaluate(t, xs);
      xs.forEach((x, i) => (worst = Math.max(worst, Math.abs(v[i]! - series1d(t, x)))));
    }
    // Tolerance: the sparse-grid L2(H¹) error at this level is ~3e-3 (see the convergence test);
    // point values away from t = 0 are smoother and measured at ~6e-5, so 1e-4 leaves a small margin.
    expect(worst).toBeLessThan(1e-4);
  });

  it('d = 2 unit square, sparse grids L = 5, 6: error ≤ 1e-2 for t ≥ 0.05 and decreasing', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const pts = [0.5, 0.5, 0.25, 0.5, 0.3, 0.7];
    const worstFor = (L: number): number => {
      const sys = new SpaceTimeSystem(new HeatProblem({ domain, T: 0.5, initial: () => 1 }), DoubleTree.sparseGrid(domain, L));
      const { solution } = sys.solve({ relTol: 1e-8 });
      let worst = 0;
      for (const t of [0.05, 0.1, 0.25]) {
        const v = solution.evaluate(t, pts);
        for (let i = 0; i < 3; i++) worst = Math.max(worst, Math.abs(v[i]! - series1d(t, pts[2 * i]!) * series1d(t, pts[2 * i + 1]!)));
      }
      return worst;
    };
    const e5 = worstFor(5);
    const e6 = worstFor(6);
    // Measured when written: 1.5e-2 (L = 5) and 8.4e-3 (L = 6), worst at t = 0.05; the incompatible
    // initial layer limits uniform sparse grids (docs/method.md §7), so the bound is loose by design.
    expect(e6).toBeLessThan(1e-2);
    expect(e6).toBeLessThan(0.7 * e5);
  });
});
