/**
 * Time-stepping baseline for the `compare.` suite: the heat equation on a uniform P1 mesh built with
 * the library's own spatial module (domain, leaf mesh, matrix-free element loops for M and A, the
 * multilevel V-cycle as PCG preconditioner per step), with the method of lines:
 *   implicit Euler   (M + τA) u_k = M u_{k−1},
 *   Crank–Nicolson   (M + τ/2 A) u_k = (M − τ/2 A) u_{k−1}, after `damping` implicit-Euler steps
 *                    (Rannacher's start-up for non-smooth data; common practice),
 * on steps graded toward t = 0, t_k = T (k/K)^q (common practice for the t^{-1/4} singularity of
 * ‖∇u‖ with incompatible initial data; q = 2 … 3).
 *
 * The discrete solution is the piecewise linear interpolant in time of the nodal vectors u_k. Its
 * error in L2(0, T; H¹₀) against a known solution is computed like `spaceTimeErrors` does for the
 * space-time solver: Gauss points in time on every step (3 by default), and at each of them the
 * degree-5 triangle rule / 3-point Gauss rule on the leaf mesh.
 */
import type { KnownSolution } from '../src/output/error-norms';
import { elementTables, applyElementsNodal, type ElementTables } from '../src/space/element-matrices';
import { MultilevelPreconditioner, type LeafMesh, type SpatialDomain } from '../src/space/index';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../src/space/quadrature';
import { gaussLegendre01 } from '../src/numerics/gauss-legendre';

export interface SteppingOptions {
  method: 'euler' | 'crank-nicolson';
  /** Number of time steps K. */
  steps: number;
  /** Grading exponent q of t_k = T (k/K)^q (default 2). */
  grading?: number;
  /** Implicit-Euler start-up steps of Crank–Nicolson (default 4). */
  damping?: number;
  /** Relative PCG tolerance per step (default 1e-8). */
  relTol?: number;
  /**
   * Keep every nodal vector in the result (default true). Fine meshes cannot: 512 steps on the
   * 2049² mesh are 17 GB. Without them only u_0 and u_K are kept; use `onStep` to stream.
   */
  keepStates?: boolean;
  /** Called after every step with the interval [t_{k−1}, t_k] and both nodal vectors. */
  onStep?: (k: number, t0: number, t1: number, previous: Float64Array, current: Float64Array) => void;
}

export interface SteppingResult {
  /** Nodal vectors u_0 … u_K (local leaf-mesh numbering); only u_0, u_K unless `keepStates`. */
  states: Float64Array[];
  times: Float64Array;
  /** Total PCG iterations over all steps. */
  iterations: number;
  /** Spatial unknowns (free vertices) and space-time unknowns (free vertices × K). */
  spatialUnknowns: number;
  unknowns: number;
  mesh: LeafMesh;
}

/** A uniform P1 discretisation on the leaf mesh of `set` with its V-cycle. */
export class UniformP1 {
  readonly mesh: LeafMesh;
  readonly tables: ElementTables;
  readonly pre: MultilevelPreconditioner;
  readonly free: Uint8Array;
  readonly nFree: number;
  constructor(domain: SpatialDomain, set: Int32Array) {
    const mesh = domain.leafMesh(set);
    this.mesh = mesh;
    this.tables = elementTables(domain.forest, mesh);
    this.pre = new MultilevelPreconditioner(mesh);
    this.free = mesh.isFree;
    let n = 0;
    for (let i = 0; i < mesh.vertexCount; i++) n += this.free[i]!;
    this.nFree = n;
  }
  /** r = (wm M + wa A) u on free vertices (0 on Dirichlet ones). */
  apply(u: Float64Array, r: Float64Array, wm: number, wa: number): void {
    r.fill(0);
    applyElementsNodal(this.tables, u, r, wm, wa);
    for (let i = 0; i < r.length; i++) if (!this.free[i]) r[i] = 0;
  }
}

/** PCG for (A + αM) x = b with the V-cycle; x holds the initial guess. Returns the iterations. */
function solveShifted(d: UniformP1, alpha: number, b: Float64Array, x: Float64Array, relTol: number, work: Float64Array[]): number {
  const [r, z, p, q] = work as [Float64Array, Float64Array, Float64Array, Float64Array];
  const n = b.length;
  d.apply(x, q, alpha, 1);
  for (let i = 0; i < n; i++) r[i] = b[i]! - q[i]!;
  d.pre.applyNodal(r, z, alpha);
  let rz = 0;
  for (let i = 0; i < n; i++) rz += r[i]! * z[i]!;
  const target = relTol * relTol * rz;
  p.set(z);
  let it = 0;
  while (rz > target && it < 200) {
    d.apply(p, q, alpha, 1);
    let pq = 0;
    for (let i = 0; i < n; i++) pq += p[i]! * q[i]!;
    const a = rz / pq;
    for (let i = 0; i < n; i++) { x[i] = x[i]! + a * p[i]!; r[i] = r[i]! - a * q[i]!; }
    d.pre.applyNodal(r, z, alpha);
    let rzNew = 0;
    for (let i = 0; i < n; i++) rzNew += r[i]! * z[i]!;
    const beta = rzNew / rz;
    rz = rzNew;
    for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!;
    it++;
  }
  return it;
}

