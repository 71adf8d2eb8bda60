/**
 * Time panels for space-time error norms: the exact solution is sampled at a
 * few times per panel instead of at Gauss points of every breakpoint interval.
 *
 * Between breakpoints u_δ is linear in t, and the direct rule (./error-norms)
 * needs the exact solution u at 3 times per breakpoint interval on every
 * element of the union mesh — for sparse grids that is (2^L)² cells in d = 1
 * against L·2^L unknowns, and exact evaluations dominate the cost. Where u is
 * smooth in t (away from t = 0 and named singular times), a panel P = [a, b]
 * made of many breakpoint intervals uses instead the p-point Gauss nodes τ_j
 * of P and the interpolant I_P u of u in t at those nodes (degree p − 1, per
 * spatial quadrature point). The panel's share of the error is integrated
 * exactly for that interpolant:
 *
 *   ∫_P Q(|∇(I_P u − u_δ)|²) dt = Σ_j W_j Q(|∇u(τ_j)|²) − 2 Σ_j Q(∇u(τ_j)·∇V_j) + ∫_P Q(|∇u_δ|²) dt,
 *
 * with Q the spatial rule, W_j the Gauss weights of P, and V_j = ∫_P ℓ_j(t) u_δ(t) dt
 * (ℓ_j the Lagrange basis at the τ_j): the first sum is exact because |∇I_P u|²
 * has degree 2p − 2 and equals |∇u|² at the nodes; the second is exact because
 * I_P u = Σ_j ℓ_j u(τ_j); the last term needs no exact solution and is computed
 * exactly by the caller (./error-energy, or per breakpoint interval with held boundary values). So the result is the error
 * of I_P u instead of u — by the triangle inequality it differs from the
 * direct value by at most ‖∇(u − I_P u)‖ on the panel, not by a multiple of
 * ‖∇u‖² as an expansion with independent rules would.
 *
 * V_j = Σ_λ (∫_P σ_λ ℓ_j dt) f_λ is formed in hierarchical coordinates from the
 * temporal wavelets overlapping P (σ_λ is linear on its level's grid cells,
 * each integrated with a 7-point Gauss rule, exact for degree 13 ≥ p), plus the
 * held boundary values, linear in t between breakpoints as in the direct rule.
 *
 * Panels (caller): dyadic cells of whole breakpoint intervals, length ≤ half the distance to the nearest singular
 * time, so the interpolated functions are analytic in the Bernstein ellipse of
 * parameter ρ ≈ 9.9 around P (for heat-type solutions: Re t > 0 there), and
 * the interpolation error is about ρ^-p ≈ 1e-12 relative for p = 12
 * (L. N. Trefethen, Approximation Theory and Approximation Practice, SIAM 2013,
 * Thm. 8.2); length ≤ T/16 in any case.
 */
import { evaluateTemporal } from '../time/index';
import { hierarchicalToNodal } from '../space/hierarchical';
import { liftingOf } from '../space/boundary-lifting';
import type { LeafMesh } from '../space/leaf-mesh';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import type { SpaceTimeSolution } from '../spacetime/space-time-solution';
import { trialSupports, type BreakpointSlices } from './error-slices';
import type { SliceIntegrator } from './error-quadrature';
import { weightedDot } from './energy-weights';

/** Gauss nodes per time panel. */
export const PANEL_POINTS = 12;
/** Longest panel, as a fraction of T. */
export const MAX_PANEL = 1 / 16;
const PIECE = gaussLegendre01(7);

export class TimePanels {
  /** Results of the last {@link TimePanels.panel}: Σ_j W_j‖∇u‖² − 2Σ_j(∇u, ∇V_j), the L2 analogue and the energy analogue Σ_j W_j a(u, u) − 2Σ_j a(u, V_j). */
  g = 0;
  v = 0;
  k = 0;
  readonly points = PANEL_POINTS;
  private readonly nodes: Float64Array;
  private readonly weights: Float64Array;
  private readonly bary: Float64Array;
  private readonly ell: Float64Array;
  private readonly gamma: Float64Array;
  private readonly V: Float64Array[];
  private readonly lo: Float64Array;
  private readonly hi: Float64Array;
  private readonly liftG: Float64Array;

  constructor(
    private readonly solution: SpaceTimeSolution,
    private readonly slices: BreakpointSlices,
    private readonly integ: SliceIntegrator,
  ) {
    const p = PANEL_POINTS;
    const r = gaussLegendre01(p);
    this.nodes = r.nodes;
    this.weights = r.weights;
    // barycentric weights of the Lagrange basis at the nodes (second form; Trefethen ATAP ch. 5)
    this.bary = new Float64Array(p);
    for (let j = 0; j < p; j++) {
      let d = 1;
      for (let k = 0; k < p; k++) if (k !== j) d *= this.nodes[j]! - this.nodes[k]!;
      this.bary[j] = 1 / d;
    }
    this.ell = new Float64Array(p);
    this.gamma = new Float64Array(p);
    const nv = slices.mesh.vertexCount;
    this.V = Array.from({ length: p }, () => new Float64Array(nv));
    ({ lo: this.lo, hi: this.hi } = trialSupports(solution.trialSet.tree));
    this.liftG = new Float64Array(liftingOf(solution.domain.forest).vertices.length);
  }

