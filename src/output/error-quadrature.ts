/**
 * Quadrature for space-time error norms of solutions that are singular at
 * t = 0 (incompatible data such as u0 ≡ 1 with u = 0 on the boundary, where
 * ‖∇u(t)‖² grows like t^{-1/2} and u has a boundary layer of width √(κt)).
 *
 * Time: on an interval [a, b] touching a singular time a, geometric panels
 * [a + L 2^{-j-1}, a + L 2^{-j}] (L = b − a, j < P) plus [a, a + L 2^{-P}], and on
 * every panel Gauss–Legendre in s with t = a + s² — the substitution turns the
 * t^{-1/2} singularity into a smooth integrand (Davis & Rabinowitz, Methods of
 * Numerical Integration, 2nd ed., 1984, §2.12 on removing endpoint singularities by
 * change of variable; geometric grading toward singular points is common practice).
 *
 * Space: elements touching the Dirichlet boundary at times when the layer width
 * ℓ = √(κ t) is below the element size h get composite rules graded toward the
 * boundary with ⌈log₂(h/ℓ)⌉ + 2 halvings — in 1D panels toward the boundary
 * vertex, in 2D collapsed (Duffy) coordinates toward a boundary edge or vertex
 * (M. G. Duffy, SIAM J. Numer. Anal. 19 (1982) 1260–1262). Other elements use the
 * degree-5 rules of ../space/quadrature.
 */
