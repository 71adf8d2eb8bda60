/**
 * K_X: block-diagonal preconditioner for the Schur complement (DESIGN.md §6),
 *   K_X = blockdiag_λ ( (A + α_λ M)⁻¹ A (A + α_λ M)⁻¹ ),   α_λ = ‖∂t σ_λ‖_{L2(I)},
 * from the L2- and scaled-H¹-Riesz property of the trial wavelets:
 * (A + αM) A⁻¹ (A + αM) lies between A + α² M A⁻¹ M and twice it, the X-norm
 * block of σ_λ ⊗ (·). Each inverse is a {@link FibreInverse}.
 */
import { derivativeNorms } from '../time/index';
import type { SpatialOperatorPlan } from '../space/index';
import type { DoubleTree } from '../spacetime/double-tree';
import type { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import type { FibreInverse, FibreInverseCache } from './fibre-inverse';
import type { LinearOperator } from './linear-operator';

/**
 * K_X, the block-diagonal preconditioner of the Schur complement.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const n = system.size;
 * const out = new Float64Array(n);
 * system.KX.apply(new Float64Array(n).fill(1), out);
 * ```
 */
export class TrialPreconditioner implements LinearOperator {
  readonly inSize: number;
  readonly outSize: number;
  private readonly inverses: FibreInverse[];
  private readonly stiffness: SpatialOperatorPlan[];
  private readonly alpha: Float64Array;
  private readonly offsets: Int32Array;
  private readonly lengths: Int32Array;
  private readonly tmp: Float64Array;

  constructor(trialSet: DoubleTree, inverses: FibreInverseCache, plans: SpatialPlanCache, T: number) {
    this.inSize = this.outSize = trialSet.size;
    const nf = trialSet.functionCount;
    this.alpha = derivativeNorms(trialSet.tree, T);
    this.offsets = trialSet.functionOffset;
    this.lengths = new Int32Array(nf);
    this.inverses = new Array(nf);
    this.stiffness = new Array(nf);
    let maxLen = 0;
    for (let f = 0; f < nf; f++) {
      const id = trialSet.functionFibre[f]!;
      const len = trialSet.functionOffset[f + 1]! - trialSet.functionOffset[f]!;
      this.lengths[f] = len;
      maxLen = Math.max(maxLen, len);
      if (len === 0) continue;
      this.inverses[f] = inverses.get(id);
      this.stiffness[f] = plans.get(id, id);
    }
    this.tmp = new Float64Array(2 * maxLen);
  }

  apply(r: Float64Array, z: Float64Array): void {
    const { inverses, stiffness, alpha, offsets, lengths, tmp } = this;
    for (let f = 0; f < inverses.length; f++) {
      const n = lengths[f]!;
      if (n === 0) continue;
      const o = offsets[f]!;
      const inv = inverses[f]!;
      const a = alpha[f]!;
      inv.apply(r, o, tmp, 0, a);
      stiffness[f]!.apply(tmp, 0, tmp, n, 0, 1);
      inv.apply(tmp, n, z, o, a);
    }
  }
}
