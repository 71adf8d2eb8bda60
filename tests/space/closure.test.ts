/**
 * Closure and conformity properties of the bisection forest, over many seeds: for random vertex
 * sets, close() agrees with a naive godparent search, and the leaf mesh of the closure is a
 * conforming triangulation of Ω whose vertex set is exactly the closure (docs/method.md §4.1).
 */
import { describe, expect, it } from 'vitest';
import { intervalDomain, lShapeDomain, squareWithHoleDomain, triangulatedDomain, type SpatialDomain } from '../../src/space/index';
import { growForest, rng } from './random-sets';

/** Naive closure: breadth-first over godparents with a JS Set, plus all initial vertices. */
function naiveClosure(dom: SpatialDomain, ids: number[]): Set<number> {
  const out = new Set<number>();
  const queue: number[] = [];
  for (let v = 0; v < dom.initialVertexCount; v++) queue.push(v);
  queue.push(...ids);
  const g = new Int32Array(2);
  while (queue.length) {
    const v = queue.pop()!;
    if (out.has(v)) continue;
    out.add(v);
    const k = dom.godparents(v, g);
    for (let i = 0; i < k; i++) queue.push(g[i]!);
  }
  return out;
}

function initialArea(dom: SpatialDomain): number {
  const t = new Int32Array(3);
  let a = 0;
  for (let e = 0; e < dom.initialElementCount; e++) {
    dom.initialElement(e, t);
    if (dom.dim === 1) a += Math.abs(dom.coordinate(t[1]!, 0) - dom.coordinate(t[0]!, 0));
    else {
      const [p, q, r] = [t[0]!, t[1]!, t[2]!];
      const x = (v: number) => dom.coordinate(v, 0), y = (v: number) => dom.coordinate(v, 1);
      a += 0.5 * ((x(q) - x(p)) * (y(r) - y(p)) - (x(r) - x(p)) * (y(q) - y(p)));
    }
  }
  return a;
}

/** Boundary segments of the initial mesh (edges in exactly one initial triangle). */
function initialBoundary(dom: SpatialDomain): number[][] {
  const t = new Int32Array(3);
  const count = new Map<string, number[]>();
  for (let e = 0; e < dom.initialElementCount; e++) {
    dom.initialElement(e, t);
    for (let k = 0; k < 3; k++) {
      const i = t[k]!, j = t[(k + 1) % 3]!;
      const key = `${Math.min(i, j)},${Math.max(i, j)}`;
      count.set(key, [...(count.get(key) ?? []), i, j]);
    }
  }
  return [...count.values()].filter((v) => v.length === 2).map(([i, j]) => [dom.coordinate(i!, 0), dom.coordinate(i!, 1), dom.coordinate(j!, 0), dom.coordinate(j!, 1)]);
}

