/**
 * Compact P1 element data of a leaf mesh and the matrix-free element loops (docs/method.md §4.2).
 *
 * Closed forms (Braess, Finite Elements, ch. II (from memory)): for a triangle with vertices
 * p0, p1, p2, b_i = y_{i+1} − y_{i+2}, c_i = x_{i+2} − x_{i+1} (indices mod 3), the stiffness is
 * κ (b_i b_j + c_i c_j) / (4|T|) and the mass |T|/12 · (1 + δ_ij); for an interval of length h,
 * κ/h [1 −1; −1 1] and h/6 [2 1; 1 2]. The reaction matrix is c times the mass matrix.
 *
 * In 2D the unit-κ stiffness is taken from the element's shape class (see ./forest) and the
 * measure is |T0| 2^{−generation} with T0 the initial ancestor, so nothing here depends on
 * coordinate differences (which lose accuracy at large depth). Per element the loops read three
 * vertex indices, a class id, a material id and a generation byte; the tables are small.
 */
import { applyRobinNodal, robinSegments, type RobinSegments } from './boundary-segments';
import type { BisectionForest } from './forest';
import type { LeafMesh } from './leaf-mesh';

export interface ElementTables {
  readonly dim: 1 | 2;
  readonly count: number;
  readonly elements: Int32Array;
  /** Shape class per element (2D). */
  readonly shape: Int32Array;
  readonly material: Int32Array;
  readonly generation: Uint8Array;
  /** Unit-κ stiffness per shape class, 6 entries (2D). */
  readonly shapeK: Float64Array;
  readonly kappa: Float64Array;
  readonly reaction: Float64Array;
  /** Per material: |T0|/12 (2D) or h0/6 (1D). */
  readonly massBase: Float64Array;
  /** Per material (1D): κ/h0. */
  readonly stiffBase: Float64Array;
  /** 2^{−g} and 2^{g} for g = 0 … 255. */
  readonly pow2neg: Float64Array;
  readonly pow2pos: Float64Array;
  /** Convection boundary mass h ∫_Γ u v (part of the stiffness A; see ./boundary). */
  readonly robin: RobinSegments;
}

const POW2NEG = Float64Array.from({ length: 256 }, (_, g) => 2 ** -g);
const POW2POS = Float64Array.from({ length: 256 }, (_, g) => 2 ** g);

/** Element tables of a leaf mesh produced by SpatialDomain.leafMesh (needs its forestElement). */
export function elementTables(forest: BisectionForest, mesh: LeafMesh & { readonly forestElement: Int32Array }): ElementTables {
  const ne = mesh.elementCount;
  const fe = mesh.forestElement;
  const shape = new Int32Array(mesh.dim === 2 ? ne : 0);
  const generation = new Uint8Array(ne);
  for (let e = 0; e < ne; e++) {
    const f = fe[e]!;
    const g = forest.eGen[f]!;
    if (g > 255) throw new RangeError(`element generation ${g} exceeds 255`);
    generation[e] = g;
    if (mesh.dim === 2) shape[e] = forest.eShape[f]!;
  }
  const nm = forest.initialElementCount;
  const massBase = new Float64Array(nm);
  const stiffBase = new Float64Array(nm);
  for (let m = 0; m < nm; m++) {
    const meas = forest.initialMeasure[m]!;
    massBase[m] = mesh.dim === 2 ? meas / 12 : meas / 6;
    stiffBase[m] = mesh.dim === 1 ? forest.kappa[m]! / meas : 0;
  }
  return {
    dim: mesh.dim,
    count: ne,
    elements: mesh.elements,
    shape,
    material: mesh.elementMaterial,
    generation,
    shapeK: Float64Array.from(forest.shapeK),
    kappa: forest.kappa,
    reaction: forest.reaction,
    massBase,
    stiffBase,
    pow2neg: POW2NEG,
    pow2pos: POW2POS,
    robin: robinSegments(mesh),
  };
}

/** r += (wm·M + wa·(K + C)) u on nodal vectors of length vertexCount. */
export function applyElementsNodal(t: ElementTables, u: Float64Array, r: Float64Array, wm: number, wa: number): void {
  const el = t.elements, mat = t.material, gen = t.generation, kap = t.kappa, rea = t.reaction, mb = t.massBase;
  const pn = t.pow2neg;
  const ne = t.count;
  if (t.dim === 1) {
    const sb = t.stiffBase, pp = t.pow2pos;
    for (let e = 0; e < ne; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const mt = mat[e]!, g = gen[e]!;
      const u0 = u[i0]!, u1 = u[i1]!;
      const du = wa * sb[mt]! * pp[g]! * (u0 - u1);
      const m = mb[mt]! * pn[g]! * (wm + wa * rea[mt]!);
      r[i0] = r[i0]! + du + m * (2 * u0 + u1);
      r[i1] = r[i1]! - du + m * (u0 + 2 * u1);
    }
    if (t.robin.count > 0) applyRobinNodal(t.robin, u, r, wa);
    return;
  }
  const sk = t.shapeK, sh = t.shape;
  for (let e = 0; e < ne; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const mt = mat[e]!, o = 6 * sh[e]!;
    const u0 = u[i0]!, u1 = u[i1]!, u2 = u[i2]!;
    const k = wa * kap[mt]!;
    const m = mb[mt]! * pn[gen[e]!]! * (wm + wa * rea[mt]!);
    const k00 = sk[o]!, k01 = sk[o + 1]!, k02 = sk[o + 2]!, k11 = sk[o + 3]!, k12 = sk[o + 4]!, k22 = sk[o + 5]!;
    const s = u0 + u1 + u2;
    r[i0] = r[i0]! + k * (k00 * u0 + k01 * u1 + k02 * u2) + m * (u0 + s);
    r[i1] = r[i1]! + k * (k01 * u0 + k11 * u1 + k12 * u2) + m * (u1 + s);
    r[i2] = r[i2]! + k * (k02 * u0 + k12 * u1 + k22 * u2) + m * (u2 + s);
  }
  if (t.robin.count > 0) applyRobinNodal(t.robin, u, r, wa);
}

