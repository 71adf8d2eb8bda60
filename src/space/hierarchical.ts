/**
 * Hierarchical ↔ nodal transforms on a leaf mesh (docs/method.md §4.2).
 *
 * With local vertices ordered so that interpolation parents precede children,
 * T maps hierarchical coefficients h to nodal values u by
 *   u[m] = h[m] + ½ (u[a] + u[b]),
 * and Tᵀ runs the same relation in reverse order. All kernels work in place
 * on arrays of length `mesh.vertexCount`.
 */
import type { LeafMesh } from './leaf-mesh';

/** In place: v ← T v (hierarchical → nodal). */
export function hierarchicalToNodal(mesh: LeafMesh, v: Float64Array): void {
  const pa = mesh.parentA;
  const pb = mesh.parentB;
  const n = mesh.vertexCount;
  for (let m = 0; m < n; m++) {
    const a = pa[m]!;
    if (a >= 0) v[m] = v[m]! + 0.5 * (v[a]! + v[pb[m]!]!);
  }
}

/** In place: v ← T⁻¹ v (nodal → hierarchical). */
export function nodalToHierarchical(mesh: LeafMesh, v: Float64Array): void {
  const pa = mesh.parentA;
  const pb = mesh.parentB;
  for (let m = mesh.vertexCount - 1; m >= 0; m--) {
    const a = pa[m]!;
    if (a >= 0) v[m] = v[m]! - 0.5 * (v[a]! + v[pb[m]!]!);
  }
}

/** In place: v ← Tᵀ v (used to bring nodal load/residual vectors to hierarchical coordinates). */
export function hierarchicalToNodalTransposed(mesh: LeafMesh, v: Float64Array): void {
  const pa = mesh.parentA;
  const pb = mesh.parentB;
  for (let m = mesh.vertexCount - 1; m >= 0; m--) {
    const a = pa[m]!;
    if (a >= 0) {
      const h = 0.5 * v[m]!;
      v[a] = v[a]! + h;
      v[pb[m]!] = v[pb[m]!]! + h;
    }
  }
}

/** In place: v ← T⁻ᵀ v. */
export function nodalToHierarchicalTransposed(mesh: LeafMesh, v: Float64Array): void {
  const pa = mesh.parentA;
  const pb = mesh.parentB;
  const n = mesh.vertexCount;
  for (let m = 0; m < n; m++) {
    const a = pa[m]!;
    if (a >= 0) {
      const h = 0.5 * v[m]!;
      v[a] = v[a]! - h;
      v[pb[m]!] = v[pb[m]!]! - h;
    }
  }
}
