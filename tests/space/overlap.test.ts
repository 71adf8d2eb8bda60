/**
 * Geometric validity of user triangulations: overlapping triangles are refused even when every
 * edge is shared consistently (issue 11: a fan winding 720° around one vertex, a moved point
 * folding a triangle over its neighbours, a strip folded back over itself).
 */
import { describe, expect, it } from 'vitest';
import { InvalidMeshError, lShapeDomain, triangulatedDomain } from '../../src/index';

function meshError(f: () => unknown): InvalidMeshError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidMeshError);
    return e as InvalidMeshError;
  }
  throw new Error('expected an InvalidMeshError');
}

describe('overlapping triangulations', () => {
  it('a fan that winds twice around its centre (angle sum 720°)', () => {
    const n = 7;
    const pts = [0, 0];
    for (let i = 0; i < n; i++) pts.push(Math.cos((4 * Math.PI * i) / n), Math.sin((4 * Math.PI * i) / n));
    const tris: number[] = [];
    for (let i = 0; i < n; i++) tris.push(0, 1 + i, 1 + ((i + 1) % n));
    const e = meshError(() => triangulatedDomain(pts, tris));
    expect(e.message).toMatch(/triangles overlap around vertex 0: their angles there add up to 720\.0°/);
    expect(e.field).toMatch(/^triangles\[\d+\]$/);
    // the same fan closing after one turn is a valid mesh (the positive control)
    const ok: number[] = [0, 0];
    for (let i = 0; i < n; i++) ok.push(Math.cos((2 * Math.PI * i) / n), Math.sin((2 * Math.PI * i) / n));
    expect(triangulatedDomain(ok, tris).initialElementCount).toBe(n);
  });

  it('a boundary point of the L-shape moved so that its triangle folds over the lower-left square', () => {
    // (−1, 1)² minus [0, 1] × [−1, 0] on unit squares, diagonals lower-left to upper-right.
    const P = [[-1, -1], [0, -1], [-1, 0], [0, 0], [1, 0], [-1, 1], [0, 1], [1, 1]];
    const T = [[0, 1, 3], [0, 3, 2], [2, 3, 6], [2, 6, 5], [3, 4, 7], [3, 7, 6]];
    expect(triangulatedDomain(P, T).initialElementCount).toBe(6);
    const moved = P.map((p) => [...p]);
    moved[4] = [-0.5, -1.5]; // triangle [3, 4, 7] stays counter-clockwise but now covers part of [−1, 0]²
    const e = meshError(() => triangulatedDomain(moved, T));
    expect(e.message).toMatch(/triangles overlap around boundary vertex 3|boundary edge .* crosses boundary edge/);
  });

  it('a strip bent round by 400° so that its end lies on its start (no vertex is over-wound)', () => {
    const m = 9;
    const pts: number[] = [];
    for (let i = 0; i <= m; i++) {
      const phi = (i / m) * ((400 * Math.PI) / 180);
      pts.push(Math.cos(phi), Math.sin(phi), 2 * Math.cos(phi), 2 * Math.sin(phi));
    }
    const tris: number[] = [];
    for (let i = 0; i < m; i++) tris.push(2 * i, 2 * i + 2, 2 * i + 3, 2 * i, 2 * i + 3, 2 * i + 1);
    const e = meshError(() => triangulatedDomain(pts, tris));
    expect(e.message).toMatch(/boundary edge \[\d+, \d+\] of triangles\[\d+\] crosses boundary edge \[\d+, \d+\] of triangles\[\d+\]/);
    // bent by 300° only, the same strip is valid
    const ok: number[] = [];
    for (let i = 0; i <= m; i++) {
      const phi = (i / m) * ((300 * Math.PI) / 180);
      ok.push(Math.cos(phi), Math.sin(phi), 2 * Math.cos(phi), 2 * Math.sin(phi));
    }
    expect(triangulatedDomain(ok, tris).initialElementCount).toBe(2 * m);
  });

  it('valid non-convex meshes with re-entrant corners still pass', () => {
    expect(lShapeDomain(3).initialElementCount).toBe(54);
  });
});