function checkConforming(dom: SpatialDomain, set: Int32Array, ids: number[]): void {
  const mesh = dom.leafMesh(set);
  // close(ids) is the free part of the naive closure of ids; the leaf mesh's vertex set is exactly
  // the naive closure of that free set (Dirichlet ids not needed as godparents are dropped)
  expect(Array.from(set)).toEqual([...naiveClosure(dom, ids)].filter((v) => dom.isFree(v)).sort((a, b) => a - b));
  expect(new Set(mesh.globalId)).toEqual(naiveClosure(dom, Array.from(set)));
  // local numbering: by (generation, id), generations and coordinates those of the forest, parents
  // and members mapped through it (src/space/leaf-mesh.ts)
  for (let i = 0; i < mesh.vertexCount; i++) {
    const v = mesh.globalId[i]!;
    expect(mesh.generation[i]).toBe(dom.generation(v));
    for (let k = 0; k < dom.dim; k++) expect(mesh.coords[i * dom.dim + k]).toBe(dom.coordinate(v, k));
    expect(mesh.isFree[i]).toBe(dom.isFree(v) ? 1 : 0);
    if (i > 0) {
      const u = mesh.globalId[i - 1]!;
      expect(dom.generation(u) < dom.generation(v) || (dom.generation(u) === dom.generation(v) && u < v)).toBe(true);
    }
    const a = dom.forest.vParentA[v]!;
    expect(mesh.parentA[i]).toBe(a >= 0 ? Array.from(mesh.globalId).indexOf(a) : -1);
  }
  for (let i = 0; i < set.length; i++) expect(mesh.globalId[mesh.memberLocal[i]!]).toBe(set[i]);
  const used = new Set<number>();
  for (const v of mesh.elements) used.add(v);
  expect(used.size).toBe(mesh.vertexCount);
  const xy = mesh.coords;
  if (dom.dim === 1) {
    const iv = Array.from({ length: mesh.elementCount }, (_, e) => [xy[mesh.elements[2 * e]!]!, xy[mesh.elements[2 * e + 1]!]!].sort((a, b) => a - b) as [number, number]);
    iv.sort((a, b) => a[0] - b[0]);
    for (let k = 1; k < iv.length; k++) expect(iv[k]![0]).toBe(iv[k - 1]![1]);
    expect(iv[iv.length - 1]![1] - iv[0]![0]).toBeCloseTo(initialArea(dom), 12);
    return;
  }
  let area = 0;
  const edges = new Map<string, number>();
  for (let e = 0; e < mesh.elementCount; e++) {
    const v = [mesh.elements[3 * e]!, mesh.elements[3 * e + 1]!, mesh.elements[3 * e + 2]!];
    const a = 0.5 * ((xy[2 * v[1]!]! - xy[2 * v[0]!]!) * (xy[2 * v[2]! + 1]! - xy[2 * v[0]! + 1]!) - (xy[2 * v[2]!]! - xy[2 * v[0]!]!) * (xy[2 * v[1]! + 1]! - xy[2 * v[0]! + 1]!));
    expect(a).toBeGreaterThan(0); // counter-clockwise
    area += a;
    for (let k = 0; k < 3; k++) {
      const i = v[k]!, j = v[(k + 1) % 3]!;
      const key = `${Math.min(i, j)},${Math.max(i, j)}`;
      edges.set(key, (edges.get(key) ?? 0) + 1);
    }
  }
  expect(area).toBeCloseTo(initialArea(dom), 12);
  // every edge in one or two triangles; edges in one triangle lie on ∂Ω (else: hanging node)
  const bnd = initialBoundary(dom);
  for (const [key, c] of edges) {
    expect(c).toBeLessThanOrEqual(2);
    if (c === 2) continue;
    const [i, j] = key.split(',').map(Number) as [number, number];
    const mx = 0.5 * (xy[2 * i]! + xy[2 * j]!), my = 0.5 * (xy[2 * i + 1]! + xy[2 * j + 1]!);
    const onB = bnd.some(([x0, y0, x1, y1]) => {
      const dx = x1! - x0!, dy = y1! - y0!;
      const t = ((mx - x0!) * dx + (my - y0!) * dy) / (dx * dx + dy * dy);
      return t >= 0 && t <= 1 && Math.abs((mx - x0!) * dy - (my - y0!) * dx) < 1e-12;
    });
    expect(onB).toBe(true);
  }
}

const cases: [string, () => SpatialDomain][] = [
  ['interval', () => intervalDomain(0, 3, 3, { insulated: (x) => x > 1 })],
  ['L-shape', () => lShapeDomain(1)],
  ['square with hole', () => squareWithHoleDomain(1, { insulated: (x, y) => Math.abs(x) < 0.5 && Math.abs(y) < 0.5 })],
  // unstructured, with an interior edge that is the longest edge of only one neighbour (non-matching labelling)
  ['unstructured', () => triangulatedDomain([0, 0, 2, 0, 3, 1, 1.2, 0.9, 0, 2, 2.5, 2.4], [[0, 1, 3], [1, 2, 3], [0, 3, 4], [3, 2, 5], [3, 5, 4]])],
];

