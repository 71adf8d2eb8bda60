/** Shared helpers for the Poisson convergence checks: CG in hierarchical coordinates and error norms. */
import { SpatialOperatorPlan, loadVector, nodalValues, type SpatialDomain } from '../../src/space/index';
import { TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../../src/space/quadrature';

/** Unpreconditioned conjugate gradients for y = A x (A SPD); returns the iteration count. */
export function conjugateGradient(apply: (x: Float64Array, y: Float64Array) => void, b: Float64Array, x: Float64Array, relTol: number, maxIt: number): number {
  const n = b.length;
  const r = new Float64Array(n), p = new Float64Array(n), q = new Float64Array(n);
  apply(x, q);
  for (let i = 0; i < n; i++) r[i] = b[i]! - q[i]!;
  p.set(r);
  let rr = r.reduce((s, v) => s + v * v, 0);
  const stop = relTol * relTol * b.reduce((s, v) => s + v * v, 0);
  for (let it = 0; it < maxIt; it++) {
    if (rr <= stop) return it;
    apply(p, q);
    let pq = 0;
    for (let i = 0; i < n; i++) pq += p[i]! * q[i]!;
    const alpha = rr / pq;
    for (let i = 0; i < n; i++) {
      x[i] = x[i]! + alpha * p[i]!;
      r[i] = r[i]! - alpha * q[i]!;
    }
    const rr2 = r.reduce((s, v) => s + v * v, 0);
    const beta = rr2 / rr;
    rr = rr2;
    for (let i = 0; i < n; i++) p[i] = r[i]! + beta * p[i]!;
  }
  throw new Error(`CG did not converge in ${maxIt} iterations`);
}

/** Solves −Δu = f with the Galerkin method on `set`; returns L2 and H¹-seminorm errors against u. */
export function poissonErrors(
  dom: SpatialDomain, set: Int32Array, f: (x: number, y: number) => number,
  u: (x: number, y: number) => number, grad: (x: number, y: number) => [number, number],
): { l2: number; h1: number; iterations: number } {
  const plan = new SpatialOperatorPlan(dom, set, set);
  const b = loadVector(dom, set, f);
  const x = new Float64Array(set.length);
  const iterations = conjugateGradient((v, y) => plan.apply(v, 0, y, 0, 0, 1), b, x, 1e-11, 5000);
  const { mesh, values } = nodalValues(dom, set, x);
  let l2 = 0, h1 = 0;
  const xy = mesh.coords;
  for (let e = 0; e < mesh.elementCount; e++) {
    const i = [mesh.elements[3 * e]!, mesh.elements[3 * e + 1]!, mesh.elements[3 * e + 2]!];
    const X = i.map((k) => xy[2 * k]!), Y = i.map((k) => xy[2 * k + 1]!), U = i.map((k) => values[k]!);
    const det = (X[1]! - X[0]!) * (Y[2]! - Y[0]!) - (X[2]! - X[0]!) * (Y[1]! - Y[0]!);
    const area = det / 2;
    // constant gradient of the linear interpolant
    const gx = ((U[1]! - U[0]!) * (Y[2]! - Y[0]!) - (U[2]! - U[0]!) * (Y[1]! - Y[0]!)) / det;
    const gy = ((X[1]! - X[0]!) * (U[2]! - U[0]!) - (X[2]! - X[0]!) * (U[1]! - U[0]!)) / det;
    for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
      const l = [TRIANGLE_POINTS[3 * q]!, TRIANGLE_POINTS[3 * q + 1]!, TRIANGLE_POINTS[3 * q + 2]!];
      const px = l[0]! * X[0]! + l[1]! * X[1]! + l[2]! * X[2]!, py = l[0]! * Y[0]! + l[1]! * Y[1]! + l[2]! * Y[2]!;
      const uh = l[0]! * U[0]! + l[1]! * U[1]! + l[2]! * U[2]!;
      const [ux, uy] = grad(px, py);
      const w = TRIANGLE_WEIGHTS[q]! * area;
      l2 += w * (u(px, py) - uh) ** 2;
      h1 += w * ((ux - gx) ** 2 + (uy - gy) ** 2);
    }
  }
  return { l2: Math.sqrt(l2), h1: Math.sqrt(h1), iterations };
}

/** Least-squares slope of log y against log x. */
export function slope(x: number[], y: number[]): number {
  const lx = x.map(Math.log), ly = y.map(Math.log);
  const mx = lx.reduce((a, b) => a + b, 0) / lx.length, my = ly.reduce((a, b) => a + b, 0) / ly.length;
  let num = 0, den = 0;
  for (let i = 0; i < lx.length; i++) {
    num += (lx[i]! - mx) * (ly[i]! - my);
    den += (lx[i]! - mx) ** 2;
  }
  return num / den;
}