/** rM += M u and rA += (K + C) u. */
export function applyElementsNodalSplit(t: ElementTables, u: Float64Array, rM: Float64Array, rA: Float64Array): void {
  const el = t.elements, mat = t.material, gen = t.generation, kap = t.kappa, rea = t.reaction, mb = t.massBase;
  const pn = t.pow2neg;
  const ne = t.count;
  if (t.dim === 1) {
    const sb = t.stiffBase, pp = t.pow2pos;
    for (let e = 0; e < ne; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const mt = mat[e]!, g = gen[e]!;
      const u0 = u[i0]!, u1 = u[i1]!;
      const du = sb[mt]! * pp[g]! * (u0 - u1);
      const m = mb[mt]! * pn[g]!, c = m * rea[mt]!;
      const a0 = 2 * u0 + u1, a1 = u0 + 2 * u1;
      rM[i0] = rM[i0]! + m * a0;
      rM[i1] = rM[i1]! + m * a1;
      rA[i0] = rA[i0]! + du + c * a0;
      rA[i1] = rA[i1]! - du + c * a1;
    }
    if (t.robin.count > 0) applyRobinNodal(t.robin, u, rA, 1);
    return;
  }
  const sk = t.shapeK, sh = t.shape;
  for (let e = 0; e < ne; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const mt = mat[e]!, o = 6 * sh[e]!;
    const u0 = u[i0]!, u1 = u[i1]!, u2 = u[i2]!;
    const k = kap[mt]!;
    const m = mb[mt]! * pn[gen[e]!]!, c = m * rea[mt]!;
    const k00 = sk[o]!, k01 = sk[o + 1]!, k02 = sk[o + 2]!, k11 = sk[o + 3]!, k12 = sk[o + 4]!, k22 = sk[o + 5]!;
    const s = u0 + u1 + u2;
    const a0 = u0 + s, a1 = u1 + s, a2 = u2 + s;
    rM[i0] = rM[i0]! + m * a0;
    rM[i1] = rM[i1]! + m * a1;
    rM[i2] = rM[i2]! + m * a2;
    rA[i0] = rA[i0]! + k * (k00 * u0 + k01 * u1 + k02 * u2) + c * a0;
    rA[i1] = rA[i1]! + k * (k01 * u0 + k11 * u1 + k12 * u2) + c * a1;
    rA[i2] = rA[i2]! + k * (k02 * u0 + k12 * u1 + k22 * u2) + c * a2;
  }
  if (t.robin.count > 0) applyRobinNodal(t.robin, u, rA, 1);
}

/** r += M uM + (K + C) uA. */
export function applyElementsNodalSum(t: ElementTables, uM: Float64Array, uA: Float64Array, r: Float64Array): void {
  const el = t.elements, mat = t.material, gen = t.generation, kap = t.kappa, rea = t.reaction, mb = t.massBase;
  const pn = t.pow2neg;
  const ne = t.count;
  if (t.dim === 1) {
    const sb = t.stiffBase, pp = t.pow2pos;
    for (let e = 0; e < ne; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const mt = mat[e]!, g = gen[e]!;
      const p0 = uM[i0]!, p1 = uM[i1]!, q0 = uA[i0]!, q1 = uA[i1]!;
      const du = sb[mt]! * pp[g]! * (q0 - q1);
      const m = mb[mt]! * pn[g]!, c = m * rea[mt]!;
      r[i0] = r[i0]! + du + m * (2 * p0 + p1) + c * (2 * q0 + q1);
      r[i1] = r[i1]! - du + m * (p0 + 2 * p1) + c * (q0 + 2 * q1);
    }
    if (t.robin.count > 0) applyRobinNodal(t.robin, uA, r, 1);
    return;
  }
  const sk = t.shapeK, sh = t.shape;
  for (let e = 0; e < ne; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const mt = mat[e]!, o = 6 * sh[e]!;
    const p0 = uM[i0]!, p1 = uM[i1]!, p2 = uM[i2]!;
    const q0 = uA[i0]!, q1 = uA[i1]!, q2 = uA[i2]!;
    const k = kap[mt]!;
    const m = mb[mt]! * pn[gen[e]!]!, c = m * rea[mt]!;
    const k00 = sk[o]!, k01 = sk[o + 1]!, k02 = sk[o + 2]!, k11 = sk[o + 3]!, k12 = sk[o + 4]!, k22 = sk[o + 5]!;
    const sp = p0 + p1 + p2, sq = q0 + q1 + q2;
    r[i0] = r[i0]! + k * (k00 * q0 + k01 * q1 + k02 * q2) + m * (p0 + sp) + c * (q0 + sq);
    r[i1] = r[i1]! + k * (k01 * q0 + k11 * q1 + k12 * q2) + m * (p1 + sp) + c * (q1 + sq);
    r[i2] = r[i2]! + k * (k02 * q0 + k12 * q1 + k22 * q2) + m * (p2 + sp) + c * (q2 + sq);
  }
  if (t.robin.count > 0) applyRobinNodal(t.robin, uA, r, 1);
}
