/**
 * The flux u0 carries across initial boundary edges (src/space/surface-flux-mismatch.ts), against
 * gradients of polynomials by hand (common practice): outward normals, n·K∇u0 with a full tensor,
 * and the 1D end points.
 */
import { describe, expect, it } from 'vitest';
import { intervalDomain, rectangleDomain } from '../../src/index';
import { boundaryEdgeFrames, conormalFlux, normalDiffusivity } from '../../src/space/surface-flux-mismatch';

describe('flux of the initial state across boundary edges', () => {
  it('outward normals of a rectangle and n·K∇u0 with a tensor, at points inside each edge', () => {
    const K = { xx: 2, xy: 0.5, yy: 1 };
    const d = rectangleDomain(0, 2, 0, 1, 3, 2, { diffusionTensor: K });
    const f = d.forest;
    const frames = boundaryEdgeFrames(f);
    const u0 = (x: number, y: number) => x * x + 3 * x * y - y * y;
    const grad = (x: number, y: number) => [2 * x + 3 * y, 3 * x - 2 * y] as const;
    const b = f.boundary;
    expect(b.edgeCount).toBe(10);
    for (let k = 0; k < b.edgeCount; k++) {
      const i = b.edgeVertices[2 * k]!, j = b.edgeVertices[2 * k + 1]!;
      const x = 0.3 * f.vCoord[2 * i]! + 0.7 * f.vCoord[2 * j]!, y = 0.3 * f.vCoord[2 * i + 1]! + 0.7 * f.vCoord[2 * j + 1]!;
      const n = x < 1e-12 ? [-1, 0] : x > 2 - 1e-12 ? [1, 0] : y < 1e-12 ? [0, -1] : [0, 1];
      expect(frames.normal[2 * k]).toBeCloseTo(n[0]!, 14);
      expect(frames.normal[2 * k + 1]).toBeCloseTo(n[1]!, 14);
      const [gx, gy] = grad(x, y);
      const want = n[0]! * (K.xx * gx + K.xy * gy) + n[1]! * (K.xy * gx + K.yy * gy);
      expect(conormalFlux(f, frames, k, u0, x, y)).toBeCloseTo(want, 4);
      expect(normalDiffusivity(f, frames, k)).toBeCloseTo(n[0] !== 0 ? K.xx : K.yy, 14);
    }
  });

  it('1D: κ u0′ at the right end, −κ u0′ at the left end', () => {
    const d = intervalDomain(0, 1, 2, { kappa: 0.25 });
    const f = d.forest;
    const frames = boundaryEdgeFrames(f);
    const u0 = (x: number) => x * x * x + 2 * x;
    for (let k = 0; k < f.boundary.edgeCount; k++) {
      const x = f.vCoord[f.boundary.edgeVertices[2 * k]!]!;
      const want = (x > 0.5 ? 1 : -1) * 0.25 * (3 * x * x + 2);
      expect(conormalFlux(f, frames, k, u0, x, 0)).toBeCloseTo(want, 5);
    }
  });
});
