/**
 * Benchmark cases of the output module (`output.` rows): one call of
 * spaceTimeErrors per unknown, against the smooth closed form
 * u = (1 + t²) Π sin(π x_i) (cheap to evaluate, so the rows show the
 * library's own cost). Sparse grids of the unit interval / square, and d = 1
 * adaptive sets for u0 ≡ 1 (where the adaptive loop refines toward t = 0).
 *
 * Extra fields: `slices` (time points evaluated), `elements` (union leaf mesh),
 * `nsPerCell` = time / (slices × elements) — the direct evaluation visits every
 * element of the union mesh at every time point, so for sparse grids the cost
 * grows like (2^L)² in d = 1 against L·2^L unknowns.
 */
import { DoubleTree } from '../src/spacetime/double-tree';
import { intervalDomain, rectangleDomain } from '../src/space/index';
import { SpaceTimeSolution } from '../src/spacetime/space-time-solution';
import { spaceTimeErrors, type KnownSolution } from '../src/output/error-norms';
import { BreakpointSlices } from '../src/output/error-slices';
import { HeatProblem } from '../src/system/heat-problem';
import { solveAdaptive } from '../src/adapt/index';
import type { BenchCase, BenchInstance } from './harness';

const PI = Math.PI;

function smooth(dim: 1 | 2): KnownSolution {
  return {
    value: (t, x, y) => (1 + t * t) * Math.sin(PI * x) * (dim === 2 ? Math.sin(PI * y) : 1),
    gradient: (t, x, y, g) => {
      const a = (1 + t * t) * PI;
      if (dim === 1) g[0] = a * Math.cos(PI * x);
      else {
        g[0] = a * Math.cos(PI * x) * Math.sin(PI * y);
        g[1] = a * Math.sin(PI * x) * Math.cos(PI * y);
      }
    },
  };
}

function instance(solution: SpaceTimeSolution, dim: 1 | 2): BenchInstance {
  const exact = smooth(dim);
  const elements = new BreakpointSlices(solution).mesh.elementCount;
  const first = spaceTimeErrors(solution, exact);
  return {
    units: solution.trialSet.size,
    run: () => { spaceTimeErrors(solution, exact); },
    extra: { slices: first.slices, elements, cells: first.slices * elements },
  };
}

function sparse(dim: 1 | 2, L: number): BenchInstance {
  const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
  const set = DoubleTree.sparseGrid(domain, L);
  const coef = new Float64Array(set.size).map((_, i) => Math.sin(0.37 * i + 0.1));
  return instance(new SpaceTimeSolution(domain, set, coef, 1), dim);
}

function adaptive(maxUnknowns: number): BenchInstance {
  const domain = intervalDomain(0, 1, 2);
  const res = solveAdaptive(new HeatProblem({ domain, T: 1, initial: () => 1 }), { maxUnknowns, solverFraction: 0.05 });
  return instance(res.solution, 1);
}

/** `sizes` are sparse-grid levels, or unknown budgets for the adaptive rows. */
export function outputCases(quick: boolean): BenchCase[] {
  return [
    { component: 'output.errors.d1.sparse', sizes: quick ? [5] : [6, 8, 10], setup: (L) => sparse(1, L) },
    { component: 'output.errors.d2.sparse', sizes: quick ? [2] : [3, 4, 5], setup: (L) => sparse(2, L) },
    { component: 'output.errors.d1.adaptive', sizes: quick ? [300] : [1000, 4000, 16000], setup: (n) => adaptive(n) },
  ];
}
