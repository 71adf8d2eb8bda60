/**
 * Nodal P1 matrices of the leaf mesh restricted to the free vertices
 * (docs/method.md §4.2): K = stiffness with κ plus reaction c·mass, M = mass.
 * Element matrices are the standard P1 closed forms (common practice):
 *   d = 1: κ/h [[1,−1],[−1,1]],  mass h/6 [[2,1],[1,2]];
 *   d = 2: κ (b_i b_j + c_i c_j) / (4|T|),  mass |T|/12 (1 + δ_ij),
 * with b_i = y_{i+1} − y_{i+2}, c_i = x_{i+2} − x_{i+1} (indices mod 3).
 * Element sizes are exact rather than coordinate differences: a leaf of
 * generation k (the largest generation among its vertices) has 2^−k times the
 * length/area of its initial element (each bisection halves it), and the initial
 * size is measured on the shallowest leaf of that initial element. This keeps
 * deep meshes near non-dyadic points (ulp(x) ≫ h) assemblable in d = 1; in d = 2
 * only the shape factors b_i, c_i come from coordinates.
 * Dirichlet vertices get no entries (their rows stay empty). The mesh must
 * have passed `validateLeafMesh` (indices, materials, coefficients).
 */
import { gradProduct } from '../diffusion-tensor';
import { InvalidMeshError } from '../../errors';
import { robinSegments } from '../boundary-segments';
import type { LeafMesh } from '../leaf-mesh';
import { PairedRows } from './paired-rows';

/**
 * Initial slots of every row: a free vertex has at most (incident elements + 1) neighbours (the
 * + 1 for a boundary vertex), and coarsening never raises the valence of a remaining vertex (every
 * coarse element around it is a union of fine ones), so rows do not need to grow in practice.
 */
export function rowCapacity(mesh: LeafMesh): Int32Array {
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
  for (let v = 0; v < n; v++) if (free[v]) capacity[v] = capacity[v]! + 1;
  return capacity;
}

/**
 * The fine nodal matrices in growable rows; `reserve` pool slots are kept for the row snapshots
 * of the hierarchy (see galerkin-hierarchy.ts). `capacity` (from {@link rowCapacity}) is taken over.
 */
export function assemblePair(mesh: LeafMesh, reserve = 0, capacity: Int32Array = rowCapacity(mesh)): PairedRows {
  const rows = new PairedRows(mesh.vertexCount, capacity, reserve);
  const sizes = exactSizes(mesh);
  if (mesh.dim === 1) assemble1d(mesh, rows, sizes);
  else assemble2d(mesh, rows, sizes);
  addConvection(mesh, rows);
  return rows;
}

/**
 * Adds the convection boundary mass h ∫_Γ u v (h|s|/6 [2 1; 1 2] per segment, ../boundary) to K
 * on the free vertices, so the V-cycle's fine matrix, its Galerkin coarse matrices and the exact
 * coarse solve all carry the boundary term.
 */
function addConvection(mesh: LeafMesh, rows: PairedRows): void {
  const rs = robinSegments(mesh);
  const free = mesh.isFree;
  for (let s = 0; s < rs.count; s++) {
    const a = rs.vertices[2 * s]!, b = rs.vertices[2 * s + 1]!, w = rs.weight[s]!;
    if (a === b) {
      if (free[a]) rows.diag[2 * a] = rows.diag[2 * a]! + 6 * w;
      continue;
    }
    if (free[a]) rows.diag[2 * a] = rows.diag[2 * a]! + 2 * w;
    if (free[b]) rows.diag[2 * b] = rows.diag[2 * b]! + 2 * w;
    if (free[a] && free[b]) {
      rows.add(a, b, w, 0);
      rows.add(b, a, w, 0);
    }
  }
}


/**
 * Exact element sizes (see the file comment) without a per-element array: the size of leaf e is
 * `rootSize[elementMaterial[e]] · halving[k]` with k its largest vertex generation.
 */
interface ExactSizes {
  readonly rootSize: Float64Array;
  readonly halving: Float64Array;
}

/** Largest vertex generation of leaf element e. */
function elementGeneration(el: Int32Array, gen: Int32Array, nv: number, e: number): number {
  let k = 0;
  for (let i = 0; i < nv; i++) {
    const g = gen[el[nv * e + i]!]!;
    if (g > k) k = g;
  }
  return k;
}

function elementSize(mesh: LeafMesh, sizes: ExactSizes, nv: number, e: number): number {
  return sizes.rootSize[mesh.elementMaterial[e]!]! * sizes.halving[elementGeneration(mesh.elements, mesh.generation, nv, e)]!;
}

