/**
 * Refinement strategies on the bisection forest of a domain (docs/method.md §4.1): uniform sets, one
 * bisection of every leaf, interior refinement, refinement toward a point or segment, and meshes
 * graded by a mesh-size function. Each returns a closed free vertex set (or the new part of one).
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { segmentMeetsElement } from './geometry';
import { BYTES_PER_FOREST_VERTEX, checkFunction, checkMemory, memoryBudget } from '../validation/index';
import type { VertexClosure } from './vertex-closure';

/** See SpatialDomain.uniformSet. */
export function uniformSet(closure: VertexClosure, level: number): Int32Array {
  if (!Number.isInteger(level) || level < 0 || level > 60) {
    throw new InvalidArgumentError(`level must be an integer in [0, 60], received ${describeValue(level)}`, {
      field: 'level',
      expected: 'integer in [0, 60]',
      received: level,
    });
  }
  const f = closure.forest;
  const maxGen = level * closure.dim;
  // NVB halves element measure per generation: about initialElements · 2^maxGen leaves, half as many vertices in 2D.
  const vertices = f.initialVertexCount + (f.initialElementCount * 2 ** maxGen) / closure.dim;
  checkMemory(vertices * BYTES_PER_FOREST_VERTEX, `the uniform set of level ${level} (about ${vertices.toExponential(1)} vertices)`, 'level', 'choose a lower level');
  const created: number[] = [];
  let sp = 0;
  for (let e = 0; e < f.initialElementCount; e++) sp = closure.pushStack(sp, e);
  while (sp > 0) {
    const e = closure.stack[--sp]!;
    if (f.eGen[e]! >= maxGen) continue;
    const m = f.bisect(e);
    if (f.vGen[m]! <= maxGen) created.push(m);
    const c = f.eChild[e]!;
    sp = closure.pushStack(sp, c);
    sp = closure.pushStack(sp, c + 1);
  }
  return closure.close(created);
}

/** See SpatialDomain.refineAll. */
export function refineAll(closure: VertexClosure, set: Int32Array): Int32Array {
  let n = closure.markSet(set, 'set');
  const nl = closure.collectLeaves();
  const leaves = closure.leafBuf.slice(0, nl);
  const mids: number[] = [];
  for (let i = 0; i < nl; i++) mids.push(closure.forest.bisect(leaves[i]!));
  const start = n;
  n = closure.addMidpoints(mids, n);
  const fr = closure.forest.vFree;
  const out: number[] = [];
  for (let k = start; k < n; k++) if (fr[closure.work[k]!]) out.push(closure.work[k]!);
  closure.unmark(n);
  return Int32Array.from(out).sort();
}

/** See SpatialDomain.refineInterior. */
export function refineInterior(closure: VertexClosure, set: Int32Array, generations: number, extra = 4): Int32Array {
  if (!Number.isInteger(generations) || generations < 1 || generations > 8) {
    throw new InvalidArgumentError(`generations must be an integer in [1, 8], received ${describeValue(generations)}`, {
      field: 'generations',
      expected: 'integer in [1, 8]',
      received: generations,
    });
  }
  let n = closure.markSet(set, 'set');
  const nl = closure.collectLeaves();
  const leaves = closure.leafBuf.slice(0, nl);
  const f = closure.forest;
  const mids: number[] = [];
  // Per leaf: breadth-first over its descendants, one generation per round.
  let front: number[] = [];
  let next: number[] = [];
  for (let i = 0; i < nl; i++) {
    front.length = 0;
    front.push(leaves[i]!);
    let freeFound = false;
    for (let g = 0; g < generations + extra && front.length > 0; g++) {
      if (g >= generations && freeFound) break;
      next.length = 0;
      for (const e of front) {
        const m = f.bisect(e);
        mids.push(m);
        if (f.vFree[m]) freeFound = true;
        const c = f.eChild[e]!;
        next.push(c, c + 1);
      }
      const t = front;
      front = next;
      next = t;
    }
  }
  const start = n;
  n = closure.addMidpoints(mids, n);
  const fr = f.vFree;
  const out: number[] = [];
  for (let k = start; k < n; k++) if (fr[closure.work[k]!]) out.push(closure.work[k]!);
  closure.unmark(n);
  return Int32Array.from(out).sort();
}

