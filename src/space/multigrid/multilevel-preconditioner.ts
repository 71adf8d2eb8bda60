/**
 * Local multiplicative V-cycle on the generation hierarchy of a leaf mesh
 * (docs/method.md §4.3): an approximation of (A + αM)⁻¹ that is symmetric, positive
 * definite and linear (fixed) for every α ≥ 0.
 *
 * All levels share the local numbering: mesh_g is the prefix of local vertices
 * of generation ≤ g, so a level-g vector is the prefix of one array. The cycle
 * keeps only local work per level:
 *  - down (g = G … 1): forward Gauss–Seidel on S_g for A_g e = r_g started at
 *    e = 0, with the residual ρ_g = r_g − A_g e updated in place along the rows
 *    of S_g; e and ρ_g are saved on S_g; r_{g−1} = P_gᵀ ρ_g only changes the
 *    parents of generation-g vertices.
 *  - bottom: y = (A_0 + αM_0)⁻¹ r_0 exactly.
 *  - up (g = 1 … G): y ← P_g y (midpoint values at the generation-g vertices),
 *    backward Gauss–Seidel on S_g with residual ρ_g − A_g y (the saved
 *    down-correction e enters through ρ_g), then y += e.
 * With backward sweeps after the coarse correction mirroring the forward sweeps
 * before it and Galerkin coarse matrices, the cycle is a symmetric operator.
 */
import { InvalidArgumentError } from '../../errors';
import type { LeafMesh } from '../leaf-mesh';
import { nodalToHierarchical, nodalToHierarchicalTransposed } from '../hierarchical';
import { assemblePair, rowCapacity } from './assemble-pair';
import { CoarseSolver } from './coarse-solver';
import { buildHierarchy, copyPairedRows, snapshotReserve, type LevelHierarchy, type PairedCsr } from './galerkin-hierarchy';
import { validateLeafMesh } from './validate-leaf-mesh';
import { WorkVectors } from '../../numerics/work-vectors';
import { checkOptions } from '../../validation/index';

// Slots of the cycle's work vectors.
const RES = 0;
const HBUF = 1;
const RCOPY = 2;
const CORR = 3;
const RHO = 4;
const EPRE = 5;
const JTMP = 6;
/** Number of work-vector slots a cycle uses (0 … CYCLE_SLOTS − 1); code around a cycle may use the next ones. @internal */
export const CYCLE_SLOTS = 7;

/**
 * Options of {@link MultilevelPreconditioner}.
 *
 * @example
 * ```ts
 * import { rectangleDomain, MultilevelPreconditioner } from 'chronomesh';
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const pre = new MultilevelPreconditioner(dom.leafMesh(dom.uniformSet(3)), { cycles: 2, smoothingSteps: 1 });
 * ```
 */
export interface MultilevelOptions {
  /** Number of V-cycles per application (default 1); more cycles give a closer approximation. */
  cycles?: number;
  /** Smoothing sweeps before and after each coarse correction (default 1). */
  smoothingSteps?: number;
  /**
   * Smoother: `'auto'` (default) uses damped Jacobi on the levels where the mass term dominates
   * (α·Σ diag M ≥ 0.1·Σ diag A over the level's smoothing set) and symmetric Gauss–Seidel on the
   * others; `'gauss-seidel'` and `'jacobi'` force one kind on every level.
   */
  smoother?: 'auto' | 'gauss-seidel' | 'jacobi';
  /** Damping ω of the Jacobi smoother, in (0, 1] (default 0.6). */
  damping?: number;
}

const MULTILEVEL_KEYS: Record<keyof Required<MultilevelOptions>, true> = { cycles: true, smoothingSteps: true, smoother: true, damping: true };

function checkCount(name: string, v: number | undefined, dflt: number): number {
  if (v === undefined) return dflt;
  if (!Number.isInteger(v) || v < 1 || v > 64) {
    throw new InvalidArgumentError(`${name} must be an integer in [1, 64]`, { field: name, expected: 'an integer in [1, 64]', received: v });
  }
  return v;
}

