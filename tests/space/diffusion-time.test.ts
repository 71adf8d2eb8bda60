/**
 * The shortest diffusion time h²/κ of an initial mesh (h the shortest edge of a cell; the
 * definition of the time scale is common practice), which grades the adaptive loop's first set.
 */
import { describe, expect, it } from 'vitest';
import { intervalDomain, rectangleDomain, triangulatedDomain } from '../../src/index';
import { shortestDiffusionTime } from '../../src/space/diffusion-time';

describe('shortestDiffusionTime', () => {
  it('is min over cells of (shortest edge)² / κ, by hand on small meshes', () => {
    expect(shortestDiffusionTime(intervalDomain(0, 1, 2))).toBeCloseTo(0.25, 15);
    expect(shortestDiffusionTime(intervalDomain(0, 2, 4, { kappa: 4 }))).toBeCloseTo(0.0625, 15);
    // Piecewise κ: the cell [0, 0.5] with κ = 10 sets the scale (0.25 / 10).
    expect(shortestDiffusionTime(intervalDomain(0, 1, 2, { kappa: (x) => (x < 0.5 ? 10 : 1) }))).toBeCloseTo(0.025, 15);
    // 2 × 2 squares split into right triangles with legs 0.5 (the hypotenuse is longer).
    expect(shortestDiffusionTime(rectangleDomain(0, 1, 0, 1, 2, 2))).toBeCloseTo(0.25, 15);
    // A flat triangle: its two short edges, of length √(0.5² + 0.1²), decide.
    expect(shortestDiffusionTime(triangulatedDomain([0, 0, 1, 0, 0.5, 0.1], [0, 1, 2]))).toBeCloseTo(0.5 ** 2 + 0.1 ** 2, 12);
  });
});
