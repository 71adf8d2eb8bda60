/**
 * The residual r = b̲ − S̲ ũ of a solution u on Λ, extended by zero to a larger trial set Λ̲ ⊇ Λ,
 * at the cost of about one application of S on Λ̲ and with nothing kept afterwards
 * (docs/adaptivity.md §3):
 *
 *   r = B̲ᵀ K̲_Y (ℓ_f − B̲ ũ) + γ0ᵀ(u0 − γ0 ũ)   on Λ̲,
 *
 * where B̲ ũ only needs the input Λ (ũ vanishes on Λ̲ \ Λ), so it is applied from Λ to Λ̲_Y; K̲_Y
 * is applied block by block with one spatial inverse alive at a time; and the spatial plans are
 * released as soon as the pass that used them is done. No preconditioner is built on Λ̲. The
 * spatial halves of B̲ and B̲ᵀ that work on test fibres run inside K̲_Y's loop over the distinct
 * test fibres, on one leaf mesh per fibre (tests/spacetime/test-side-intermediates.test.ts checks
 * that their fibres lie in the test fibres).
 */
import type { DoubleTree } from '../spacetime/double-tree';
import type { FibrePool } from '../spacetime/fibre-pool';
import type { SpatialDomain } from '../space/index';
import { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { applySpaceFirstHalfOnce, spaceFirstSet, spaceFirstTemporalOnce, timeFirstTemporalOnce } from '../spacetime/tensor-apply';
import { SpatialPassPlan } from '../spacetime/spatial-pass';
import { SpatialOperatorPlan } from '../space/index';
import { sharedLeafMesh, type SharedLeafMesh } from '../space/operator-plan';
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
  plans.advanceEpoch(0); // the load's spatial plans are no longer needed
  // w += B(−u) (no second vector on the test set, the largest set of the estimate, ≈ 16 #Λ), in
  // three parts so that the last one shares each test fibre's leaf mesh with K_Y below: the
  // space-first half of B, then the temporal pass of its time-first half (Θ, zM, zA).
  const minusU = new Float64Array(u.length);
  for (let i = 0; i < u.length; i++) minusU[i] = -u[i]!;
  applySpaceFirstHalfOnce('derivIn', 'mass', set, test, plans, T, minusU, w, work);
  work.release(); // Σ's scratch is larger than Θ's; the loop below keeps Θ's alive
  const { theta, zM, zA } = timeFirstTemporalOnce('derivIn', 'mass', set, test, T, minusU, work);
  // Bᵀ's space-first half starts on the test fibres too: its intermediate set Σ' has the test set's
  // temporal tree, and Σ''s fibre of f (the fibres of Λ̲ one level finer that overlap f) lies in F,
  // since their parents overlap f on its level.
  const sigmaT = spaceFirstSet(test, enlarged);
  const uM = work.get(2, sigmaT.size).fill(0, 0, sigmaT.size);
  const uA = work.get(3, sigmaT.size).fill(0, 0, sigmaT.size);
  // Then per test function f, grouped by its fibre F (K_Y is block diagonal, so the blocks may go
  // in any order; a few hundred distinct fibres serve thousands of test functions):
  //   w_f += M_x zM_f + A_x zA_f   (the spatial half of B's time-first pass: Θ's fibre of f lies in F)
  //   v_f  = K_Y,F w_f             (in place: w is not needed after)
  //   uM_f, uA_f = M_x v_f, A_x v_f on Σ''s fibre of f (the spatial half of Bᵀ's space-first pass)
  // Each distinct fibre's leaf mesh is built once for all three, its inverse once, and only one of
  // each is alive at a time (docs/adaptivity.md §3). The scratch alive here (Θ's and Σ''s) is less
  // than that of Bᵀ's time-first half below, the estimate's largest.
  const v = w;
  const inverses = new FibreInverseCache(domain, pool, plans, inner);
  const byFibre: number[] = [];
  for (let f = 0; f < test.functionCount; f++) if (test.functionOffset[f + 1]! > test.functionOffset[f]!) byFibre.push(f);
  const thetaFibre = theta.functionFibre;
  byFibre.sort((a, b) => test.functionFibre[a]! - test.functionFibre[b]! || thetaFibre[a]! - thetaFibre[b]! || a - b);
  let current = -1;
  let inverse: FibreInverse | null = null;
  let mesh: SharedLeafMesh | null = null;
  const intoF = new FromToPlans(domain, pool);
  const fromF = new FromToPlans(domain, pool);
  for (const f of byFibre) {
    const id = test.functionFibre[f]!;
    if (id !== current) {
      mesh = sharedLeafMesh(domain, pool.get(id));
      inverse = inverses.build(id, mesh.mesh);
      current = id;
      intoF.reset(mesh);
      fromF.reset(mesh);
    }
    const o = test.functionOffset[f]!;
    const t0 = theta.functionOffset[f]!;
    if (theta.functionOffset[f + 1]! > t0) intoF.get(thetaFibre[f]!, id).applySum(zM, t0, zA, t0, w, o, true);
    inverse!.apply(w, o, v, o, 0);
    const s0 = sigmaT.functionOffset[f]!;
    if (sigmaT.functionOffset[f + 1]! > s0) fromF.get(id, sigmaT.functionFibre[f]!).applySplit(v, o, uM, s0, uA, s0);
  }
  // r = Bᵀ v on Λ̲: the temporal pass of its space-first half, then its time-first half; then the
  // initial-trace terms γ0ᵀ u0 − G ũ.
  const r = new Float64Array(enlarged.size);
  spaceFirstTemporalOnce('derivOut', 'mass', sigmaT, enlarged, T, uM, uA, r);
  // Bᵀ's time-first half needs the largest scratch: drop the rest now, so that it can be collected.
  work.release();
  plans.advanceEpoch(0);
  {
    const half = timeFirstTemporalOnce('derivOut', 'mass', test, enlarged, T, v, work);
    new SpatialPassPlan(half.theta, enlarged, plans, true).applySum(half.zM, half.zA, r, true);
  }
  work.release();
  const G = new InitialTraceOperator(enlarged, plans, T);
  G.addTraced(initialLoadWithLifting(problem, G.traceFibre, plans), r, 1);
  const ut = new Float64Array(enlarged.size);
  for (let p = 0; p < map.length; p++) ut[map[p]!] = u[p]!;
  G.applyAdd(ut, r, -1);
  return r;
}

/**
 * Spatial plans on one shared leaf mesh, the last one kept: consecutive functions of a fibre group
 * often share their other fibre, so each distinct pair is built once per group.
 */
class FromToPlans {
  private mesh: SharedLeafMesh | null = null;
  private plan: SpatialOperatorPlan | null = null;
  private from = -1;
  private to = -1;
  constructor(private readonly domain: SpatialDomain, private readonly pool: FibrePool) {}

  reset(mesh: SharedLeafMesh): void {
    this.mesh = mesh;
    this.plan = null;
    this.from = this.to = -1;
  }

  get(from: number, to: number): SpatialOperatorPlan {
    if (this.plan === null || from !== this.from || to !== this.to) {
      this.plan = new SpatialOperatorPlan(this.domain, this.pool.get(from), this.pool.get(to), this.mesh!);
      this.from = from;
      this.to = to;
    }
    return this.plan;
  }
}
