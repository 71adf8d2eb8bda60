/**
 * Values of a space-time function u = Σ c_{λν} σ_λ ⊗ φ_ν at fixed points for many times
 * (sensor histories), at a cost that does not grow with the number of times beyond O(levels) each.
 *
 * Because a hierarchical hat φ_ν is the same function in every set that contains ν, its value at a
 * point x does not depend on the fibre it is used in. So, once per point, the weights φ_ν(x) of
 * every vertex ν of the union U of all fibres are read off the leaf mesh of U (the transpose of the
 * hierarchical-to-nodal transform applied to the barycentric coordinates of x: a few vertices per
 * generation are nonzero), and, once per temporal function λ, its spatial value at the point
 * w_λ(x) = Σ_ν c_{λν} φ_ν(x). Then u(t, x) = Σ_λ σ_λ(t) w_λ(x), where at most three trial wavelets
 * per level (two at level 0) have supports containing t: they are found by a binary search in the
 * level's sorted indices. Setup: one leaf mesh of U, O(depth) work per point and one pass over the
 * coefficients; then O(levels · points) per time instead of a leaf mesh per time.
 */
import { InvalidArgumentError } from '../errors';
import { evaluateTemporal } from '../time/index';
import type { SpatialDomain } from '../space/index';
import { localIndices } from '../space/operator-plan';
import { liftingOf } from '../space/boundary-lifting';
import type { DoubleTree } from './double-tree';
import { unionSorted } from './fibre-pool';

/**
 * Spatial values w_λ(x_p) of every temporal function at every point, as `values[λ · points + p]`;
 * `inside[p]` is 0 for a point outside Ω (its row stays 0). @internal
 */
