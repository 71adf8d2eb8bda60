/**
 * ∫_P ‖∇u_δ‖² dt, ∫_P ‖u_δ‖² dt and ∫_P a(u_δ, u_δ) dt (the energy of ./energy-weights) over a
 * dyadic time cell P, in time linear in the number of coefficients that touch P (no sweep over
 * every breakpoint × element).
 *
 * On a dyadic cell Q of level m every trial wavelet of level ≤ m is linear in t
 * (its kinks lie on its level's grid, docs/method.md §3.1). Split the wavelets
 * overlapping Q into that linear part c_Q(t) = (1 − θ) C_a + θ C_b and the finer
 * rest f_Q; then
 *
 *   ∫_Q ‖∇(c_Q + f_Q)‖² = |Q|/3 (a(C_a, C_a) + a(C_a, C_b) + a(C_b, C_b))
 *                        + 2 Σ_{λ ∈ f_Q} [a(C_a, f_λ) ∫_Q σ_λ(1 − θ) + a(C_b, f_λ) ∫_Q σ_λ θ]
 *                        + Σ_{children Q'} ∫_{Q'} ‖∇f_Q‖²,
 *
 * and on each child the wavelets of level m + 1 are the new linear part. a(C, f_λ) for all λ
 * at once: r = Tᵀ A C (nodal stiffness on the mesh of Q, then the transposed hierarchical
 * transform), a(C, f_λ) = Σ_ν c_{λν} r_ν. Same for the mass form and the energy. The mesh of Q is the leaf
 * mesh of the union of the fibres overlapping Q; fibres shrink along the temporal tree, so
 * these meshes shrink with the cells and the total work is about Σ_λ #fibre(λ) × (levels
 * below |λ| the cell recursion passes through).
 */
import { evaluateTemporal } from '../time/index';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from '../space/hierarchical';
import type { LeafMesh } from '../space/leaf-mesh';
import type { SpaceTimeSolution } from '../spacetime/space-time-solution';
import { intervalQuadratic } from './error-panels';
import { trialSupports } from './error-slices';
import { energyWeights } from './energy-weights';

const G2 = [0.5 - Math.sqrt(3) / 6, 0.5 + Math.sqrt(3) / 6];

export class CellEnergy {
  private readonly lo: Float64Array;
  private readonly hi: Float64Array;
  private readonly quad = new Float64Array(3);
  private readonly meshes = new Map<string, { union: Int32Array; mesh: LeafMesh & { readonly memberLocal: Int32Array }; weights: Float64Array }>();
  /** Results of the last {@link CellEnergy.energy}. */
  g = 0;
  v = 0;
  k = 0;

  constructor(private readonly solution: SpaceTimeSolution) {
    ({ lo: this.lo, hi: this.hi } = trialSupports(solution.trialSet.tree));
  }

  /** ∫ over the dyadic cell [c·2^-m, (c+1)·2^-m]·T of ‖∇u_δ‖², ‖u_δ‖² and a(u_δ, u_δ) (held boundary values excluded) into g, v, k. */
  energy(m: number, c: number): void {
    const tree = this.solution.trialSet.tree;
    const a = c * 2 ** -m;
    const b = (c + 1) * 2 ** -m;
    const nodes: number[] = [];
    for (let i = 0; i < tree.size; i++) if (this.lo[i]! < b && this.hi[i]! > a) nodes.push(i);
    this.g = 0;
    this.v = 0;
    this.k = 0;
    this.cell(m, c, Int32Array.from(nodes));
  }

  private sigma(i: number, t: number): number {
    const tree = this.solution.trialSet.tree;
    const T = this.solution.T;
    return evaluateTemporal('trial', tree.level[i]!, tree.index[i]!, 0, Math.min(t * T, T), T).value;
  }

