/**
 * Extraction of the leaf mesh of a closed vertex set from the bisection forest, in the local
 * numbering of ./leaf-mesh.ts (docs/method.md §4.1–4.2). Linear in the size of the closure.
 */
import { leafBoundarySegments } from './boundary-segments';
import type { LeafMesh } from './leaf-mesh';
import type { VertexClosure } from './vertex-closure';

/** See SpatialDomain.leafMesh. */
export function extractLeafMesh(closure: VertexClosure, set: Int32Array, field = 'set'): LeafMesh & { readonly forestElement: Int32Array; readonly memberLocal: Int32Array } {
  const n = closure.markSet(set, field);
  const f = closure.forest;
  const d = closure.dim;
  // Order (generation, id): the ids sorted, then a stable bucket pass by generation. The work list
  // is already sorted up to the closure's additions (initial vertices, then the sorted set's other
  // members); only those additions (Dirichlet vertices) need sorting before a merge.
  const work = closure.work;
  let head = 1;
  while (head < n && work[head]! > work[head - 1]!) head++;
  const tail = work.slice(head, n).sort();
  const sorted = new Int32Array(n);
  for (let i = 0, a = 0, b = 0; i < n; i++) {
    sorted[i] = b >= tail.length || (a < head && work[a]! < tail[b]!) ? work[a++]! : tail[b++]!;
  }
  // One pass over the forest's generations (random access), then the buckets from local copies.
  const vGen = f.vGen;
  const genOf = new Int32Array(n);
  let maxG = 0;
  for (let k = 0; k < n; k++) {
    const g = vGen[sorted[k]!]!;
    genOf[k] = g;
    if (g > maxG) maxG = g;
  }
  const start = new Int32Array(maxG + 2);
  for (let k = 0; k < n; k++) start[genOf[k]! + 1]!++;
  for (let g = 0; g <= maxG; g++) start[g + 1] = start[g + 1]! + start[g]!;
  const globalId = new Int32Array(n);
  const fill = start.slice(0, maxG + 1);
  for (let k = 0; k < n; k++) globalId[fill[genOf[k]!]!++] = sorted[k]!;
  const generation = new Int32Array(n);
  for (let g = 0; g <= maxG; g++) generation.fill(g, start[g]!, start[g + 1]!);
  const coords = new Float64Array(n * d);
  const isFree = new Uint8Array(n);
  const local = closure.localIdx;
  const vCoord = f.vCoord;
  const vFree = f.vFree;
  for (let i = 0; i < n; i++) {
    const v = globalId[i]!;
    local[v] = i;
    for (let k = 0; k < d; k++) coords[i * d + k] = vCoord[v * d + k]!;
    isFree[i] = vFree[v]!;
  }
  const parentA = new Int32Array(n);
  const parentB = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const v = globalId[i]!;
    const a = f.vParentA[v]!;
    parentA[i] = a >= 0 ? local[a]! : -1;
    parentB[i] = a >= 0 ? local[f.vParentB[v]!]! : -1;
  }
  const nl = closure.collectLeaves();
  const nv = f.nv;
  const elements = new Int32Array(nl * nv);
  const elementMaterial = new Int32Array(nl);
  const forestElement = closure.leafBuf.slice(0, nl);
  for (let i = 0; i < nl; i++) {
    const e = forestElement[i]!;
    for (let k = 0; k < nv; k++) elements[i * nv + k] = local[f.eVert[e * nv + k]!]!;
    elementMaterial[i] = f.eMat[e]!;
  }
  const boundarySegments = leafBoundarySegments(f, forestElement, local);
  const memberLocal = new Int32Array(set.length);
  for (let i = 0; i < set.length; i++) memberLocal[i] = local[set[i]!]!;
  for (let i = 0; i < n; i++) local[globalId[i]!] = -1;
  closure.unmark(n);
  return {
    boundarySegments,
    dim: closure.dim,
    vertexCount: n,
    globalId,
    coords,
    generation,
    parentA,
    parentB,
    isFree,
    elementCount: nl,
    elements,
    elementMaterial,
    kappa: f.kappa,
    ...(f.kappaTensor !== null ? { kappaTensor: f.kappaTensor } : {}),
    reaction: f.reaction,
    forestElement,
    memberLocal,
  };
}