export function pointValuesPerFunction(
  domain: SpatialDomain, set: DoubleTree, coefficients: Float64Array, points: ArrayLike<number>,
): { values: Float64Array; inside: Uint8Array } {
  const d = domain.dim;
  const np = points.length / d;
  const { tree } = set;
  // Union of all fibres (each distinct fibre once) and its leaf mesh.
  const ids = new Set<number>();
  for (let i = 0; i < tree.size; i++) ids.add(set.nodeFibre[i]!);
  const union = unionSorted([...ids].map((id) => set.pool.get(id)));
  const mesh = domain.leafMesh(union);
  const n = mesh.vertexCount;
  // Per point, the nonzero weights φ_ν(x_p) by mesh vertex: CSR over vertices (point, weight).
  const entryPoint: number[] = [];
  const entryVertex: number[] = [];
  const entryWeight: number[] = [];
  const inside = new Uint8Array(np);
  const w = new Float64Array(n);
  const heap = new Int32Array(n); // max-heap of touched vertices (a vertex's parents come before it)
  const queued = new Uint8Array(n);
  const f = domain.forest;
  const local = domain.beginMeshQuery(mesh);
  try {
    for (let p = 0; p < np; p++) {
      const x = points[p * d]!, y = d === 2 ? points[p * d + 1]! : 0;
      const e = domain.locateLeaf(x, y);
      if (e < 0) continue;
      inside[p] = 1;
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
      // barycentric coordinates of x in leaf element e: the nodal weights
      const c = f.vCoord;
      if (d === 1) {
        const a = f.eVert[2 * e]!, b = f.eVert[2 * e + 1]!;
        const s = Math.min(1, Math.max(0, (x - c[a]!) / (c[b]! - c[a]!)));
        push(local[a]!, 1 - s);
        push(local[b]!, s);
      } else {
        const a = f.eVert[3 * e]!, b = f.eVert[3 * e + 1]!, g = f.eVert[3 * e + 2]!;
        const ax = c[2 * a]!, ay = c[2 * a + 1]!, bx = c[2 * b]!, by = c[2 * b + 1]!, gx = c[2 * g]!, gy = c[2 * g + 1]!;
        const det = (bx - ax) * (gy - ay) - (by - ay) * (gx - ax);
        const l1 = ((x - ax) * (gy - ay) - (y - ay) * (gx - ax)) / det;
        const l2 = ((bx - ax) * (y - ay) - (by - ay) * (x - ax)) / det;
        push(local[a]!, 1 - l1 - l2);
        push(local[b]!, l1);
        push(local[g]!, l2);
      }
      // Transpose of hierarchical → nodal (u[m] += ½(u[a] + u[b]) in increasing m): visit the
      // touched vertices in decreasing order and pass half of each weight to both parents.
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
  const start = new Int32Array(n + 1);
  for (const v of entryVertex) start[v + 1]!++;
  for (let v = 0; v < n; v++) start[v + 1]! += start[v]!;
  const fill = start.slice(0, n);
  const rowPoint = new Int32Array(entryVertex.length);
  const rowWeight = new Float64Array(entryVertex.length);
  entryVertex.forEach((v, k) => {
    rowPoint[fill[v]!] = entryPoint[k]!;
    rowWeight[fill[v]!++] = entryWeight[k]!;
  });
  // w_λ(x_p) = Σ_ν c_{λν} φ_ν(x_p), each fibre's local indices computed once.
  const values = new Float64Array(tree.size * np);
  const localOf: (Int32Array | undefined)[] = [];
  for (let i = 0; i < tree.size; i++) {
    const id = set.nodeFibre[i]!;
    const loc = (localOf[id] ??= localIndices(domain, mesh, set.pool.get(id)));
    const o = set.functionOffset[i]!;
    for (let k = 0; k < loc.length; k++) {
      const v = loc[k]!;
      const ck = coefficients[o + k]!;
      for (let q = start[v]!; q < start[v + 1]!; q++) values[i * np + rowPoint[q]!]! += ck * rowWeight[q]!;
    }
  }
  return { values, inside };
}

/**
 * u(t_k, x_p) into `out[k · points + p]` from the per-function values of
 * {@link pointValuesPerFunction}; points outside Ω get `outside`. @internal
 */
export function pointSeriesAt(
  domain: SpatialDomain, tree: DoubleTree['tree'], T: number, perFunction: { values: Float64Array; inside: Uint8Array },
  points: ArrayLike<number>, times: ArrayLike<number>, outside: number, out: Float64Array,
): void {
  const np = perFunction.inside.length;
  const { values, inside } = perFunction;
  const lifting = liftingOf(domain.forest);
  for (let k = 0; k < times.length; k++) {
    const t = times[k]!;
    const row = out.subarray(k * np, (k + 1) * np);
    row.fill(0);
    for (let l = 0; l <= tree.maxLevel; l++) {
      const a = tree.levelStart[l]!, b = tree.levelStart[l + 1]!;
      if (a === b) continue;
      // trial wavelets of level l ≥ 1 with index k have support [2k − 2, 2k + 4]·2^-l·T: those
      // nonzero at t have S/2 − 2 < k < S/2 + 1 with S = t·2^l/T, so k ∈ [⌊S/2⌋ − 1, ⌊S/2⌋ + 1]
      // (both functions at level 0)
      const s = Math.floor(((t / T) * 2 ** l) / 2);
      const lo = l === 0 ? 0 : s - 1, hi = l === 0 ? 1 : s + 1;
      let i = lowerBound(tree.index, a, b, lo);
      for (; i < b && tree.index[i]! <= hi; i++) {
        const sigma = evaluateTemporal('trial', l, tree.index[i]!, 0, t, T).value;
        if (sigma === 0) continue;
        for (let p = 0; p < np; p++) row[p]! += sigma * values[i * np + p]!;
      }
    }
    lifting.addAtPoints(t, points, row);
    for (let p = 0; p < np; p++) if (!inside[p]) row[p] = outside;
  }
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
    throw new InvalidArgumentError(`points must be a non-empty flat array of ${d === 1 ? 'x' : 'x, y'} values`, { field: 'points', expected: `length a positive multiple of ${d}`, received: points.length });
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
