/**
 * The residual r = b̲ − S̲ ũ of a solution u on Λ, extended by zero to a larger trial set Λ̲ ⊇ Λ,
 * at the cost of about one application of S on Λ̲ and with nothing kept afterwards
 * (docs/adaptivity.md §3):
 *
 *   r = B̲ᵀ K̲_Y (ℓ_f − B̲ ũ) + γ0ᵀ(u0 − γ0 ũ)   on Λ̲,
 *
 * where B̲ ũ only needs the input Λ (ũ vanishes on Λ̲ \ Λ), so it is applied from Λ to Λ̲_Y; K̲_Y
 * is applied block by block with one spatial inverse alive at a time; and the spatial plans are
 * released as soon as the pass that used them is done. No preconditioner is built on Λ̲.
 */
import type { DoubleTree } from '../spacetime/double-tree';
import { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { applyTensorOperatorOnce } from '../spacetime/tensor-apply';
import { testIndexSet } from '../spacetime/test-index-set';
import { WorkVectors } from '../numerics/work-vectors';
import { FibreInverseCache, type FibreInverse, type InnerSolver } from './fibre-inverse';
import type { HeatProblem } from './heat-problem';
import { InitialTraceOperator } from './initial-trace';
import { initialLoadWithLifting, sourceLoadWithBoundary } from './boundary-data-load';

/**
 * r = b̲ − S̲ ũ on `enlarged` for the coefficients `u` on `set` (both of one fibre pool, set ⊆
 * enlarged), with `map` the positions of set's coefficients in enlarged.
 * @internal
 */
export function enlargedResidual(
  problem: HeatProblem,
  set: DoubleTree,
  u: Float64Array,
  enlarged: DoubleTree,
  map: Int32Array,
  inner: InnerSolver = { kind: 'multigrid' },
): Float64Array {
  const T = problem.T;
  const domain = problem.domain;
  const pool = enlarged.pool;
  const test = testIndexSet(enlarged);
  const plans = new SpatialPlanCache(domain, pool);
  // Scratch of the one-shot applications of B and Bᵀ, sized to the largest intermediate set.
  const work = new WorkVectors();
  // w = ℓ_f − B ũ on Λ̲_Y, with B applied from Λ (where ũ lives).
  const w = sourceLoadWithBoundary(problem, test, plans); // with boundary data (./boundary-data-load)
  {
    // w += B(−u): no second vector on the test set (the largest set of the estimate, ≈ 16 #Λ).
    const minusU = new Float64Array(u.length);
    for (let i = 0; i < u.length; i++) minusU[i] = -u[i]!;
    applyTensorOperatorOnce('derivIn', 'mass', set, test, plans, T, minusU, w, true, work);
    // B̲ᵀ needs larger scratch: drop B̲'s now, so that it can be collected during K̲_Y instead of
    // sitting next to B̲ᵀ's.
    work.release();
  }
  plans.advanceEpoch(0); // the load's spatial plans are no longer needed
  // v = K_Y w in place (w is not needed after), block by block. K_Y is block diagonal, so the blocks
  // may go in any order: grouped by fibre, each distinct fibre's inverse is built once and only one
  // is alive at a time (a few dozen distinct fibres serve hundreds of test functions).
  const v = w;
  const inverses = new FibreInverseCache(domain, pool, plans, inner);
  const byFibre: number[] = [];
  for (let f = 0; f < test.functionCount; f++) if (test.functionOffset[f + 1]! > test.functionOffset[f]!) byFibre.push(f);
  byFibre.sort((a, b) => test.functionFibre[a]! - test.functionFibre[b]! || a - b);
  let current = -1;
  let inverse: FibreInverse | null = null;
  for (const f of byFibre) {
    const id = test.functionFibre[f]!;
    if (id !== current) {
      inverse = inverses.build(id);
      current = id;
    }
    const o = test.functionOffset[f]!;
    inverse!.apply(w, o, v, o, 0);
  }
  plans.advanceEpoch(0);
  // r = Bᵀ v on Λ̲, then the initial-trace terms γ0ᵀ u0 − G ũ.
  const r = new Float64Array(enlarged.size);
  applyTensorOperatorOnce('derivOut', 'mass', test, enlarged, plans, T, v, r, false, work);
  work.release();
  const G = new InitialTraceOperator(enlarged, plans, T);
  G.addTraced(initialLoadWithLifting(problem, G.traceFibre, plans), r, 1);
  const ut = new Float64Array(enlarged.size);
  for (let p = 0; p < map.length; p++) ut[map[p]!] = u[p]!;
  G.applyAdd(ut, r, -1);
  return r;
}