  /** `nodes`: the wavelets overlapping the cell whose level is ≥ m, or any level on the top cell. */
  private cell(m: number, c: number, nodes: Int32Array): void {
    if (nodes.length === 0) return;
    const sol = this.solution;
    const set = sol.trialSet;
    const tree = set.tree;
    const coef = sol.coefficients;
    const T = sol.T;
    const h = 2 ** -m;
    const a = c * h;
    const b = a + h;
    const { union, mesh, weights } = this.meshOf(nodes);
    const nv = mesh.vertexCount;
    const member = mesh.memberLocal;
    const Ca = new Float64Array(nv);
    const Cb = new Float64Array(nv);
    let fine = 0;
    for (const i of nodes) {
      if (tree.level[i]! > m) { fine++; continue; }
      const sa = this.sigma(i, a);
      const sb = this.sigma(i, b);
      this.scatter(i, union, member, sa, Ca, sb, Cb, coef);
    }
    hierarchicalToNodal(mesh, Ca);
    hierarchicalToNodal(mesh, Cb);
    intervalQuadratic(mesh, Ca, Cb, h * T, this.quad, weights);
    this.g += this.quad[0]!;
    this.v += this.quad[1]!;
    this.k += this.quad[2]!;
    if (fine === 0) return;
    // dual vectors r = Tᵀ A C, Tᵀ M C, Tᵀ K C (K: the energy form)
    const rAa = new Float64Array(nv), rAb = new Float64Array(nv), rMa = new Float64Array(nv), rMb = new Float64Array(nv);
    const rKa = new Float64Array(nv), rKb = new Float64Array(nv);
    applyP1(mesh, Ca, rAa, rMa, rKa, weights);
    applyP1(mesh, Cb, rAb, rMb, rKb, weights);
    for (const r of [rAa, rAb, rMa, rMb, rKa, rKb]) hierarchicalToNodalTransposed(mesh, r);
    const left: number[] = [];
    const right: number[] = [];
    const mid = a + 0.5 * h;
    for (const i of nodes) {
      const l = tree.level[i]!;
      if (l <= m) continue;
      // ∫_Q σ (1 − θ) dt and ∫_Q σ θ dt: σ linear on the level-l cells, 2-point Gauss per piece
      const lo = Math.max(a, this.lo[i]!);
      const hi = Math.min(b, this.hi[i]!);
      const hl = 2 ** -l;
      let al = 0;
      let be = 0;
      for (let k = Math.floor(lo / hl); k * hl < hi; k++) {
        const p0 = Math.max(lo, k * hl);
        const p1 = Math.min(hi, (k + 1) * hl);
        if (!(p1 > p0)) continue;
        const s0 = this.sigma(i, p0);
        const s1 = this.sigma(i, p1);
        for (const x of G2) {
          const t = p0 + (p1 - p0) * x;
          const s = (1 - x) * s0 + x * s1;
          const th = (t - a) / h;
          al += 0.5 * (p1 - p0) * s * (1 - th);
          be += 0.5 * (p1 - p0) * s * th;
        }
      }
      al *= T;
      be *= T;
      const f = set.fibre(i);
      const o = set.functionOffset[i]!;
      let dA = 0;
      let dM = 0;
      let dK = 0;
      let q = 0;
      for (let r = 0; r < f.length; r++) {
        while (union[q]! !== f[r]!) q++;
        const loc = member[q]!;
        const cv = coef[o + r]!;
        dA += cv * (al * rAa[loc]! + be * rAb[loc]!);
        dM += cv * (al * rMa[loc]! + be * rMb[loc]!);
        dK += cv * (al * rKa[loc]! + be * rKb[loc]!);
      }
      this.g += 2 * dA;
      this.v += 2 * dM;
      this.k += 2 * dK;
      if (this.lo[i]! < mid) left.push(i);
      if (this.hi[i]! > mid) right.push(i);
    }
    this.cell(m + 1, 2 * c, Int32Array.from(left));
    this.cell(m + 1, 2 * c + 1, Int32Array.from(right));
  }

  /**
   * Leaf mesh of the union of the fibres of `nodes`, cached by the set of distinct fibre ids
   * (neighbouring cells of one level usually share it; on sparse grids all cells of a level do).
   */
  private meshOf(nodes: Int32Array): { union: Int32Array; mesh: LeafMesh & { readonly memberLocal: Int32Array }; weights: Float64Array } {
    const set = this.solution.trialSet;
    const idList: number[] = [];
    for (const i of nodes) idList.push(set.nodeFibre[i]!);
    idList.sort((x, y) => x - y);
    let n = 0;
    for (let q = 0; q < idList.length; q++) if (n === 0 || idList[q] !== idList[n - 1]) idList[n++] = idList[q]!;
    idList.length = n;
    const key = idList.join(',');
    const hit = this.meshes.get(key);
    if (hit) return hit;
    let total = 0;
    for (const id of idList) total += set.pool.get(id).length;
    const cat = new Int32Array(total);
    let p = 0;
    for (const id of idList) { const f = set.pool.get(id); cat.set(f, p); p += f.length; }
    cat.sort();
    let nu = 0;
    for (let q = 0; q < cat.length; q++) if (nu === 0 || cat[q]! !== cat[nu - 1]!) cat[nu++] = cat[q]!;
    const union = cat.slice(0, nu);
    const mesh = this.solution.domain.leafMesh(union);
    const entry = { union, mesh, weights: energyWeights(mesh) };
    if (this.meshes.size >= 64) this.meshes.clear();
    this.meshes.set(key, entry);
    return entry;
  }

