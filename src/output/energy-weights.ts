/**
 * The weights of the energy a(e, e) = ∫_Ω K∇e·∇e + c e² dx of the spatial form (docs/method.md §1;
 * docs/error-norms.md §9), per initial element of a leaf mesh's domain: four numbers per material
 * m, (Kxx, Kxy, Kyy, c), with K = κ·I for isotropic diffusion (Kxx = κ in 1D). The convection term
 * h∫_Γ e² of boundary parts that exchange heat is integrated separately (./error-boundary).
 */
import type { LeafMesh } from '../space/leaf-mesh';

/** (Kxx, Kxy, Kyy, c) of every material (initial element) of `mesh`, 4 numbers each. */
export function energyWeights(mesh: LeafMesh): Float64Array {
  const n = mesh.kappa.length;
  const w = new Float64Array(4 * n);
  const K = mesh.kappaTensor;
  for (let m = 0; m < n; m++) {
    if (K !== undefined) {
      w[4 * m] = K[3 * m]!;
      w[4 * m + 1] = K[3 * m + 1]!;
      w[4 * m + 2] = K[3 * m + 2]!;
    } else {
      w[4 * m] = mesh.kappa[m]!;
      w[4 * m + 2] = mesh.dim === 2 ? mesh.kappa[m]! : 0;
    }
    w[4 * m + 3] = mesh.reaction[m]!;
  }
  return w;
}

/** K∇a·∇b for the weights of material m (gradients (ax, ay), (bx, by); ay = by = 0 in 1D). */
export function weightedDot(w: Float64Array, m: number, ax: number, ay: number, bx: number, by: number): number {
  const o = 4 * m;
  return w[o]! * ax * bx + w[o + 1]! * (ax * by + ay * bx) + w[o + 2]! * ay * by;
}
