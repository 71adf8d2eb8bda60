/**
 * Nodal P1 matrices of the leaf mesh restricted to the free vertices
 * (DESIGN.md §4.2): K = stiffness with κ plus reaction c·mass, M = mass.
 * Element matrices are the standard P1 closed forms (common practice):
 *   d = 1: κ/h [[1,−1],[−1,1]],  mass h/6 [[2,1],[1,2]];
 *   d = 2: κ (b_i b_j + c_i c_j) / (4|T|),  mass |T|/12 (1 + δ_ij),
 * with b_i = y_{i+1} − y_{i+2}, c_i = x_{i+2} − x_{i+1} (indices mod 3).
 * Dirichlet vertices get no entries (their rows stay empty). The mesh must
 * have passed `validateLeafMesh` (indices, materials, coefficients).
 */
import { InvalidMeshError } from '../../errors';
import type { LeafMesh } from '../leaf-mesh';
import { PairedRows } from './paired-rows';

export function assemblePair(mesh: LeafMesh): PairedRows {
  const n = mesh.vertexCount;
  const nv = mesh.dim + 1;
  const el = mesh.elements;
  const free = mesh.isFree;
  const capacity = new Int32Array(n);
  for (let e = 0; e < mesh.elementCount; e++) {
    for (let i = 0; i < nv; i++) {
      const v = el[e * nv + i]!;
      if (free[v]) capacity[v] = capacity[v]! + 1;
    }
  }
  for (let v = 0; v < n; v++) if (free[v]) capacity[v] = capacity[v]! + 2;
  const rows = new PairedRows(n, capacity);
  if (mesh.dim === 1) assemble1d(mesh, rows);
  else assemble2d(mesh, rows);
  return rows;
}

function degenerate(e: number, size: number): InvalidMeshError {
  return new InvalidMeshError(`leaf element ${e} is degenerate (size ${size})`, {
    field: `elements[${e}]`, expected: 'an element of positive finite size', received: size,
  });
}

function assemble1d(mesh: LeafMesh, rows: PairedRows): void {
  const el = mesh.elements;
  const x = mesh.coords;
  const free = mesh.isFree;
  const loc = [0, 0];
  for (let e = 0; e < mesh.elementCount; e++) {
    const v0 = el[2 * e]!;
    const v1 = el[2 * e + 1]!;
    const h = Math.abs(x[v1]! - x[v0]!);
    if (!(h > 0) || !Number.isFinite(h)) throw degenerate(e, h);
    const mat = mesh.elementMaterial[e]!;
    const kappa = mesh.kappa[mat]!;
    const c = mesh.reaction[mat]!;
    loc[0] = v0;
    loc[1] = v1;
    for (let i = 0; i < 2; i++) {
      const vi = loc[i]!;
      if (!free[vi]) continue;
      for (let j = 0; j < 2; j++) {
        const vj = loc[j]!;
        if (!free[vj]) continue;
        const mass = (h / 6) * (i === j ? 2 : 1);
        const stiff = (kappa / h) * (i === j ? 1 : -1);
        if (i === j) {
          rows.diag[2 * vi] = rows.diag[2 * vi]! + stiff + c * mass;
          rows.diag[2 * vi + 1] = rows.diag[2 * vi + 1]! + mass;
        } else {
          rows.add(vi, vj, stiff + c * mass, mass);
        }
      }
    }
  }
}

function assemble2d(mesh: LeafMesh, rows: PairedRows): void {
  const el = mesh.elements;
  const xy = mesh.coords;
  const free = mesh.isFree;
  const loc = [0, 0, 0];
  const b = [0, 0, 0];
  const g = [0, 0, 0];
  for (let e = 0; e < mesh.elementCount; e++) {
    for (let i = 0; i < 3; i++) loc[i] = el[3 * e + i]!;
    for (let i = 0; i < 3; i++) {
      const p = loc[(i + 1) % 3]!;
      const q = loc[(i + 2) % 3]!;
      b[i] = xy[2 * p + 1]! - xy[2 * q + 1]!;
      g[i] = xy[2 * q]! - xy[2 * p]!;
    }
    // 2|T| = b_0 c_1 − b_1 c_0 (signed; counter-clockwise gives > 0)
    const twiceArea = Math.abs(b[0]! * g[1]! - b[1]! * g[0]!);
    if (!(twiceArea > 0) || !Number.isFinite(twiceArea)) throw degenerate(e, twiceArea / 2);
    const area = twiceArea / 2;
    const mat = mesh.elementMaterial[e]!;
    const kappa = mesh.kappa[mat]!;
    const c = mesh.reaction[mat]!;
    const sk = kappa / (4 * area);
    for (let i = 0; i < 3; i++) {
      const vi = loc[i]!;
      if (!free[vi]) continue;
      for (let j = 0; j < 3; j++) {
        const vj = loc[j]!;
        if (!free[vj]) continue;
        const mass = (area / 12) * (i === j ? 2 : 1);
        const stiff = sk * (b[i]! * b[j]! + g[i]! * g[j]!);
        if (i === j) {
          rows.diag[2 * vi] = rows.diag[2 * vi]! + stiff + c * mass;
          rows.diag[2 * vi + 1] = rows.diag[2 * vi + 1]! + mass;
        } else {
          rows.add(vi, vj, stiff + c * mass, mass);
        }
      }
    }
  }
}
