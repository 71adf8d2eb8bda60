import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { assemblePair } from '../../../src/space/multigrid/assemble-pair';
import { buildHierarchy, copyPairedRows } from '../../../src/space/multigrid/galerkin-hierarchy';
import type { LeafMesh } from '../../../src/space/leaf-mesh';
import { BisectionFixture } from './fixtures';
import { denseMatrices } from './reference';

/** Largest deviation of the interleaved (K, M) rows of the given vertices from the dense reference. */
function maxRowError(
  verts: ArrayLike<number>, cols: Int32Array, vals: Float64Array, diag: Float64Array,
  ref: { free: number[]; K: Matrix; M: Matrix }, rowOf: (k: number) => [number, number],
): number {
  const pos = new Map<number, number>();
  ref.free.forEach((v, i) => pos.set(v, i));
  let err = 0;
  for (let k = 0; k < verts.length; k++) {
    const v = verts[k]!;
    const p = pos.get(v)!;
    const K = new Float64Array(ref.free.length);
    const M = new Float64Array(ref.free.length);
    K[p] = diag[2 * k]!;
    M[p] = diag[2 * k + 1]!;
    const [s, e] = rowOf(k);
    for (let t = s; t < e; t++) {
      const q = pos.get(cols[t]!);
      if (q === undefined) return Infinity; // entry outside the mesh of this level
      K[q] = K[q]! + vals[2 * t]!;
      M[q] = M[q]! + vals[2 * t + 1]!;
    }
    for (let q = 0; q < ref.free.length; q++) {
      err = Math.max(err, Math.abs(K[q]! - ref.K.get(p, q)), Math.abs(M[q]! - ref.M.get(p, q)));
    }
  }
  return err;
}

const scale = (K: Matrix): number => (K.rows > 0 ? Math.max(1, K.max()) : 1);

const meshes: [string, () => BisectionFixture][] = [
  ['1d uniform', () => BisectionFixture.interval([0, 0.3, 1], { left: true, right: false }, { kappa: [1, 5], reaction: [0, 2] }).uniform(4)],
  ['1d graded', () => BisectionFixture.interval([0, 1], { left: true, right: true }).gradeTowardPoint(12, 0.37)],
  ['2d uniform, 4 pieces, materials', () => BisectionFixture.square(4, { kappa: [1, 10, 0.1, 3], reaction: [0, 1, 0, 4], dirichlet: (x) => x === 0 }).uniform(5)],
  ['2d graded to corner', () => BisectionFixture.square(2).gradeTowardPoint(14, 0, 0)],
  ['2d graded to corner, anisotropic tensors', () => BisectionFixture.square(2, { kappaTensor: [4, 1, 0.5, 1, -0.3, 2] }).gradeTowardPoint(10, 0, 0)],
  ['2d graded to edge', () => BisectionFixture.square(2, { dirichlet: (_x, y) => y === 1 }).gradeTowardBottomEdge(7)],
];

describe('P1 assembly of the fine matrices', () => {
  it('matches the 5-point stencil and the 1D three-point stencils (common practice)', () => {
    // Uniform right-triangle mesh of the square: stiffness row of an interior vertex is 4, −1 ×4 (textbook fact,
    // e.g. Johnson, Numerical Solution of PDEs by the FEM, 1987, §1.3 (from memory)); 1D: (1/h)(−1, 2, −1), mass (h/6)(1, 4, 1).
    // NVB meshes of the square are "union jack" meshes: axis neighbours get −1, diagonal neighbours 0.
    const m2 = BisectionFixture.square(2).uniform(6).leafMesh();
    const hh = 1 / 8;
    const rows2 = assemblePair(m2);
    let checked = 0;
    for (let v = 0; v < m2.vertexCount; v++) {
      if (!m2.isFree[v]) continue;
      expect(rows2.diag[2 * v]).toBeCloseTo(4, 12);
      for (let t = rows2.start[v]!; t < rows2.start[v]! + rows2.len[v]!; t++) {
        const w = rows2.cols[t]!;
        const dist = Math.hypot(m2.coords[2 * w]! - m2.coords[2 * v]!, m2.coords[2 * w + 1]! - m2.coords[2 * v + 1]!);
        expect(rows2.vals[2 * t]).toBeCloseTo(Math.abs(dist - hh) < 1e-12 ? -1 : 0, 12);
      }
      checked++;
    }
    expect(checked).toBe(49);
    const m1 = BisectionFixture.interval([0, 1], { left: true, right: true }).uniform(5).leafMesh();
    const rows1 = assemblePair(m1);
    const h = 1 / 32;
    for (let v = 0; v < m1.vertexCount; v++) {
      if (!m1.isFree[v]) continue;
      expect(rows1.diag[2 * v]).toBeCloseTo(2 / h, 9);
      expect(rows1.diag[2 * v + 1]).toBeCloseTo((4 * h) / 6, 14);
    }
  });

  it('uses exact element sizes 2^−k·h_0, not coordinate differences (1D, 50 generations toward x = 1/3)', () => {
    // near 1/3, ulp(1/3) = 2^−54 while h = 2^−50/3: coordinate differences would be off by tens of percent
    const mesh = BisectionFixture.interval([0, 1 / 3, 1], { left: true, right: true }).gradeTowardPoint(50, 1 / 3).leafMesh();
    const rows = assemblePair(mesh);
    const v = 1; // the initial vertex 1/3 (local order: initial vertices first)
    expect(mesh.coords[v]).toBe(1 / 3);
    const hl = (1 / 3) * 2 ** -50;
    const hr = (2 / 3) * 2 ** -50;
    expect(rows.diag[2 * v]! / (1 / hl + 1 / hr) - 1).toBeCloseTo(0, 13);
    expect(rows.diag[2 * v + 1]! / ((2 * (hl + hr)) / 6) - 1).toBeCloseTo(0, 13);
  });

  it.each(meshes)('equals the independent dense assembly (%s)', (_name, mk) => {
    const mesh = mk().leafMesh();
    const csr = copyPairedRows(assemblePair(mesh));
    const ref = denseMatrices(mesh);
    const err = maxRowError(ref.free, csr.cols, csr.vals, Float64Array.from(ref.free.flatMap((v) => [csr.diag[2 * v]!, csr.diag[2 * v + 1]!])), ref,
      (k) => [csr.ptr[ref.free[k]!]!, csr.ptr[ref.free[k]! + 1]!]);
    expect(err).toBeLessThan(1e-11 * scale(ref.K));
  });
});

