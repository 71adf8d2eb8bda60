/**
 * Values of a space-time function u = Σ c_{λν} σ_λ ⊗ φ_ν at fixed points for many times (sensor
 * histories, and the observation operator of sensor data), at a cost that does not grow with the
 * number of times beyond O(levels · points) each.
 *
 * Because a hierarchical hat φ_ν is the same function in every set that contains ν, its value at a
 * point x does not depend on the fibre it is used in. So, once per point, the weights φ_ν(x) of the
 * vertices ν of the union U of all fibres are read off the leaf mesh of U (the transpose of the
 * hierarchical-to-nodal transform applied to the barycentric coordinates of x: a few vertices per
 * generation are nonzero). An application then forms, for each temporal function λ active at one
 * of the times, w_λ(x) = Σ_ν c_{λν} φ_ν(x) over the few ν with a weight, and u(t, x) =
 * Σ_λ σ_λ(t) w_λ(x), where at most three trial wavelets per level (two at level 0) are nonzero at
 * t; they are found once, by a binary search in each level's sorted indices. A time no longer
 * costs a leaf mesh of the functions active at it.
 */
import { InvalidArgumentError } from '../errors';
import { checkMemory } from '../validation/index';
import { evaluateTemporal } from '../time/index';
import type { SpatialDomain } from '../space/index';
import { localIndices } from '../space/operator-plan';
import { leafBarycentric } from '../space/evaluate';
import type { LeafMesh } from '../space/leaf-mesh';
import type { DoubleTree } from './double-tree';
import { unionSorted } from './fibre-pool';

/**
 * The linear map E from coefficients u on a trial set to the values u(t_k, x_p) at fixed points for
 * given times, rows time-major (row k · points + p), with its transpose; the part of the function
 * that lives in the coefficients (a lifting of held boundary values is the caller's). Points outside
 * Ω have `inside[p] = 0` and rows of zeros. Module comment: how. @internal
 */
export class PointSeriesOperator {
  readonly timeCount: number;
  readonly pointCount: number;
  readonly rowCount: number;
  readonly inside: Uint8Array;
  // Per-point weights φ_ν(x_p) as CSR over the mesh vertices of the union of all fibres.
  private readonly vStart: Int32Array;
  private readonly rowPoint: Int32Array;
  private readonly rowWeight: Float64Array;
  // Temporal functions active at some time and seen by some point ("used", by slot): the
  // coefficients with a point weight, as coefficient index and mesh vertex, slot by slot.
  private readonly usedCount: number;
  private readonly slotStart: Int32Array;
  private readonly entryCoef: Int32Array;
  private readonly entryVertex: Int32Array;
  // Per time: its active functions as used slots, with σ(t).
  private readonly actStart: Int32Array;
  private readonly actSlot: Int32Array;
  private readonly actSigma: Float64Array;
  private readonly work: Float64Array; // used slots × points