  /** ℓ_j(s) for all j at s ∈ [0, 1] into this.ell. */
  private lagrange(s: number): void {
    const p = PANEL_POINTS;
    let den = 0;
    for (let j = 0; j < p; j++) {
      const d = s - this.nodes[j]!;
      if (d === 0) {
        this.ell.fill(0);
        this.ell[j] = 1;
        return;
      }
      den += this.bary[j]! / d;
    }
    for (let j = 0; j < p; j++) this.ell[j] = this.bary[j]! / (s - this.nodes[j]!) / den;
  }

  /** gamma[j] += ∫_{p0}^{p1} f(t) ℓ_j(t) dt (reference times, panel [a, b]) for f linear, f(p0) = f0, f(p1) = f1; scaled by T. */
  private addLinear(a: number, b: number, p0: number, p1: number, f0: number, f1: number, T: number): void {
    const len = p1 - p0;
    for (let r = 0; r < PIECE.nodes.length; r++) {
      const x = PIECE.nodes[r]!;
      const f = (1 - x) * f0 + x * f1;
      if (f === 0) continue;
      this.lagrange((p0 + len * x - a) / (b - a));
      const w = T * len * PIECE.weights[r]! * f;
      for (let j = 0; j < PANEL_POINTS; j++) this.gamma[j] = this.gamma[j]! + w * this.ell[j]!;
    }
  }

  /**
   * The exact-solution part of the panel [breaks[k0], breaks[k1]] (see the module comment) into
   * this.g / this.v. The caller adds the u_δ–u_δ part per breakpoint interval.
   */
  panel(k0: number, k1: number): void {
    const sol = this.solution;
    const set = sol.trialSet;
    const tree = set.tree;
    const coef = sol.coefficients;
    const loc = this.slices.localOf;
    const br = this.slices.breaks;
    const mesh: LeafMesh = this.slices.mesh;
    const T = sol.T;
    const a = br[k0]!;
    const b = br[k1]!;
    const p = PANEL_POINTS;
    for (const v of this.V) v.fill(0);
    const gamma = this.gamma;
    for (let i = 0; i < tree.size; i++) {
      const lo = Math.max(a, this.lo[i]!);
      const hi = Math.min(b, this.hi[i]!);
      if (!(hi > lo)) continue;
      gamma.fill(0);
      const l = tree.level[i]!;
      const idx = tree.index[i]!;
      const h = 2 ** -l;
      // σ is linear on every level-l grid cell: integrate cell by cell
      for (let c = Math.floor(lo / h); c * h < hi; c++) {
        const p0 = Math.max(lo, c * h);
        const p1 = Math.min(hi, (c + 1) * h);
        if (!(p1 > p0)) continue;
        const s0 = evaluateTemporal('trial', l, idx, 0, Math.min(p0 * T, T), T).value;
        const s1 = evaluateTemporal('trial', l, idx, 0, Math.min(p1 * T, T), T).value;
        this.addLinear(a, b, p0, p1, s0, s1, T);
      }
      const o0 = set.functionOffset[i]!;
      const o1 = set.functionOffset[i + 1]!;
      for (let j = 0; j < p; j++) {
        const gj = gamma[j]!;
        if (gj === 0) continue;
        const V = this.V[j]!;
        for (let q = o0; q < o1; q++) V[loc[q]!] += gj * coef[q]!;
      }
    }
    // held boundary values G(t_k) on the initial vertices, linear in t between breakpoints
    const lifting = liftingOf(sol.domain.forest);
    if (!lifting.isZero) {
      for (let k = k0; k <= k1; k++) {
        gamma.fill(0);
        if (k > k0) this.addLinear(a, b, br[k - 1]!, br[k]!, 0, 1, T);
        if (k < k1) this.addLinear(a, b, br[k]!, br[k + 1]!, 1, 0, T);
        const g = lifting.values(Math.min(br[k]! * T, T), this.liftG);
        for (let j = 0; j < p; j++) {
          const V = this.V[j]!;
          for (let d = 0; d < g.length; d++) V[lifting.vertices[d]!] += gamma[j]! * g[d]!;
        }
      }
    }
    let gs = 0;
    let vs = 0;
    let ks = 0;
    const integ = this.integ;
    for (let j = 0; j < p; j++) {
      const V = this.V[j]!;
      hierarchicalToNodal(mesh, V);
      const t = (a + (b - a) * this.nodes[j]!) * T;
      integ.integrateCross(t, a * T, b * T, V);
      const W = (b - a) * T * this.weights[j]!;
      gs += W * integ.a2 - 2 * integ.g2;
      vs += W * integ.b2 - 2 * integ.v2;
      ks += W * integ.ka2 - 2 * integ.k2;
    }
    this.g = gs;
    this.v = vs;
    this.k = ks;
  }
}

