/**
 * Backward problems −∂t p − ∇·(κ∇p) + c p = g, p(T) = p_T, solved by time reversal:
 * against the forward solver under t ↦ T − t (the same discrete system, so agreement to solver
 * tolerance), and against closed forms by separation of variables (e.g. Evans, Partial
 * Differential Equations, 2nd ed., 2010, §7.1 / any PDE text): p_T = sin(πx) on (0, 1) with
 * p = 0 at both ends gives p = e^{−π²(T−t)} sin(πx); on the unit square sin(πx) sin(πy) gives
 * e^{−2π²(T−t)} sin(πx) sin(πy).
 */
import { describe, expect, it } from 'vitest';
import { ConvergenceError, DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, probeTableCsv, rectangleDomain, solveBackward, spaceTimeErrors } from '../../src/index';

const report: string[] = [];

describe('backward problems by time reversal', () => {
  it('equals the forward solve under t ↦ T − t (d = 1, source and terminal state, not symmetric in time)', () => {
    const domain = intervalDomain(0, 1, 2, { kappa: 0.7, reaction: 0.3 });
    const T = 0.8;
    const g = (t: number, x: number) => t * t * x * (1 - x) + (t > 0.3 ? 1 : 0);
    const pT = (x: number) => x * (1.2 - x);
    const set = DoubleTree.sparseGrid(domain, 6);
    const { solution: p } = solveBackward({ domain, T, terminal: pT, source: g }, set, { relTol: 1e-12 });
    const fwd = new SpaceTimeSystem(new HeatProblem({ domain, T, initial: pT, source: (s, x) => g(T - s, x) }), set).solve({ relTol: 1e-12 }).solution;
    let worst = 0;
    for (const t of [0, 0.1, 0.35, 0.5, 0.79, 0.8]) {
      const a = p.evaluate(t, [0.1, 0.4, 0.77]);
      const b = fwd.evaluate(T - t, [0.1, 0.4, 0.77]);
      a.forEach((v, i) => (worst = Math.max(worst, Math.abs(v - b[i]!))));
    }
    report.push(`backward vs forward (t ↦ T − t): max difference ${worst.toExponential(1)}`);
    expect(worst).toBeLessThan(1e-9);
    // The usual outputs work on the backward solution with the original time.
    expect(probeTableCsv(p, [0, T], [[0.5]]).split('\n')[2]!.startsWith(`${T},`)).toBe(true);
    expect(p.slice(T).values.length).toBeGreaterThan(0);
  });

  it('matches p = e^{−π²(T−t)} sin(πx) (d = 1) and converges', () => {
    const domain = intervalDomain(0, 1, 2);
    const T = 0.5;
    const exact = (t: number, x: number) => Math.exp(-Math.PI * Math.PI * (T - t)) * Math.sin(Math.PI * x);
    const errs: number[] = [];
    for (const L of [5, 7, 9]) {
      const { solution } = solveBackward({ domain, T, terminal: (x) => Math.sin(Math.PI * x) }, DoubleTree.sparseGrid(domain, L), { relTol: 1e-10 });
      let worst = 0;
      for (const t of [0, 0.1, 0.3, 0.45, 0.5]) {
        const v = solution.evaluate(t, [0.2, 0.5, 0.7]);
        [0.2, 0.5, 0.7].forEach((x, i) => (worst = Math.max(worst, Math.abs(v[i]! - exact(t, x)))));
      }
      const e = spaceTimeErrors(solution, {
        value: (t, x) => exact(t, x),
        gradient: (t, x, _y, gr) => { gr[0] = Math.PI * Math.exp(-Math.PI * Math.PI * (T - t)) * Math.cos(Math.PI * x); },
      });
      errs.push(e.gradientL2);
      report.push(`d=1 sparse L=${L}: max point error ${worst.toExponential(2)}, L2(H1) error ${e.gradientL2.toExponential(2)}`);
      if (L === 9) expect(worst).toBeLessThan(2e-4);
    }
    // Sparse grids in d = 1 converge like N^{-1} for smooth solutions (docs/method.md §7): the error must fall.
    expect(errs[1]!).toBeLessThan(0.5 * errs[0]!);
    expect(errs[2]!).toBeLessThan(0.5 * errs[1]!);
  });

  it('matches p = e^{−2π²(T−t)} sin(πx) sin(πy) on the unit square', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const T = 0.2;
    const { solution } = solveBackward({ domain, T, terminal: (x, y) => Math.sin(Math.PI * x) * Math.sin(Math.PI * y) }, DoubleTree.sparseGrid(domain, 6), { relTol: 1e-10 });
    let worst = 0;
    for (const t of [0, 0.1, 0.2]) {
      const v = solution.evaluate(t, [0.5, 0.5, 0.25, 0.6]);
      const ex = [[0.5, 0.5], [0.25, 0.6]].map(([x, y]) => Math.exp(-2 * Math.PI * Math.PI * (T - t)) * Math.sin(Math.PI * x!) * Math.sin(Math.PI * y!));
      ex.forEach((e, i) => (worst = Math.max(worst, Math.abs(v[i]! - e))));
    }
    report.push(`d=2 sparse L=6: max point error ${worst.toExponential(2)}`);
    expect(worst).toBeLessThan(5e-3);
  });

  it('rejects bad input before work', () => {
    const domain = intervalDomain(0, 1, 2);
    const set = DoubleTree.sparseGrid(domain, 2);
    expect(() => solveBackward({ domain, T: -1 }, set)).toThrow(/T = -1/);
    expect(() => solveBackward({ domain, T: 1, terminal: 3 as never }, set)).toThrow(/terminal/);
    expect(() => solveBackward({ domain, T: 1, terminal: () => 1 }, set, { maxIterations: 1, relTol: 1e-14 })).toThrow(ConvergenceError);
  });

  it('report', () => {
    if (process.env.CHRONOMESH_REPORT) console.log(report.join('\n'));
    expect(report.length).toBeGreaterThan(0);
  });
});