  constructor(domain: SpatialDomain, set: DoubleTree, T: number, times: ArrayLike<number>, points: ArrayLike<number>) {
    const d = domain.dim;
    const np = points.length / d;
    this.timeCount = times.length;
    this.pointCount = np;
    this.rowCount = times.length * np;
    const { tree } = set;
    // the work array holds a value per (active temporal function, point): at most nodes × points
    checkMemory(8 * tree.size * np, `point values of ${tree.size} temporal functions at ${np} points`, 'points', 'use fewer points per call');
    // Union of all fibres (each distinct fibre once) and its leaf mesh.
    const ids = new Set<number>();
    for (let i = 0; i < tree.size; i++) ids.add(set.nodeFibre[i]!);
    const union = unionSorted([...ids].map((id) => set.pool.get(id)));
    const mesh = domain.leafMesh(union);
    const { vStart, rowPoint, rowWeight, inside } = pointWeights(domain, mesh, points);
    this.vStart = vStart;
    this.rowPoint = rowPoint;
    this.rowWeight = rowWeight;
    this.inside = inside;
    // Per distinct fibre id: positions in the fibre of the vertices with weights, and those vertices.
    const hitPos: Int32Array[] = [];
    const hitVertex: Int32Array[] = [];
    for (const id of ids) {
      const loc = localIndices(domain, mesh, set.pool.get(id));
      const pos: number[] = [];
      for (let k = 0; k < loc.length; k++) if (vStart[loc[k]!]! < vStart[loc[k]! + 1]!) pos.push(k);
      hitPos[id] = Int32Array.from(pos);
      hitVertex[id] = Int32Array.from(pos, (k) => loc[k]!);
    }
    // Active functions per time (at most three per level, two at level 0), found by binary search.
    const slotOf = new Int32Array(tree.size).fill(-1);
    const used: number[] = [];
    const actStart = new Int32Array(times.length + 1);
    const actSlot: number[] = [];
    const actSigma: number[] = [];
    for (let k = 0; k < times.length; k++) {
      const t = times[k]!;
      for (let l = 0; l <= tree.maxLevel; l++) {
        const a = tree.levelStart[l]!, b = tree.levelStart[l + 1]!;
        if (a === b) continue;
        // trial wavelets of level l ≥ 1 with index k have support [2k − 2, 2k + 4]·2^-l·T: those
        // nonzero at t have S/2 − 2 < k < S/2 + 1 with S = t·2^l/T, so k ∈ [⌊S/2⌋ − 1, ⌊S/2⌋ + 1]
        // (both functions at level 0)
        const s = Math.floor(((t / T) * 2 ** l) / 2);
        const lo = l === 0 ? 0 : s - 1, hi = l === 0 ? 1 : s + 1;
        for (let i = lowerBound(tree.index, a, b, lo); i < b && tree.index[i]! <= hi; i++) {
          if (hitPos[set.nodeFibre[i]!]!.length === 0) continue;
          const sigma = evaluateTemporal('trial', l, tree.index[i]!, 0, t, T).value;
          if (sigma === 0) continue;
          if (slotOf[i] < 0) {
            slotOf[i] = used.length;
            used.push(i);
          }
          actSlot.push(slotOf[i]!);
          actSigma.push(sigma);
        }
      }
      actStart[k + 1] = actSlot.length;
    }
    this.usedCount = used.length;
    this.slotStart = new Int32Array(used.length + 1);
    used.forEach((i, slot) => { this.slotStart[slot + 1] = this.slotStart[slot]! + hitPos[set.nodeFibre[i]!]!.length; });
    this.entryCoef = new Int32Array(this.slotStart[used.length]!);
    this.entryVertex = new Int32Array(this.entryCoef.length);
    used.forEach((i, slot) => {
      const id = set.nodeFibre[i]!, o = set.functionOffset[i]!, at = this.slotStart[slot]!;
      hitPos[id]!.forEach((k, j) => { this.entryCoef[at + j] = o + k; this.entryVertex[at + j] = hitVertex[id]![j]!; });
    });
    this.actStart = actStart;
    this.actSlot = Int32Array.from(actSlot);
    this.actSigma = Float64Array.from(actSigma);
    this.work = new Float64Array(used.length * np);
  }

  /** out[k · points + p] = (E u) at (t_k, x_p); overwrites rowCount entries. */
  apply(u: Float64Array, out: Float64Array): void {
    const np = this.pointCount;
    const W = this.work;
    W.fill(0);
    const { vStart, rowPoint, rowWeight, slotStart, entryCoef, entryVertex } = this;
    // W[s, p] = w_λ(x_p) = Σ_ν u_{λν} φ_ν(x_p) for the used functions λ
    for (let s = 0; s < this.usedCount; s++) {
      for (let j = slotStart[s]!; j < slotStart[s + 1]!; j++) {
        const c = u[entryCoef[j]!]!, v = entryVertex[j]!;
        for (let q = vStart[v]!; q < vStart[v + 1]!; q++) W[s * np + rowPoint[q]!]! += c * rowWeight[q]!;
      }
    }
    out.fill(0, 0, this.rowCount);
    for (let k = 0; k < this.timeCount; k++) {
      for (let a = this.actStart[k]!; a < this.actStart[k + 1]!; a++) {
        const s = this.actSlot[a]!, sigma = this.actSigma[a]!;
        for (let p = 0; p < np; p++) out[k * np + p]! += sigma * W[s * np + p]!;
      }
    }
  }

  /** g += Eᵀ r (r has rowCount entries, time-major). */
  applyTransposed(r: Float64Array, g: Float64Array): void {
    const np = this.pointCount;
    const R = this.work;
    R.fill(0);
    for (let k = 0; k < this.timeCount; k++) {
      for (let a = this.actStart[k]!; a < this.actStart[k + 1]!; a++) {
        const s = this.actSlot[a]!, sigma = this.actSigma[a]!;
        for (let p = 0; p < np; p++) R[s * np + p]! += sigma * r[k * np + p]!;
      }
    }
    const { vStart, rowPoint, rowWeight, slotStart, entryCoef, entryVertex } = this;
    // g_{λν} += Σ_p φ_ν(x_p) R[s, p]
    for (let s = 0; s < this.usedCount; s++) {
      for (let j = slotStart[s]!; j < slotStart[s + 1]!; j++) {
        let acc = 0;
        for (let q = vStart[entryVertex[j]!]!; q < vStart[entryVertex[j]! + 1]!; q++) acc += rowWeight[q]! * R[s * np + rowPoint[q]!]!;
        g[entryCoef[j]!]! += acc;
      }
    }
  }
}