  /** A[loc(ν)] += sa·c_ν and B[loc(ν)] += sb·c_ν over the fibre of node i (hierarchical). */
  private scatter(i: number, union: Int32Array, member: Int32Array, sa: number, A: Float64Array, sb: number, B: Float64Array, coef: Float64Array): void {
    const set = this.solution.trialSet;
    const f = set.fibre(i);
    const o = set.functionOffset[i]!;
    let q = 0;
    for (let r = 0; r < f.length; r++) {
      while (union[q]! !== f[r]!) q++;
      const loc = member[q]!;
      A[loc] += sa * coef[o + r]!;
      B[loc] += sb * coef[o + r]!;
    }
  }
}

/**
 * Nodal P1 stiffness (plain gradient, no κ), mass and energy form applied to u on `mesh`:
 * outA += A u, outM += M u, outK += (A_K + c M) u with A_K the stiffness of each element's K
 * (element forms as in ./error-panels intervalQuadratic; weights from ./energy-weights).
 */
function applyP1(mesh: LeafMesh, u: Float64Array, outA: Float64Array, outM: Float64Array, outK: Float64Array, w: Float64Array): void {
  const { elements, coords, elementCount: ne, elementMaterial: mat } = mesh;
  if (mesh.dim === 1) {
    for (let e = 0; e < ne; e++) {
      const i0 = elements[2 * e]!, i1 = elements[2 * e + 1]!;
      const len = Math.abs(coords[i1]! - coords[i0]!);
      const du = (u[i1]! - u[i0]!) / len;
      outA[i0] -= du;
      outA[i1] += du;
      const s = u[i0]! + u[i1]!;
      const m0 = (len / 6) * (u[i0]! + s), m1 = (len / 6) * (u[i1]! + s);
      outM[i0] += m0;
      outM[i1] += m1;
      const o = 4 * mat[e]!;
      outK[i0] += -w[o]! * du + w[o + 3]! * m0;
      outK[i1] += w[o]! * du + w[o + 3]! * m1;
    }
    return;
  }
  for (let e = 0; e < ne; e++) {
    const i0 = elements[3 * e]!, i1 = elements[3 * e + 1]!, i2 = elements[3 * e + 2]!;
    const x0 = coords[2 * i0]!, y0 = coords[2 * i0 + 1]!;
    const x1 = coords[2 * i1]!, y1 = coords[2 * i1 + 1]!;
    const x2 = coords[2 * i2]!, y2 = coords[2 * i2 + 1]!;
    const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    const area = 0.5 * Math.abs(det);
    // ∇λ_k = (y_{k+1} − y_{k+2}, x_{k+2} − x_{k+1}) / det
    const g0x = (y1 - y2) / det, g0y = (x2 - x1) / det;
    const g1x = (y2 - y0) / det, g1y = (x0 - x2) / det;
    const g2x = (y0 - y1) / det, g2y = (x1 - x0) / det;
    const ux = u[i0]! * g0x + u[i1]! * g1x + u[i2]! * g2x;
    const uy = u[i0]! * g0y + u[i1]! * g1y + u[i2]! * g2y;
    outA[i0] += area * (ux * g0x + uy * g0y);
    outA[i1] += area * (ux * g1x + uy * g1y);
    outA[i2] += area * (ux * g2x + uy * g2y);
    const s = u[i0]! + u[i1]! + u[i2]!;
    const m0 = (area / 12) * (u[i0]! + s), m1 = (area / 12) * (u[i1]! + s), m2 = (area / 12) * (u[i2]! + s);
    outM[i0] += m0;
    outM[i1] += m1;
    outM[i2] += m2;
    const o = 4 * mat[e]!;
    const kx = w[o]! * ux + w[o + 1]! * uy, ky = w[o + 1]! * ux + w[o + 2]! * uy, c = w[o + 3]!;
    outK[i0] += area * (kx * g0x + ky * g0y) + c * m0;
    outK[i1] += area * (kx * g1x + ky * g1y) + c * m1;
    outK[i2] += area * (kx * g2x + ky * g2y) + c * m2;
  }
}
