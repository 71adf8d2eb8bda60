/**
 * Residual a-posteriori estimator (docs/method.md §7). With Λ̲ the enlargement
 * of Λ and ũ the current solution extended by zero,
 *   r = b̲ − S̲ ũ  on Λ̲,    η_i = |r_i| / √d_i  for i = (λ, ν) ∈ Λ̲ \ Λ,
 *   d_i = (A_x)_{νν} + α_λ² (M_x)_{νν}² / (A_x)_{νν}   (X-norm² of σ_λ ⊗ φ_ν up to constants),
 * and E = (Σ η_i²)^{1/2}. Under the saturation assumption E is reliable and efficient.
 *
 * The indicators weigh the residual that an algebraic error of u leaves on the candidates far more
 * than that error's S-energy norm (about 20× measured at κT/L² = 5·10⁻⁴: an algebraic error of
 * 0.05 E doubled E), so u should be solved well below E; solveAdaptive re-solves whenever E rises
 * (docs/adaptivity.md §4).
 */
import { SolverBreakdownError } from '../errors';
import { derivativeNorms } from '../time/index';
import type { DoubleTree } from '../spacetime/double-tree';
import { SpaceTimeSystem } from '../system/space-time-system';
import { HeatProblem } from '../system/heat-problem';
import { validateInnerSolver } from '../system/system-options';
import { checkSetOnDomain } from '../spacetime/set-checks';
import { checkFloat64Array, checkInstance } from '../validation/index';
import type { InnerSolver } from '../system/fibre-inverse';
import { enlargedResidual } from '../system/enlarged-residual';
import { hierarchicalDiagonals } from '../space/hierarchical-diagonals';
import { embeddingMap, prolongCoefficients } from './embedding';

/** Result of {@link residualIndicators}. */
export interface ResidualIndicators {
  /** η_i² for every coefficient of Λ̲ (0 on Λ itself). */
  eta2: Float64Array;
  /** E = (Σ η²)^{1/2}. */
  estimate: number;
  /** Positions of Λ's coefficients inside Λ̲. */
  embedding: Int32Array;
}

/**
 * Squared indicators on the enlarged set of `enlarged` (a system built on Λ̲ ⊇ Λ)
 * for the solution `u` on Λ. Solve u well below the E you expect: the indicators see its
 * algebraic error many times magnified (docs/adaptivity.md §4).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, enlargeDoubleTree, intervalDomain, residualIndicators } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
 * const set = DoubleTree.sparseGrid(domain, 4);
 * const { pcg } = new SpaceTimeSystem(problem, set).solve();
 * const ind = residualIndicators(new SpaceTimeSystem(problem, enlargeDoubleTree(domain, set)), set, pcg.solution);
 * console.log(ind.estimate);
 * ```
 */
export function residualIndicators(enlarged: SpaceTimeSystem, set: DoubleTree, u: Float64Array, b?: Float64Array): ResidualIndicators {
  checkInstance(enlarged, SpaceTimeSystem, 'enlarged', 'a SpaceTimeSystem on the enlarged set');
  checkSetOnDomain(set, enlarged.problem.domain, 'set');
  checkFloat64Array(u, 'u', { length: set.size, finite: true });
  if (b !== undefined) checkFloat64Array(b, 'b', { length: enlarged.size, finite: true });
  const big = enlarged.trialSet;
  const map = embeddingMap(set, big);
  const ut = prolongCoefficients(map, u, big.size);
  let r: Float64Array;
  if (b) {
    r = Float64Array.from(b);
    const su = new Float64Array(big.size);
    enlarged.S.apply(ut, su);
    for (let i = 0; i < r.length; i++) r[i]! -= su[i]!;
  } else r = enlarged.residual(ut); // one application of B, K_Y, Bᵀ
  return indicatorsFromResidual(enlarged.problem, big, r, map);
}

/**
 * The estimator on Λ̲ = `enlarged` for the solution `u` on `set` without building a system on Λ̲:
 * the residual costs about one application of S there and keeps nothing afterwards (see
 * docs/adaptivity.md §3). This is what {@link solveAdaptive} uses. As for
 * {@link residualIndicators}, solve u well below the E you expect: an algebraic error of a few
 * hundredths of E (S-energy norm) was measured to double E (docs/adaptivity.md §4).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, enlargeDoubleTree, estimateResidual, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
 * const set = DoubleTree.sparseGrid(domain, 4);
 * const { pcg } = new SpaceTimeSystem(problem, set).solve();
 * console.log(estimateResidual(problem, set, pcg.solution, enlargeDoubleTree(domain, set)).estimate);
 * ```
 */
export function estimateResidual(problem: HeatProblem, set: DoubleTree, u: Float64Array, enlarged: DoubleTree, inner?: InnerSolver): ResidualIndicators {
  checkInstance(problem, HeatProblem, 'problem', 'a HeatProblem');
  checkSetOnDomain(set, problem.domain, 'set');
  checkFloat64Array(u, 'u', { length: set.size, finite: true });
  checkSetOnDomain(enlarged, problem.domain, 'enlarged');
  if (inner !== undefined) validateInnerSolver(inner, 'inner');
  const map = embeddingMap(set, enlarged);
  const r = enlargedResidual(problem, set, u, enlarged, map, inner);
  return indicatorsFromResidual(problem, enlarged, r, map);
}

/** η_i² = r_i² / d_i on Λ̲ \ Λ with the X-norm scaling d_i of the module comment. */
function indicatorsFromResidual(problem: HeatProblem, big: DoubleTree, r: Float64Array, map: Int32Array): ResidualIndicators {
  for (let i = 0; i < r.length; i++) {
    if (!Number.isFinite(r[i]!)) throw new SolverBreakdownError(`the residual on the enlarged set is not finite at coefficient ${i} (${r[i]}): the solution or the data contain NaN or ∞`);
  }
  const inSmall = new Uint8Array(big.size);
  for (let p = 0; p < map.length; p++) inSmall[map[p]!] = 1;
  const alpha = derivativeNorms(big.tree, problem.T);
  // Hierarchical diagonals per vertex: the basis function of a vertex does not depend on the set.
  const { A, M } = hierarchicalDiagonals(problem.domain);
  const eta2 = new Float64Array(big.size);
  let total = 0;
  for (let f = 0; f < big.functionCount; f++) {
    const o = big.functionOffset[f]!;
    const n = big.functionOffset[f + 1]! - o;
    if (n === 0) continue;
    const fibre = big.pool.get(big.functionFibre[f]!);
    const a2 = alpha[f]! * alpha[f]!;
    for (let p = 0; p < n; p++) {
      if (inSmall[o + p]) continue;
      const v = fibre[p]!;
      const d = A[v]! + (a2 * M[v]! * M[v]!) / A[v]!;
      const e = (r[o + p]! * r[o + p]!) / d;
      eta2[o + p] = e;
      total += e;
    }
  }
  return { eta2, estimate: Math.sqrt(total), embedding: map };
}
