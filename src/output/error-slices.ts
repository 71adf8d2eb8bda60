/**
 * Nodal values of a discrete space-time solution at the temporal breakpoints,
 * built once for error integration.
 *
 * u_δ(t, ·) = Σ_λ σ_λ(t) f_λ is piecewise linear in t between consecutive
 * breakpoints of the trial functions present (docs/method.md §3.1), and every
 * f_λ lives on a sub-mesh of one leaf mesh: fibres shrink along the temporal
 * tree (a double tree is closed under temporal parents, §5.1), so the union of
 * all fibres is the finest mesh met at any time. The plan keeps that one leaf
 * mesh, a map from every coefficient to its local vertex, and for every
 * breakpoint the list of temporal nodes whose support contains it. The nodal
 * vector at breakpoint k then costs Σ_{λ active at k} #fibre(λ) plus one
 * hierarchical → nodal sweep, and slices between two breakpoints are linear
 * interpolations of their end vectors (no mesh is rebuilt, no per-slice scan).
 */
import { evaluateTemporal } from '../time/index';
import { supportOf } from '../time/nodes';
import type { SpatialDomain } from '../space/index';
import type { LeafMesh } from '../space/leaf-mesh';
import { hierarchicalToNodal } from '../space/hierarchical';
import { liftingOf } from '../space/boundary-lifting';
import type { SpaceTimeSolution } from '../spacetime/space-time-solution';

export class BreakpointSlices {
  /** Leaf mesh of the union of all fibres. */
  readonly mesh: LeafMesh;
  /** Sorted distinct breakpoints on the reference interval [0, 1] (0 and 1 included, plus `extra`). */
  readonly breaks: Float64Array;
  /** CSR lists: temporal nodes whose closed support contains breakpoint k. */
  private readonly activeStart: Int32Array;
  private readonly activeNode: Int32Array;
  /** Local mesh vertex of every coefficient (aligned with the solution's coefficient vector). */
  readonly localOf: Int32Array;
  private readonly solution: SpaceTimeSolution;

  constructor(solution: SpaceTimeSolution, extra: ArrayLike<number> = []) {
    this.solution = solution;
    const set = solution.trialSet;
    const tree = set.tree;
    const n = tree.size;
    const sup = new Float64Array(2);

    // Breakpoints: every level-l grid point in the support of every node (exact dyadic numbers).
    let count = 2 + extra.length;
    for (let i = 0; i < n; i++) {
      supportOf('trial', tree.level[i]!, tree.index[i]!, sup);
      count += sup[1]! - sup[0]! + 1;
    }
    const all = new Float64Array(count);
    let c = 0;
    all[c++] = 0;
    all[c++] = 1;
    for (let q = 0; q < extra.length; q++) all[c++] = extra[q]!;
    const lo = new Float64Array(n);
    const hi = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const l = tree.level[i]!;
      supportOf('trial', l, tree.index[i]!, sup);
      const h = 2 ** -l;
      lo[i] = sup[0]! * h;
      hi[i] = sup[1]! * h;
      for (let j = sup[0]!; j <= sup[1]!; j++) all[c++] = j * h;
    }
    all.sort();
    let nb = 0;
    for (let i = 0; i < all.length; i++) if (nb === 0 || all[i]! !== all[nb - 1]!) all[nb++] = all[i]!;
    this.breaks = all.slice(0, nb);
    const br = this.breaks;

    // Active lists by a difference count over breakpoint ranges.
    const k0 = new Int32Array(n);
    const k1 = new Int32Array(n);
    const start = new Int32Array(nb + 1);
    for (let i = 0; i < n; i++) {
      k0[i] = lowerBound(br, lo[i]!);
      k1[i] = lowerBound(br, hi[i]!);
      for (let k = k0[i]!; k <= k1[i]!; k++) start[k + 1]!++;
    }
    for (let k = 0; k < nb; k++) start[k + 1] = start[k + 1]! + start[k]!;
    const fill = start.slice(0, nb);
    const node = new Int32Array(start[nb]!);
    for (let i = 0; i < n; i++) for (let k = k0[i]!; k <= k1[i]!; k++) node[fill[k]!++] = i;
    this.activeStart = start;
    this.activeNode = node;

