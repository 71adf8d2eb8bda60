/**
 * K_Y: block-diagonal approximation of A_Y⁻¹ = (I ⊗ A_x)⁻¹ on the test index
 * set (docs/method.md §6). Ψ is L2-orthonormal, so A_Y is block diagonal over the
 * test functions and each block is the spatial A_x on the function's fibre.
 */
import type { DoubleTree } from '../spacetime/double-tree';
import type { FibreInverse, FibreInverseCache } from './fibre-inverse';
import { checkNotAliased, type LinearOperator } from '../numerics/linear-operator';

/**
 * K_Y ≈ (I ⊗ A_x)⁻¹ = A_Y⁻¹, the inverse of the inner product of the test space, on the test
 * index set, one spatial inverse per test function. It is a factor of S = Bᵀ K_Y B + G
 * (not a preconditioner of PCG; that is K_X, {@link TrialPreconditioner}).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const n = system.testSet.size;
 * const out = new Float64Array(n);
 * system.KY.apply(new Float64Array(n).fill(1), out);
 * ```
 */
export class TestInnerProductInverse implements LinearOperator {
  readonly inSize: number;
  readonly outSize: number;
  private readonly blocks: FibreInverse[];
  private readonly offsets: Int32Array;
  private readonly lengths: Int32Array;

  constructor(testSet: DoubleTree, inverses: FibreInverseCache) {
    this.inSize = this.outSize = testSet.size;
    const nf = testSet.functionCount;
    this.blocks = new Array(nf);
    this.offsets = testSet.functionOffset;
    this.lengths = new Int32Array(nf);
    for (let f = 0; f < nf; f++) {
      this.lengths[f] = testSet.functionOffset[f + 1]! - testSet.functionOffset[f]!;
      this.blocks[f] = inverses.get(testSet.functionFibre[f]!);
    }
  }

  apply(r: Float64Array, z: Float64Array): void {
    checkNotAliased(r, z, 'K_Y');
    const { blocks, offsets, lengths } = this;
    for (let f = 0; f < blocks.length; f++) {
      if (lengths[f] === 0) continue;
      blocks[f]!.apply(r, offsets[f]!, z, offsets[f]!, 0);
    }
  }
}
