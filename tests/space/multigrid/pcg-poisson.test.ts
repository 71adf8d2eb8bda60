import { describe, expect, it } from 'vitest';
import { MultilevelPreconditioner } from '../../../src/space/multigrid/index';
import { BisectionFixture } from './fixtures';
import { makeOperator, pcg } from './reference';

describe('PCG with the V-cycle on Poisson problems', () => {
  it.each([
    ['d = 1, −u″ = 1 on (0, 1)', (l: number) => BisectionFixture.interval([0, 1], { left: true, right: true }).uniform(2 * l + 2)],
    ['d = 2, −Δu = 1 on the unit square', (l: number) => BisectionFixture.square(2).uniform(2 * l + 2)],
    ['d = 2, −Δu = 1, mesh graded to a corner', (l: number) => BisectionFixture.square(4).uniform(2 * l).gradeTowardPoint(30, 0, 0)],
  ])('%s: iteration count to 1e-8 does not grow with refinement', (_n, mk) => {
    const its: number[] = [];
    for (const l of [2, 3, 4, 5]) {
      const mesh = mk(l).leafMesh();
      const op = makeOperator(mesh);
      const pre = new MultilevelPreconditioner(mesh);
      // load of f = 1: b = M·1 restricted to free vertices (lumping not needed: M·1 = ∫ φ_v)
      const ones = new Float64Array(mesh.vertexCount).fill(1);
      const b = new Float64Array(mesh.vertexCount);
      const free = Uint8Array.from(mesh.isFree);
      const allFree = { ...mesh, isFree: new Uint8Array(mesh.vertexCount).fill(1) };
      makeOperator({ ...allFree, kappa: new Float64Array(mesh.kappa.length).fill(1e-300), reaction: new Float64Array(mesh.reaction.length) })(1, ones, b);
      for (let i = 0; i < b.length; i++) if (!free[i]) b[i] = 0;
      const res = pcg((x, y) => op(0, x, y), (r, z) => pre.applyNodal(r, z, 0), b, { maxIter: 100, relTol: 1e-8 });
      expect(res.relResidual).toBeLessThan(1e-8);
      its.push(res.iterations);
    }
    // measured: 7 6 6 5 (d = 1), 5 7 7 7 (square), 6 7 7 7 (graded); allow ±1 on the three finest meshes
    expect(Math.max(...its)).toBeLessThanOrEqual(12);
    const fine = its.slice(1);
    expect(Math.max(...fine) - Math.min(...fine)).toBeLessThanOrEqual(1);
  });
});