    // One leaf mesh for the union of all fibres (distinct fibres only, then sort + dedupe).
    const domain: SpatialDomain = solution.domain;
    const seen = new Uint8Array(set.pool.fibres.length);
    let total = 0;
    for (let i = 0; i < n; i++) {
      const id = set.nodeFibre[i]!;
      if (!seen[id]) { seen[id] = 1; total += set.fibre(i).length; }
    }
    const cat = new Int32Array(total);
    seen.fill(0);
    c = 0;
    for (let i = 0; i < n; i++) {
      const id = set.nodeFibre[i]!;
      if (!seen[id]) { seen[id] = 1; cat.set(set.fibre(i), c); c += set.fibre(i).length; }
    }
    cat.sort();
    let nu = 0;
    for (let i = 0; i < cat.length; i++) if (nu === 0 || cat[i]! !== cat[nu - 1]!) cat[nu++] = cat[i]!;
    this.mesh = domain.leafMesh(cat.subarray(0, nu));
    const local = domain.beginMeshQuery(this.mesh);
    this.localOf = new Int32Array(set.size);
    for (let i = 0; i < n; i++) {
      const f = set.fibre(i);
      const o = set.functionOffset[i]!;
      for (let p = 0; p < f.length; p++) this.localOf[o + p] = local[f[p]!]!;
    }
    domain.endMeshQuery(this.mesh);
  }

  /** Number of breakpoints. */
  get count(): number {
    return this.breaks.length;
  }

  /** Nodal values of u_δ(breaks[k]·T, ·) on {@link BreakpointSlices.mesh} into `out` (length vertexCount). */
  nodalAt(k: number, out: Float64Array): void {
    out.fill(0);
    const sol = this.solution;
    const set = sol.trialSet;
    const tree = set.tree;
    const coef = sol.coefficients;
    const loc = this.localOf;
    const T = sol.T;
    const t = Math.min(this.breaks[k]! * T, T);
    for (let a = this.activeStart[k]!; a < this.activeStart[k + 1]!; a++) {
      const i = this.activeNode[a]!;
      const w = evaluateTemporal('trial', tree.level[i]!, tree.index[i]!, 0, t, T).value;
      if (w === 0) continue;
      const o0 = set.functionOffset[i]!;
      const o1 = set.functionOffset[i + 1]!;
      for (let p = o0; p < o1; p++) out[loc[p]!] += w * coef[p]!;
    }
    hierarchicalToNodal(this.mesh, out);
    // held boundary values: u = w + G (src/space/boundary-lifting.ts); G is linearly interpolated
    // between breakpoints like u_δ (exact when g is affine in t between them)
    liftingOf(this.solution.domain.forest).addNodal(this.mesh, t, out);
  }
}

/** First index with a[i] ≥ x (a sorted). @internal */
export function lowerBound(a: Float64Array, x: number): number {
  let l = 0;
  let r = a.length;
  while (l < r) {
    const m = (l + r) >> 1;
    if (a[m]! < x) l = m + 1;
    else r = m;
  }
  return l;
}

/** Supports [lo[i], hi[i]] (as fractions of T) of every trial wavelet of `tree`. @internal */
export function trialSupports(tree: { size: number; level: ArrayLike<number>; index: ArrayLike<number> }): { lo: Float64Array; hi: Float64Array } {
  const lo = new Float64Array(tree.size);
  const hi = new Float64Array(tree.size);
  const sup = new Float64Array(2);
  for (let i = 0; i < tree.size; i++) {
    const l = tree.level[i]!;
    supportOf('trial', l, tree.index[i]!, sup);
    lo[i] = sup[0]! * 2 ** -l;
    hi[i] = sup[1]! * 2 ** -l;
  }
  return { lo, hi };
}