describe('Galerkin hierarchy', () => {
  it.each(meshes)('rows of A_g, M_g on S_g equal direct assembly on the mesh of generation ≤ g (%s)', (_name, mk) => {
    const f = mk();
    const mesh: LeafMesh = f.leafMesh();
    const h = buildHierarchy(mesh, assemblePair(mesh));
    const G = mesh.generation[mesh.vertexCount - 1]!;
    expect(h.levels).toBe(G + 1);
    let rowsChecked = 0;
    for (let g = 1; g <= G; g++) {
      const ref = denseMatrices(f.leafMesh(g));
      const verts = h.setVerts.subarray(h.setBegin[g]!, h.setEnd[g]!);
      const diag = h.rowDiag.subarray(2 * h.setBegin[g]!, 2 * h.setEnd[g]!);
      const off = h.setBegin[g]!;
      const err = maxRowError(verts, h.rowCols, pairedValues(h), diag, ref, (k) => [h.rowStart[off + k]!, h.rowEnd[off + k]!]);
      expect(err).toBeLessThan(1e-10 * scale(ref.K));
      rowsChecked += verts.length;
      // the smoothing set: free generation-g vertices and their free interpolation parents
      const want = new Set<number>();
      for (let m = h.levelStart[g]!; m < h.levelStart[g + 1]!; m++) {
        if (!mesh.isFree[m]) continue;
        want.add(m);
        if (mesh.isFree[mesh.parentA[m]!]) want.add(mesh.parentA[m]!);
        if (mesh.isFree[mesh.parentB[m]!]) want.add(mesh.parentB[m]!);
      }
      const narrow = h.setVerts.subarray(h.setBegin[g]!, h.narrowEnd[g]!);
      expect(new Set(narrow)).toEqual(want);
      // the widened part (Jacobi smoothing only): free mesh_g neighbours of the new vertices
      const wide = h.setVerts.subarray(h.narrowEnd[g]!, h.setEnd[g]!);
      for (const v of wide) {
        expect(want.has(v)).toBe(false);
        expect(mesh.isFree[v]).toBe(1);
        expect(mesh.generation[v]!).toBeLessThan(g);
      }
    }
    expect(rowsChecked).toBeGreaterThan(0);
    const ref0 = denseMatrices(f.leafMesh(0));
    const err0 = maxRowError(h.coarseVerts, Int32Array.from(h.coarseCols, (c) => h.coarseVerts[c]!), h.coarseVals, h.coarseDiag, ref0,
      (k) => [h.coarsePtr[k]!, h.coarsePtr[k + 1]!]);
    expect(err0).toBeLessThan(1e-10 * scale(ref0.K));
  });

  it('stores linearly many entries on a mesh graded over 40 generations', () => {
    const mesh = BisectionFixture.square(4).gradeTowardPoint(40, 0, 0).leafMesh();
    const h = buildHierarchy(mesh, assemblePair(mesh));
    expect(h.levels).toBeGreaterThanOrEqual(41);
    expect(h.setVerts.length).toBeLessThanOrEqual(3 * mesh.vertexCount);
    expect(h.rowCols.length).toBeLessThanOrEqual(3 * 12 * mesh.vertexCount);
  });
});

/** The interleaved (A, M) values of every stored entry, decoded from the table of distinct pairs. */
function pairedValues(h: ReturnType<typeof buildHierarchy>): Float64Array {
  const vals = new Float64Array(2 * h.rowPair.length);
  for (let t = 0; t < h.rowPair.length; t++) {
    vals[2 * t] = h.pairValues[2 * h.rowPair[t]!]!;
    vals[2 * t + 1] = h.pairValues[2 * h.rowPair[t]! + 1]!;
  }
  return vals;
}
