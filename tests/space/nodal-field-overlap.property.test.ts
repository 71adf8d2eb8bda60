/**
 * The overlap check of NodalField (src/space/nodal-field.ts) against an oracle that shares no code
 * with it, on random meshes drawn by fast-check from a fixed seed.
 *
 * Oracle (common practice in mesh untangling): moving one interior point of a triangulation of a
 * convex region, with the boundary fixed, leaves a valid triangulation exactly when every triangle
 * keeps the sign of its area; a triangle that flips overlaps its neighbours. And a copy of a cell
 * on points of its own, shifted by less than a third of the cell's smallest altitude, keeps the
 * copy's centroid strictly inside the original (barycentric coordinates move by at most
 * |shift| / altitude), so it must be refused. Two triangles without common points overlap exactly
 * when no line along one of their six edges separates them (the separating axis theorem for convex
 * polygons; common practice in collision detection), however small the overlap.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InvalidMeshError, NodalField } from '../../src/index';

const SEED = 20261204;

/** An n × n grid of the unit square, each quad cut along a diagonal chosen by `diag`. */
function grid(n: number, diag: boolean[]): { points: number[]; cells: number[] } {
  const points: number[] = [];
  for (let j = 0; j <= n; j++) for (let i = 0; i <= n; i++) points.push(i / n, j / n);
  const id = (i: number, j: number) => j * (n + 1) + i;
  const cells: number[] = [];
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const [a, b, c, d] = [id(i, j), id(i + 1, j), id(i + 1, j + 1), id(i, j + 1)];
      cells.push(...(diag[(j * n + i) % diag.length] ? [a, b, c, a, c, d] : [a, b, d, b, c, d]));
    }
  }
  return { points, cells };
}

function signedArea(p: number[], c: number[], e: number): number {
  const [i, j, k] = [c[3 * e]!, c[3 * e + 1]!, c[3 * e + 2]!];
  return 0.5 * ((p[2 * j]! - p[2 * i]!) * (p[2 * k + 1]! - p[2 * i + 1]!) - (p[2 * j + 1]! - p[2 * i + 1]!) * (p[2 * k]! - p[2 * i]!));
}

function accepted(points: number[], cells: number[]): boolean {
  try {
    new NodalField({ dim: 2, points, cells, values: new Array(points.length / 2).fill(0) });
    return true;
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidMeshError);
    return false;
  }
}

describe('NodalField overlap check, property-based', () => {
  it('moving one interior point: accepted exactly when no triangle flips', () => {
    let flipped = 0, kept = 0;
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 7 }), fc.array(fc.boolean(), { minLength: 1, maxLength: 49 }),
        fc.nat(), fc.double({ min: -1.5, max: 1.5, noNaN: true }), fc.double({ min: -1.5, max: 1.5, noNaN: true }),
        (n, diag, pick, dx, dy) => {
          const { points, cells } = grid(n, diag);
          const i = 1 + (pick % (n - 1)), j = 1 + ((pick >> 3) % (n - 1)); // an interior point
          const v = j * (n + 1) + i;
          const moved = points.slice();
          moved[2 * v] = moved[2 * v]! + dx / n;
          moved[2 * v + 1] = moved[2 * v + 1]! + dy / n;
          const m = cells.length / 3;
          let valid = true;
          for (let e = 0; e < m; e++) {
            const before = signedArea(points, cells, e), after = signedArea(moved, cells, e);
            if (Math.abs(after) < 1e-6 / (n * n)) return; // nearly degenerate: the oracle cannot tell
            if (Math.sign(before) !== Math.sign(after)) valid = false;
          }
          if (valid) kept++;
          else flipped++;
          expect(accepted(moved, cells)).toBe(valid);
        },
      ),
      { seed: SEED, numRuns: 300 },
    );
    // both kinds were drawn (a property that only ever sees valid meshes tests nothing)
    expect(flipped).toBeGreaterThan(20);
    expect(kept).toBeGreaterThan(20);
  });

  it('two triangles without common points: accepted exactly when a separating axis exists', () => {
    // the largest gap (or, negative, the least overlap depth) along the six edge normals
    const gap = (p: number[]): number => {
      let best = -Infinity;
      for (let t = 0; t < 2; t++) {
        for (let k = 0; k < 3; k++) {
          const a = 3 * t + k, b = 3 * t + ((k + 1) % 3);
          const nx = p[2 * b + 1]! - p[2 * a + 1]!, ny = p[2 * a]! - p[2 * b]!;
          const len = Math.hypot(nx, ny);
          const proj = (v: number) => (p[2 * v]! * nx + p[2 * v + 1]! * ny) / len;
          const [lo0, hi0] = [Math.min(proj(0), proj(1), proj(2)), Math.max(proj(0), proj(1), proj(2))];
          const [lo1, hi1] = [Math.min(proj(3), proj(4), proj(5)), Math.max(proj(3), proj(4), proj(5))];
          best = Math.max(best, lo1 - hi0, lo0 - hi1);
        }
      }
      return best;
    };
    let apart = 0, overlapping = 0, slight = 0;
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 1000 }), { minLength: 12, maxLength: 12 }), (ints) => {
        const p = ints.map((k) => k / 1000);
        for (const e of [0, 1]) if (Math.abs(signedArea(p, [0, 1, 2, 3, 4, 5], e)) < 1e-3) return; // too thin to tell
        const g = gap(p);
        if (Math.abs(g) < 1e-6) return; // touching within rounding: either answer is defensible
        if (g > 0) apart++;
        else {
          overlapping++;
          if (g > -0.02) slight++;
        }
        expect(accepted(p, [0, 1, 2, 3, 4, 5])).toBe(g > 0);
      }),
      { seed: SEED, numRuns: 1000 },
    );
    expect(apart).toBeGreaterThan(50);
    expect(overlapping).toBeGreaterThan(50);
    expect(slight).toBeGreaterThan(5); // overlaps too slight for a centroid to fall inside the other cell
  });

  it('a shifted copy of any cell is refused; the mesh without it is accepted', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 6 }), fc.array(fc.boolean(), { minLength: 1, maxLength: 36 }),
        fc.nat(), fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), fc.double({ min: 0, max: 0.3, noNaN: true }),
        (n, diag, pick, angle, fraction) => {
          const { points, cells } = grid(n, diag);
          expect(accepted(points, cells)).toBe(true);
          const e = pick % (cells.length / 3);
          // smallest altitude of cell e: 2·area / longest edge
          const corner = [0, 1, 2].map((k) => cells[3 * e + k]!);
          let longest = 0;
          for (let k = 0; k < 3; k++) {
            const a = corner[k]!, b = corner[(k + 1) % 3]!;
            longest = Math.max(longest, Math.hypot(points[2 * b]! - points[2 * a]!, points[2 * b + 1]! - points[2 * a + 1]!));
          }
          const shift = (fraction * (2 * Math.abs(signedArea(points, cells, e)) / longest)) / 3;
          const base = points.length / 2;
          const copy = corner.flatMap((a) => [points[2 * a]! + shift * Math.cos(angle), points[2 * a + 1]! + shift * Math.sin(angle)]);
          expect(accepted([...points, ...copy], [...cells, base, base + 1, base + 2])).toBe(false);
        },
      ),
      { seed: SEED, numRuns: 200 },
    );
  });
});
