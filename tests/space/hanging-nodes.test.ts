import { describe, expect, it } from 'vitest';
import { InvalidMeshError } from '../../src/errors';
import { checkNoHangingNodes } from '../../src/space/hanging-nodes';
import { triangulatedDomain } from '../../src/space/index';

/** Brute force (every vertex against every edge): v strictly inside [i, j], the point-on-segment test (common practice). */
function bruteForceHanging(coords: Float64Array, bEdges: number[]): boolean {
  const verts = new Set<number>();
  for (let q = 0; q < bEdges.length; q += 3) verts.add(bEdges[q + 1]!).add(bEdges[q + 2]!);
  for (let q = 0; q < bEdges.length; q += 3) {
    const i = bEdges[q + 1]!, j = bEdges[q + 2]!;
    const x0 = coords[2 * i]!, y0 = coords[2 * i + 1]!, dx = coords[2 * j]! - x0, dy = coords[2 * j + 1]! - y0;
    const l2 = dx * dx + dy * dy;
    for (const v of verts) {
      if (v === i || v === j) continue;
      const px = coords[2 * v]! - x0, py = coords[2 * v + 1]! - y0;
      const t = (px * dx + py * dy) / l2;
      if (t > 1e-10 && t < 1 - 1e-10 && Math.abs(px * dy - py * dx) <= 1e-10 * l2) return true;
    }
  }
  return false;
}

function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

describe('hanging-node check of input triangulations', () => {
  it('agrees with the brute-force test on random lattice segments (exact collinearity happens often)', () => {
    let hanging = 0, clean = 0;
    for (let seed = 1; seed <= 300; seed++) {
      const r = rng(seed);
      const nv = 3 + Math.floor(r() * 40);
      const size = 2 + Math.floor(r() * 12);
      const coords = new Float64Array(2 * nv);
      for (let k = 0; k < 2 * nv; k++) coords[k] = Math.floor(r() * size) * (seed % 3 === 0 ? 0.1 : 1);
      const bEdges: number[] = [];
      const ne = 1 + Math.floor(r() * 30);
      for (let q = 0; q < ne; q++) {
        const i = Math.floor(r() * nv);
        let j = Math.floor(r() * nv);
        if (j === i) j = (i + 1) % nv;
        if (coords[2 * i] === coords[2 * j] && coords[2 * i + 1] === coords[2 * j + 1]) continue; // zero-length edges do not occur in validated meshes
        bEdges.push(3 * q, i, j);
      }
      if (bEdges.length === 0) continue;
      const want = bruteForceHanging(coords, bEdges);
      if (want) {
        hanging++;
        expect(() => checkNoHangingNodes(coords, bEdges), `seed ${seed}`).toThrow(InvalidMeshError);
      } else {
        clean++;
        expect(() => checkNoHangingNodes(coords, bEdges), `seed ${seed}`).not.toThrow();
      }
    }
    expect(hanging).toBeGreaterThan(20);
    expect(clean).toBeGreaterThan(20);
  });

  it('refuses a triangulation with a vertex in the middle of another triangle’s boundary edge', () => {
    // two triangles on [0,2]×[0,1] split by the diagonal, plus a third triangle hanging on the bottom edge's midpoint
    const points = [[0, 0], [2, 0], [2, 1], [0, 1], [1, 0], [1, -1]];
    const ok = [[0, 1, 2], [0, 2, 3]];
    expect(() => triangulatedDomain(points.slice(0, 4), ok)).not.toThrow();
    expect(() => triangulatedDomain(points, [...ok, [0, 5, 4]])).toThrow(/hanging node/);
  });

  it('accepts a long thin boundary with many short edges next to one long edge (grid walk along the edge)', () => {
    // strip [0, 1000] × [0, 1]: bottom edge split into 1000 unit edges, top edge one long edge
    const n = 1000;
    const coords = new Float64Array(2 * (n + 3));
    for (let k = 0; k <= n; k++) coords[2 * k] = k;
    coords[2 * (n + 1)] = 0; coords[2 * (n + 1) + 1] = 1;
    coords[2 * (n + 2)] = n; coords[2 * (n + 2) + 1] = 1;
    const bEdges: number[] = [];
    for (let k = 0; k < n; k++) bEdges.push(3 * k, k, k + 1);
    bEdges.push(3 * n, n + 1, n + 2);
    expect(bruteForceHanging(coords, bEdges)).toBe(false);
    expect(() => checkNoHangingNodes(coords, bEdges)).not.toThrow();
    // the top edge gets a vertex at its middle: now a hanging node
    const c2 = new Float64Array(coords.length + 2);
    c2.set(coords);
    c2[coords.length] = n / 2; c2[coords.length + 1] = 1;
    const b2 = [...bEdges, 3 * (n + 1), n + 1, n + 3];
    expect(bruteForceHanging(c2, b2)).toBe(true);
    expect(() => checkNoHangingNodes(c2, b2)).toThrow(/vertex 1003 lies inside edge \[1001, 1002\]/);
  });
});
