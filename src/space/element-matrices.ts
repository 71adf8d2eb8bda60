/**
 * P1 element matrices on leaf elements (DESIGN.md §4.2), precomputed into one flat array.
 *
 * 2D, triangle with vertices p0, p1, p2 and area |T|: with b_i = y_{i+1} − y_{i+2} and
 * c_i = x_{i+2} − x_{i+1} (indices mod 3) the stiffness is κ (b_i b_j + c_i c_j) / (4|T|) and the
 * mass is |T|/12 · (1 + δ_ij). 1D, interval of length h: stiffness κ/h [1 −1; −1 1], mass
 * h/6 [2 1; 1 2]. The reaction matrix is c times the mass matrix.
 */
import type { LeafMesh } from './leaf-mesh';

/** Stride of the per-element record: 2D (k00 k01 k02 k11 k12 k22 m r), 1D (k m r). */
export function elementStride(dim: 1 | 2): number {
  return dim === 2 ? 8 : 3;
}

/**
 * Fills `out` (length elementCount · stride) with the element records of `mesh`: stiffness
 * entries scaled by κ, the mass factor m (|T|/12 in 2D, h/6 in 1D) and r = c · m.
 */
export function elementRecords(mesh: LeafMesh, out = new Float64Array(mesh.elementCount * elementStride(mesh.dim))): Float64Array {
  const el = mesh.elements, xy = mesh.coords, mat = mesh.elementMaterial;
  const kap = mesh.kappa, rea = mesh.reaction;
  if (mesh.dim === 1) {
    for (let e = 0; e < mesh.elementCount; e++) {
      const h = Math.abs(xy[el[2 * e + 1]!]! - xy[el[2 * e]!]!);
      const m = mat[e]!;
      out[3 * e] = kap[m]! / h;
      out[3 * e + 1] = h / 6;
      out[3 * e + 2] = (rea[m]! * h) / 6;
    }
    return out;
  }
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const x0 = xy[2 * i0]!, y0 = xy[2 * i0 + 1]!, x1 = xy[2 * i1]!, y1 = xy[2 * i1 + 1]!, x2 = xy[2 * i2]!, y2 = xy[2 * i2 + 1]!;
    const b0 = y1 - y2, b1 = y2 - y0, b2 = y0 - y1;
    const c0 = x2 - x1, c1 = x0 - x2, c2 = x1 - x0;
    const area = 0.5 * (c2 * b1 - c1 * b2); // ½ ((x1 − x0)(y2 − y0) − (x2 − x0)(y1 − y0))
    const m = mat[e]!;
    const s = kap[m]! / (4 * area);
    const o = 8 * e;
    out[o] = s * (b0 * b0 + c0 * c0);
    out[o + 1] = s * (b0 * b1 + c0 * c1);
    out[o + 2] = s * (b0 * b2 + c0 * c2);
    out[o + 3] = s * (b1 * b1 + c1 * c1);
    out[o + 4] = s * (b1 * b2 + c1 * c2);
    out[o + 5] = s * (b2 * b2 + c2 * c2);
    out[o + 6] = area / 12;
    out[o + 7] = (rea[m]! * area) / 12;
  }
  return out;
}

/** Nodal element loop: r += (wm·M + wa·(K + C)) u. All arrays have length vertexCount. */
export function applyElementsNodal(
  mesh: LeafMesh, rec: Float64Array, u: Float64Array, r: Float64Array, wm: number, wa: number,
): void {
  const el = mesh.elements;
  const ne = mesh.elementCount;
  if (mesh.dim === 1) {
    for (let e = 0; e < ne; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const u0 = u[i0]!, u1 = u[i1]!;
      const k = wa * rec[3 * e]!;
      const m = wm * rec[3 * e + 1]! + wa * rec[3 * e + 2]!;
      const du = k * (u0 - u1);
      r[i0] = r[i0]! + du + m * (2 * u0 + u1);
      r[i1] = r[i1]! - du + m * (u0 + 2 * u1);
    }
    return;
  }
  for (let e = 0; e < ne; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const u0 = u[i0]!, u1 = u[i1]!, u2 = u[i2]!;
    const o = 8 * e;
    const k00 = rec[o]!, k01 = rec[o + 1]!, k02 = rec[o + 2]!, k11 = rec[o + 3]!, k12 = rec[o + 4]!, k22 = rec[o + 5]!;
    const m = wm * rec[o + 6]! + wa * rec[o + 7]!;
    const s = u0 + u1 + u2;
    r[i0] = r[i0]! + wa * (k00 * u0 + k01 * u1 + k02 * u2) + m * (u0 + s);
    r[i1] = r[i1]! + wa * (k01 * u0 + k11 * u1 + k12 * u2) + m * (u1 + s);
    r[i2] = r[i2]! + wa * (k02 * u0 + k12 * u1 + k22 * u2) + m * (u2 + s);
  }
}

