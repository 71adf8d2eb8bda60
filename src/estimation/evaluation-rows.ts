/**
 * Point evaluations of a discrete space-time function as a linear map E from its coefficients
 * (one row per point (t_k, x_k)), with its transpose. Every functional of this module is a
 * weighted least-squares sum over such rows, so its gradient with respect to the coefficients is
 * exactly Eᵀ W (E u − d) — the derivative of the value that is computed, not of a continuous model.
 *
 * Rows are grouped by time. For one time t only the O(levels) trial functions whose support
 * contains t are nonzero; u(t, ·) is a P1 function on the leaf mesh of the union of their fibres
 * (hierarchical hats do not depend on the set they are used in), so a row is a barycentric
 * combination of three (two in 1D) nodal values of that mesh. A frame stores the active
 * functions, the leaf mesh and the local index of every fibre entry, and is shared by the time
 * points of one interval between temporal breakpoints; the rows are stored once per frame as
 * (element, rule point) with a spatial weight; a slice adds σ_f(t) and the targets: apply and
 * transpose are passes over these flat arrays. Slices serve the
 * quadrature rows of the tracking integrals (many points at one time); sensor readings (few points
 * at many times) use src/spacetime/point-series.ts instead, and both enter the functionals as an
 * {@link EvaluationBlock}.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import type { SpatialDomain } from '../space/index';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from '../space/hierarchical';
import type { LeafMesh } from '../space/leaf-mesh';
import { localIndices } from '../space/operator-plan';
import { INTERVAL_POINTS, INTERVAL_WEIGHTS, TRIANGLE_POINTS, TRIANGLE_WEIGHTS } from '../space/quadrature';
import type { DoubleTree } from '../spacetime/double-tree';
import { FibrePool, positionsIn, unionSorted } from '../spacetime/fibre-pool';
import { evaluateTemporal } from '../time/index';

/**
 * The active trial functions of one stretch of time (an interval between consecutive temporal
 * breakpoints, or one instant), the union of their fibres and its leaf mesh. The time points of a
 * tracking integral inside one interval share it: only the values σ_f(t) differ between them.
 */
export interface SliceFrame {
  readonly functions: Int32Array;
  /** Coefficient offset of each active function and, per fibre entry, its local mesh vertex. */
  readonly offsets: Int32Array;
  readonly localOf: Int32Array[];
  readonly mesh: LeafMesh;
  /** Scratch of length mesh.vertexCount (the blocks of a functional are applied one at a time; frames on one mesh share it). */
  readonly scratch: Float64Array;
}

/**
 * Leaf meshes of the frames of one functional, by their vertex set. The frames of different
 * intervals often have the same mesh (on adaptive sets the fibre of the coarsest temporal function
 * holds nearly every vertex, and it is active everywhere), so each distinct mesh is built once,
 * with its local numbering, scratch and (see {@link quadratureRows}) rows.
 */
export class FrameMeshes {
  // Equal vertex sets get one id (a pool of the functional's own, not the trial set's).
  private readonly ids = new FibrePool();
  private readonly byId: FrameMesh[] = [];

  constructor(private readonly domain: SpatialDomain) {}

  get(set: Int32Array): FrameMesh {
    const id = this.ids.intern(set);
    let m = this.byId[id];
    if (m === undefined) {
      const mesh = this.domain.leafMesh(set);
      m = { set, mesh, loc: localIndices(this.domain, mesh, set), scratch: new Float64Array(mesh.vertexCount), rows: null };
      this.byId[id] = m;
    }
    return m;
  }
}

/** A leaf mesh of {@link FrameMeshes} with what the frames on it share. */
export interface FrameMesh {
  readonly set: Int32Array;
  readonly mesh: LeafMesh;
  /** Local vertex of every entry of `set`. */
  readonly loc: Int32Array;
  readonly scratch: Float64Array;
  /** The quadrature rows of the functional on this mesh, once made. */
  rows: QuadratureRows | null;
}

/**
 * The frame of the trial functions that do not vanish at one of `times` (all in one interval
 * between breakpoints, or a single instant), and σ_f(t) for every time (0 where one vanishes).
 */
export function sliceFrame(
  domain: SpatialDomain, trialSet: DoubleTree, T: number, times: readonly number[], meshes = new FrameMeshes(domain),
): { frame: SliceFrame; sigma: Float64Array[]; shared: FrameMesh } {
  const { tree } = trialSet;
  const fns: number[] = [];
  const vals: number[][] = times.map(() => []);
  for (let i = 0; i < tree.size; i++) {
    if (trialSet.fibre(i).length === 0) continue;
    const v = times.map((t) => evaluateTemporal('trial', tree.level[i]!, tree.index[i]!, 0, t, T).value);
    if (v.some((x) => x !== 0)) {
      fns.push(i);
      v.forEach((x, k) => vals[k]!.push(x));
    }
  }
  const fibres = fns.map((i) => trialSet.fibre(i));
  const shared = meshes.get(unionSorted(fibres));
  const { set, loc, mesh, scratch } = shared;
  const localOf = fibres.map((fib) => {
    const pos = positionsIn(fib, set);
    const out = new Int32Array(pos.length);
    for (let p = 0; p < pos.length; p++) out[p] = loc[pos[p]!]!;
    return out;
  });
  const frame: SliceFrame = { functions: Int32Array.from(fns), offsets: Int32Array.from(fns, (i) => trialSet.functionOffset[i]!), localOf, mesh, scratch };
  return { frame, sigma: vals.map((v) => Float64Array.from(v)), shared };
}

