/** Hierarchical ↔ nodal transform kernels of src/space/hierarchical.ts on random leaf meshes. */
import { describe, expect, it } from 'vitest';
import {
  hierarchicalToNodal, hierarchicalToNodalTransposed, nodalToHierarchical, nodalToHierarchicalTransposed,
} from '../../src/space/hierarchical';
import { intervalDomain, lShapeDomain, rectangleDomain, triangulatedDomain, type SpatialDomain } from '../../src/space/index';
import { denseTransform } from './reference';
import { growForest, matVec, randomClosedSubset, randomVector, relErr, rng } from './random-sets';

const dot = (a: Float64Array, b: Float64Array) => a.reduce((s, v, i) => s + v * b[i]!, 0);

const cases: [string, () => SpatialDomain][] = [
  ['interval', () => intervalDomain(0, 1, 2)],
  ['square', () => rectangleDomain(0, 1, 0, 1, 2, 2)],
  ['L-shape', () => lShapeDomain(1, { insulated: (x) => x < -0.99 })],
  // non-matching longest-edge labelling (edge [2, 3] is the refinement edge of one neighbour only)
  ['unstructured', () => triangulatedDomain([0, 0, 2, 0, 3, 1, 1.2, 0.9, 0, 2, 2.5, 2.4], [[0, 1, 3], [1, 2, 3], [0, 3, 4], [3, 2, 5], [3, 5, 4]])],
];

describe('hierarchical transforms', () => {
  for (const [name, make] of cases) {
    it(`${name}: T∘T⁻¹ = I, T⁻¹∘T = I, adjoints, and T equals the explicit hat expansion`, () => {
      const r = rng(name.charCodeAt(0));
      for (let trial = 0; trial < 6; trial++) {
        const dom = make();
        const grown = growForest(dom, r, dom.dim === 1 ? 3 : 2, 3, 8);
        const set = randomClosedSubset(dom, grown, r, 0.1 + 0.5 * r());
        const mesh = dom.leafMesh(set);
        const n = mesh.vertexCount;
        for (let i = 0; i < n; i++) {
          if (mesh.parentA[i]! >= 0) {
            expect(mesh.parentA[i]!).toBeLessThan(i);
            expect(mesh.parentB[i]!).toBeLessThan(i);
            expect(mesh.generation[i]!).toBeGreaterThan(mesh.generation[mesh.parentA[i]!]!);
          }
        }
        const x = randomVector(r, n), y = randomVector(r, n);
        const v = x.slice();
        hierarchicalToNodal(mesh, v);
        nodalToHierarchical(mesh, v);
        expect(relErr(v, x)).toBeLessThan(1e-14);
        nodalToHierarchical(mesh, v);
        hierarchicalToNodal(mesh, v);
        expect(relErr(v, x)).toBeLessThan(1e-14);
        const w = x.slice();
        hierarchicalToNodalTransposed(mesh, w);
        nodalToHierarchicalTransposed(mesh, w);
        expect(relErr(w, x)).toBeLessThan(1e-14);
        const Tx = x.slice(), Tty = y.slice();
        hierarchicalToNodal(mesh, Tx);
        hierarchicalToNodalTransposed(mesh, Tty);
        expect(Math.abs(dot(Tx, y) - dot(x, Tty))).toBeLessThan(1e-12 * Math.sqrt(dot(Tx, Tx) * dot(y, y)));
        const Ix = x.slice(), Ity = y.slice();
        nodalToHierarchical(mesh, Ix);
        nodalToHierarchicalTransposed(mesh, Ity);
        expect(Math.abs(dot(Ix, y) - dot(x, Ity))).toBeLessThan(1e-12 * Math.sqrt(dot(Ix, Ix) * dot(y, y)));
        // explicit transform over the free vertices (Dirichlet coefficients are zero)
        const free: number[] = [];
        const h = new Float64Array(n);
        for (let i = 0; i < n; i++) if (mesh.isFree[i]) free.push(i);
        const ids = Int32Array.from(free.map((i) => mesh.globalId[i]!));
        const T = denseTransform(dom, mesh.globalId, ids);
        const c = randomVector(r, free.length);
        free.forEach((i, k) => (h[i] = c[k]!));
        hierarchicalToNodal(mesh, h);
        expect(relErr(h, matVec(T, c))).toBeLessThan(1e-14);
      }
    });
  }
});