/** Size of the shallowest leaf of every initial element, scaled back to the initial element. */
function exactSizes(mesh: LeafMesh): ExactSizes {
  const ne = mesh.elementCount;
  const nv = mesh.dim + 1;
  const el = mesh.elements;
  const gen = mesh.generation;
  const x = mesh.coords;
  const nr = mesh.kappa.length;
  const rootGen = new Int32Array(nr).fill(0x7fffffff);
  const rootElem = new Int32Array(nr).fill(-1);
  const mats = mesh.elementMaterial;
  for (let e = 0; e < ne; e++) {
    const k = elementGeneration(el, gen, nv, e);
    const r = mats[e]!;
    if (k < rootGen[r]!) { rootGen[r] = k; rootElem[r] = e; }
  }
  const rootSize = new Float64Array(nr);
  for (let r = 0; r < nr; r++) {
    const e = rootElem[r]!;
    if (e < 0) continue;
    let size: number;
    if (mesh.dim === 1) size = Math.abs(x[el[2 * e + 1]!]! - x[el[2 * e]!]!);
    else {
      const p0 = el[3 * e]!, p1 = el[3 * e + 1]!, p2 = el[3 * e + 2]!;
      size = 0.5 * Math.abs((x[2 * p1]! - x[2 * p0]!) * (x[2 * p2 + 1]! - x[2 * p0 + 1]!) - (x[2 * p2]! - x[2 * p0]!) * (x[2 * p1 + 1]! - x[2 * p0 + 1]!));
    }
    if (!(size > 0) || !Number.isFinite(size)) throw degenerate(e, size);
    rootSize[r] = size * 2 ** rootGen[r]!;
  }
  const maxGen = gen[mesh.vertexCount - 1]!;
  const halving = new Float64Array(maxGen + 1);
  for (let k = 0; k <= maxGen; k++) halving[k] = 2 ** -k;
  return { rootSize, halving };
}

function degenerate(e: number, size: number): InvalidMeshError {
  return new InvalidMeshError(`leaf element ${e} is degenerate (size ${size})`, {
    field: `elements[${e}]`, expected: 'an element of positive finite size', received: size,
  });
}

function assemble1d(mesh: LeafMesh, rows: PairedRows, sizes: ExactSizes): void {
  const el = mesh.elements;
  const free = mesh.isFree;
  const loc = [0, 0];
  for (let e = 0; e < mesh.elementCount; e++) {
    const v0 = el[2 * e]!;
    const v1 = el[2 * e + 1]!;
    const h = elementSize(mesh, sizes, 2, e);
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

function assemble2d(mesh: LeafMesh, rows: PairedRows, sizes: ExactSizes): void {
  const el = mesh.elements;
  const xy = mesh.coords;
  const free = mesh.isFree;
  const mats = mesh.elementMaterial;
  const kap = mesh.kappa;
  const ten = mesh.kappaTensor ?? null;
  const rea = mesh.reaction;
  const diag = rows.diag;
  for (let e = 0; e < mesh.elementCount; e++) {
    const v0 = el[3 * e]!;
    const v1 = el[3 * e + 1]!;
    const v2 = el[3 * e + 2]!;
    const x0 = xy[2 * v0]!, y0 = xy[2 * v0 + 1]!;
    const x1 = xy[2 * v1]!, y1 = xy[2 * v1 + 1]!;
    const x2 = xy[2 * v2]!, y2 = xy[2 * v2 + 1]!;
    const b0 = y1 - y2, b1 = y2 - y0, b2 = y0 - y1;
    const c0 = x2 - x1, c1 = x0 - x2, c2 = x1 - x0;
    // 2|T| = b_0 c_1 − b_1 c_0 from coordinates; a vanishing value means the coordinates no longer resolve T
    if (!(Math.abs(b0 * c1 - b1 * c0) > 0)) throw degenerate(e, 0.5 * Math.abs(b0 * c1 - b1 * c0));
    const area = elementSize(mesh, sizes, 3, e);
    const mat = mats[e]!;
    // isotropic: κ/(4|T|) · g_i·g_j; anisotropic: g_iᵀKg_j / (4|T|) (../diffusion-tensor)
    const sk = ten === null ? kap[mat]! / (4 * area) : 1 / (4 * area);
    const c = rea[mat]!;
    const mo = area / 12; // off-diagonal mass; diagonal 2·mo
    const f0 = free[v0]!, f1 = free[v1]!, f2 = free[v2]!;
    if (f0) {
      diag[2 * v0] = diag[2 * v0]! + sk * gradProduct(ten, mat, b0, c0, b0, c0) + 2 * c * mo;
      diag[2 * v0 + 1] = diag[2 * v0 + 1]! + 2 * mo;
    }
    if (f1) {
      diag[2 * v1] = diag[2 * v1]! + sk * gradProduct(ten, mat, b1, c1, b1, c1) + 2 * c * mo;
      diag[2 * v1 + 1] = diag[2 * v1 + 1]! + 2 * mo;
    }
    if (f2) {
      diag[2 * v2] = diag[2 * v2]! + sk * gradProduct(ten, mat, b2, c2, b2, c2) + 2 * c * mo;
      diag[2 * v2 + 1] = diag[2 * v2 + 1]! + 2 * mo;
    }
    const k01 = sk * gradProduct(ten, mat, b0, c0, b1, c1) + c * mo;
    const k12 = sk * gradProduct(ten, mat, b1, c1, b2, c2) + c * mo;
    const k20 = sk * gradProduct(ten, mat, b2, c2, b0, c0) + c * mo;
    if (f0 && f1) { rows.add(v0, v1, k01, mo); rows.add(v1, v0, k01, mo); }
    if (f1 && f2) { rows.add(v1, v2, k12, mo); rows.add(v2, v1, k12, mo); }
    if (f2 && f0) { rows.add(v2, v0, k20, mo); rows.add(v0, v2, k20, mo); }
  }
}
