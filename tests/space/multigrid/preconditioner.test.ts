import { Matrix, inverse, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { InvalidArgumentError, InvalidMeshError, SolverBreakdownError } from '../../../src/errors';
import type { LeafMesh } from '../../../src/space/leaf-mesh';
import { MultilevelPreconditioner } from '../../../src/space/multigrid/index';
import { WorkVectors } from '../../../src/numerics/work-vectors';
import { BisectionFixture } from './fixtures';
import { dot, denseMatrices, denseOfMap, denseSpectrum, randomVector } from './reference';

const ALPHAS = [0, 1, 1e2, 1e4, 1e6, 1e8];

// Third entry: relative rounding tolerance. The 1D mesh graded over 30 generations has h from 1/2 to 2⁻³⁰,
// so cond(A) ≈ 2³⁰ and rounding alone gives relative errors far above 1e-12 there.
const meshes: [string, () => LeafMesh, number][] = [
  ['1d uniform, mixed boundary, materials', () =>
    BisectionFixture.interval([0, 0.25, 1], { left: true, right: false }, { kappa: [3, 0.5], reaction: [1, 0] }).uniform(5).leafMesh(), 1e-12],
  ['1d graded to an interior point', () => BisectionFixture.interval([0, 1], { left: true, right: true }).gradeTowardPoint(30, 0.3).leafMesh(), 1e-8],
  ['2d uniform, 4 pieces, Dirichlet on x = 0 only, materials', () =>
    BisectionFixture.square(4, { kappa: [1, 100, 0.01, 1], reaction: [0, 0, 5, 0], dirichlet: (x) => x === 0 }).uniform(6).leafMesh(), 1e-12],
  ['2d graded to a corner (30 generations)', () => BisectionFixture.square(2).uniform(2).gradeTowardPoint(30, 0, 0).leafMesh(), 1e-12],
  ['2d graded to the bottom edge', () => BisectionFixture.square(2, { dirichlet: (_x, y) => y === 1 }).gradeTowardBottomEdge(9).leafMesh(), 1e-12],
];

/** Dense T (hierarchical → nodal), built column by column from the midpoint relation (test-side). */
function denseT(mesh: LeafMesh): Matrix {
  const n = mesh.vertexCount;
  const T = Matrix.zeros(n, n);
  for (let j = 0; j < n; j++) {
    const u = new Float64Array(n);
    u[j] = 1;
    for (let m = 0; m < n; m++) if (mesh.parentA[m]! >= 0) u[m] = u[m]! + 0.5 * (u[mesh.parentA[m]!]! + u[mesh.parentB[m]!]!);
    for (let i = 0; i < n; i++) T.set(i, j, u[i]!);
  }
  return T;
}

function restrict(A: Matrix, idx: number[]): Matrix {
  return new Matrix(idx.map((i) => idx.map((j) => A.get(i, j))));
}

describe('MultilevelPreconditioner: exactness on the initial mesh', () => {
  it.each([
    ['1d', () => BisectionFixture.interval([0, 0.2, 0.5, 0.6, 1], { left: true, right: false }, { kappa: [1, 2, 3, 4], reaction: [0, 1, 0, 2] })],
    ['2d, 4 pieces', () => BisectionFixture.square(4, { dirichlet: (x, y) => x === 0 && y <= 1 })],
    ['2d, 2 pieces, pure Neumann with reaction', () => BisectionFixture.square(2, { dirichlet: () => false, reaction: [1, 2] })],
  ])('V = (A + αM)⁻¹ when the mesh has only generation 0 (%s; ml-matrix solve)', (_n, mk) => {
    const mesh = mk().leafMesh();
    const pre = new MultilevelPreconditioner(mesh);
    expect(pre.levels).toBe(1);
    const { free, K, M } = denseMatrices(mesh);
    for (const alpha of ALPHAS) {
      const r = randomVector(mesh, 11);
      const z = new Float64Array(mesh.vertexCount);
      pre.applyNodal(r, z, alpha);
      const want = solve(K.clone().add(M.clone().mul(alpha)), Matrix.columnVector(free.map((v) => r[v]!)));
      const scale = Math.max(...want.to1DArray().map(Math.abs));
      free.forEach((v, i) => expect(Math.abs(z[v]! - want.get(i, 0))).toBeLessThan(1e-12 * scale));
      for (let v = 0; v < mesh.vertexCount; v++) if (!mesh.isFree[v]) expect(z[v]).toBe(0);
    }
  });
});

describe('MultilevelPreconditioner: symmetry and positivity', () => {
  it.each(meshes)('⟨Vx, y⟩ = ⟨x, Vy⟩ and ⟨Vx, x⟩ > 0, nodal and hierarchical (%s)', (_n, mk, tol) => {
    const mesh = mk();
    for (const opts of [{}, { smoothingSteps: 2 }, { cycles: 2 }]) {
      const pre = new MultilevelPreconditioner(mesh, opts);
      for (const alpha of ALPHAS) {
        for (const mode of ['nodal', 'hierarchical'] as const) {
          const apply = (r: Float64Array, z: Float64Array): void =>
            mode === 'nodal' ? pre.applyNodal(r, z, alpha) : pre.applyHierarchical(r, z, alpha);
          for (let s = 0; s < 3; s++) {
            const x = randomVector(mesh, 100 + s);
            const y = randomVector(mesh, 200 + s);
            const vx = new Float64Array(mesh.vertexCount);
            const vy = new Float64Array(mesh.vertexCount);
            apply(x, vx);
            apply(y, vy);
            const a = dot(vx, y);
            const b = dot(x, vy);
            const scale = Math.sqrt(dot(vx, vx) * dot(y, y)) + Math.sqrt(dot(x, x) * dot(vy, vy));
            expect(Math.abs(a - b)).toBeLessThan(tol * scale);
            expect(dot(vx, x)).toBeGreaterThan(0);
          }
        }
      }
    }
  });

  it('is symmetric positive definite as a dense matrix (eigenvalues of its symmetric part > 0)', () => {
    const mesh = meshes[3]![1]();
    const pre = new MultilevelPreconditioner(mesh);
    for (const alpha of [0, 1e4]) {
      const V = denseOfMap(mesh, (r, z) => pre.applyNodal(r, z, alpha));
      expect(Matrix.sub(V, V.transpose()).norm('max')).toBeLessThan(1e-12 * V.norm('max'));
      const { K } = denseMatrices(mesh);
      expect(denseSpectrum(V, K).min).toBeGreaterThan(0);
    }
  });

  it('overwrites z completely and accepts r === z (no state kept between calls)', () => {
    const mesh = meshes[2]![1]();
    const pre = new MultilevelPreconditioner(mesh);
    const r = randomVector(mesh, 5);
    const z1 = new Float64Array(mesh.vertexCount);
    pre.applyNodal(r, z1, 3);
    const z2 = new Float64Array(mesh.vertexCount).fill(Number.NaN);
    pre.applyNodal(randomVector(mesh, 6), z2, 1e6);
    pre.applyNodal(r, z2, 3);
    expect(Array.from(z2)).toEqual(Array.from(z1));
    const z3 = Float64Array.from(r);
    pre.applyNodal(z3, z3, 3);
    expect(Array.from(z3)).toEqual(Array.from(z1));
    const h1 = new Float64Array(mesh.vertexCount);
    pre.applyHierarchical(r, h1, 3);
    const h2 = Float64Array.from(r);
    pre.applyHierarchical(h2, h2, 3);
    expect(Array.from(h2)).toEqual(Array.from(h1));
  });

  it('preconditioners sharing one set of work vectors, applied in turn, give what each gives alone', () => {
    // The fibre inverses of one cache share their cycles' work vectors (src/numerics/work-vectors.ts);
    // the cycle must not depend on what another cycle left in them, for 1 and for 2 cycles.
    const shared = new WorkVectors();
    const cases = [meshes[2]!, meshes[3]!, meshes[0]!].flatMap(([, mk], i) => [1, 2].map((cycles) => {
      const mesh = mk();
      const r = randomVector(mesh, 10 + i);
      const alone = new MultilevelPreconditioner(mesh, { cycles });
      const z = new Float64Array(mesh.vertexCount);
      alone.applyHierarchical(r, z, 7);
      return { pre: new MultilevelPreconditioner(mesh, { cycles }).useScratch(shared), r, z, n: mesh.vertexCount, mesh };
    }));
    for (let round = 0; round < 2; round++) {
      for (const c of cases) {
        const got = new Float64Array(c.n).fill(Number.NaN);
        c.pre.applyHierarchical(c.r, got, 7);
        expect(Array.from(got)).toEqual(Array.from(c.z));
        c.pre.applyNodal(randomVector(c.mesh, 99), got, 1e5); // leaves other data behind
      }
    }
  });
});

describe('MultilevelPreconditioner: coordinates', () => {
  it.each(meshes)('applyHierarchical = T⁻¹ V T⁻ᵀ and inverts A_h = TᵀAT when converged (%s)', (_n, mk, tol) => {
    const mesh = mk();
    if (mesh.vertexCount > 400) return; // dense check only on the small meshes
    const { free, K, M } = denseMatrices(mesh);
    const T = restrict(denseT(mesh), free);
    const Tinv = inverse(T);
    const pre = new MultilevelPreconditioner(mesh);
    const exact = new MultilevelPreconditioner(mesh, { cycles: 40 });
    for (const alpha of [0, 1e2, 1e8]) {
      const Vn = denseOfMap(mesh, (r, z) => pre.applyNodal(r, z, alpha));
      const Vh = denseOfMap(mesh, (r, z) => pre.applyHierarchical(r, z, alpha));
      const want = Tinv.mmul(Vn).mmul(Tinv.transpose());
      expect(Matrix.sub(Vh, want).norm('max')).toBeLessThan(100 * tol * want.norm('max'));
      // hierarchical matrix and its dense inverse
      const Kt = T.transpose().mmul(K.clone().add(M.clone().mul(alpha))).mmul(T);
      const Kh = Kt.add(Kt.transpose()).mul(0.5);
      const KhInv = inverse(Kh);
      const Eh = denseOfMap(mesh, (r, z) => exact.applyHierarchical(r, z, alpha));
      expect(Matrix.sub(Eh, KhInv).norm('max')).toBeLessThan(1000 * tol * KhInv.norm('max'));
      // the wrong composition T·V·Tᵀ is not the hierarchical inverse (guards the coordinate convention)
      const wrong = T.mmul(Vn).mmul(T.transpose());
      expect(Matrix.sub(wrong, KhInv).norm('max')).toBeGreaterThan(1e-3 * KhInv.norm('max'));
      // same spectrum in both coordinate systems
      const sn = denseSpectrum(Vn, K.clone().add(M.clone().mul(alpha)));
      const sh = denseSpectrum(Vh, Kh);
      expect(Math.abs(sh.max / sh.min - sn.max / sn.min)).toBeLessThan(1e4 * tol);
    }
  });

  it('more cycles converge to the exact inverse (error contracts by at least 2 per cycle)', () => {
    const mesh = meshes[2]![1]();
    const { free, K, M } = denseMatrices(mesh);
    const r = randomVector(mesh, 9);
    const alpha = 10;
    const want = solve(K.clone().add(M.clone().mul(alpha)), Matrix.columnVector(free.map((v) => r[v]!)));
    let prev = Infinity;
    for (const cycles of [1, 2, 3, 4]) {
      const z = new Float64Array(mesh.vertexCount);
      new MultilevelPreconditioner(mesh, { cycles }).applyNodal(r, z, alpha);
      const err = Math.max(...free.map((v, i) => Math.abs(z[v]! - want.get(i, 0))));
      expect(err).toBeLessThan(prev / 2);
      prev = err;
    }
  });
});

describe('MultilevelPreconditioner: errors', () => {
  const mesh = BisectionFixture.square(4).uniform(2).leafMesh();
  const pre = new MultilevelPreconditioner(mesh);
  const n = mesh.vertexCount;
  it('rejects bad arguments with InvalidArgumentError', () => {
    expect(() => pre.applyNodal(new Float64Array(n - 1), new Float64Array(n), 0)).toThrow(InvalidArgumentError);
    expect(() => pre.applyNodal(new Float64Array(n), new Float64Array(n + 1), 0)).toThrow(/z must be/);
    expect(() => pre.applyHierarchical(new Float64Array(n), new Float64Array(n), -1)).toThrow(/alpha/);
    expect(() => pre.applyNodal(new Float64Array(n), new Float64Array(n), Number.NaN)).toThrow(InvalidArgumentError);
    const r = new Float64Array(n);
    r[3] = Number.POSITIVE_INFINITY;
    expect(() => pre.applyNodal(r, new Float64Array(n), 1)).toThrow(/r\[3\]/);
    expect(() => new MultilevelPreconditioner(mesh, { cycles: 0 })).toThrow(/cycles/);
    expect(() => new MultilevelPreconditioner(mesh, { smoothingSteps: 1.5 })).toThrow(/smoothingSteps/);
  });
  it('rejects meshes that break the LeafMesh contract with InvalidMeshError', () => {
    const bad = (patch: Partial<LeafMesh>): LeafMesh => ({ ...mesh, ...patch });
    const gen = Int32Array.from(mesh.generation);
    gen[n - 1] = 0;
    expect(() => new MultilevelPreconditioner(bad({ generation: gen }))).toThrow(InvalidMeshError);
    const pa = Int32Array.from(mesh.parentA);
    pa[n - 1] = n - 1;
    expect(() => new MultilevelPreconditioner(bad({ parentA: pa }))).toThrow(/parentA\[/);
    expect(() => new MultilevelPreconditioner(bad({ kappa: Float64Array.from([1, -1, 1, 1]) }))).toThrow(/kappa\[1\]/);
    const el = Int32Array.from(mesh.elements);
    el[5] = n + 3;
    expect(() => new MultilevelPreconditioner(bad({ elements: el }))).toThrow(/elements\[5\]/);
    const xy = Float64Array.from(mesh.coords);
    xy[2 * mesh.elements[0]!] = xy[2 * mesh.elements[1]!]!;
    xy[2 * mesh.elements[0]! + 1] = xy[2 * mesh.elements[1]! + 1]!;
    expect(() => new MultilevelPreconditioner(bad({ coords: xy }))).toThrow(/degenerate/);
  });
  it('reports a singular coarse problem (no Dirichlet boundary, no reaction, α = 0) with SolverBreakdownError', () => {
    const neumann = BisectionFixture.square(2, { dirichlet: () => false }).uniform(3).leafMesh();
    const p = new MultilevelPreconditioner(neumann);
    const m = neumann.vertexCount;
    expect(() => p.applyNodal(new Float64Array(m).fill(1), new Float64Array(m), 0)).toThrow(SolverBreakdownError);
    const z = new Float64Array(m);
    p.applyNodal(new Float64Array(m).fill(1), z, 1);
    expect(z.every(Number.isFinite)).toBe(true);
  });
});

describe('MultilevelPreconditioner: TSDoc example', () => {
  it('runs as written (with src imports)', async () => {
    const { rectangleDomain } = await import('../../../src/space/index');
    const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    const mesh = dom.leafMesh(dom.uniformSet(3));
    const pre = new MultilevelPreconditioner(mesh);
    const r = new Float64Array(mesh.vertexCount).fill(1);
    const z = new Float64Array(mesh.vertexCount);
    pre.applyNodal(r, z, 16);
    expect(z.every(Number.isFinite)).toBe(true);
    expect(Math.max(...z)).toBeGreaterThan(0);
    expect(new MultilevelPreconditioner(mesh, { cycles: 2, smoothingSteps: 1 }).levels).toBe(pre.levels);
  });
});
