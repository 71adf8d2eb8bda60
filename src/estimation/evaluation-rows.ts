/**
 * Point evaluations of a discrete space-time function as a linear map E from its coefficients
 * (one row per point (t_k, x_k)), with its transpose. Every functional of this module is a
 * weighted least-squares sum over such rows, so its gradient with respect to the coefficients is
 * exactly Eᵀ W (E u − d) — the derivative of the value that is computed, not of a continuous model.
 *
 * Rows are grouped by time. For one time t only the O(levels) trial functions whose support
 * contains t are nonzero; u(t, ·) is a P1 function on the leaf mesh of the union of their fibres
 * (hierarchical hats do not depend on the set they are used in), so a row is a barycentric
 * combination of three (two in 1D) nodal values of that mesh. A slice stores its active
 * functions, the leaf mesh, the local index of every fibre entry and, per row, the vertices and
 * barycentric weights: apply and transpose are passes over these flat arrays. Slices serve the
 * quadrature rows of the tracking integrals (many points at one time); sensor readings (few points
 * at many times) use src/spacetime/point-series.ts instead, and both enter the functionals as an
 * {@link EvaluationBlock}.
 */
import { InvalidArgumentError } from '../errors';
import type { SpatialDomain } from '../space/index';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from '../space/hierarchical';
import type { LeafMesh } from '../space/leaf-mesh';
import { localIndices } from '../space/operator-plan';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../space/quadrature';
import type { DoubleTree } from '../spacetime/double-tree';
import { positionsIn, unionSorted } from '../spacetime/fibre-pool';
import { evaluateTemporal } from '../time/index';

/** The rows of E that share one time. */
export interface EvaluationSlice {
  readonly t: number;
  /** Active trial functions at t and their values σ_f(t). */
  readonly functions: Int32Array;
  readonly sigma: Float64Array;
  /** Coefficient offset of each active function and, per fibre entry, its local mesh vertex. */
  readonly offsets: Int32Array;
  readonly localOf: Int32Array[];
  readonly mesh: LeafMesh;
  /** Rows: `dim + 1` local vertices and barycentric weights each. */
  readonly rowCount: number;
  readonly vertices: Int32Array;
  readonly bary: Float64Array;
  /** Weight w_k and target d_k of each row. */
  readonly weights: Float64Array;
  readonly targets: Float64Array;
  /** Scratch of length mesh.vertexCount. */
  readonly scratch: Float64Array;
}

/** Active trial functions at t, the union of their fibres and its leaf mesh. */
export function sliceFrame(domain: SpatialDomain, trialSet: DoubleTree, T: number, t: number) {
  const { tree } = trialSet;
  const fns: number[] = [];
  const vals: number[] = [];
  for (let i = 0; i < tree.size; i++) {
    if (trialSet.fibre(i).length === 0) continue;
    const v = evaluateTemporal('trial', tree.level[i]!, tree.index[i]!, 0, t, T).value;
    if (v !== 0) {
      fns.push(i);
      vals.push(v);
    }
  }
  const fibres = fns.map((i) => trialSet.fibre(i));
  const set = unionSorted(fibres);
  const mesh = domain.leafMesh(set);
  const loc = localIndices(domain, mesh, set);
  const localOf = fibres.map((fib) => {
    const pos = positionsIn(fib, set);
    const out = new Int32Array(pos.length);
    for (let p = 0; p < pos.length; p++) out[p] = loc[pos[p]!]!;
    return out;
  });
  return {
    functions: Int32Array.from(fns),
    sigma: Float64Array.from(vals),
    offsets: Int32Array.from(fns, (i) => trialSet.functionOffset[i]!),
    localOf,
    mesh,
  };
}

/**
 * Rows at the quadrature points (degree-5 rules) of every leaf element of the slice mesh whose
 * point satisfies `inside`; weight = timeWeight · |element| · rule weight, target = target(x, y).
 */
