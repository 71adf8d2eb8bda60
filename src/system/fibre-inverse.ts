/**
 * Approximate inverses of (A_x + α M_x) on one spatial fibre, in hierarchical
 * coordinates (docs/method.md §4.3, §6): either the multilevel V-cycle of the
 * spatial module or, for small problems and tests, an exact dense Cholesky
 * solve (ml-matrix) of the hierarchical matrix.
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { InvalidArgumentError } from '../errors';
import type { SpatialDomain } from '../space/index';
import type { LeafMesh } from '../space/leaf-mesh';
import { CYCLE_SLOTS, MultilevelPreconditioner } from '../space/multigrid/index';
import { WorkVectors } from '../numerics/work-vectors';
import { localIndices } from '../space/operator-plan';
import type { FibrePool } from '../spacetime/fibre-pool';
import type { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { EpochMap } from '../spacetime/epoch-map';
import { innerCycles } from '../space/flat-elements';

/**
 * How the spatial inverses inside K_Y and K_X are realised: V-cycles (`cycles` per application;
 * default 1, more for anisotropic diffusion, see {@link SpatialDomain.mappedAnisotropy}) or exact
 * dense solves (small problems and tests only).
 */
export type InnerSolver =
  | { kind: 'multigrid'; cycles?: number }
  | { kind: 'exact' };

/**
 * z[zOff..] ≈ (A + αM)⁻¹ r[rOff..] on one fibre, in hierarchical coordinates: what
 * {@link FibreInverseCache} builds.
 *
 * @example
 * ```ts
 * import { DoubleTree, FibreInverseCache, SpatialPlanCache, intervalDomain, type FibreInverse } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const set = DoubleTree.sparseGrid(domain, 3);
 * const plans = new SpatialPlanCache(domain, set.pool);
 * const id = set.nodeFibre[0]!;
 * const inv: FibreInverse = new FibreInverseCache(domain, set.pool, plans, { kind: 'exact' }).get(id);
 * const n = set.pool.get(id).length;
 * const z = new Float64Array(n);
 * inv.apply(new Float64Array(n).fill(1), 0, z, 0, 0); // z = A⁻¹ r for r = (1, …, 1); rᵀA⁻¹r > 0
 * console.log(z.reduce((s, v) => s + v, 0) > 0); // → true
 * ```
 */
export interface FibreInverse {
  apply(r: Float64Array, rOff: number, z: Float64Array, zOff: number, alpha: number): void;
  /** Diagonals of the hierarchical A and M on the fibre, in fibre order (used by the estimator). */
  diagonals(): { A: Float64Array; M: Float64Array };
}

class MultigridFibreInverse implements FibreInverse {
  private readonly local: Int32Array;
  private readonly n: number;
  // The local vectors live in the scratch the cache's cycles share (one inverse runs at a time).
  constructor(domain: SpatialDomain, mesh: LeafMesh, fibre: Int32Array, private readonly mg: MultilevelPreconditioner, private readonly scratch: WorkVectors) {
    this.local = localIndices(domain, mesh, fibre);
    this.n = mesh.vertexCount;
  }
  apply(r: Float64Array, rOff: number, z: Float64Array, zOff: number, alpha: number): void {
    const { local, n } = this;
    // Views of exactly n entries (the cycle checks the lengths); two small objects per apply.
    const rLoc = this.scratch.get(CYCLE_SLOTS, n).subarray(0, n);
    const zLoc = this.scratch.get(CYCLE_SLOTS + 1, n).subarray(0, n);
    rLoc.fill(0);
    for (let p = 0; p < local.length; p++) rLoc[local[p]!] = r[rOff + p]!;
    this.mg.applyHierarchical(rLoc, zLoc, alpha);
    for (let p = 0; p < local.length; p++) z[zOff + p] = zLoc[local[p]!]!;
  }
  diagonals(): { A: Float64Array; M: Float64Array } {
    const d = this.mg.hierarchicalDiagonals();
    return { A: Float64Array.from(this.local, (i) => d.A[i]!), M: Float64Array.from(this.local, (i) => d.M[i]!) };
  }
}

class ExactFibreInverse implements FibreInverse {
  private readonly factors = new Map<number, CholeskyDecomposition>();
  private readonly rhs: Matrix;
  constructor(private readonly M: Matrix, private readonly A: Matrix) {
    this.rhs = new Matrix(M.rows, 1);
  }
  apply(r: Float64Array, rOff: number, z: Float64Array, zOff: number, alpha: number): void {
    const n = this.M.rows;
    let chol = this.factors.get(alpha);
    if (chol === undefined) {
      const K = Matrix.add(this.A, Matrix.mul(this.M, alpha));
      // The fast plans are symmetric only up to rounding; ml-matrix's Cholesky wants exact symmetry.
      chol = new CholeskyDecomposition(Matrix.add(K, K.transpose()).mul(0.5));
      if (!chol.isPositiveDefinite()) throw new InvalidArgumentError(`spatial operator A + ${alpha}·M is not positive definite on this fibre`, { field: 'alpha', received: alpha });
      this.factors.set(alpha, chol);
    }
    for (let i = 0; i < n; i++) this.rhs.set(i, 0, r[rOff + i]!);
    const sol = chol.solve(this.rhs);
    for (let i = 0; i < n; i++) z[zOff + i] = sol.get(i, 0);
  }
  diagonals(): { A: Float64Array; M: Float64Array } {
    const n = this.M.rows;
    return { A: Float64Array.from({ length: n }, (_, i) => this.A.get(i, i)), M: Float64Array.from({ length: n }, (_, i) => this.M.get(i, i)) };
  }
}