/** Nodal element loop with two outputs: rM += M u, rA += (K + C) u. */
export function applyElementsNodalSplit(mesh: LeafMesh, rec: Float64Array, u: Float64Array, rM: Float64Array, rA: Float64Array): void {
  const el = mesh.elements;
  const ne = mesh.elementCount;
  if (mesh.dim === 1) {
    for (let e = 0; e < ne; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const u0 = u[i0]!, u1 = u[i1]!;
      const du = rec[3 * e]! * (u0 - u1);
      const m = rec[3 * e + 1]!, c = rec[3 * e + 2]!;
      const a0 = 2 * u0 + u1, a1 = u0 + 2 * u1;
      rM[i0] = rM[i0]! + m * a0;
      rM[i1] = rM[i1]! + m * a1;
      rA[i0] = rA[i0]! + du + c * a0;
      rA[i1] = rA[i1]! - du + c * a1;
    }
    return;
  }
  for (let e = 0; e < ne; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const u0 = u[i0]!, u1 = u[i1]!, u2 = u[i2]!;
    const o = 8 * e;
    const k00 = rec[o]!, k01 = rec[o + 1]!, k02 = rec[o + 2]!, k11 = rec[o + 3]!, k12 = rec[o + 4]!, k22 = rec[o + 5]!;
    const m = rec[o + 6]!, c = rec[o + 7]!;
    const s = u0 + u1 + u2;
    const a0 = u0 + s, a1 = u1 + s, a2 = u2 + s;
    rM[i0] = rM[i0]! + m * a0;
    rM[i1] = rM[i1]! + m * a1;
    rM[i2] = rM[i2]! + m * a2;
    rA[i0] = rA[i0]! + k00 * u0 + k01 * u1 + k02 * u2 + c * a0;
    rA[i1] = rA[i1]! + k01 * u0 + k11 * u1 + k12 * u2 + c * a1;
    rA[i2] = rA[i2]! + k02 * u0 + k12 * u1 + k22 * u2 + c * a2;
  }
}

/** Nodal element loop with two inputs: r += M uM + (K + C) uA. */
export function applyElementsNodalSum(mesh: LeafMesh, rec: Float64Array, uM: Float64Array, uA: Float64Array, r: Float64Array): void {
  const el = mesh.elements;
  const ne = mesh.elementCount;
  if (mesh.dim === 1) {
    for (let e = 0; e < ne; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const p0 = uM[i0]!, p1 = uM[i1]!, q0 = uA[i0]!, q1 = uA[i1]!;
      const du = rec[3 * e]! * (q0 - q1);
      const m = rec[3 * e + 1]!, c = rec[3 * e + 2]!;
      r[i0] = r[i0]! + du + m * (2 * p0 + p1) + c * (2 * q0 + q1);
      r[i1] = r[i1]! - du + m * (p0 + 2 * p1) + c * (q0 + 2 * q1);
    }
    return;
  }
  for (let e = 0; e < ne; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const p0 = uM[i0]!, p1 = uM[i1]!, p2 = uM[i2]!;
    const q0 = uA[i0]!, q1 = uA[i1]!, q2 = uA[i2]!;
    const o = 8 * e;
    const k00 = rec[o]!, k01 = rec[o + 1]!, k02 = rec[o + 2]!, k11 = rec[o + 3]!, k12 = rec[o + 4]!, k22 = rec[o + 5]!;
    const m = rec[o + 6]!, c = rec[o + 7]!;
    const sp = p0 + p1 + p2, sq = q0 + q1 + q2;
    r[i0] = r[i0]! + k00 * q0 + k01 * q1 + k02 * q2 + m * (p0 + sp) + c * (q0 + sq);
    r[i1] = r[i1]! + k01 * q0 + k11 * q1 + k12 * q2 + m * (p1 + sp) + c * (q1 + sq);
    r[i2] = r[i2]! + k02 * q0 + k12 * q1 + k22 * q2 + m * (p2 + sp) + c * (q2 + sq);
  }
}
