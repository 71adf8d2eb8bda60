/**
 * How much κ and c vary inside the initial elements, and h along the initial convection edges. The
 * library takes κ and c constant per initial element, at its centroid (README, "What it solves"),
 * and h constant per initial boundary edge, at its midpoint, so a coefficient that varies there is
 * replaced by a piecewise-constant one: a change of the model that refinement does not undo and the
 * estimator does not see. The front end measures the largest relative variation at interior points
 * of every initial element or edge (points strictly inside, so a coefficient that jumps at element
 * edges or vertices, as at a material interface, shows none) and reports where it is largest.
 */
import type { LeafMesh } from './core';

/** The largest variation of one coefficient inside an initial element. */
export interface CoefficientSpread {
  /** The problem-file field: `diffusion`, `reaction` or `boundary[p].transferCoefficient`. */
  readonly field: 'diffusion' | 'diffusion.xx' | 'diffusion.xy' | 'diffusion.yy' | 'reaction' | `boundary[${number}].transferCoefficient`;
  /** max |v(p) − v(centroid)| / max |v| over the element's (edge's) sample points (0 … 2). */
  readonly relative: number;
  /** Centroid of the initial element (midpoint of the initial boundary edge) where it is largest ([x, 0] in 1D). */
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

/**
 * The initial boundary edge of part `part` where the transfer coefficient `h` varies most along the
 * edge, or null if it is constant per edge up to rounding (always in 1D, where edges are points).
 * `mesh` is the initial mesh and `edgePart` the part of each initial boundary edge.
 */
export function transferSpread(mesh: LeafMesh, edgePart: Int32Array, part: number, h: (x: number, y: number) => number): CoefficientSpread | null {
  const bs = mesh.boundarySegments;
  if (mesh.dim === 1 || !bs) return null;
  const xy = mesh.coords;
  let worst: CoefficientSpread | null = null;
  for (let s = 0; s < bs.count; s++) {
    if (edgePart[bs.edge[s]!] !== part) continue;
    const i0 = bs.vertices[2 * s]!, i1 = bs.vertices[2 * s + 1]!;
    const at = (b: number): [number, number] => [(1 - b) * xy[2 * i0]! + b * xy[2 * i1]!, (1 - b) * xy[2 * i0 + 1]! + b * xy[2 * i1 + 1]!];
    const mid = at(0.5);
    const c = h(mid[0], mid[1]);
    let scale = Math.abs(c), spread = 0;
    for (const [, b] of SEG) {
      const value = h(...at(b!));
      scale = Math.max(scale, Math.abs(value));
      spread = Math.max(spread, Math.abs(value - c));
    }
    const relative = scale > 0 ? spread / scale : 0;
    if (relative > 1e-12 && (worst === null || relative > worst.relative)) worst = { field: `boundary[${part}].transferCoefficient`, relative, centroid: mid };
  }
  return worst;
}
