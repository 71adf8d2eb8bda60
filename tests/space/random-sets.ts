/** Seeded random domains and closed vertex sets for the spatial tests. */
import type { SpatialDomain } from '../../src/space/index';
import { rng } from '../helpers/random';

export { rng };

/** A random point of the bounding box [x0, x1] × [y0, y1]. */
function randomPoint(r: () => number, dim: 1 | 2, box: number[]): number[] {
  const x = box[0]! + r() * (box[1]! - box[0]!);
  return dim === 1 ? [x] : [x, box[2]! + r() * (box[3]! - box[2]!)];
}

function bbox(domain: SpatialDomain): number[] {
  const b = [Infinity, -Infinity, Infinity, -Infinity];
  for (let v = 0; v < domain.initialVertexCount; v++) {
    const x = domain.coordinate(v, 0), y = domain.dim === 2 ? domain.coordinate(v, 1) : 0;
    b[0] = Math.min(b[0]!, x); b[1] = Math.max(b[1]!, x); b[2] = Math.min(b[2]!, y); b[3] = Math.max(b[3]!, y);
  }
  return b;
}

/** Grows the forest (uniform level plus grading toward random points) and returns the grown closed set. */
export function growForest(domain: SpatialDomain, r: () => number, level: number, spots: number, generations: number): Int32Array {
  let set = domain.uniformSet(level);
  const box = bbox(domain);
  for (let s = 0; s < spots; s++) {
    const p = randomPoint(r, domain.dim, box);
    set = domain.refineTowards(set, p, generations);
  }
  return set;
}

/** Closure of a random subset (each vertex kept with probability p) of `from`. */
export function randomClosedSubset(domain: SpatialDomain, from: Int32Array, r: () => number, p: number): Int32Array {
  const ids: number[] = [];
  for (const v of from) if (r() < p) ids.push(v);
  return domain.close(ids);
}

/** Random vector with entries in (−1, 1). */
export function randomVector(r: () => number, n: number): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = 2 * r() - 1;
  return x;
}

export function matVec(A: number[][], x: ArrayLike<number>): Float64Array {
  const y = new Float64Array(A.length);
  for (let i = 0; i < A.length; i++) {
    let s = 0;
    const row = A[i]!;
    for (let j = 0; j < row.length; j++) s += row[j]! * x[j]!;
    y[i] = s;
  }
  return y;
}

export function relErr(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let num = 0, den = 0;
  for (let i = 0; i < a.length; i++) {
    num += (a[i]! - b[i]!) ** 2;
    den += b[i]! ** 2;
  }
  return Math.sqrt(num / Math.max(den, 1e-300));
}
