/** The enlargement, the residual estimator and the adaptive loop (docs/method.md §7). */
import { describe, expect, it } from 'vitest';
import {
  DoubleTree, HeatProblem, SpaceTimeSystem, embeddingMap, enlargeDoubleTree, intervalDomain, nodeChildren, rectangleDomain,
  residualIndicators, solveAdaptive, spaceTimeErrors,
} from '../../src/index';

const exact = { kind: 'exact' } as const;

describe('enlargement', () => {
  it('contains Λ, the temporal children and one spatial bisection of every fibre', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const set = DoubleTree.sparseGrid(domain, 2);
    const big = enlargeDoubleTree(domain, set);
    expect(() => embeddingMap(set, big)).not.toThrow();
    const ch = new Float64Array(4);
    for (let i = 0; i < set.tree.size; i++) {
      const f = set.fibre(i);
      const j = big.tree.find(set.tree.level[i]!, set.tree.index[i]!);
      const refined = domain.refineAll(f);
      const bf = new Set(big.fibre(j));
      for (const v of refined) expect(bf.has(v)).toBe(true);
      const nc = nodeChildren('trial', set.tree.level[i]!, set.tree.index[i]!, ch);
      for (let c = 0; c < nc; c++) {
        const jc = big.tree.find(ch[2 * c]!, ch[2 * c + 1]!);
        expect(jc).toBeGreaterThanOrEqual(0);
        const cf = new Set(big.fibre(jc));
        for (const v of f) expect(cf.has(v)).toBe(true);
      }
    }
    expect(big.size).toBeGreaterThan(set.size);
  });
});

describe('residual estimator', () => {
  it('vanishes when the discrete solution is exact (u = 1 + t, insulated, reaction 2)', () => {
    const domain = intervalDomain(0, 1, 2, { insulated: () => true, reaction: 2 });
    const problem = new HeatProblem({ domain, T: 1, initial: () => 1, source: (t) => 1 + 2 * (1 + t) });
    const set = DoubleTree.sparseGrid(domain, 3);
    const { pcg } = new SpaceTimeSystem(problem, set, { inner: exact }).solve({ relTol: 1e-13 });
    const big = new SpaceTimeSystem(problem, enlargeDoubleTree(domain, set), { inner: exact });
    const ind = residualIndicators(big, set, pcg.solution);
    expect(ind.estimate).toBeLessThan(1e-8);
  });

  it('is equivalent to the true L2(H¹) error on sparse grids (smooth solution, d = 1)', () => {
    const PI = Math.PI;
    const domain = intervalDomain(0, 1, 2);
    const problem = new HeatProblem({ domain, T: 1, initial: (x) => Math.sin(PI * x), source: [{ time: (t) => 2 * t + PI * PI * (1 + t * t), space: (x) => Math.sin(PI * x) }] });
    const ratios: number[] = [];
    for (const L of [3, 4, 5, 6]) {
      const set = DoubleTree.sparseGrid(domain, L);
      const { solution, pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-12 });
      const err = spaceTimeErrors(solution, {
        value: (t, x) => (1 + t * t) * Math.sin(PI * x),
        gradient: (t, x, _y, g) => { g[0] = (1 + t * t) * PI * Math.cos(PI * x); },
      }).gradientL2;
      const ind = residualIndicators(new SpaceTimeSystem(problem, enlargeDoubleTree(domain, set), { inner: exact }), set, pcg.solution);
      ratios.push(ind.estimate / err);
    }
    console.log(`estimator / true error (sparse grids L = 3..6): ${ratios.map((r) => r.toFixed(3)).join(', ')}`);
    for (const r of ratios) {
      expect(r).toBeGreaterThan(0.2);
      expect(r).toBeLessThan(5);
    }
    // Equivalence constants do not drift with refinement.
    expect(Math.max(...ratios) / Math.min(...ratios)).toBeLessThan(2);
  });
});

