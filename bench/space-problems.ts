/** Problem builders shared by the spatial bench suites. */
import { rectangleDomain, type SpatialDomain } from '../src/space/index';
import { unionOfTwoSorted } from '../src/space/operator-plan';

export type Kind = 'uniform' | 'graded';

export interface Problem {
  dom: SpatialDomain;
  set: Int32Array;
}

/**
 * Unit square 2 × 2, every element bisected while its diameter exceeds H·r (r = distance of its
 * centroid to the corner (0, 0)), down to 40 generations at the corner; H calibrated so that the
 * set has ≈ size free vertices.
 */
export function gradedProblem(size: number): Problem {
  const make = (H: number): Problem => {
    const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    return { dom, set: dom.adaptedSet((x, y) => H * Math.hypot(x, y), 40) };
  };
  let H = 0.5;
  let p = make(H);
  for (let it = 0; it < 4 && Math.abs(p.set.length / size - 1) > 0.1; it++) {
    H *= Math.sqrt(p.set.length / size);
    p = make(H);
  }
  return p;
}

/** A fixed pseudo-random vector (linear congruential; values in [−0.5, 0.5)). */
export function randomVector(n: number): Float64Array {
  const x = new Float64Array(n);
  let s = 12345;
  for (let i = 0; i < n; i++) {
    s = (s * 1103515245 + 12345) % 2147483648;
    x[i] = s / 2147483648 - 0.5;
  }
  return x;
}

/** Unit square 2 × 2 with every vertex up to generation G (odd G: one more bisection of every leaf). */
export function uniformGenerationProblem(G: number): Problem {
  const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
  let set = dom.uniformSet(G >> 1);
  if (G & 1) set = unionOfTwoSorted(set, dom.refineAll(set));
  return { dom, set };
}
