/**
 * Exact solve with A_0 + αM_0 on the free initial vertices. The ordering and
 * envelope are computed once; the factor depends on α and is computed the first
 * time an α is used and kept in a small cache (the temporal preconditioner uses
 * a few α values per temporal level, docs/method.md §6).
 */
import type { LevelHierarchy } from './galerkin-hierarchy';
import { envelopeFactor, envelopeSolveInPlace, envelopeStructure, type EnvelopeStructure } from './envelope-cholesky';

/** Upper bound on the number of factor entries kept in the cache (all α together). */
const CACHE_ENTRIES = 1 << 23;
const MAX_FACTORS = 256;

export class CoarseSolver {
  private readonly h: LevelHierarchy;
  private readonly st: EnvelopeStructure;
  private readonly work: Float64Array;
  private readonly factors = new Map<number, Float64Array>();
  private readonly maxFactors: number;

  constructor(h: LevelHierarchy) {
    this.h = h;
    const n = h.coarseVerts.length;
    this.st = envelopeStructure(n, h.coarsePtr, h.coarseCols);
    this.work = new Float64Array(n);
    this.maxFactors = Math.max(4, Math.min(MAX_FACTORS, Math.floor(CACHE_ENTRIES / Math.max(1, this.st.size))));
  }

  /** Number of nonzeros stored in one factor. */
  get factorSize(): number {
    return this.st.size;
  }

  private factorFor(alpha: number): Float64Array {
    let L = this.factors.get(alpha);
    if (L === undefined) {
      const h = this.h;
      L = envelopeFactor(this.st, h.coarsePtr, h.coarseCols, h.coarseVals, h.coarseDiag, alpha);
      if (this.factors.size >= this.maxFactors) {
        const oldest = this.factors.keys().next().value as number;
        this.factors.delete(oldest);
      }
      this.factors.set(alpha, L);
    }
    return L;
  }

  /** y[v] = ((A_0 + αM_0)⁻¹ r)[v] for the free initial vertices v (local indices); other entries untouched. */
  solve(alpha: number, r: Float64Array, y: Float64Array): void {
    const n = this.st.n;
    if (n === 0) return;
    const L = this.factorFor(alpha);
    const perm = this.st.perm;
    const verts = this.h.coarseVerts;
    const x = this.work;
    for (let i = 0; i < n; i++) x[i] = r[verts[perm[i]!]!]!;
    envelopeSolveInPlace(this.st, L, x);
    for (let i = 0; i < n; i++) y[verts[perm[i]!]!] = x[i]!;
  }
}