describe('adaptive loop', () => {
  it('u0 ≡ 1 with u = 0 on the boundary: refines deep toward t = 0 and beats sparse grids', () => {
    const domain = intervalDomain(0, 1, 2);
    const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
    const res = solveAdaptive(problem, { maxUnknowns: 1500, maxSteps: 60, theta: 0.5, solverFraction: 0.01, inner: exact });
    const h = res.history;
    const a = h.find((x) => x.unknowns >= 150)!;
    const b = h[h.length - 1]!;
    const adaptiveRate = Math.log(a.estimate / b.estimate) / Math.log(b.unknowns / a.unknowns);
    // Sparse grids on the same problem, estimator rate between L = 5 and L = 8.
    const sparse = [5, 8].map((L) => {
      const set = DoubleTree.sparseGrid(domain, L);
      const { pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-10 });
      return { n: set.size, e: residualIndicators(new SpaceTimeSystem(problem, enlargeDoubleTree(domain, set), { inner: exact }), set, pcg.solution).estimate };
    });
    const sparseRate = Math.log(sparse[0]!.e / sparse[1]!.e) / Math.log(sparse[1]!.n / sparse[0]!.n);
    console.log(`estimator rates: adaptive ${adaptiveRate.toFixed(3)} (N ${a.unknowns} → ${b.unknowns}, depth ${b.maxTimeLevel}); sparse grids ${sparseRate.toFixed(3)}`);
    expect(b.maxTimeLevel).toBeGreaterThanOrEqual(15);
    expect(adaptiveRate).toBeGreaterThan(0.5);
    expect(sparseRate).toBeLessThan(0.25);
    for (let i = 1; i < h.length; i++) expect(h[i]!.unknowns).toBeGreaterThan(h[i - 1]!.unknowns);
  }, 120_000);

  it('d = 2 square, u0 ≡ 1: the adaptive set beats the sparse grid of the same size by the estimator', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
    // Level 6 (#Λ = 39 617), not 5: at level 5 (9 633) the ratio is 0.49–0.51 depending on which
    // sets the run happens to pass through (any change to the solves shifts them), so a factor-2
    // claim there sits in that scatter; at level 6 the measured ratio is 0.34–0.35.
    const set6 = DoubleTree.sparseGrid(domain, 6);
    const { pcg } = new SpaceTimeSystem(problem, set6).solve({ relTol: 1e-8 });
    const sparseE = residualIndicators(new SpaceTimeSystem(problem, enlargeDoubleTree(domain, set6)), set6, pcg.solution).estimate;
    // Run past the sparse grid's size and compare at the same N: E interpolated log-linearly in N
    // between the two steps that bracket #sparse grid (steps grow Λ by 10–90 %).
    const N = set6.size;
    const h = solveAdaptive(problem, { maxUnknowns: 4 * N, maxSteps: 200, onStep: (s) => s.unknowns < N }).history;
    const above = h[h.length - 1]!;
    const below = h[h.length - 2]!;
    expect(below.unknowns).toBeLessThan(N);
    expect(above.unknowns).toBeGreaterThanOrEqual(N);
    const w = Math.log(N / below.unknowns) / Math.log(above.unknowns / below.unknowns);
    const atN = Math.exp((1 - w) * Math.log(below.estimate) + w * Math.log(above.estimate));
    console.log(`d = 2: adaptive E = ${atN.toFixed(4)} at N = ${N} (between steps at ${below.unknowns} and ${above.unknowns}); sparse grid L = 6: E = ${sparseE.toFixed(4)}`);
    expect(atN).toBeLessThan(0.45 * sparseE);
  }, 120_000);
});

describe('the one-pass estimator without a system on Λ̲', () => {
  it('equals the estimator of a full system on Λ̲ (random coefficients, d = 1 and 2, with source and reaction)', async () => {
    const { rng } = await import('../helpers/random');
    const { estimateResidual, rectangleDomain } = await import('../../src/index');
    const random = rng(11);
    const withParts = [
      intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t) => 1 + t }, { kind: 'convection', where: [[2]], transferCoefficient: 2, ambient: (t) => Math.cos(t) }] }),
      rectangleDomain(0, 1, 0, 1, 2, 2, {
        boundary: [
          { kind: 'value', where: (mx) => mx < 1e-9, value: (t) => 2 - t },
          { kind: 'convection', where: (mx) => mx > 1 - 1e-9, transferCoefficient: 3, ambient: (t, _x, y) => t * y },
          { kind: 'flux', where: (_mx, my) => my > 1 - 1e-9, flux: (t) => Math.sin(t) },
        ],
      }),
    ];
    for (const domain of [intervalDomain(0, 1, 2, { reaction: 0.5 }), rectangleDomain(0, 1, 0, 1, 2, 2), ...withParts]) {
      const problem = new HeatProblem({ domain, T: 0.7, initial: (x) => 1 + x, source: (t, x) => Math.sin(3 * t + x) });
      const set = DoubleTree.sparseGrid(domain, domain.dim === 1 ? 5 : 3);
      const u = Float64Array.from({ length: set.size }, () => random() - 0.5);
      const big = enlargeDoubleTree(domain, set);
      const a = estimateResidual(problem, set, u, big);
      const b = residualIndicators(new SpaceTimeSystem(problem, big), set, u);
      expect(Math.abs(a.estimate - b.estimate)).toBeLessThan(1e-12 * b.estimate);
      let worst = 0;
      for (let i = 0; i < a.eta2.length; i++) worst = Math.max(worst, Math.abs(a.eta2[i]! - b.eta2[i]!));
      expect(worst).toBeLessThan(1e-12 * b.estimate * b.estimate);
    }
  });
});