/** Dense hierarchical M and A on a fibre, by applying the fast spatial plan to unit vectors. */
export function denseFibreMatrices(cache: SpatialPlanCache, fibreId: number): { M: Matrix; A: Matrix } {
  const n = cache.pool.get(fibreId).length;
  const plan = cache.get(fibreId, fibreId);
  const M = new Matrix(n, n);
  const A = new Matrix(n, n);
  const e = new Float64Array(n);
  const ym = new Float64Array(n);
  const ya = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    e.fill(0);
    e[j] = 1;
    plan.applySplit(e, 0, ym, 0, ya, 0);
    for (let i = 0; i < n; i++) {
      M.set(i, j, ym[i]!);
      A.set(i, j, ya[i]!);
    }
  }
  return { M, A };
}

/**
 * One approximate inverse of A + αM per fibre id, built on first use (V-cycle hierarchy or dense
 * factors). Systems of one fibre pool can share it (see `SpaceTimeSystemOptions.caches`);
 * {@link FibreInverseCache.advanceEpoch} releases the inverses that were not used recently.
 *
 * @example
 * ```ts
 * import { DoubleTree, FibreInverseCache, HeatProblem, SpaceTimeSystem, SpatialPlanCache, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const set = DoubleTree.sparseGrid(domain, 4);
 * const plans = new SpatialPlanCache(domain, set.pool);
 * const inverses = new FibreInverseCache(domain, set.pool, plans, { kind: 'multigrid' });
 * const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
 * const a = new SpaceTimeSystem(problem, set, { caches: { plans, inverses } });
 * const b = new SpaceTimeSystem(problem, set, { caches: { plans, inverses } }); // reuses a's plans and inverses
 * console.log(a.solve().pcg.iterations === b.solve().pcg.iterations, inverses.size > 0); // → true true
 * ```
 */
export class FibreInverseCache {
  private readonly items = new EpochMap<FibreInverse>();
  // Work vectors shared by the V-cycles of all inverses built here (numerics/work-vectors).
  private readonly scratch = new WorkVectors();
  // V-cycles per application, from the shape of the initial mesh (computed on first use).
  private cycles: number | undefined;
  constructor(
    private readonly domain: SpatialDomain,
    readonly pool: FibrePool,
    readonly plans: SpatialPlanCache,
    readonly solver: InnerSolver,
  ) {
    // Fibre ids are read in both (the inverses take their meshes, the exact solves their matrices,
    // from the plans), so they must number the same fibres.
    if (plans.pool !== pool) {
      throw new InvalidArgumentError('plans must serve the same fibre pool as the inverse cache (fibre ids would name other fibres)', {
        field: 'plans', expected: 'a SpatialPlanCache built on `pool`', received: 'a SpatialPlanCache of another pool',
      });
    }
  }

  get(fibreId: number): FibreInverse {
    return this.items.getOrMake(fibreId, () => this.build(fibreId));
  }

  /**
   * A new inverse on fibre `fibreId`, not kept (for one-shot sweeps such as the estimator's K_Y).
   * `mesh`, if given, is the fibre's leaf mesh built by the caller for other work on the same fibre.
   */
  build(fibreId: number, mesh?: LeafMesh): FibreInverse {
    if (this.solver.kind === 'exact') {
      const { M, A } = denseFibreMatrices(this.plans, fibreId);
      return new ExactFibreInverse(M, A);
    }
    const fibre = this.pool.get(fibreId);
    // the plans' mesh of the fibre when they have one (B's and Bᵀ's unions on the test side are the
    // test fibres, K_X's stiffness plans work on the trial fibres): one extraction, one copy alive
    mesh ??= this.plans.meshOf(fibreId).mesh;
    // one V-cycle unless the mesh looks flat to the smoother (innerCycles, docs/method.md §4.4)
    const cycles = this.solver.cycles ?? (this.cycles ??= innerCycles(this.domain));
    const mg = new MultilevelPreconditioner(mesh, { cycles }).useScratch(this.scratch);
    return new MultigridFibreInverse(this.domain, mesh, fibre, mg, this.scratch);
  }

  /** Number of fibre inverses held. */
  get size(): number {
    return this.items.size;
  }

  /** Starts a new epoch and releases the inverses not requested during the last `keep` epochs. */
  advanceEpoch(keep = 1): void {
    this.items.advance(keep);
  }

  /** Releases the inverses not used during the current epoch. */
  prune(): void {
    this.items.prune();
  }

  /** Releases every inverse. */
  clear(): void {
    this.items.clear();
    this.scratch.release();
  }
}