/**
 * The weights φ_ν(x_p) of every mesh vertex ν at every point, as CSR over the vertices
 * (vStart, rowPoint, rowWeight): the barycentric coordinates of x_p in its leaf element, pushed
 * through the transpose of the hierarchical-to-nodal transform (u[m] += ½(u[a] + u[b]) in
 * increasing m), visiting only the touched vertices, in decreasing order (a max-heap).
 */
function pointWeights(domain: SpatialDomain, mesh: LeafMesh, points: ArrayLike<number>): { vStart: Int32Array; rowPoint: Int32Array; rowWeight: Float64Array; inside: Uint8Array } {
  const d = domain.dim;
  const np = points.length / d;
  const n = mesh.vertexCount;
  const entryPoint: number[] = [];
  const entryVertex: number[] = [];
  const entryWeight: number[] = [];
  const inside = new Uint8Array(np);
  const w = new Float64Array(n);
  const heap = new Int32Array(n);
  const queued = new Uint8Array(n);
  let size = 0;
  const push = (v: number, weight: number): void => {
    w[v]! += weight;
    if (queued[v]) return;
    queued[v] = 1;
    let k = size++;
    while (k > 0) {
      const up = (k - 1) >> 1;
      if (heap[up]! >= v) break;
      heap[k] = heap[up]!;
      k = up;
    }
    heap[k] = v;
  };
  const baryVertex = new Int32Array(3);
  const baryWeight = new Float64Array(3);
  const local = domain.beginMeshQuery(mesh);
  try {
    for (let p = 0; p < np; p++) {
      const x = points[p * d]!, y = d === 2 ? points[p * d + 1]! : 0;
      const e = domain.locateLeaf(x, y);
      if (e < 0) continue;
      inside[p] = 1;
      const nv = leafBarycentric(domain, e, x, y, baryVertex, baryWeight);
      for (let k = 0; k < nv; k++) push(local[baryVertex[k]!]!, baryWeight[k]!);
      while (size > 0) {
        const m = heap[0]!;
        const last = heap[--size]!;
        let k = 0;
        for (;;) {
          let child = 2 * k + 1;
          if (child >= size) break;
          if (child + 1 < size && heap[child + 1]! > heap[child]!) child++;
          if (heap[child]! <= last) break;
          heap[k] = heap[child]!;
          k = child;
        }
        if (size > 0) heap[k] = last;
        queued[m] = 0;
        const weight = w[m]!;
        w[m] = 0;
        if (weight === 0) continue;
        entryPoint.push(p);
        entryVertex.push(m);
        entryWeight.push(weight);
        const pa = mesh.parentA[m]!;
        if (pa >= 0) {
          push(pa, 0.5 * weight);
          push(mesh.parentB[m]!, 0.5 * weight);
        }
      }
    }
  } finally {
    domain.endMeshQuery(mesh);
  }
  const vStart = new Int32Array(n + 1);
  for (const v of entryVertex) vStart[v + 1]!++;
  for (let v = 0; v < n; v++) vStart[v + 1]! += vStart[v]!;
  const fill = vStart.slice(0, n);
  const rowPoint = new Int32Array(entryVertex.length);
  const rowWeight = new Float64Array(entryVertex.length);
  entryVertex.forEach((v, k) => {
    rowPoint[fill[v]!] = entryPoint[k]!;
    rowWeight[fill[v]!++] = entryWeight[k]!;
  });
  return { vStart, rowPoint, rowWeight, inside };
}

/** First position in [a, b) of the sorted `index` with a value ≥ v. */
function lowerBound(index: Float64Array, a: number, b: number, v: number): number {
  while (a < b) {
    const m = (a + b) >>> 1;
    if (index[m]! < v) a = m + 1;
    else b = m;
  }
  return a;
}

/** Checks the times (in [0, T]) and points (finite, pairs in 2D) of a point series before any work. @internal */
export function checkSeriesInput(domain: SpatialDomain, T: number, times: ArrayLike<number>, points: ArrayLike<number>): void {
  const d = domain.dim;
  if (points.length % d !== 0 || points.length === 0) {
    throw new InvalidArgumentError(`points must be a non-empty flat array of ${d === 1 ? 'x' : 'x, y'} values${d === 2 ? ` (x0, y0, x1, y1, …); found ${points.length} numbers` : ''}`, { field: 'points', expected: `length a positive multiple of ${d}`, received: points.length });
  }
  for (let k = 0; k < times.length; k++) {
    const t = times[k]!;
    if (!(typeof t === 'number' && t >= 0 && t <= T)) throw new InvalidArgumentError(`times[${k}] = ${t} is outside [0, ${T}]`, { field: `times[${k}]`, expected: `[0, ${T}]`, received: t });
  }
  for (let i = 0; i < points.length; i++) {
    const v = points[i]!;
    if (!(typeof v === 'number' && Number.isFinite(v))) throw new InvalidArgumentError(`points[${i}] = ${v} is not a finite number`, { field: `points[${i}]`, expected: 'a finite number', received: v });
  }
}
