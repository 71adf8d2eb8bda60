/**
 * The Schur complement S = Bᵀ K_Y B + G of the minimal-residual
 * Petrov–Galerkin system (docs/method.md §2, §6), as one operator on Λ.
 * B = D ⊗ M_x + N ⊗ A_x : Λ → Λ_Y and Bᵀ are applied matrix-free in linear
 * time by {@link TensorOperatorPlan}.
 */
import type { TensorOperatorPlan } from '../spacetime/tensor-apply';
import type { InitialTraceOperator } from './initial-trace';
import { checkNotAliased, type LinearOperator } from '../numerics/linear-operator';

/**
 * S = Bᵀ K_Y B + G as one operator with `apply(x, out)`.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const n = system.size;
 * const out = new Float64Array(n);
 * system.S.apply(new Float64Array(n).fill(1), out);
 * ```
 */
export class SchurOperator implements LinearOperator {
  readonly inSize: number;
  readonly outSize: number;
  private readonly u: Float64Array;
  private readonly v: Float64Array;

  constructor(
    readonly B: TensorOperatorPlan,
    readonly Bt: TensorOperatorPlan,
    readonly KY: LinearOperator,
    readonly G: InitialTraceOperator,
  ) {
    this.inSize = this.outSize = B.input.size;
    this.u = new Float64Array(B.output.size);
    this.v = new Float64Array(B.output.size);
  }

  /** y = S x (overwrites y; y must not share memory with x: Bᵀ writes y before G reads x). */
  apply(x: Float64Array, y: Float64Array): void {
    checkNotAliased(x, y, 'S');
    this.B.apply(x, this.u);
    this.KY.apply(this.u, this.v);
    this.Bt.apply(this.v, y);
    this.G.applyAdd(x, y);
  }
}
