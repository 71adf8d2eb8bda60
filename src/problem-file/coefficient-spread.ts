/**
 * How much κ and c vary inside the initial elements. The library takes both constant per initial
 * element, at its centroid (README, "What it solves"), so a coefficient that varies inside an
 * element is replaced by a piecewise-constant one: a change of the model that refinement does not
 * undo and the estimator does not see. The front end measures the largest relative variation at
 * interior points of every initial element (points strictly inside, so a coefficient that jumps
 * along element edges, as at a material interface, shows none) and reports where it is largest.
 */
import type { LeafMesh } from './core';

/** The largest variation of one coefficient inside an initial element. */
export interface CoefficientSpread {
  /** The problem-file field. */
  readonly field: 'diffusion' | 'reaction';
  /** max |v(p) − v(centroid)| / max |v| over the element's sample points (0 … 2). */
  readonly relative: number;
  /** Centroid of the initial element where it is largest ([x, 0] in 1D). */
  readonly centroid: readonly [number, number];
}

/** Barycentric sample points strictly inside a triangle (two 3-point orbits) and an interval. */
const TRI = [[2 / 3, 1 / 6, 1 / 6], [1 / 6, 2 / 3, 1 / 6], [1 / 6, 1 / 6, 2 / 3], [0.5, 0.25, 0.25], [0.25, 0.5, 0.25], [0.25, 0.25, 0.5]];
const SEG = [[0.9, 0.1], [0.7, 0.3], [0.3, 0.7], [0.1, 0.9]];

/**
 * The element of `mesh` (the initial mesh) where `coef` varies most, or null if it is constant
 * per element up to rounding.
 */
export function coefficientSpread(mesh: LeafMesh, field: CoefficientSpread['field'], coef: (x: number, y: number) => number): CoefficientSpread | null {
  const dim = mesh.dim;
  const nv = dim + 1;
  const points = dim === 2 ? TRI : SEG;
  let worst: CoefficientSpread | null = null;
  for (let e = 0; e < mesh.elementCount; e++) {
    let cx = 0, cy = 0;
    for (let j = 0; j < nv; j++) {
      const v = mesh.elements[nv * e + j]!;
      cx += mesh.coords[dim * v]! / nv;
      if (dim === 2) cy += mesh.coords[dim * v + 1]! / nv;
    }
    const c = coef(cx, cy);
    let scale = Math.abs(c), spread = 0;
    for (const b of points) {
      let x = 0, y = 0;
      for (let j = 0; j < nv; j++) {
        const v = mesh.elements[nv * e + j]!;
        x += b[j]! * mesh.coords[dim * v]!;
        if (dim === 2) y += b[j]! * mesh.coords[dim * v + 1]!;
      }
      const value = coef(x, y);
      scale = Math.max(scale, Math.abs(value));
      spread = Math.max(spread, Math.abs(value - c));
    }
    const relative = scale > 0 ? spread / scale : 0;
    if (relative > 1e-12 && (worst === null || relative > worst.relative)) worst = { field, relative, centroid: [cx, cy] };
  }
  return worst;
}