/**
 * ∫ over a breakpoint interval of length h of |∇u_h|², u_h² and the energy a(u_h, u_h) (into
 * out[0], out[1], out[2]) for u_h = (1 − θ)ua + θ ub (nodal vectors on `mesh`):
 * h/3·(q(ua, ua) + q(ua, ub) + q(ub, ub)) with the P1 stiffness and mass forms, mass
 * |K|/((d+1)(d+2))·(I + 11ᵀ) per element (common practice); the energy weighs each element's
 * gradient form by its K and its mass form by its c (`weights`, from ./energy-weights).
 */
export function intervalQuadratic(mesh: LeafMesh, ua: Float64Array, ub: Float64Array, h: number, out: Float64Array, weights: Float64Array): void {
  const { elements, coords, elementCount: ne, elementMaterial: mat } = mesh;
  let sg = 0;
  let sv = 0;
  let sk = 0;
  if (mesh.dim === 1) {
    for (let e = 0; e < ne; e++) {
      const i0 = elements[2 * e]!, i1 = elements[2 * e + 1]!;
      const len = Math.abs(coords[i1]! - coords[i0]!);
      const a0 = ua[i0]!, a1 = ua[i1]!, b0 = ub[i0]!, b1 = ub[i1]!;
      const da = (a1 - a0) / len, db = (b1 - b0) / len;
      const g = len * (da * da + da * db + db * db);
      const v = (len / 6) * (mass1(a0, a1, a0, a1) + mass1(a0, a1, b0, b1) + mass1(b0, b1, b0, b1));
      const o = 4 * mat[e]!;
      sg += g;
      sv += v;
      sk += weights[o]! * g + weights[o + 3]! * v;
    }
  } else {
    for (let e = 0; e < ne; e++) {
      const i0 = elements[3 * e]!, i1 = elements[3 * e + 1]!, i2 = elements[3 * e + 2]!;
      const x0 = coords[2 * i0]!, y0 = coords[2 * i0 + 1]!;
      const x1 = coords[2 * i1]!, y1 = coords[2 * i1 + 1]!;
      const x2 = coords[2 * i2]!, y2 = coords[2 * i2 + 1]!;
      const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
      const area = 0.5 * Math.abs(det);
      const a0 = ua[i0]!, a1 = ua[i1]!, a2 = ua[i2]!;
      const b0 = ub[i0]!, b1 = ub[i1]!, b2 = ub[i2]!;
      const ax = ((a1 - a0) * (y2 - y0) - (a2 - a0) * (y1 - y0)) / det;
      const ay = ((a2 - a0) * (x1 - x0) - (a1 - a0) * (x2 - x0)) / det;
      const bx = ((b1 - b0) * (y2 - y0) - (b2 - b0) * (y1 - y0)) / det;
      const by = ((b2 - b0) * (x1 - x0) - (b1 - b0) * (x2 - x0)) / det;
      sg += area * (ax * ax + ay * ay + ax * bx + ay * by + bx * bx + by * by);
      const sa = a0 + a1 + a2, sb = b0 + b1 + b2;
      const aa = a0 * a0 + a1 * a1 + a2 * a2 + sa * sa;
      const ab = a0 * b0 + a1 * b1 + a2 * b2 + sa * sb;
      const bb = b0 * b0 + b1 * b1 + b2 * b2 + sb * sb;
      const v = (area / 12) * (aa + ab + bb);
      sv += v;
      const m = mat[e]!;
      // q(a, a) + q(a, b) + q(b, b) of the K-weighted gradient form
      const kq = weightedDot(weights, m, ax, ay, ax, ay) + weightedDot(weights, m, ax, ay, bx, by) + weightedDot(weights, m, bx, by, bx, by);
      sk += area * kq + weights[4 * m + 3]! * v;
    }
  }
  out[0] = (h / 3) * sg;
  out[1] = (h / 3) * sv;
  out[2] = (h / 3) * sk;
}

/** (x, y) of the 1D element mass matrix times 6/h: x·y + (Σx)(Σy). */
function mass1(x0: number, x1: number, y0: number, y1: number): number {
  return x0 * y0 + x1 * y1 + (x0 + x1) * (y0 + y1);
}