/** Barycentric coordinates of the degree-5 rule's points (dim + 1 per point) and its weights. */
function rule(dim: number): { points: Float64Array; weights: Float64Array } {
  return dim === 1 ? { points: INTERVAL_POINTS, weights: INTERVAL_WEIGHTS } : { points: TRIANGLE_POINTS, weights: TRIANGLE_WEIGHTS };
}

/**
 * Quadrature rows of a region on a frame's mesh: the points of the degree-5 rule on every leaf
 * element that satisfy `inside`. Stored per element (its index and a bit per rule point), with the
 * spatial weight |element| · rule weight per row, so that all time points of an interval share one
 * copy (a row costs 8 bytes here instead of its vertices and barycentric weights at every time).
 */
export interface QuadratureRows {
  readonly count: number;
  readonly elements: Int32Array;
  /** Bit q set: rule point q of the element is a row. */
  readonly points: Uint8Array;
  readonly weights: Float64Array;
}

/** The rows of {@link QuadratureRows} on `mesh` whose point satisfies `inside`. */
export function quadratureRows(mesh: LeafMesh, inside: (x: number, y: number) => boolean): QuadratureRows {
  const d = mesh.dim, k1 = d + 1;
  const { points: P, weights: W } = rule(d);
  const nq = W.length;
  const el = mesh.elements, xy = mesh.coords;
  const elements: number[] = [];
  const bits: number[] = [];
  const w: number[] = [];
  for (let e = 0; e < mesh.elementCount; e++) {
    let size: number;
    if (d === 1) size = Math.abs(xy[el[2 * e + 1]!]! - xy[el[2 * e]!]!);
    else {
      const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
      size = 0.5 * Math.abs((xy[2 * i1]! - xy[2 * i0]!) * (xy[2 * i2 + 1]! - xy[2 * i0 + 1]!) - (xy[2 * i2]! - xy[2 * i0]!) * (xy[2 * i1 + 1]! - xy[2 * i0 + 1]!));
    }
    let mask = 0;
    for (let q = 0; q < nq; q++) {
      rulePoint(mesh, e, P, k1 * q);
      if (!inside(pt[0]!, pt[1]!)) continue;
      mask |= 1 << q;
      w.push(size * W[q]!);
    }
    if (mask !== 0) {
      elements.push(e);
      bits.push(mask);
    }
  }
  return { count: w.length, elements: Int32Array.from(elements), points: Uint8Array.from(bits), weights: Float64Array.from(w) };
}

// The point of rulePoint (module scratch: building is synchronous).
const pt = new Float64Array(2);

/** Writes into `pt` the rule point with barycentric coordinates P[o..o+dim] in leaf element e. */
function rulePoint(mesh: LeafMesh, e: number, P: Float64Array, o: number): void {
  const el = mesh.elements, xy = mesh.coords;
  if (mesh.dim === 1) {
    pt[0] = P[o]! * xy[el[2 * e]!]! + P[o + 1]! * xy[el[2 * e + 1]!]!;
    pt[1] = 0;
    return;
  }
  const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
  const l0 = P[o]!, l1 = P[o + 1]!, l2 = P[o + 2]!;
  pt[0] = l0 * xy[2 * i0]! + l1 * xy[2 * i1]! + l2 * xy[2 * i2]!;
  pt[1] = l0 * xy[2 * i0 + 1]! + l1 * xy[2 * i1 + 1]! + l2 * xy[2 * i2 + 1]!;
}

/** target(x, y) at every row (in row order), each checked to be finite. */
export function rowTargets(mesh: LeafMesh, rows: QuadratureRows, target: (x: number, y: number) => number, field: string, t: number): Float64Array {
  const k1 = mesh.dim + 1;
  const P = rule(mesh.dim).points;
  const nq = P.length / k1;
  const out = new Float64Array(rows.count);
  let r = 0;
  for (let i = 0; i < rows.elements.length; i++) {
    const e = rows.elements[i]!, mask = rows.points[i]!;
    for (let q = 0; q < nq; q++) {
      if (!((mask >> q) & 1)) continue;
      rulePoint(mesh, e, P, k1 * q);
      const x = pt[0]!, y = pt[1]!;
      const v = target(x, y);
      if (!Number.isFinite(v)) {
        throw new InvalidArgumentError(`${field}(${mesh.dim === 1 ? x : `${x}, ${y}`}) at t = ${t} returned ${describeValue(v)}; expected a finite number`, { field, received: v });
      }
      out[r++] = v;
    }
  }
  return out;
}

