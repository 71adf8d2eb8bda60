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
  // order (generation, id): bucket by generation, then sort each bucket
  let maxG = 0;
  for (let k = 0; k < n; k++) {
    const g = f.vGen[closure.work[k]!]!;
    if (g > maxG) maxG = g;
  }
  const start = new Int32Array(maxG + 2);
  for (let k = 0; k < n; k++) start[f.vGen[closure.work[k]!]! + 1]!++;
  for (let g = 0; g <= maxG; g++) start[g + 1] = start[g + 1]! + start[g]!;
  const globalId = new Int32Array(n);
  const fill = start.slice(0, maxG + 1);
  for (let k = 0; k < n; k++) {
    const v = closure.work[k]!;
    globalId[fill[f.vGen[v]!]!++] = v;
  }
  for (let g = 0; g <= maxG; g++) globalId.subarray(start[g]!, start[g + 1]!).sort();
  const generation = new Int32Array(n);
  const coords = new Float64Array(n * d);
  const isFree = new Uint8Array(n);
  const local = closure.localIdx;
  for (let i = 0; i < n; i++) {
    const v = globalId[i]!;
    generation[i] = f.vGen[v]!;
    local[v] = i;
    for (let k = 0; k < d; k++) coords[i * d + k] = f.vCoord[v * d + k]!;
    isFree[i] = f.vFree[v]!;
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
    reaction: f.reaction,
    forestElement,
    memberLocal,
  };
}