import type { LeafMesh } from '../space/leaf-mesh';
import { TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../space/quadrature';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import { checkCallbackResult } from '../validation/index';
import { energyWeights } from './energy-weights';

/** Points and weights of a time rule on one interval, reused between intervals. */
export class TimeRule {
  t = new Float64Array(64);
  w = new Float64Array(64);
  n = 0;
  private readonly nodes: Float64Array;
  private readonly weights: Float64Array;

  constructor(readonly points: number, readonly panels: number) {
    const r = gaussLegendre01(points);
    this.nodes = r.nodes;
    this.weights = r.weights;
  }

  /** Rule for ∫_a^b, graded toward a (singular left end) and/or b. */
  build(a: number, b: number, singularLeft: boolean, singularRight: boolean): void {
    this.n = 0;
    if (singularLeft && singularRight) {
      const m = 0.5 * (a + b);
      this.graded(a, m - a);
      this.graded(b, m - b);
    } else if (singularLeft) this.graded(a, b - a);
    else if (singularRight) this.graded(b, a - b);
    else {
      const h = b - a;
      for (let q = 0; q < this.points; q++) this.push(a + h * this.nodes[q]!, h * this.weights[q]!);
    }
  }

  /** Panels from the singular end `s` over signed length L, each with t = s ± σ² Gauss in σ. */
  private graded(s: number, L: number): void {
    const dir = L < 0 ? -1 : 1;
    const len = Math.abs(L);
    let hi = len;
    for (let j = 0; j <= this.panels; j++) {
      const lo = j === this.panels ? 0 : hi * 0.5;
      const s0 = Math.sqrt(lo);
      const s1 = Math.sqrt(hi);
      const hs = s1 - s0;
      for (let q = 0; q < this.points; q++) {
        const sig = s0 + hs * this.nodes[q]!;
        this.push(s + dir * sig * sig, 2 * sig * hs * this.weights[q]!);
      }
      hi = lo;
    }
  }

  private push(t: number, w: number): void {
    if (this.n === this.t.length) {
      const t2 = new Float64Array(2 * this.n);
      const w2 = new Float64Array(2 * this.n);
      t2.set(this.t);
      w2.set(this.w);
      this.t = t2;
      this.w = w2;
    }
    this.t[this.n] = t;
    this.w[this.n] = w;
    this.n++;
  }
}

/** The exact solution as the integrator calls it. */
export interface ExactFunctions {
  value(t: number, x: number, y: number): number;
  gradient(t: number, x: number, y: number, grad: Float64Array): void;
  /** Optional: value and gradient in one call (returns the value). */
  valueAndGradient?(t: number, x: number, y: number, grad: Float64Array): number;
}

const MAX_SPACE_DEPTH = 40;
const G3 = gaussLegendre01(3);
/** 5 points on graded panels: 3 left 4e-5 relative slice errors on the layer of u0 ≡ 1 (measured). */
const GP = gaussLegendre01(5);

/**
 * Spatial part of the error integrand at one time: ∫_Ω |∇(u − u_δ)|², ∫_Ω (u − u_δ)² and the
 * energy a(u − u_δ, u − u_δ) = ∫_Ω K∇(u − u_δ)·∇(u − u_δ) + c (u − u_δ)² on a fixed leaf mesh, for
 * nodal values given as (1 − θ)·va + θ·vb.
 */
export class SliceIntegrator {
  /**
   * Results of the last {@link SliceIntegrator.integrate}: ∫|∇(u − u_h)|² and ∫(u − u_h)²; after
   * {@link SliceIntegrator.integrateCross}: the cross terms ∫∇u·∇v and ∫u v.
   */
  g2 = 0;
  v2 = 0;
  /** After {@link SliceIntegrator.integrate}: a(u − u_h, u − u_h); after integrateCross: a(u, v). */
  k2 = 0;
  /** After {@link SliceIntegrator.integrateCross}: ∫|∇u|², ∫u² and a(u, u) with the same rule. */
  a2 = 0;
  b2 = 0;
  ka2 = 0;
  /** Exact-solution evaluations so far (all calls). */
  evaluations = 0;
  private cross = false;
  private ea = 0;
  private eb = 0;
  /** Times the spatial rule is chosen for: layer widths from tLo, the tail's reach from tHi. */
  private tLo = 0;
  private tHi = 0;
  private readonly flags: Int32Array;
  private readonly size: Float64Array;
  private readonly corner: Uint8Array;
  /** Lower bound (graph distance) from each element's nearest vertex to the Dirichlet boundary. */
  private readonly dist: Float64Array;
  private readonly grad = new Float64Array(2);
  // per-element state used by the point kernel
  private t = 0;
  private u0 = 0;
  private x0 = 0;
  private y0 = 0;
  private gx = 0;
  private gy = 0;
  private eg = 0;
  private ev = 0;
  private ek = 0;
  private eka = 0;
  // energy weights of the current element's material (./energy-weights)
  private kxx = 0;
  private kxy = 0;
  private kyy = 0;
  private rc = 0;
  /** Energy weights of the mesh's materials (./energy-weights), for callers that integrate u_δ alone. */
  readonly weights: Float64Array;

  /**
   * @param elementSplits every element away from the boundary layer is split into this many pieces
   *   per edge for the spatial rule (1: the plain degree-5 rule; more for exact solutions with kinks
   *   or jumps inside elements, which the plain rule integrates only to O(h))
   */
  constructor(readonly mesh: LeafMesh, private readonly exact: ExactFunctions, private readonly elementSplits = 1) {
    const ne = mesh.elementCount;
    const nv = mesh.dim + 1;
    const { elements, coords, isFree } = mesh;
    this.weights = energyWeights(mesh);
    this.flags = new Int32Array(ne);
    this.size = new Float64Array(ne);
    this.corner = new Uint8Array(mesh.vertexCount);
    for (let e = 0; e < ne; e++) {
      let f = 0;
      for (let k = 0; k < nv; k++) if (!isFree[elements[nv * e + k]!]) f |= 1 << k;
      this.flags[e] = f;
      if (mesh.dim === 1) this.size[e] = Math.abs(coords[elements[2 * e + 1]!]! - coords[elements[2 * e]!]!);
      else {
        let h = 0;
        for (let k = 0; k < 3; k++) {
          const a = elements[3 * e + k]!;
          const b = elements[3 * e + ((k + 1) % 3)]!;
          h = Math.max(h, Math.hypot(coords[2 * a]! - coords[2 * b]!, coords[2 * a + 1]! - coords[2 * b + 1]!));
        }
        this.size[e] = h;
      }
    }
    if (mesh.dim === 2) this.markBoundaryEdges();
    const vd = distanceToDirichlet(mesh);
    this.dist = new Float64Array(ne);
    for (let e = 0; e < ne; e++) {
      let d = Infinity;
      for (let k = 0; k < nv; k++) d = Math.min(d, vd[elements[nv * e + k]!]!);
      this.dist[e] = d;
    }
  }

  /**
   * Dirichlet boundary edges (edges of one element with both ends on the Dirichlet boundary) into
   * flag bits 3 + k for edge (v_k, v_{k+1}); corners: Dirichlet vertices where these edges are
   * not two collinear ones.
   */
  private markBoundaryEdges(): void {
    const { elements, coords, isFree, vertexCount: nv, elementCount: ne } = this.mesh;
    const count = new Map<number, number>();
    const key = (a: number, b: number) => (a < b ? a * nv + b : b * nv + a);
    for (let e = 0; e < ne; e++) {
      if ((this.flags[e]! & 7) === 0) continue;
      for (let k = 0; k < 3; k++) {
        const kk = key(elements[3 * e + k]!, elements[3 * e + ((k + 1) % 3)]!);
        count.set(kk, (count.get(kk) ?? 0) + 1);
      }
    }
    const edges = new Int32Array(nv);
    const dirX = new Float64Array(nv);
    const dirY = new Float64Array(nv);
    const bent = new Uint8Array(nv);
    for (let e = 0; e < ne; e++) {
      if ((this.flags[e]! & 7) === 0) continue;
      for (let k = 0; k < 3; k++) {
        const a = elements[3 * e + k]!;
        const b = elements[3 * e + ((k + 1) % 3)]!;
        if (isFree[a] || isFree[b]) continue;
        // Interior edges are met twice; an edge shared with an element not touching the boundary
        // is met once here but then it has a free vertex, so the count is exact.
        if (count.get(key(a, b)) !== 1) continue;
        this.flags[e] = this.flags[e]! | (1 << (3 + k));
        const dx = coords[2 * b]! - coords[2 * a]!;
        const dy = coords[2 * b + 1]! - coords[2 * a + 1]!;
        for (const [v, sx, sy] of [[a, dx, dy], [b, -dx, -dy]] as const) {
          if (edges[v] === 0) { dirX[v] = sx; dirY[v] = sy; }
          else {
            const cross = dirX[v]! * sy - dirY[v]! * sx;
            const dot = dirX[v]! * sx + dirY[v]! * sy;
            // collinear and opposite (a straight boundary through v) is not a corner
            if (Math.abs(cross) > 1e-9 * Math.hypot(dirX[v]!, dirY[v]!) * Math.hypot(sx, sy) || dot > 0) bent[v] = 1;
          }
          edges[v]!++;
        }
      }
    }
    for (let v = 0; v < nv; v++) if (!isFree[v]) this.corner[v] = edges[v] !== 2 || bent[v] ? 1 : 0;
  }

  /** Integrates over all elements at time t (t > 0 is the time since the initial singularity). */
  integrate(t: number, va: Float64Array, vb: Float64Array, theta: number): void {
    this.t = t;
    this.tLo = t;
    this.tHi = t;
    this.cross = false;
    this.resetResults();
    if (this.mesh.dim === 1) this.integrate1D(va, vb, theta);
    else this.integrate2D(va, vb, theta);
  }

  /**
   * Cross terms at time t for a nodal field v: g2 = ∫∇u·∇v, v2 = ∫u v, k2 = a(u, v), a2 = ∫|∇u|²,
   * b2 = ∫u², ka2 = a(u, u), with
   * the rule every time in [tLo, tHi] would get (the finer of the two choices per element), so that
   * one rule serves a whole time panel (./error-panels).
   */
  integrateCross(t: number, tLo: number, tHi: number, v: Float64Array): void {
    this.t = t;
    this.tLo = tLo;
    this.tHi = tHi;
    this.cross = true;
    this.resetResults();
    if (this.mesh.dim === 1) this.integrate1D(v, v, 0);
    else this.integrate2D(v, v, 0);
    this.cross = false;
  }

  /** Layer width √(κ t_lo) on element e (the thinnest layer of the times the rule serves). */
  private width(e: number): number {
    return Math.sqrt(this.mesh.kappa[this.mesh.elementMaterial[e]!]! * this.tLo);
  }

  /** Halvings toward the boundary for an element touching it (0: the plain rule suffices). */
  private depth(e: number): number {
    const width = this.width(e);
    const h = this.size[e]!;
    if (!(width < 4 * h)) return 0;
    return Math.min(MAX_SPACE_DEPTH, Math.max(1, Math.ceil(Math.log2(h / width)) + 1));
  }

  /**
   * Subdivisions for an element near (not on) the boundary that the layer's tail reaches:
   * |∇u|² decays like e^{−d²/(2κt)} at distance d, negligible beyond d = 8√(κt).
   */
  private nearSplits(e: number): number {
    const width = this.width(e);
    const reach = Math.sqrt(this.mesh.kappa[this.mesh.elementMaterial[e]!]! * this.tHi);
    const h = this.size[e]!;
    if (!(this.dist[e]! < 8 * reach) || !(width < h)) return 1;
    return Math.min(4, Math.max(2, Math.ceil((2 * h) / width)));
  }

  /**
   * Pieces per edge for element e (flags f, boundary grading depth m): at least `elementSplits`
   * unless a graded boundary rule applies, more near a boundary layer's tail.
   */
  private splits(e: number, f: number, m: number): number {
    if (f === 0) return Math.max(this.elementSplits, this.nearSplits(e));
    return m === 0 ? this.elementSplits : 1;
  }

  /** Names the callback and point that gave a non-finite value or gradient (typed error). */
  private reportNonFinite(u: number, x: number, y: number): void {
    const args = [this.t, x, y];
    const both = this.exact.valueAndGradient !== undefined;
    for (let k = 0; k < this.mesh.dim; k++) {
      if (!Number.isFinite(this.grad[k]!)) checkCallbackResult(this.grad[k], both ? 'exact.valueAndGradient' : 'exact.gradient', args);
    }
    checkCallbackResult(u, both ? 'exact.valueAndGradient' : 'exact.value', args);
  }

  private point(x: number, y: number, w: number): void {
    const g = this.grad;
    const ex = this.exact;
    g[0] = NaN;
    g[1] = this.mesh.dim === 1 ? 0 : NaN;
    let u: number;
    if (ex.valueAndGradient) u = ex.valueAndGradient(this.t, x, y, g);
    else {
      ex.gradient(this.t, x, y, g);
      u = ex.value(this.t, x, y);
    }
    this.evaluations++;
    const uh = this.u0 + this.gx * (x - this.x0) + this.gy * (y - this.y0);
    const g0 = g[0]!;
    const g1 = this.mesh.dim === 1 ? 0 : g[1]!;
    const { kxx, kxy, kyy, rc } = this;
    if (this.cross) {
      if (!Number.isFinite(g0 + g1 + u)) this.reportNonFinite(u, x, y);
      const gx = this.gx, gy = this.gy;
      this.eg += w * (g0 * gx + g1 * gy);
      this.ev += w * u * uh;
      this.ek += w * (kxx * g0 * gx + kxy * (g0 * gy + g1 * gx) + kyy * g1 * gy + rc * u * uh);
      this.ea += w * (g0 * g0 + g1 * g1);
      this.eb += w * u * u;
      this.eka += w * (kxx * g0 * g0 + 2 * kxy * g0 * g1 + kyy * g1 * g1 + rc * u * u);
      return;
    }
    const d0 = g0 - this.gx;
    const d1 = g1 - this.gy;
    const dv = u - uh;
    if (!Number.isFinite(d0 + d1 + dv)) this.reportNonFinite(u, x, y);
    this.eg += w * (d0 * d0 + d1 * d1);
    this.ev += w * dv * dv;
    this.ek += w * (kxx * d0 * d0 + 2 * kxy * d0 * d1 + kyy * d1 * d1 + rc * dv * dv);
  }

  /** All results to 0 (the element loops add every element's sums to them). */
  private resetResults(): void {
    this.g2 = this.v2 = this.k2 = this.a2 = this.b2 = this.ka2 = 0;
  }

  /** Energy weights of element e's material into kxx … rc, and the element's sums reset. */
  private startElement(e: number): void {
    const o = 4 * this.mesh.elementMaterial[e]!;
    const w = this.weights;
    this.kxx = w[o]!;
    this.kxy = w[o + 1]!;
    this.kyy = w[o + 2]!;
    this.rc = w[o + 3]!;
    this.eg = this.ev = this.ek = this.ea = this.eb = this.eka = 0;
  }

  /** Adds the current element's sums to the results. */
  private endElement(): void {
    this.g2 += this.eg;
    this.v2 += this.ev;
    this.k2 += this.ek;
    this.a2 += this.ea;
    this.b2 += this.eb;
    this.ka2 += this.eka;
  }

  // ---------------------------------------------------------------- 1D

  private integrate1D(va: Float64Array, vb: Float64Array, theta: number): void {
    const { elements, coords } = this.mesh;
    const n = G3.nodes;
    const wq = G3.weights;
    const s = 1 - theta;
    for (let e = 0; e < this.mesh.elementCount; e++) {
      const i0 = elements[2 * e]!;
      const i1 = elements[2 * e + 1]!;
      const xa = coords[i0]!;
      const xb = coords[i1]!;
      const ua = s * va[i0]! + theta * vb[i0]!;
      const ub = s * va[i1]! + theta * vb[i1]!;
      this.x0 = xa;
      this.u0 = ua;
      this.gx = (ub - ua) / (xb - xa);
      this.gy = 0;
      this.startElement(e);
      const f = this.flags[e]!;
      const m = f === 0 ? 0 : this.depth(e);
      const split = this.splits(e, f, m);
      if (split > 1) {
        const h = (xb - xa) / split;
        for (let j = 0; j < split; j++) this.panel1D(xa + j * h, xa + (j + 1) * h, GP.nodes, GP.weights);
      } else if (m === 0) this.panel1D(xa, xb, n, wq);
      else if (f === 3) {
        const mid = 0.5 * (xa + xb);
        this.graded1D(xa, mid, m - 1);
        this.graded1D(xb, mid, m - 1);
      } else if (f === 1) this.graded1D(xa, xb, m);
      else this.graded1D(xb, xa, m);
      this.endElement();
    }
  }

  private panel1D(a: number, b: number, n: Float64Array, w: Float64Array): void {
    const h = b - a;
    const L = Math.abs(h);
    for (let q = 0; q < n.length; q++) this.point(a + h * n[q]!, 0, L * w[q]!);
  }

  /** Panels on [s, o] halving toward s, m halvings. */
  private graded1D(s: number, o: number, m: number): void {
    const L = o - s;
    let hi = 1;
    for (let j = 0; j <= m; j++) {
      const lo = j === m ? 0 : hi * 0.5;
      this.panel1D(s + L * lo, s + L * hi, GP.nodes, GP.weights);
      hi = lo;
    }
  }

  // ---------------------------------------------------------------- 2D

  private integrate2D(va: Float64Array, vb: Float64Array, theta: number): void {
    const { elements, coords } = this.mesh;
    const s = 1 - theta;
    for (let e = 0; e < this.mesh.elementCount; e++) {
      const i0 = elements[3 * e]!, i1 = elements[3 * e + 1]!, i2 = elements[3 * e + 2]!;
      const x0 = coords[2 * i0]!, y0 = coords[2 * i0 + 1]!;
      const x1 = coords[2 * i1]!, y1 = coords[2 * i1 + 1]!;
      const x2 = coords[2 * i2]!, y2 = coords[2 * i2 + 1]!;
      const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
      const u0 = s * va[i0]! + theta * vb[i0]!;
      const u1 = s * va[i1]! + theta * vb[i1]!;
      const u2 = s * va[i2]! + theta * vb[i2]!;
      // Gradient of the linear interpolant (common practice).
      this.gx = ((u1 - u0) * (y2 - y0) - (u2 - u0) * (y1 - y0)) / det;
      this.gy = ((u2 - u0) * (x1 - x0) - (u1 - u0) * (x2 - x0)) / det;
      this.u0 = u0;
      this.x0 = x0;
      this.y0 = y0;
      this.startElement(e);
      const f = this.flags[e]!;
      const m = f === 0 ? 0 : this.depth(e);
      const area = 0.5 * Math.abs(det);
      const split = this.splits(e, f, m);
      if (split > 1) this.splitRule(x0, y0, x1, y1, x2, y2, area, split);
      else if (m === 0) this.triangleRule(x0, y0, x1, y1, x2, y2, area);
      else if (f >> 3) this.edgeGraded(e, f, m, area);
      else this.vertexGraded(f, m, x0, y0, x1, y1, x2, y2, area);
      this.endElement();
    }
  }

  private triangleRule(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, area: number): void {
    for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
      const l0 = TRIANGLE_POINTS[3 * q]!, l1 = TRIANGLE_POINTS[3 * q + 1]!, l2 = TRIANGLE_POINTS[3 * q + 2]!;
      this.point(l0 * x0 + l1 * x1 + l2 * x2, l0 * y0 + l1 * y1 + l2 * y2, area * TRIANGLE_WEIGHTS[q]!);
    }
  }

  /** The degree-5 rule on the s² congruent sub-triangles of a uniform split into s parts per edge. */
  private splitRule(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, area: number, s: number): void {
    const ax = (x1 - x0) / s, ay = (y1 - y0) / s;
    const bx = (x2 - x0) / s, by = (y2 - y0) / s;
    const sub = area / (s * s);
    for (let i = 0; i < s; i++) {
      for (let j = 0; i + j < s; j++) {
        const px = x0 + i * ax + j * bx, py = y0 + i * ay + j * by;
        this.triangleRule(px, py, px + ax, py + ay, px + bx, py + by, sub);
        if (i + j + 1 < s) this.triangleRule(px + ax, py + ay, px + ax + bx, py + ay + by, px + bx, py + by, sub);
      }
    }
  }

  /**
   * Point contact with the Dirichlet boundary: split into six triangles (centroid, edge
   * midpoints) with one original vertex each; those at a Dirichlet vertex use Duffy coordinates
   * x = V + r((1 − w)(A − V) + w(B − V)), Jacobian 2|S| r, graded in r toward 0.
   */
  private vertexGraded(f: number, m: number, x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, area: number): void {
    const cx = (x0 + x1 + x2) / 3, cy = (y0 + y1 + y2) / 3;
    const xs = [x0, x1, x2];
    const ys = [y0, y1, y2];
    const sub = area / 6;
    for (let k = 0; k < 3; k++) {
      const vx = xs[k]!, vy = ys[k]!;
      const nx = xs[(k + 1) % 3]!, ny = ys[(k + 1) % 3]!;
      const px = xs[(k + 2) % 3]!, py = ys[(k + 2) % 3]!;
      const mnx = 0.5 * (vx + nx), mny = 0.5 * (vy + ny);
      const mpx = 0.5 * (vx + px), mpy = 0.5 * (vy + py);
      if (f & (1 << k)) {
        this.duffy(vx, vy, mnx, mny, cx, cy, sub, m);
        this.duffy(vx, vy, cx, cy, mpx, mpy, sub, m);
      } else {
        this.triangleRule(vx, vy, mnx, mny, cx, cy, sub);
        this.triangleRule(vx, vy, cx, cy, mpx, mpy, sub);
      }
    }
  }

  private duffy(vx: number, vy: number, ax: number, ay: number, bx: number, by: number, area: number, m: number): void {
    const n = G3.nodes;
    const wq = G3.weights;
    let hi = 1;
    for (let j = 0; j <= m; j++) {
      const lo = j === m ? 0 : hi * 0.5;
      const hr = hi - lo;
      for (let p = 0; p < 3; p++) {
        const r = lo + hr * n[p]!;
        for (let q = 0; q < 3; q++) {
          const w = n[q]!;
          const x = vx + r * ((1 - w) * (ax - vx) + w * (bx - vx));
          const y = vy + r * ((1 - w) * (ay - vy) + w * (by - vy));
          this.point(x, y, 2 * area * r * hr * wq[p]! * wq[q]!);
        }
      }
      hi = lo;
    }
  }

  /**
   * A Dirichlet boundary edge (A, B) with apex C: collapsed coordinates
   * x = λC + (1 − λ)((1 − w)A + wB), Jacobian 2|K|(1 − λ), graded in λ toward the edge, in w
   * toward A or B where the boundary turns (a corner, or the edge to C is a boundary edge too),
   * and in λ toward C when C is on the Dirichlet boundary.
   */
  private edgeGraded(e: number, f: number, m: number, area: number): void {
    const { elements, coords } = this.mesh;
    let k = 0;
    while (!(f & (1 << (3 + k)))) k++;
    const ia = elements[3 * e + k]!, ib = elements[3 * e + ((k + 1) % 3)]!, ic = elements[3 * e + ((k + 2) % 3)]!;
    const ax = coords[2 * ia]!, ay = coords[2 * ia + 1]!;
    const bx = coords[2 * ib]!, by = coords[2 * ib + 1]!;
    const cx = coords[2 * ic]!, cy = coords[2 * ic + 1]!;
    const edgeCA = (f & (1 << (3 + ((k + 2) % 3)))) !== 0; // edge (C, A)
    const edgeBC = (f & (1 << (3 + ((k + 1) % 3)))) !== 0; // edge (B, C)
    const gradeA = edgeCA || this.corner[ia] === 1;
    const gradeB = edgeBC || this.corner[ib] === 1;
    const apex = (f & (1 << ((k + 2) % 3))) !== 0 && !edgeCA && !edgeBC;
    // λ segments: [0, 1] graded toward 0, or split at 1/2 and graded toward both ends
    const lamSegs = apex ? [[0, 0.5, m], [1, 0.5, m]] : [[0, 1, m]];
    const wSegs = gradeA && gradeB ? [[0, 0.5, m], [1, 0.5, m]] : gradeA ? [[0, 1, m]] : gradeB ? [[1, 0, m]] : [[0, 1, 0]];
    this.ax = ax; this.ay = ay; this.bx = bx; this.by = by; this.cx = cx; this.cy = cy; this.area = area;
    // 5 points across the layer; 3 when w is graded too (tensor grading at corners is (m+1)² panels)
    const rl = gradeA || gradeB ? G3 : GP;
    for (const [ls, lo_, lm] of lamSegs) {
      const L = lo_! - ls!;
      let hi = 1;
      for (let j = 0; j <= lm!; j++) {
        const lo = j === lm ? 0 : hi * 0.5;
        const h = hi - lo;
        for (let q = 0; q < rl.nodes.length; q++) {
          const lam = ls! + L * (lo + h * rl.nodes[q]!);
          const wl = Math.abs(L) * h * rl.weights[q]!;
          for (const [ws, wo, wm] of wSegs) this.edgeRow(lam, wl, ws!, wo!, wm!);
        }
        hi = lo;
      }
    }
  }

  private ax = 0; private ay = 0; private bx = 0; private by = 0; private cx = 0; private cy = 0; private area = 0;

  /** One λ row of the collapsed rule: w panels of [s, o] halving toward s (m halvings). */
  private edgeRow(lam: number, wl: number, s: number, o: number, m: number): void {
    const L = o - s;
    const aL = Math.abs(L);
    const n = G3.nodes;
    const wq = G3.weights;
    let hi = 1;
    for (let j = 0; j <= m; j++) {
      const lo = j === m ? 0 : hi * 0.5;
      const h = hi - lo;
      for (let q = 0; q < n.length; q++) {
        const w = s + L * (lo + h * n[q]!);
        const x = lam * this.cx + (1 - lam) * ((1 - w) * this.ax + w * this.bx);
        const y = lam * this.cy + (1 - lam) * ((1 - w) * this.ay + w * this.by);
        this.point(x, y, 2 * this.area * (1 - lam) * wl * aL * h * wq[q]!);
      }
      hi = lo;
    }
  }


}