/** The rows of E at one time t: a frame, the σ_f(t) of its functions, and quadrature rows on its mesh. */
export interface EvaluationSlice {
  readonly t: number;
  readonly frame: SliceFrame;
  readonly sigma: Float64Array;
  readonly rows: QuadratureRows;
}

/** The nodal values of u(t, ·) on the slice's mesh, in the frame's scratch. */
function nodalValues(s: EvaluationSlice, u: Float64Array): Float64Array {
  const { frame, sigma } = s;
  const nodal = frame.scratch;
  nodal.fill(0);
  for (let a = 0; a < frame.functions.length; a++) {
    const sg = sigma[a]!;
    if (sg === 0) continue;
    const map = frame.localOf[a]!;
    const o = frame.offsets[a]!;
    for (let p = 0; p < map.length; p++) nodal[map[p]!]! += sg * u[o + p]!;
  }
  hierarchicalToNodal(frame.mesh, nodal);
  return nodal;
}

/** out[k] = (E u)_k for the rows of one slice (out has length ≥ its row count). */
export function applySlice(s: EvaluationSlice, u: Float64Array, out: Float64Array): void {
  const nodal = nodalValues(s, u);
  const mesh = s.frame.mesh, el = mesh.elements, k1 = mesh.dim + 1;
  const P = rule(mesh.dim).points;
  const nq = P.length / k1;
  const { elements, points } = s.rows;
  let r = 0;
  for (let i = 0; i < elements.length; i++) {
    const o = k1 * elements[i]!, mask = points[i]!;
    for (let q = 0; q < nq; q++) {
      if (!((mask >> q) & 1)) continue;
      let v = 0;
      for (let j = 0; j < k1; j++) v += P[k1 * q + j]! * nodal[el[o + j]!]!;
      out[r++] = v;
    }
  }
}

/** g += Eᵀ r for the rows of one slice. */
export function applySliceTransposed(s: EvaluationSlice, r: Float64Array, g: Float64Array): void {
  const { frame, sigma } = s;
  const nodal = frame.scratch;
  nodal.fill(0);
  const mesh = frame.mesh, el = mesh.elements, k1 = mesh.dim + 1;
  const P = rule(mesh.dim).points;
  const nq = P.length / k1;
  const { elements, points } = s.rows;
  let k = 0;
  for (let i = 0; i < elements.length; i++) {
    const o = k1 * elements[i]!, mask = points[i]!;
    for (let q = 0; q < nq; q++) {
      if (!((mask >> q) & 1)) continue;
      const rk = r[k++]!;
      for (let j = 0; j < k1; j++) nodal[el[o + j]!]! += P[k1 * q + j]! * rk;
    }
  }
  hierarchicalToNodalTransposed(mesh, nodal);
  for (let a = 0; a < frame.functions.length; a++) {
    const sg = sigma[a]!;
    if (sg === 0) continue;
    const map = frame.localOf[a]!;
    const o = frame.offsets[a]!;
    for (let p = 0; p < map.length; p++) g[o + p]! += sg * nodal[map[p]!]!;
  }
}

/**
 * A group of rows of E with their weights and targets, as the functionals use them: slices of one
 * time (./evaluation-rows) or sensor histories (src/spacetime/point-series.ts). @internal
 */
export interface EvaluationBlock {
  readonly rowCount: number;
  /** The weight of row k is scale · weights[k] (a scaled block shares its rows' weights). */
  readonly scale: number;
  readonly weights: Float64Array;
  readonly targets: Float64Array;
  /** out[k] = (E u)_k for the block's rows. */
  apply(u: Float64Array, out: Float64Array): void;
  /** g += Eᵀ r. */
  applyTransposed(r: Float64Array, g: Float64Array): void;
  /** The same rows with every weight times alpha. */
  scaled(alpha: number): EvaluationBlock;
}

/** The rows of one time slice as an {@link EvaluationBlock}: weight scale · |element| · rule weight. @internal */
export class SliceBlock implements EvaluationBlock {
  constructor(private readonly s: EvaluationSlice, readonly scale: number, readonly targets: Float64Array) {}
  get rowCount(): number { return this.s.rows.count; }
  get weights(): Float64Array { return this.s.rows.weights; }
  apply(u: Float64Array, out: Float64Array): void { applySlice(this.s, u, out); }
  applyTransposed(r: Float64Array, g: Float64Array): void { applySliceTransposed(this.s, r, g); }
  scaled(alpha: number): EvaluationBlock { return new SliceBlock(this.s, alpha * this.scale, this.targets); }
}