/**
 * Multilevel preconditioner for A + αM on the leaf mesh of a closed vertex set
 * (A: stiffness with κ plus the reaction c·mass, M: mass): a local
 * multiplicative V-cycle over the vertex generations with Gauss–Seidel smoothing
 * (forward before, backward after the coarse correction) and an exact coarse
 * solve. Symmetric positive definite for every α ≥ 0; setup and application
 * cost are linear in the number of vertices; α may change from one call to the
 * next without new setup (the coarse factor of each new α is computed once and
 * cached, so only the first call with a given α allocates).
 *
 * @example
 * ```ts
 * import { rectangleDomain, MultilevelPreconditioner } from 'chronomesh';
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const mesh = dom.leafMesh(dom.uniformSet(3));
 * const pre = new MultilevelPreconditioner(mesh);
 * const r = new Float64Array(mesh.vertexCount).fill(1);
 * const z = new Float64Array(mesh.vertexCount);
 * pre.applyNodal(r, z, 16); // z ≈ (A + 16 M)⁻¹ r
 * ```
 */
export class MultilevelPreconditioner {
  /** Number of generations of the mesh (levels of the cycle, including the initial mesh). */
  readonly levels: number;
  /** Number of local vertices (length of the vectors passed to the apply methods). */
  readonly vertexCount: number;
  readonly cycles: number;
  readonly smoothingSteps: number;

  private readonly mesh: LeafMesh;
  private readonly h: LevelHierarchy;
  private readonly coarse: CoarseSolver;
  private readonly fine: PairedCsr | null;
  // Work vectors (res, hbuf, rcopy, corr: one entry per vertex; rho, epre, jtmp: one per smoothing
  // set entry), own or shared with other preconditioners (see useScratch).
  private scratch = new WorkVectors();
  private readonly setEntries: number;
  private readonly smoother: 'auto' | 'gauss-seidel' | 'jacobi';
  private readonly levelA: Float64Array;
  private readonly levelM: Float64Array;
  private readonly omega: number;
  private readonly pairSums: Float64Array;

  constructor(mesh: LeafMesh, opts: MultilevelOptions = {}) {
    checkOptions<MultilevelOptions>(opts, 'opts', MULTILEVEL_KEYS);
    opts ??= {};
    this.cycles = checkCount('opts.cycles', opts.cycles, 1);
    this.smoothingSteps = checkCount('opts.smoothingSteps', opts.smoothingSteps, 1);
    validateLeafMesh(mesh);
    this.mesh = mesh;
    const n = mesh.vertexCount;
    this.vertexCount = n;
    const capacity = rowCapacity(mesh);
    const rows = assemblePair(mesh, snapshotReserve(capacity), capacity);
    this.fine = this.cycles > 1 ? copyPairedRows(rows) : null;
    this.h = buildHierarchy(mesh, rows);
    this.levels = this.h.levels;
    this.coarse = new CoarseSolver(this.h);
    this.setEntries = this.h.setVerts.length;
    this.smoother = opts.smoother ?? 'auto';
    if (this.smoother !== 'auto' && this.smoother !== 'gauss-seidel' && this.smoother !== 'jacobi') {
      throw new InvalidArgumentError("opts.smoother must be 'auto', 'gauss-seidel' or 'jacobi'", { field: 'opts.smoother', expected: "'auto' | 'gauss-seidel' | 'jacobi'", received: opts.smoother });
    }
    if (opts.damping !== undefined && !(opts.damping > 0 && opts.damping <= 1)) {
      throw new InvalidArgumentError('opts.damping must be a number in (0, 1]', { field: 'opts.damping', expected: 'a number in (0, 1]', received: opts.damping });
    }
    this.levelA = new Float64Array(this.h.levels);
    this.levelM = new Float64Array(this.h.levels);
    for (let g = 1; g < this.h.levels; g++) {
      for (let k = this.h.setBegin[g]!; k < this.h.setEnd[g]!; k++) {
        this.levelA[g] = this.levelA[g]! + this.h.rowDiag[2 * k]!;
        this.levelM[g] = this.levelM[g]! + this.h.rowDiag[2 * k + 1]!;
      }
    }
    this.omega = opts.damping ?? 0.6;
    this.pairSums = new Float64Array(this.h.pairValues.length / 2);
  }

