/** Seeded random double trees on 1D and 2D domains for the oracle tests. */
import { intervalDomain, rectangleDomain, lShapeDomain, type SpatialDomain } from '../../src/space/index';
import { DoubleTree } from '../../src/spacetime/double-tree';
import { FibrePool } from '../../src/spacetime/fibre-pool';

export type TreeShape = 'uniform' | 'sparse' | 'graded-start' | 'graded-end' | 'random';

/**
 * Small test domains: variant 0 has a κ jump, 1 is the L-shape (2D), 2 has an insulated part and
 * reaction, 3 has all three kinds of boundary part (value, flux, convection).
 */
export function smallDomain(dim: 1 | 2, variant = 0): SpatialDomain {
  if (variant === 3) {
    return dim === 1
      ? intervalDomain(0, 1, 2, { kappa: (x) => (x < 0.5 ? 1 : 2), boundary: [{ kind: 'value', where: [[0]], value: 1 }, { kind: 'convection', where: [[2]], transferCoefficient: 3, ambient: 0.5 }] })
      : rectangleDomain(0, 1, 0, 1, 1, 1, {
        boundary: [
          { kind: 'value', where: (mx) => mx < 1e-9, value: (t) => t },
          { kind: 'convection', where: (mx) => mx > 1 - 1e-9, transferCoefficient: 2.5, ambient: 1 },
          { kind: 'flux', where: (_mx, my) => my > 1 - 1e-9, flux: 1 },
        ],
      });
  }
  if (dim === 1) {
    return variant === 2
      ? intervalDomain(0, 2, 3, { insulated: (x) => x > 1.5, reaction: 0.3, kappa: (x) => 1 + x })
      : intervalDomain(0, 1, 2, { kappa: (x) => (x < 0.5 ? 1 : 2.5), reaction: 0.5 });
  }
  if (variant === 1) return lShapeDomain(1);
  if (variant === 2) return rectangleDomain(0, 2, 0, 1, 2, 1, { insulated: (mx) => mx < 1e-9, reaction: 1 });
  return rectangleDomain(0, 1, 0, 1, 2, 2, { kappa: (x, y) => (x + y < 1 ? 1 : 3) });
}

/**
 * A random closed trial double tree. Temporal nodes are drawn according to
 * `shape`; spatial vertices from a mildly refined vertex set; then closed.
 */
export function randomDoubleTree(domain: SpatialDomain, shape: TreeShape, rand: () => number, pool = new FibrePool()): DoubleTree {
  if (shape === 'uniform') return DoubleTree.fullGrid(domain, 2, domain.dim === 1 ? 2 : 1, pool);
  if (shape === 'sparse') return DoubleTree.sparseGrid(domain, domain.dim === 1 ? 4 : 3, pool);
  const spaceLevel = domain.dim === 1 ? 3 : 2;
  let candidates = domain.uniformSet(spaceLevel);
  if (domain.dim === 2) {
    const graded = domain.refineTowards(candidates, [0.25, 0.25], 4);
    candidates = graded;
  }
  const levels: number[] = [];
  const indices: number[] = [];
  const vertices: number[] = [];
  const count = domain.dim === 1 ? 14 : 10;
  for (let p = 0; p < count; p++) {
    let l: number;
    let k: number;
    if (shape === 'random') {
      l = Math.floor(rand() * 6);
      k = l === 0 ? Math.floor(rand() * 2) : Math.floor(rand() * 2 ** (l - 1));
    } else {
      l = 1 + Math.floor(rand() * 9);
      const width = Math.min(2 ** (l - 1), 2);
      const j = Math.floor(rand() * width);
      k = shape === 'graded-start' ? j : 2 ** (l - 1) - 1 - j;
    }
    levels.push(l);
    indices.push(k);
    vertices.push(candidates[Math.floor(rand() * candidates.length)]!);
  }
  return DoubleTree.fromPairs(domain, { levels, indices, vertices }, { close: true, pool });
}
