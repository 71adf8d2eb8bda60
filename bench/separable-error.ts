/**
 * ‖∇(u − u_h)‖² in L2(t₀, t₁; L2(Ω)) for a P1 time-stepping solution on a 2D leaf mesh when the exact
 * solution is a product u = f(t, x)·g(t, y) (the u0 ≡ 1 square: separation of variables, common
 * practice). The rules are those of `steppingGradientError` (Gauss points in time, the degree-5
 * 7-point triangle rule in space), but the exact factors are evaluated once per *distinct*
 * coordinate of the quadrature points and time point instead of once per point: on a uniform mesh
 * of n² cells there are O(n) distinct coordinates against 7·2n² points, so the error of a fine run
 * costs about as much as its solve and can be streamed step by step (no stored states).
 */
import type { LeafMesh } from '../src/space/index';
import { timeStep, type SteppingOptions, type SteppingResult, type UniformP1 } from './time-stepping';
import { TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../src/space/quadrature';
import { gaussLegendre01 } from '../src/numerics/gauss-legendre';

/** The two factors of a product solution, each writing (value, derivative) into out. */
export interface ProductFactors {
  x(t: number, x: number, out: Float64Array): void;
  y(t: number, y: number, out: Float64Array): void;
}

export class SeparableGradientError {
  private readonly mesh: LeafMesh;
  private readonly factors: ProductFactors;
  /** Distinct x (resp. y) coordinates of the quadrature points. */
  private readonly xs: Float64Array;
  private readonly ys: Float64Array;
  /** Per element and point: the index of its x (resp. y) coordinate in xs (ys). */
  private readonly ix: Int32Array;
  private readonly iy: Int32Array;
  private readonly area: Float64Array;
  private readonly fx: Float64Array;
  private readonly dfx: Float64Array;
  private readonly fy: Float64Array;
  private readonly dfy: Float64Array;
  private readonly w: Float64Array;
  private readonly nodes: Float64Array;
  private readonly weights: Float64Array;
  private readonly out = new Float64Array(2);

  constructor(mesh: LeafMesh, factors: ProductFactors, timePoints = 3) {
    if (mesh.dim !== 2) throw new Error('SeparableGradientError: 2D meshes only');
    this.mesh = mesh;
    this.factors = factors;
    const ne = mesh.elementCount;
    const el = mesh.elements;
    const c = mesh.coords;
    this.ix = new Int32Array(7 * ne);
    this.iy = new Int32Array(7 * ne);
    this.area = new Float64Array(ne);
    // Coordinates closer than 2^-36 (relative to the unit box) are the same point reached from
    // different elements with different rounding; distinct points of a mesh are far apart.
    const keyX = new Map<number, number>();
    const keyY = new Map<number, number>();
    const xs: number[] = [];
    const ys: number[] = [];
    const lookup = (v: number, keys: Map<number, number>, list: number[]): number => {
      const key = Math.round(v * 2 ** 36);
      let j = keys.get(key);
      if (j === undefined) {
        j = list.length;
        keys.set(key, j);
        list.push(v);
      }
      return j;
    };
    for (let e = 0; e < ne; e++) {
      const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
      const x0 = c[2 * i0]!, y0 = c[2 * i0 + 1]!, x1 = c[2 * i1]!, y1 = c[2 * i1 + 1]!, x2 = c[2 * i2]!, y2 = c[2 * i2 + 1]!;
      this.area[e] = Math.abs((x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0)) / 2;
      for (let p = 0; p < 7; p++) {
        const l0 = TRIANGLE_POINTS[3 * p]!, l1 = TRIANGLE_POINTS[3 * p + 1]!, l2 = TRIANGLE_POINTS[3 * p + 2]!;
        this.ix[7 * e + p] = lookup(l0 * x0 + l1 * x1 + l2 * x2, keyX, xs);
        this.iy[7 * e + p] = lookup(l0 * y0 + l1 * y1 + l2 * y2, keyY, ys);
      }
    }
    this.xs = Float64Array.from(xs);
    this.ys = Float64Array.from(ys);
    this.fx = new Float64Array(xs.length);
    this.dfx = new Float64Array(xs.length);
    this.fy = new Float64Array(ys.length);
    this.dfy = new Float64Array(ys.length);
    this.w = new Float64Array(mesh.vertexCount);
    const g = gaussLegendre01(timePoints);
    this.nodes = Float64Array.from(g.nodes);
    this.weights = Float64Array.from(g.weights);
  }

  /** Distinct quadrature coordinates (x, y): O(n) on a uniform n × n mesh. */
  get distinctCoordinates(): [number, number] {
    return [this.xs.length, this.ys.length];
  }

  /** ∫_{t0}^{t1} ‖∇(u − u_h)‖² dt for u_h linear in time from `u0` at t0 to `u1` at t1. */
  interval(t0: number, t1: number, u0: Float64Array, u1: Float64Array): number {
    const h = t1 - t0;
    const w = this.w;
    let e2 = 0;
    for (let p = 0; p < this.nodes.length; p++) {
      const s = this.nodes[p]!;
      for (let i = 0; i < w.length; i++) w[i] = (1 - s) * u0[i]! + s * u1[i]!;
      e2 += h * this.weights[p]! * this.slice(w, t0 + h * s);
    }
    return e2;
  }

  /** ‖∇(u(t) − w)‖²_{L2(Ω)} for the nodal vector w. */
  slice(w: Float64Array, t: number): number {
    const { fx, dfx, fy, dfy, xs, ys, out } = this;
    for (let j = 0; j < xs.length; j++) {
      this.factors.x(t, xs[j]!, out);
      fx[j] = out[0]!;
      dfx[j] = out[1]!;
    }
    for (let j = 0; j < ys.length; j++) {
      this.factors.y(t, ys[j]!, out);
      fy[j] = out[0]!;
      dfy[j] = out[1]!;
    }
    const { elements: el, coords: c, elementCount: ne } = this.mesh;
    const { ix, iy, area } = this;
    let s = 0;
    for (let e = 0; e < ne; e++) {
      const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
      const x0 = c[2 * i0]!, y0 = c[2 * i0 + 1]!;
      const ax = c[2 * i1]! - x0, ay = c[2 * i1 + 1]! - y0, bx = c[2 * i2]! - x0, by = c[2 * i2 + 1]! - y0;
      const det = ax * by - bx * ay;
      const w0 = w[i0]!, d1 = w[i1]! - w0, d2 = w[i2]! - w0;
      // gradient of the linear interpolant of w on the element
      const gx = (d1 * by - d2 * ay) / det;
      const gy = (d2 * ax - d1 * bx) / det;
      let se = 0;
      for (let p = 0; p < 7; p++) {
        const jx = ix[7 * e + p]!, jy = iy[7 * e + p]!;
        const ex = dfx[jx]! * fy[jy]! - gx;
        const ey = fx[jx]! * dfy[jy]! - gy;
        se += TRIANGLE_WEIGHTS[p]! * (ex * ex + ey * ey);
      }
      s += area[e]! * se;
    }
    return s;
  }
}

/** CPU seconds of this process so far (user + system). */
function cpuNow(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/**
 * Sets up the discretisation with `setup`, runs the stepper without keeping states and streams its
 * error against the product solution. `cpu` / `seconds` are the method's own (setup and steps);
 * the evaluator's setup and every error interval are timed separately (`errorCpu`).
 */
export function timedSteppingError(
  setup: () => UniformP1,
  T: number,
  factors: ProductFactors,
  opts: SteppingOptions,
): { result: SteppingResult; error: number; cpu: number; seconds: number; setupCpu: number; errorCpu: number } {
  const t0 = performance.now();
  const c0 = cpuNow();
  const d = setup();
  const setupCpu = cpuNow() - c0;
  let excludedCpu = 0;
  let excludedWall = 0;
  const excluded = <R>(work: () => R): R => {
    const c = cpuNow();
    const w = performance.now();
    const r = work();
    excludedCpu += cpuNow() - c;
    excludedWall += performance.now() - w;
    return r;
  };
  const evaluator = excluded(() => new SeparableGradientError(d.mesh, factors));
  let e2 = 0;
  const result = timeStep(d, T, () => 1, {
    ...opts,
    keepStates: false,
    onStep: (_k, a, b, u0, u1) => excluded(() => (e2 += evaluator.interval(a, b, u0, u1))),
  });
  return {
    result,
    error: Math.sqrt(e2),
    cpu: cpuNow() - c0 - excludedCpu,
    seconds: (performance.now() - t0 - excludedWall) / 1000,
    setupCpu,
    errorCpu: excludedCpu,
  };
}

