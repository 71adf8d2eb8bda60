/** Hierarchical diagonals used by the estimator: V-cycle hierarchy vs the independent dense reference. */
import { describe, expect, it } from 'vitest';
import { intervalDomain, lShapeDomain, rectangleDomain } from '../../src/index';
import { MultilevelPreconditioner } from '../../src/space/multigrid/index';
import { hierarchicalDiagonals } from '../../src/space/hierarchical-diagonals';
import { denseSpatialMatrices } from '../space/reference';

/** The domains (with their sets) on which both diagonals are compared with the dense reference. */
const CASES = [
    ['interval with variable κ and reaction', () => intervalDomain(0, 2, 3, { kappa: (x) => 1 + x, reaction: 0.7 })],
    ['square, graded', () => rectangleDomain(0, 1, 0, 1, 2, 2, { kappa: (x, y) => (x + y < 1 ? 1 : 4), reaction: 1 })],
    ['L-shape', () => lShapeDomain(1)],
    ['square with a tensor rotated per element', () => rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: (x, y) => ({ xx: 1 + x, xy: 0.4 * (y - 0.5), yy: 3 - y }), reaction: 0.5 })],
    ['interval with convection at one end, held value at the other', () => intervalDomain(0, 2, 3, { boundary: [{ kind: 'convection', where: [[3]], transferCoefficient: 2.5 }, { kind: 'value', where: [[0]], value: 1 }] })],
    ['square with value, flux and convection parts (h varies)', () => rectangleDomain(0, 1, 0, 1, 2, 2, {
      kappa: (x) => (x < 0.5 ? 1 : 3),
      boundary: [
        { kind: 'convection', where: (_mx, my) => my < 1e-9, transferCoefficient: (mx) => 1 + 4 * mx },
        { kind: 'convection', where: (mx) => mx < 1e-9, transferCoefficient: 0.5 },
        { kind: 'flux', where: (_mx, my) => my > 1 - 1e-9, flux: 1 },
        { kind: 'value', where: (mx) => mx > 1 - 1e-9, value: 2 },
      ],
    })],
  ] as const;

function caseSet(make: (typeof CASES)[number][1]) {
  const domain = make();
  let set = domain.uniformSet(2);
  if (domain.dim === 2) set = domain.refineTowards(set, [0.1, 0.1], 5);
  return { domain, set, ...denseSpatialMatrices(domain, set, set) };
}

describe('hierarchical diagonals of the V-cycle hierarchy', () => {
  it.each(CASES)('%s', (_name, make) => {
    const { domain, set, M, A } = caseSet(make);
    const mesh = domain.leafMesh(set);
    const d = new MultilevelPreconditioner(mesh).hierarchicalDiagonals();
    const pos = new Map<number, number>();
    for (let i = 0; i < mesh.vertexCount; i++) pos.set(mesh.globalId[i]!, i);
    set.forEach((v, p) => {
      const i = pos.get(v)!;
      expect(d.A[i]).toBeCloseTo(A[p]![p]!, 10);
      expect(d.M[i]).toBeCloseTo(M[p]![p]!, 12);
    });
  });
});

describe('per-vertex hierarchical diagonals from the forest', () => {
  it.each(CASES)('%s: equal the dense reference', (_name, make) => {
    const { domain, set, M, A } = caseSet(make);
    const d = hierarchicalDiagonals(domain);
    set.forEach((v, p) => {
      expect(d.A[v]).toBeCloseTo(A[p]![p]!, 10);
      expect(d.M[v]).toBeCloseTo(M[p]![p]!, 12);
    });
  });
});
