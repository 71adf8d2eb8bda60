/**
 * How far boundary data start off out of balance with the initial state: the inward conormal flux
 * n·K∇u0 that u0 carries across an initial boundary edge, against the flux the data ask for there
 * (docs/adaptivity.md §2.4). A flux part asks for q, a convection part for h(u∞ − u0); where u0
 * already carries it (a steady state, a manufactured solution), no layer starts.
 *
 * The gradient of u0 comes from differences at a step of 10⁻⁶ of the edge length (of the element's
 * length in 1D): one-sided into the element that owns the edge for the normal part, central along
 * the edge for the tangential part (2D). That is accurate to about 10⁻⁶ relative for smooth u0, far
 * below the 10⁻³ the layer test asks for.
 */
import type { BisectionForest } from './forest';

/** Outward unit normal, owning initial element and difference step of each initial boundary edge. @internal */
export interface EdgeFrames {
  /** (nx, ny) per boundary edge; ny = 0 in 1D. */
  readonly normal: Float64Array;
  /** Initial element that owns each boundary edge. */
  readonly element: Int32Array;
  /** Difference step per boundary edge. */
  readonly step: Float64Array;
}

/** The frames of all initial boundary edges of `f`. @internal */
export function boundaryEdgeFrames(f: BisectionForest): EdgeFrames {
  const b = f.boundary, d = f.dim, nv = f.nv, xy = f.vCoord;
  const nb = b.edgeCount;
  const normal = new Float64Array(2 * nb), element = new Int32Array(nb).fill(-1), step = new Float64Array(nb);
  // initial element of each pair of initial vertices (each boundary edge lies in exactly one)
  const owner = new Map<number, number>();
  const n0 = f.initialVertexCount;
  for (let e = 0; e < f.initialElementCount; e++) {
    for (let a = 0; a < nv; a++) {
      for (let c = 0; c < nv; c++) {
        if (d === 2 && a === c) continue;
        owner.set(f.eVert[nv * e + a]! * n0 + f.eVert[nv * e + c]!, e);
      }
    }
  }
  for (let k = 0; k < nb; k++) {
    const i = b.edgeVertices[2 * k]!, j = b.edgeVertices[2 * k + 1]!;
    const e = owner.get(i * n0 + j) ?? -1;
    element[k] = e;
    if (e < 0) continue;
    // the owner's vertex off the edge fixes the outward side
    let o = -1;
    for (let a = 0; a < nv; a++) { const v = f.eVert[nv * e + a]!; if (v !== i && v !== j) o = v; }
    if (d === 1) {
      const dir = Math.sign(xy[i]! - xy[o]!);
      normal[2 * k] = dir;
      step[k] = 1e-6 * Math.abs(xy[i]! - xy[o]!);
    } else {
      const tx = xy[2 * j]! - xy[2 * i]!, ty = xy[2 * j + 1]! - xy[2 * i + 1]!;
      const len = Math.hypot(tx, ty);
      let nx = ty / len, ny = -tx / len;
      if (nx * (xy[2 * o]! - xy[2 * i]!) + ny * (xy[2 * o + 1]! - xy[2 * i + 1]!) > 0) { nx = -nx; ny = -ny; }
      normal[2 * k] = nx;
      normal[2 * k + 1] = ny;
      step[k] = 1e-6 * len;
    }
  }
  return { normal, element, step };
}

/**
 * n·K∇u0 at the point (x, y) of boundary edge k (n outward; K the owning element's κ or tensor), or
 * NaN where u0 is not finite at a difference point. @internal
 */
export function conormalFlux(f: BisectionForest, frames: EdgeFrames, k: number, u0: (x: number, y: number) => number, x: number, y: number): number {
  const e = frames.element[k]!;
  if (e < 0) return 0;
  const nx = frames.normal[2 * k]!, ny = frames.normal[2 * k + 1]!, h = frames.step[k]!;
  const m = f.eMat[e]!;
  const un = (u0(x, y) - u0(x - h * nx, y - h * ny)) / h;
  if (f.dim === 1) return f.kappa[m]! * un;
  const tx = -ny, ty = nx;
  const ut = (u0(x + h * tx, y + h * ty) - u0(x - h * tx, y - h * ty)) / (2 * h);
  const gx = un * nx + ut * tx, gy = un * ny + ut * ty;
  const K = f.kappaTensor;
  if (K === null) return f.kappa[m]! * (nx * gx + ny * gy);
  return nx * (K[3 * m]! * gx + K[3 * m + 1]! * gy) + ny * (K[3 * m + 1]! * gx + K[3 * m + 2]! * gy);
}

/** n·K·n of the element that owns boundary edge k: the diffusivity across the edge. @internal */
export function normalDiffusivity(f: BisectionForest, frames: EdgeFrames, k: number): number {
  const e = frames.element[k]!;
  if (e < 0) return Infinity;
  const m = f.eMat[e]!;
  const K = f.kappaTensor;
  if (K === null) return f.kappa[m]!;
  const nx = frames.normal[2 * k]!, ny = frames.normal[2 * k + 1]!;
  return K[3 * m]! * nx * nx + 2 * K[3 * m + 1]! * nx * ny + K[3 * m + 2]! * ny * ny;
}
