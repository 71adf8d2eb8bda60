/**
 * The shortest diffusion time of the initial mesh, min over initial elements e of h_e² / κ_e with
 * h_e the element's shortest edge: the time scale below which the coarsest spatial resolution can
 * no longer follow a solution that starts off the boundary values (docs/adaptivity.md §2).
 */
import type { SpatialDomain } from './domain';
import type { BisectionForest } from './forest';

/** @internal */
export function shortestDiffusionTime(domain: SpatialDomain): number {
  const f = domain.forest;
  let tau = Infinity;
  for (let e = 0; e < f.initialElementCount; e++) tau = Math.min(tau, elementDiffusionTime(f, e));
  return tau;
}

/** h²/κ of forest element e, with h its shortest edge. @internal */
export function elementDiffusionTime(f: BisectionForest, e: number): number {
  return squaredEdgeRange(f, e, true) / f.kappa[f.eMat[e]!]!;
}

/** Diameter (longest edge) of forest element e. @internal */
export function elementDiameter(f: BisectionForest, e: number): number {
  return Math.sqrt(squaredEdgeRange(f, e, false));
}

/** The shortest (or longest) squared edge length of forest element e. */
function squaredEdgeRange(f: BisectionForest, e: number, shortest: boolean): number {
  const nv = f.nv;
  const d = f.dim;
  let best = shortest ? Infinity : 0;
  for (let a = 0; a < nv; a++) {
    for (let b = a + 1; b < nv; b++) {
      const p = f.eVert[e * nv + a]!, q = f.eVert[e * nv + b]!;
      let s = 0;
      for (let k = 0; k < d; k++) s += (f.vCoord[p * d + k]! - f.vCoord[q * d + k]!) ** 2;
      best = shortest ? Math.min(best, s) : Math.max(best, s);
    }
  }
  return best;
}
