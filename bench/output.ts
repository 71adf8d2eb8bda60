/**
 * Benchmark cases of the output module (`output.` rows): one call of
 * spaceTimeErrors per unknown, against the exact solution of u0 ≡ 1 with zero
 * boundary values (tests/helpers/heat-exact.ts — singular at t = 0, error-function
 * series, the realistic cost of a verification run). Sparse grids of the unit
 * interval / square, and adaptive sets for u0 ≡ 1 (refined toward t = 0).
 * Coefficients do not change the cost: sparse-grid rows use a fixed pseudo-random vector.
 *
 * Extra fields: `times` (times at which the exact solution is sampled on the whole mesh),
 * `elements` (union leaf mesh), `evalsPerUnknown` (exact-solution evaluations per unknown).
 * The `.direct` rows run the reference rule (Gauss points on every breakpoint interval, the
 * evaluation before time panels) for comparison: its cost grows like (2^L)² in d = 1 against
 * L·2^L unknowns.
 */
import { DoubleTree } from '../src/spacetime/double-tree';
import { intervalDomain, rectangleDomain } from '../src/space/index';
import { SpaceTimeSolution } from '../src/spacetime/space-time-solution';
import { evaluateErrors } from '../src/output/error-norms';
import { BreakpointSlices } from '../src/output/error-slices';
import { HeatProblem } from '../src/system/heat-problem';
import { solveAdaptive } from '../src/adapt/index';
import { heatExact1D, heatExact2D } from '../tests/helpers/heat-exact';
import type { BenchCase, BenchInstance } from './harness';

const T = 0.5;

function instance(solution: SpaceTimeSolution, dim: 1 | 2, mode: 'panels' | 'direct'): BenchInstance {
  const exact = dim === 1 ? heatExact1D() : heatExact2D();
  const elements = new BreakpointSlices(solution).mesh.elementCount;
  const first = evaluateErrors(solution, exact, {}, mode);
  const n = solution.trialSet.size;
  return {
    units: n,
    run: () => { evaluateErrors(solution, exact, {}, mode); },
    extra: { times: first.slices, elements, evalsPerUnknown: Math.round(first.exactEvaluations / n) },
  };
}

function sparse(dim: 1 | 2, L: number, mode: 'panels' | 'direct'): BenchInstance {
  const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
  const set = DoubleTree.sparseGrid(domain, L);
  const coef = new Float64Array(set.size).map((_, i) => 1e-3 * Math.sin(0.37 * i + 0.1));
  return instance(new SpaceTimeSolution(domain, set, coef, T), dim, mode);
}

function adaptive(dim: 1 | 2, maxUnknowns: number): BenchInstance {
  const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
  const res = solveAdaptive(new HeatProblem({ domain, T, initial: () => 1 }), { maxUnknowns });
  return instance(res.solution, dim, 'panels');
}

/**
 * Sensor histories: u at 10 fixed points for 1 000 times on an adaptive solution (u0 ≡ 1 on the unit
 * square), by `sampleAtPoints` (spatial work once) or, in the `.evaluate` rows, by one `evaluate`
 * call per time (a leaf mesh per time). Units: times, so nsPerUnit is the cost per time.
 */
function history(maxUnknowns: number, perTime: boolean): BenchInstance {
  const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
  const res = solveAdaptive(new HeatProblem({ domain, T, initial: () => 1 }), { maxUnknowns });
  const times = Array.from({ length: 1000 }, (_, k) => (T * (k + 0.5)) / 1000);
  const points = Array.from({ length: 20 }, (_, i) => 0.05 + 0.09 * (i >> 1) + (i % 2) * 0.03);
  const u = res.solution;
  return {
    units: times.length,
    run: perTime ? () => { for (const t of times) u.evaluate(t, points); } : () => { u.sampleAtPoints(times, points); },
    extra: { unknowns: u.trialSet.size, points: points.length / 2 },
  };
}

/** `sizes` are sparse-grid levels, or unknown budgets for the adaptive rows. */
export function outputCases(quick: boolean): BenchCase[] {
  return [
    { component: 'output.errors.d1.sparse', sizes: quick ? [5] : [8, 10, 12, 13], setup: (L) => sparse(1, L, 'panels') },
    { component: 'output.errors.d1.sparse.direct', sizes: quick ? [5] : [8, 10], setup: (L) => sparse(1, L, 'direct') },
    { component: 'output.errors.d2.sparse', sizes: quick ? [2] : [3, 4, 5], setup: (L) => sparse(2, L, 'panels') },
    { component: 'output.errors.d1.adaptive', sizes: quick ? [300] : [1000, 4000], setup: (n) => adaptive(1, n) },
    { component: 'output.errors.d2.adaptive', sizes: quick ? [300] : [1500, 6000], setup: (n) => adaptive(2, n) },
    { component: 'output.history.d2', sizes: quick ? [300] : [1e4, 1e5], setup: (n) => history(n, false) },
    { component: 'output.history.d2.evaluate', sizes: quick ? [300] : [1e4, 1e5], setup: (n) => history(n, true) },
  ];
}
