/**
 * Operator-cost measurement on a chosen problem size: the public entry point
 * behind the `spacetime.` benchmark rows, for users who want to know what one
 * application of S, B or K_X costs on their machine before sizing a run.
 */
import { BYTES_PER_SYSTEM_UNKNOWN, checkBoolean, checkInteger, checkMemory, checkNumber, checkObject, checkOneOf, checkOptions } from '../validation/index';
import { intervalDomain, rectangleDomain } from '../space/index';
import { DoubleTree } from '../spacetime/double-tree';
import { HeatProblem } from './heat-problem';
import { SpaceTimeSystem } from './space-time-system';
import type { LinearOperator } from '../numerics/linear-operator';

/** Options of {@link measureOperatorCost}. */
export interface OperatorCostOptions {
  /** Spatial dimension: unit interval (1) or unit square (2), Dirichlet boundary. */
  dim: 1 | 2;
  /** Grid level L (sparse: |λ| + ℓ_x(ν) ≤ L; full: both ≤ L). */
  level: number;
  /** `'sparse'` (default) or `'full'`. */
  grid?: 'sparse' | 'full';
  /** Minimum number of timed applications per operator (default 5); the median is reported. */
  repetitions?: number;
  /** Also run PCG with K_X to a relative residual reduction of `pcgTolerance` (default 1e-6). */
  measurePcg?: boolean;
  pcgTolerance?: number;
}

const COST_KEYS: Record<keyof Required<OperatorCostOptions>, true> = {
  dim: true, level: true, grid: true, repetitions: true, measurePcg: true, pcgTolerance: true,
};

/** Result of {@link measureOperatorCost}; times are medians in nanoseconds per unknown of Λ. */
export interface OperatorCost {
  unknowns: number;
  testUnknowns: number;
  setupMs: number;
  nsPerUnknown: { schur: number; B: number; precond: number };
  /** PCG iterations for a fixed smooth right-hand side from a zero initial guess (with `measurePcg`). */
  pcgIterations?: number;
}

/**
 * Builds the heat problem on the unit interval or square with a smooth
 * source and initial state, sets up the space-time system on a sparse or full
 * grid, and times single applications of S, B and K_X.
 *
 * @example
 * ```ts
 * import { measureOperatorCost } from 'chronomesh';
 * const cost = measureOperatorCost({ dim: 1, level: 5, measurePcg: true });
 * console.log(cost.unknowns, cost.nsPerUnknown.schur, cost.pcgIterations);
 * ```
 */
export function measureOperatorCost(opts: OperatorCostOptions): OperatorCost {
  const o = checkObject(opts, 'opts', 'an options object { dim, level, … }') as Partial<OperatorCostOptions>;
  checkOptions<OperatorCostOptions>(o, 'opts', COST_KEYS);
  const dim = checkOneOf(o.dim, 'opts.dim', [1, 2] as const);
  const level = checkInteger(o.level, 'opts.level', 0, 30);
  const grid = o.grid === undefined ? 'sparse' : checkOneOf(o.grid, 'opts.grid', ['sparse', 'full'] as const);
  const reps = o.repetitions === undefined ? 5 : checkInteger(o.repetitions, 'opts.repetitions', 1, 1000);
  if (o.measurePcg !== undefined) checkBoolean(o.measurePcg, 'opts.measurePcg');
  if (o.pcgTolerance !== undefined) checkNumber(o.pcgTolerance, 'opts.pcgTolerance', { min: 0, max: 1, minOpen: true, maxOpen: true });
  // Benchmark domains: 3 initial vertices (1D) or 9 (2D); sizes as in DoubleTree.sparseGrid.
  const nv0 = dim === 1 ? 3 : 9;
  let unknowns = 0;
  if (grid === 'full') unknowns = 2 ** level * nv0 * 2 ** (dim * level);
  else for (let l = 0; l <= level; l++) unknowns += (l === 0 ? 2 : 2 ** (l - 1)) * nv0 * 2 ** (dim * (level - l));
  checkMemory(unknowns * BYTES_PER_SYSTEM_UNKNOWN, `the ${grid} grid of level ${level} in ${dim}D (about ${unknowns.toExponential(1)} unknowns)`, 'opts.level', 'choose a lower level');
  const t0 = performance.now();
  const system = benchmarkSystem(dim, level, grid);
  const setupMs = performance.now() - t0;
  const n = system.size;
  const x = new Float64Array(n).map((_, i) => Math.sin(0.37 * i + 0.1));
  const y = new Float64Array(n);
  const yY = new Float64Array(system.testSet.size);
  const time = (op: LinearOperator, out: Float64Array) => medianNs(() => op.apply(x, out), reps) / n;
  const result: OperatorCost = {
    unknowns: n,
    testUnknowns: system.testSet.size,
    setupMs,
    nsPerUnknown: { schur: time(system.S, y), B: time(system.B, yY), precond: time(system.KX, y) },
  };
  if (o.measurePcg) {
    const r = system.solve({ relTol: o.pcgTolerance ?? 1e-6, maxIterations: 1000 });
    result.pcgIterations = r.pcg.iterations;
  }
  return result;
}

/** The benchmark problem on (0,1) (2 cells) or (0,1)² (2×2 cells): κ = 1, c = 0, T = 1, u0 = Π sin(πx_i), f = (1 + t) Π sin(πx_i). */
export function benchmarkSystem(dim: 1 | 2, level: number, grid: 'sparse' | 'full'): SpaceTimeSystem {
  const domain = dim === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
  const bump = dim === 1 ? (x: number) => Math.sin(Math.PI * x) : (x: number, y: number) => Math.sin(Math.PI * x) * Math.sin(Math.PI * y);
  const problem = new HeatProblem({ domain, T: 1, initial: bump, source: [{ time: (t) => 1 + t, space: bump }] });
  const set = grid === 'sparse' ? DoubleTree.sparseGrid(domain, level) : DoubleTree.fullGrid(domain, level, level);
  return new SpaceTimeSystem(problem, set);
}

function medianNs(run: () => void, reps: number): number {
  run();
  const samples: number[] = [];
  const start = performance.now();
  while (samples.length < reps || (performance.now() - start < 300 && samples.length < 50)) {
    const a = performance.now();
    run();
    samples.push((performance.now() - a) * 1e6);
  }
  samples.sort((p, q) => p - q);
  return samples[samples.length >> 1]!;
}