/**
 * Graph distance along mesh edges from every vertex to the nearest Dirichlet vertex (Dijkstra's
 * algorithm, common practice); an upper bound of the Euclidean distance to the Dirichlet boundary,
 * exact in 1D. Infinity when there is no Dirichlet vertex.
 */
function distanceToDirichlet(mesh: LeafMesh): Float64Array {
  const { vertexCount: nv, elementCount: ne, elements, coords, isFree, dim } = mesh;
  const k = dim + 1;
  // vertex → incident elements (CSR)
  const start = new Int32Array(nv + 1);
  for (let i = 0; i < ne * k; i++) start[elements[i]! + 1]!++;
  for (let v = 0; v < nv; v++) start[v + 1] = start[v + 1]! + start[v]!;
  const fill = start.slice(0, nv);
  const inc = new Int32Array(ne * k);
  for (let e = 0; e < ne; e++) for (let j = 0; j < k; j++) inc[fill[elements[k * e + j]!]!++] = e;
  const dist = new Float64Array(nv).fill(Infinity);
  const heapV = new Int32Array(ne * k * k + nv);
  const heapD = new Float64Array(heapV.length);
  let hn = 0;
  const push = (v: number, d: number) => {
    let i = hn++;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (heapD[p]! <= d) break;
      heapV[i] = heapV[p]!; heapD[i] = heapD[p]!; i = p;
    }
    heapV[i] = v; heapD[i] = d;
  };
  const pop = (): number => {
    const top = heapV[0]!;
    const lv = heapV[--hn]!, ld = heapD[hn]!;
    let i = 0;
    for (;;) {
      let c = 2 * i + 1;
      if (c >= hn) break;
      if (c + 1 < hn && heapD[c + 1]! < heapD[c]!) c++;
      if (heapD[c]! >= ld) break;
      heapV[i] = heapV[c]!; heapD[i] = heapD[c]!; i = c;
    }
    heapV[i] = lv; heapD[i] = ld;
    return top;
  };
  for (let v = 0; v < nv; v++) if (!isFree[v]) { dist[v] = 0; push(v, 0); }
  while (hn > 0) {
    const dTop = heapD[0]!;
    const v = pop();
    if (dTop > dist[v]!) continue;
    for (let a = start[v]!; a < start[v + 1]!; a++) {
      const e = inc[a]!;
      for (let j = 0; j < k; j++) {
        const w = elements[k * e + j]!;
        if (w === v) continue;
        let len = 0;
        for (let c = 0; c < dim; c++) len += (coords[dim * w + c]! - coords[dim * v + c]!) ** 2;
        const nd = dTop + Math.sqrt(len);
        if (nd < dist[w]!) {
          dist[w] = nd;
          if (hn < heapV.length) push(w, nd);
        }
      }
    }
  }
  return dist;
}