  /**
   * Diagonals of the stiffness A (with reaction) and mass M in hierarchical
   * coordinates, per local vertex (0 on Dirichlet vertices). The hierarchical
   * hat of a generation-g vertex is its nodal hat on mesh_g, so its diagonal
   * entry is the one of the Galerkin matrix A_g saved for the smoother of level g.
   */
  hierarchicalDiagonals(): { A: Float64Array; M: Float64Array } {
    const h = this.h;
    const gen = this.mesh.generation;
    const A = new Float64Array(this.vertexCount);
    const M = new Float64Array(this.vertexCount);
    for (let g = 1; g < h.levels; g++) {
      for (let k = h.setBegin[g]!; k < h.setEnd[g]!; k++) {
        const v = h.setVerts[k]!;
        if (gen[v] !== g) continue;
        A[v] = h.rowDiag[2 * k]!;
        M[v] = h.rowDiag[2 * k + 1]!;
      }
    }
    for (let i = 0; i < h.coarseVerts.length; i++) {
      const v = h.coarseVerts[i]!;
      A[v] = h.coarseDiag[2 * i]!;
      M[v] = h.coarseDiag[2 * i + 1]!;
    }
    return { A, M };
  }

  private checkArgs(r: Float64Array, z: Float64Array, alpha: number): void {
    const n = this.vertexCount;
    if (!(r instanceof Float64Array) || r.length !== n) {
      throw new InvalidArgumentError(`r must be a Float64Array of length ${n}`, { field: 'r', expected: `Float64Array(length ${n})`, received: r?.length });
    }
    if (!(z instanceof Float64Array) || z.length !== n) {
      throw new InvalidArgumentError(`z must be a Float64Array of length ${n}`, { field: 'z', expected: `Float64Array(length ${n})`, received: z?.length });
    }
    if (!(alpha >= 0) || !Number.isFinite(alpha)) {
      throw new InvalidArgumentError('alpha must be a finite number ≥ 0', { field: 'alpha', expected: 'a finite number ≥ 0', received: alpha });
    }
    let s = 0;
    for (let i = 0; i < n; i++) s += r[i]!;
    if (!Number.isFinite(s)) {
      for (let i = 0; i < n; i++) {
        if (!Number.isFinite(r[i]!)) {
          throw new InvalidArgumentError(`r[${i}] is not finite`, { field: `r[${i}]`, expected: 'a finite number', received: r[i] });
        }
      }
    }
  }

  /**
   * z ≈ (A + αM)⁻¹ r in nodal coordinates: r holds the nodal residual (entries
   * ⟨ℓ, φ_v⟩ for the nodal hats φ_v of the leaf mesh), z the nodal values.
   * Dirichlet entries of r are ignored and those of z set to 0. `r` and `z` may
   * be the same array.
   */
  applyNodal(r: Float64Array, z: Float64Array, alpha: number): void {
    this.checkArgs(r, z, alpha);
    this.cyclesNodal(r, z, alpha);
  }

  /**
   * Shares the work vectors with other preconditioners that are never applied at the same time
   * (the fibre inverses of one cache). @internal
   */
  useScratch(scratch: WorkVectors): this {
    this.scratch = scratch;
    return this;
  }

  /** applyNodal without the argument checks. */
  private cyclesNodal(r: Float64Array, z: Float64Array, alpha: number): void {
    if (this.cycles === 1) {
      this.vcycle(r, z, alpha);
      return;
    }
    const n = this.vertexCount;
    const rc = this.scratch.get(RCOPY, n);
    const corr = this.scratch.get(CORR, n);
    const hbuf = this.scratch.get(HBUF, n);
    if (rc !== r) for (let i = 0; i < n; i++) rc[i] = r[i]!;
    this.vcycle(rc, z, alpha);
    for (let c = 1; c < this.cycles; c++) {
      this.fineResidual(rc, z, alpha, hbuf);
      this.vcycle(hbuf, corr, alpha);
      for (let i = 0; i < n; i++) z[i] = z[i]! + corr[i]!;
    }
  }