export function quadratureSlice(
  domain: SpatialDomain, trialSet: DoubleTree, T: number, t: number, timeWeight: number,
  inside: (x: number, y: number) => boolean, target: (x: number, y: number) => number, field: string,
): EvaluationSlice {
  const frame = sliceFrame(domain, trialSet, T, t);
  const { mesh } = frame;
  const d = mesh.dim;
  const el = mesh.elements, xy = mesh.coords;
  const verts: number[] = [];
  const bary: number[] = [];
  const w: number[] = [];
  const tg: number[] = [];
  const push = (vs: number[], ls: number[], weight: number, x: number, y: number) => {
    if (!inside(x, y)) return;
    const v = target(x, y);
    if (!Number.isFinite(v)) {
      throw new InvalidArgumentError(`${field}(${d === 1 ? x : `${x}, ${y}`}) at t = ${t} returned ${v}; expected a finite number`, { field, received: v });
    }
    verts.push(...vs);
    bary.push(...ls);
    w.push(weight);
    tg.push(v);
  };
  if (d === 1) {
    for (let e = 0; e < mesh.elementCount; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const h = Math.abs(xy[i1]! - xy[i0]!);
      for (let q = 0; q < INTERVAL_WEIGHTS.length; q++) {
        const l0 = INTERVAL_POINTS[2 * q]!, l1 = INTERVAL_POINTS[2 * q + 1]!;
        push([i0, i1], [l0, l1], timeWeight * h * INTERVAL_WEIGHTS[q]!, l0 * xy[i0]! + l1 * xy[i1]!, 0);
      }
    }
  } else {
    for (let e = 0; e < mesh.elementCount; e++) {
      const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
      const x0 = xy[2 * i0]!, y0 = xy[2 * i0 + 1]!, x1 = xy[2 * i1]!, y1 = xy[2 * i1 + 1]!, x2 = xy[2 * i2]!, y2 = xy[2 * i2 + 1]!;
      const area = 0.5 * Math.abs((x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0));
      for (let q = 0; q < TRIANGLE_WEIGHTS.length; q++) {
        const l0 = TRIANGLE_POINTS[3 * q]!, l1 = TRIANGLE_POINTS[3 * q + 1]!, l2 = TRIANGLE_POINTS[3 * q + 2]!;
        push([i0, i1, i2], [l0, l1, l2], timeWeight * area * TRIANGLE_WEIGHTS[q]!, l0 * x0 + l1 * x1 + l2 * x2, l0 * y0 + l1 * y1 + l2 * y2);
      }
    }
  }
  return {
    t, ...frame, rowCount: w.length, vertices: Int32Array.from(verts), bary: Float64Array.from(bary),
    weights: Float64Array.from(w), targets: Float64Array.from(tg), scratch: new Float64Array(mesh.vertexCount),
  };
}

/** out[k] = (E u)_k for the rows of one slice (out has length ≥ rowCount). */
export function applySlice(s: EvaluationSlice, u: Float64Array, out: Float64Array): void {
  const nodal = s.scratch;
  nodal.fill(0);
  for (let a = 0; a < s.functions.length; a++) {
    const map = s.localOf[a]!;
    const o = s.offsets[a]!;
    const sg = s.sigma[a]!;
    for (let p = 0; p < map.length; p++) nodal[map[p]!]! += sg * u[o + p]!;
  }
  hierarchicalToNodal(s.mesh, nodal);
  const k1 = s.mesh.dim + 1;
  for (let r = 0; r < s.rowCount; r++) {
    let v = 0;
    for (let j = 0; j < k1; j++) v += s.bary[k1 * r + j]! * nodal[s.vertices[k1 * r + j]!]!;
    out[r] = v;
  }
}

/** g += Eᵀ r for the rows of one slice. */
export function applySliceTransposed(s: EvaluationSlice, r: Float64Array, g: Float64Array): void {
  const nodal = s.scratch;
  nodal.fill(0);
  const k1 = s.mesh.dim + 1;
  for (let k = 0; k < s.rowCount; k++) {
    const rk = r[k]!;
    for (let j = 0; j < k1; j++) nodal[s.vertices[k1 * k + j]!]! += s.bary[k1 * k + j]! * rk;
  }
  hierarchicalToNodalTransposed(s.mesh, nodal);
  for (let a = 0; a < s.functions.length; a++) {
    const map = s.localOf[a]!;
    const o = s.offsets[a]!;
    const sg = s.sigma[a]!;
    for (let p = 0; p < map.length; p++) g[o + p]! += sg * nodal[map[p]!]!;
  }
}

/**
 * A group of rows of E with their weights and targets, as the functionals use them: slices of one
 * time (./evaluation-rows) or sensor histories (src/spacetime/point-series.ts). @internal
 */
export interface EvaluationBlock {
  readonly rowCount: number;
  readonly weights: Float64Array;
  readonly targets: Float64Array;
  /** out[k] = (E u)_k for the block's rows. */
  apply(u: Float64Array, out: Float64Array): void;
  /** g += Eᵀ r. */
  applyTransposed(r: Float64Array, g: Float64Array): void;
  /** The same rows with every weight times alpha. */
  scaled(alpha: number): EvaluationBlock;
}

/** The rows of one time slice as an {@link EvaluationBlock}. @internal */
export class SliceBlock implements EvaluationBlock {
  constructor(private readonly s: EvaluationSlice) {}
  get rowCount(): number { return this.s.rowCount; }
  get weights(): Float64Array { return this.s.weights; }
  get targets(): Float64Array { return this.s.targets; }
  apply(u: Float64Array, out: Float64Array): void { applySlice(this.s, u, out); }
  applyTransposed(r: Float64Array, g: Float64Array): void { applySliceTransposed(this.s, r, g); }
  scaled(alpha: number): EvaluationBlock {
    return new SliceBlock({ ...this.s, weights: this.s.weights.map((w) => alpha * w), scratch: new Float64Array(this.s.mesh.vertexCount) });
  }
}