describe('closure and conformity over many seeds', () => {
  for (const [name, make] of cases) {
    it(name, () => {
      for (let seed = 1; seed <= 25; seed++) {
        const r = rng(seed * 104729 + name.length);
        const dom = make();
        const grown = growForest(dom, r, 1 + (seed % 2), 2, 5 + (seed % 7));
        const all = Array.from({ length: dom.vertexCount }, (_, v) => v);
        const ids = all.filter(() => r() < 0.08 + 0.2 * r());
        const set = dom.close(ids);
        checkConforming(dom, set, ids);
        // idempotent, monotone
        expect(Array.from(dom.close(set))).toEqual(Array.from(set));
        const bigger = dom.close([...ids, ...all.filter(() => r() < 0.1)]);
        expect(Array.from(set).every((v) => bigger.includes(v))).toBe(true);
        // refineAll: new vertices are exactly the leaf midpoints, the union is closed and conforming
        const mesh = dom.leafMesh(set);
        const fresh = dom.refineAll(set);
        const union = Int32Array.from([...set, ...fresh]).sort();
        expect(Array.from(dom.close(union))).toEqual(Array.from(union));
        checkConforming(dom, union, Array.from(union));
        expect(fresh.every((v) => !set.includes(v))).toBe(true);
        // every leaf was bisected once; its midpoint is in the union unless it is a Dirichlet vertex
        const inUnion = new Set(union);
        for (const e of mesh.forestElement) {
          const m = dom.forest.eMid[e]!;
          expect(m).toBeGreaterThanOrEqual(0);
          expect(inUnion.has(m)).toBe(dom.isFree(m));
        }
        expect(grown.length).toBeGreaterThan(0);
      }
    });
  }

  it('generation and level: uniform sets', () => {
    // all-insulated: every vertex free, so the level-L mesh is the full uniform refinement
    const ins = squareWithHoleDomain(1, { insulated: () => true, reaction: 1 });
    const ne0 = ins.initialElementCount;
    for (let L = 0; L <= 4; L++) {
      const set = ins.uniformSet(L);
      expect(ins.leafMesh(set).elementCount).toBe(ne0 * 4 ** L);
      for (const v of set) expect(ins.level(v)).toBeLessThanOrEqual(L);
      for (const v of set) expect(ins.level(v)).toBe(Math.ceil(ins.generation(v) / 2));
    }
    // Dirichlet: level L of the structured mesh is the grid of spacing (2/3)·2^−L; count its interior points
    const dom = squareWithHoleDomain(1);
    for (let L = 0; L <= 4; L++) {
      const m = 3 * 2 ** L;
      const interior = (m + 1) ** 2 - (2 ** L - 1) ** 2 - 4 * m - 4 * 2 ** L;
      expect(dom.uniformSet(L).length).toBe(interior);
    }
    const d1 = intervalDomain(0, 1, 3);
    expect(d1.uniformSet(5).length).toBe(3 * 32 - 1);
    for (const v of d1.uniformSet(5)) expect(d1.level(v)).toBe(d1.generation(v));
  });

  it('refineTowards a point and a boundary edge grades the mesh locally', () => {
    const dom = lShapeDomain(1);
    const base = dom.uniformSet(1);
    const graded = dom.refineTowards(base, [0, 0], 30);
    checkConforming(dom, graded, Array.from(graded));
    const mesh = dom.leafMesh(graded);
    let hmin = Infinity;
    for (let e = 0; e < mesh.elementCount; e++) {
      const i = mesh.elements[3 * e]!, j = mesh.elements[3 * e + 1]!;
      hmin = Math.min(hmin, Math.hypot(mesh.coords[2 * i]! - mesh.coords[2 * j]!, mesh.coords[2 * i + 1]! - mesh.coords[2 * j + 1]!));
    }
    expect(hmin).toBeLessThan(2 ** -15); // 30 generations = 15 halvings of h
    expect(mesh.vertexCount).toBeLessThan(1000); // local: O(generations) new vertices
    const ins = lShapeDomain(1, { insulated: (_x, y) => y > 0.99 });
    const toEdge = ins.refineTowards(ins.uniformSet(1), [-1, 1, 1, 1], 6); // the top boundary edge
    checkConforming(ins, toEdge, Array.from(toEdge));
    const xs = Array.from(ins.leafMesh(toEdge).globalId).filter((v) => Math.abs(ins.coordinate(v, 1) - 1) < 1e-14).map((v) => ins.coordinate(v, 0)).sort((a, b) => a - b);
    // level 1 gives spacing 1/2 on the edge; 6 more generations halve it three times
    expect(xs.length).toBe(33);
    for (let k = 1; k < xs.length; k++) expect(xs[k]! - xs[k - 1]!).toBeCloseTo(1 / 16, 14);
  });
});