  /**
   * The same operator in hierarchical coordinates (docs/method.md §4.2–4.3): with
   * A_h = Tᵀ A T, (A_h + αM_h)⁻¹ = T⁻¹ (A + αM)⁻¹ T⁻ᵀ, so z = T⁻¹ V T⁻ᵀ r for a
   * residual r in the hierarchical basis and hierarchical coefficients z.
   */
  applyHierarchical(r: Float64Array, z: Float64Array, alpha: number): void {
    this.checkArgs(r, z, alpha);
    const n = this.vertexCount;
    const w = this.scratch.get(this.cycles === 1 ? HBUF : RCOPY, n);
    for (let i = 0; i < n; i++) w[i] = r[i]!;
    nodalToHierarchicalTransposed(this.mesh, w);
    this.cyclesNodal(w, z, alpha);
    nodalToHierarchical(this.mesh, z);
  }

  /** out = r − (A + αM) z on the free vertices (fine matrix; only for cycles > 1). */
  private fineResidual(r: Float64Array, z: Float64Array, alpha: number, out: Float64Array): void {
    const f = this.fine!;
    const free = this.mesh.isFree;
    const ptr = f.ptr;
    const cols = f.cols;
    const vals = f.vals;
    const diag = f.diag;
    for (let i = 0; i < this.vertexCount; i++) {
      if (!free[i]) { out[i] = 0; continue; }
      let s = r[i]! - (diag[2 * i]! + alpha * diag[2 * i + 1]!) * z[i]!;
      for (let t = ptr[i]!; t < ptr[i + 1]!; t++) s -= (vals[2 * t]! + alpha * vals[2 * t + 1]!) * z[cols[t]!]!;
      out[i] = s;
    }
  }

  /**
   * Whether level g is smoothed by damped Jacobi (on the widened set) rather than Gauss–Seidel.
   *
   * Why: inside K_X the cycle is used as (A + αM)⁻¹ A (A + αM)⁻¹, which needs the cycle's error
   * I − V(A + αM) to be bounded in the A-norm, not only in the (A + αM)-norm. When αM dominates,
   * Gauss–Seidel in the set order (new vertices, then parents: a two-colouring) turns a smooth
   * error into an odd/even oscillation, small in the mass norm but large in the A-norm (measured:
   * cond(V A V · (A + α² M A⁻¹ M)) ≈ 3e4 at α = 1e8 on a uniform 1D mesh of 127 vertices).
   * Jacobi is a polynomial in D⁻¹(A + αM), and D⁻¹M maps a smooth function to a multiple of
   * itself up to O(h∇u) (row sum / diagonal of the P1 mass matrix is 3/2 in 1D and 2 in 2D), so
   * smooth errors stay smooth; smoothing all neighbours of the new vertices avoids the kinks that
   * a partly smoothed patch would leave. With it that condition number is ≈ 4 in 1D and 2D.
   * Gauss–Seidel stays where the stiffness dominates (it smooths A better than Jacobi).
   */
  private useJacobi(g: number, alpha: number): boolean {
    if (this.smoother === 'auto') return alpha * this.levelM[g]! >= 0.1 * this.levelA[g]!;
    return this.smoother === 'jacobi';
  }