/** Runs the time stepper for u0 given by its nodal interpolant `initial(x, y)`. */
export function timeStep(d: UniformP1, T: number, initial: (x: number, y: number) => number, opts: SteppingOptions): SteppingResult {
  const K = opts.steps;
  const q = opts.grading ?? 2;
  const nDamp = opts.method === 'euler' ? K : Math.min(K, opts.damping ?? 4);
  const relTol = opts.relTol ?? 1e-8;
  const mesh = d.mesh;
  const n = mesh.vertexCount;
  const times = Float64Array.from({ length: K + 1 }, (_, k) => T * (k / K) ** q);
  const u0 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (!d.free[i]) continue;
    u0[i] = initial(mesh.coords[mesh.dim * i]!, mesh.dim === 2 ? mesh.coords[2 * i + 1]! : 0);
  }
  const keep = opts.keepStates ?? true;
  const states = [u0];
  const b = new Float64Array(n);
  const work = [0, 0, 0, 0].map(() => new Float64Array(n));
  let iterations = 0;
  let prev = u0;
  for (let k = 1; k <= K; k++) {
    const tau = times[k]! - times[k - 1]!;
    const x = Float64Array.from(prev);
    if (k <= nDamp) {
      // (A + M/τ) u_k = (1/τ) M u_{k−1}
      d.apply(prev, b, 1 / tau, 0);
      iterations += solveShifted(d, 1 / tau, b, x, relTol, work);
    } else {
      // (A + 2M/τ) u_k = (2/τ) M u_{k−1} − A u_{k−1}
      d.apply(prev, b, 2 / tau, -1);
      iterations += solveShifted(d, 2 / tau, b, x, relTol, work);
    }
    opts.onStep?.(k, times[k - 1]!, times[k]!, prev, x);
    if (keep || k === K) states.push(x);
    prev = x;
  }
  return { states, times, iterations, spatialUnknowns: d.nFree, unknowns: d.nFree * K, mesh };
}

/** ‖∇(u − u_h)‖²_{L2(Ω)} at time t for the nodal vector w, degree-5 / 3-point rules per element. */
function sliceGradientError2(mesh: LeafMesh, w: Float64Array, exact: KnownSolution, t: number, g: Float64Array): number {
  const el = mesh.elements;
  const c = mesh.coords;
  let s = 0;
  if (mesh.dim === 1) {
    for (let e = 0; e < mesh.elementCount; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const x0 = c[i0]!, x1 = c[i1]!;
      const h = x1 - x0;
      const du = (w[i1]! - w[i0]!) / h;
      for (let p = 0; p < 3; p++) {
        const x = INTERVAL_POINTS[2 * p]! * x0 + INTERVAL_POINTS[2 * p + 1]! * x1;
        exact.gradient(t, x, 0, g);
        const d = g[0]! - du;
        s += Math.abs(h) * INTERVAL_WEIGHTS[p]! * d * d;
      }
    }
    return s;
  }
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const x0 = c[2 * i0]!, y0 = c[2 * i0 + 1]!, x1 = c[2 * i1]!, y1 = c[2 * i1 + 1]!, x2 = c[2 * i2]!, y2 = c[2 * i2 + 1]!;
    const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    const area = Math.abs(det) / 2;
    // gradient of the linear interpolant of w
    const w0 = w[i0]!, w1 = w[i1]!, w2 = w[i2]!;
    const gx = ((w1 - w0) * (y2 - y0) - (w2 - w0) * (y1 - y0)) / det;
    const gy = ((w2 - w0) * (x1 - x0) - (w1 - w0) * (x2 - x0)) / det;
    for (let p = 0; p < 7; p++) {
      const l0 = TRIANGLE_POINTS[3 * p]!, l1 = TRIANGLE_POINTS[3 * p + 1]!, l2 = TRIANGLE_POINTS[3 * p + 2]!;
      exact.gradient(t, l0 * x0 + l1 * x1 + l2 * x2, l0 * y0 + l1 * y1 + l2 * y2, g);
      const dx = g[0]! - gx, dy = g[1]! - gy;
      s += area * TRIANGLE_WEIGHTS[p]! * (dx * dx + dy * dy);
    }
  }
  return s;
}

/** ‖u − u_h‖_{L2(0,T; H¹₀)} of the piecewise linear-in-time interpolant of the states. */
export function steppingGradientError(r: SteppingResult, exact: KnownSolution, timePoints = 3): number {
  if (r.states.length !== r.times.length) throw new Error('steppingGradientError needs every state (keepStates: true)');
  const { nodes, weights } = gaussLegendre01(timePoints);
  const w = new Float64Array(r.mesh.vertexCount);
  const g = new Float64Array(3);
  let e2 = 0;
  for (let k = 1; k < r.states.length; k++) {
    const a = r.times[k - 1]!, h = r.times[k]! - a;
    const u0 = r.states[k - 1]!, u1 = r.states[k]!;
    for (let p = 0; p < timePoints; p++) {
      const s = nodes[p]!;
      for (let i = 0; i < w.length; i++) w[i] = (1 - s) * u0[i]! + s * u1[i]!;
      e2 += h * weights[p]! * sliceGradientError2(r.mesh, w, exact, a + h * s, g);
    }
  }
  return Math.sqrt(e2);
}