/** See SpatialDomain.refineTowards. */
export function refineTowards(closure: VertexClosure, set: Int32Array, point: number[], generations: number): Int32Array {
  const d = closure.dim;
  if (!Array.isArray(point) || (point.length !== d && point.length !== 2 * d) || point.some((p) => !Number.isFinite(p))) {
    throw new InvalidArgumentError(`point must be ${d} (a point) or ${2 * d} (a segment) finite numbers, received ${JSON.stringify(point)}`, {
      field: 'point',
      expected: `${d} or ${2 * d} finite numbers`,
      received: JSON.stringify(point),
    });
  }
  if (!Number.isInteger(generations) || generations < 0 || generations > 200) {
    throw new InvalidArgumentError(`generations must be an integer in [0, 200], received ${describeValue(generations)}`, {
      field: 'generations',
      expected: 'integer in [0, 200]',
      received: generations,
    });
  }
  const q = point.length === d ? [...point, ...point] : point;
  const f = closure.forest;
  let n = closure.markSet(set, 'set');
  const hits: number[] = [];
  for (let g = 0; g < generations; g++) {
    hits.length = 0;
    let sp = 0;
    for (let e = 0; e < f.initialElementCount; e++) if (segmentMeetsElement(f, e, q)) sp = closure.pushStack(sp, e);
    while (sp > 0) {
      const e = closure.stack[--sp]!;
      const m = f.eMid[e]!;
      if (m >= 0 && closure.mark[m]! & 1) {
        const c = f.eChild[e]!;
        if (segmentMeetsElement(f, c, q)) sp = closure.pushStack(sp, c);
        if (segmentMeetsElement(f, c + 1, q)) sp = closure.pushStack(sp, c + 1);
      } else hits.push(e);
    }
    n = closure.addMidpoints(hits.map((e) => f.bisect(e)), n);
  }
  const out = closure.freeSorted(n);
  closure.unmark(n);
  return out;
}

/** See SpatialDomain.adaptedSet. */
export function adaptedSet(closure: VertexClosure, meshSize: (x: number, y: number) => number, maxGeneration: number): Int32Array {
  checkFunction(meshSize, 'meshSize', 'a function (x, y) => h');
  if (!Number.isInteger(maxGeneration) || maxGeneration < 0 || maxGeneration > 200) {
    throw new InvalidArgumentError(`maxGeneration must be an integer in [0, 200], received ${describeValue(maxGeneration)}`, {
      field: 'maxGeneration',
      expected: 'integer in [0, 200]',
      received: maxGeneration,
    });
  }
  const f = closure.forest;
  const d = closure.dim, nv = f.nv;
  const created: number[] = [];
  // The final size is unknown in advance: refuse once the forest would outgrow the memory budget.
  const maxVertices = memoryBudget() / BYTES_PER_FOREST_VERTEX;
  let sp = 0;
  for (let e = 0; e < f.initialElementCount; e++) sp = closure.pushStack(sp, e);
  while (sp > 0) {
    const e = closure.stack[--sp]!;
    if (f.eGen[e]! >= maxGeneration) continue;
    if (f.vertexCount >= maxVertices) {
      checkMemory(f.vertexCount * BYTES_PER_FOREST_VERTEX * 2, `adaptedSet with maxGeneration ${maxGeneration} (already ${f.vertexCount} vertices, still refining)`, 'meshSize', 'ask for a coarser meshSize or a lower maxGeneration');
    }
    let cx = 0, cy = 0, diam = 0;
    for (let k = 0; k < nv; k++) {
      const v = f.eVert[e * nv + k]!;
      cx += f.vCoord[v * d]! / nv;
      if (d === 2) cy += f.vCoord[v * d + 1]! / nv;
    }
    // The refinement edge is the longest edge of an NVB element up to a bounded factor; use it as diameter.
    const a = f.eVert[e * nv]!, b = f.eVert[e * nv + 1]!;
    for (let k = 0; k < d; k++) diam += (f.vCoord[a * d + k]! - f.vCoord[b * d + k]!) ** 2;
    diam = Math.sqrt(diam);
    const h: unknown = meshSize(cx, cy);
    if (typeof h !== 'number' || Number.isNaN(h) || h < 0) {
      throw new InvalidArgumentError(`meshSize(${cx}, ${cy}) returned ${describeValue(h)}; expected a number ≥ 0 (Infinity: no refinement)`, {
        field: 'meshSize',
        expected: 'a number ≥ 0',
        received: describeValue(h),
      });
    }
    if (!(diam > h)) continue;
    created.push(f.bisect(e));
    const c = f.eChild[e]!;
    sp = closure.pushStack(sp, c);
    sp = closure.pushStack(sp, c + 1);
  }
  return closure.close(created);
}