  /** One V-cycle: y = V r. `r` is read once at the start; y is fully overwritten. */
  private vcycle(r: Float64Array, y: Float64Array, alpha: number): void {
    const h = this.h;
    const mesh = this.mesh;
    const free = mesh.isFree;
    const pa = mesh.parentA;
    const pb = mesh.parentB;
    const levelStart = h.levelStart;
    const setBegin = h.setBegin;
    const setEnd = h.setEnd;
    const narrowEnd = h.narrowEnd;
    const verts = h.setVerts;
    const rowStart = h.rowStart;
    const rowEnd = h.rowEnd;
    const cols = h.rowCols;
    const pair = h.rowPair;
    const diag = h.rowDiag;
    // A + αM of every distinct off-diagonal pair, computed as the rows would compute it.
    const pv = h.pairValues;
    const vals = this.pairSums;
    for (let p = 0; p < vals.length; p++) vals[p] = pv[2 * p]! + alpha * pv[2 * p + 1]!;
    const n = this.vertexCount;
    const res = this.scratch.get(RES, n);
    const rho = this.scratch.get(RHO, this.setEntries);
    const epre = this.scratch.get(EPRE, this.setEntries);
    const jt = this.scratch.get(JTMP, this.setEntries);
    const nu = this.smoothingSteps;
    const G = h.levels - 1;
    for (let i = 0; i < n; i++) res[i] = r[i]!;

    for (let g = G; g >= 1; g--) {
      const k0 = setBegin[g]!;
      const k1 = setEnd[g]!;
      for (let k = k0; k < k1; k++) epre[k] = 0;
      const jac = this.useJacobi(g, alpha);
      if (jac) {
        const om = this.omega;
        for (let sweep = 0; sweep < nu; sweep++) {
          for (let k = k0; k < k1; k++) jt[k] = (om * res[verts[k]!]!) / (diag[2 * k]! + alpha * diag[2 * k + 1]!);
          for (let k = k0; k < k1; k++) {
            const v = verts[k]!;
            const delta = jt[k]!;
            epre[k] = epre[k]! + delta;
            res[v] = res[v]! - (diag[2 * k]! + alpha * diag[2 * k + 1]!) * delta;
            for (let t = rowStart[k]!; t < rowEnd[k]!; t++) {
              const j = cols[t]!;
              res[j] = res[j]! - vals[pair[t]!]! * delta;
            }
          }
        }
      } else {
        const kn = narrowEnd[g]!;
        for (let sweep = 0; sweep < nu; sweep++) {
          for (let k = k0; k < kn; k++) {
            const v = verts[k]!;
            const d = diag[2 * k]! + alpha * diag[2 * k + 1]!;
            const delta = res[v]! / d;
            epre[k] = epre[k]! + delta;
            res[v] = 0;
            for (let t = rowStart[k]!; t < rowEnd[k]!; t++) {
              const j = cols[t]!;
              res[j] = res[j]! - vals[pair[t]!]! * delta;
            }
          }
        }
      }
      for (let k = k0; k < k1; k++) rho[k] = res[verts[k]!]!;
      for (let m = levelStart[g]!; m < levelStart[g + 1]!; m++) {
        if (!free[m]) continue;
        const half = 0.5 * res[m]!;
        const a = pa[m]!;
        const b = pb[m]!;
        if (free[a]) res[a] = res[a]! + half;
        if (free[b]) res[b] = res[b]! + half;
      }
    }

    const n0 = levelStart[1]!;
    for (let v = 0; v < n0; v++) y[v] = 0;
    this.coarse.solve(alpha, res, y);

    for (let g = 1; g <= G; g++) {
      for (let m = levelStart[g]!; m < levelStart[g + 1]!; m++) {
        y[m] = free[m] ? 0.5 * (y[pa[m]!]! + y[pb[m]!]!) : 0;
      }
      // Backward Gauss–Seidel in gather form on y' = y − e_pre: the current residual at v is
      // r_g[v] − (A_g y)_v = ρ_g[v] − (A_g y')_v, since ρ_g = r_g − A_g e_pre.
      const k0 = setBegin[g]!;
      const k1 = setEnd[g]!;
      const jac = this.useJacobi(g, alpha);
      if (jac) {
        const om = this.omega;
        for (let sweep = 0; sweep < nu; sweep++) {
          for (let k = k0; k < k1; k++) {
            const v = verts[k]!;
            const d = diag[2 * k]! + alpha * diag[2 * k + 1]!;
            let s = rho[k]! - d * y[v]!;
            for (let t = rowStart[k]!; t < rowEnd[k]!; t++) s -= vals[pair[t]!]! * y[cols[t]!]!;
            jt[k] = (om * s) / d;
          }
          for (let k = k0; k < k1; k++) y[verts[k]!] = y[verts[k]!]! + jt[k]!;
        }
      } else {
        const kn = narrowEnd[g]!;
        for (let sweep = 0; sweep < nu; sweep++) {
          for (let k = kn - 1; k >= k0; k--) {
            const v = verts[k]!;
            const d = diag[2 * k]! + alpha * diag[2 * k + 1]!;
            let s = rho[k]! - d * y[v]!;
            for (let t = rowStart[k]!; t < rowEnd[k]!; t++) s -= vals[pair[t]!]! * y[cols[t]!]!;
            y[v] = y[v]! + s / d;
          }
        }
      }
      for (let k = k0; k < k1; k++) {
        const v = verts[k]!;
        y[v] = y[v]! + epre[k]!;
      }
    }
  }
}
