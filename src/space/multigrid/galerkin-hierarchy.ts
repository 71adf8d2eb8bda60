/**
 * Setup of the local multilevel hierarchy on the generation levels of a leaf
 * mesh (docs/method.md §4.3).
 *
 * mesh_g = local vertices of generation ≤ g; because local vertices are ordered
 * by generation, mesh_g is the prefix [0, levelStart[g+1]). The prolongation
 * P_g: mesh_{g−1} → mesh_g is the identity on old vertices and the midpoint rule
 * u[m] = ½(u[a] + u[b]) at the vertices m of generation g, so the Galerkin
 * matrices A_{g−1} = P_gᵀ A_g P_g are the nodal matrices of the coarser
 * conforming meshes. Going from A_g to A_{g−1} changes only the rows of the
 * generation-g vertices (removed) and of their interpolation parents, so the
 * matrices are coarsened in place, one vertex elimination at a time:
 *   K'[i,j] = K[i,j] + w_i K[m,j] + w_j K[i,m] + w_i w_j K[m,m],  w = ½ at the parents of m.
 * Before coarsening level g we keep the rows that the smoother of level g
 * needs (the smoothing set S_g, see LevelHierarchy.narrowEnd). In a bisection
 * mesh no two vertices of generation g are neighbours in mesh_g (every element
 * of mesh_g has exactly one vertex of its largest generation, its newest
 * vertex), so eliminating the generation-g vertices never changes the row of
 * another one: their rows stay in place in the row pool, and only the rows of
 * the older vertices of S_g (which coarsening changes) are copied to the end of
 * the pool. A row that does have a same-generation neighbour (possible in a
 * LeafMesh not made by bisection) is copied too. Each vertex is eliminated once
 * and each row has bounded length, so the total work and storage are linear in
 * the number of vertices.
 */
import type { LeafMesh } from '../leaf-mesh';
import type { PairedRows } from './paired-rows';
import { compactRows } from './value-pairs';

export interface LevelHierarchy {
  /** Number of generations (maximal generation + 1). */
  readonly levels: number;
  /** Vertices of generation g are the local indices [levelStart[g], levelStart[g+1]). */
  readonly levelStart: Int32Array;
  /**
   * Smoothing set of level g ≥ 1: setVerts[setBegin[g] .. setEnd[g]) (empty for g = 0). Levels are
   * stored from the finest to the coarsest, so setEnd[g] = setBegin[g−1].
   */
  readonly setBegin: Int32Array;
  readonly setEnd: Int32Array;
  /**
   * setVerts[setBegin[g] .. narrowEnd[g]) are the new free vertices of generation g and their free
   * interpolation parents (the classical local smoothing set); [narrowEnd[g], setEnd[g]) their other
   * free neighbours in mesh_g (smoothed only by the Jacobi smoother, see multilevel-preconditioner.ts).
   */
  readonly narrowEnd: Int32Array;
  readonly setVerts: Int32Array;
  /**
   * Row of A_g, M_g for the set entry k: off-diagonal entries [rowStart[k] .. rowEnd[k]) with
   * columns rowCols and values (pairValues[2p], pairValues[2p + 1]) = (A, M) for p = rowPair of
   * the entry (distinct value pairs stored once: ./value-pairs.ts).
   */
  readonly rowStart: Int32Array;
  readonly rowEnd: Int32Array;
  readonly rowCols: Int32Array;
  readonly rowPair: Uint16Array | Int32Array;
  readonly pairValues: Float64Array;
  /** Diagonal (A, M) of each set entry. */
  readonly rowDiag: Float64Array;
  /** Free initial vertices (local indices) and their Galerkin matrices A_0, M_0 in CSR over that numbering. */
  readonly coarseVerts: Int32Array;
  readonly coarsePtr: Int32Array;
  readonly coarseCols: Int32Array;
  readonly coarseVals: Float64Array;
  readonly coarseDiag: Float64Array;
}

/** Compressed copy of all rows of a PairedRows (used for the fine matrix). */
export interface PairedCsr {
  readonly ptr: Int32Array;
  readonly cols: Int32Array;
  readonly vals: Float64Array;
  readonly diag: Float64Array;
}

export function copyPairedRows(rows: PairedRows): PairedCsr {
  const n = rows.n;
  const ptr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) ptr[i + 1] = ptr[i]! + rows.len[i]!;
  const nnz = ptr[n]!;
  const cols = new Int32Array(nnz);
  const vals = new Float64Array(2 * nnz);
  for (let i = 0; i < n; i++) {
    const s = rows.start[i]!;
    const l = rows.len[i]!;
    const o = ptr[i]!;
    for (let t = 0; t < l; t++) {
      cols[o + t] = rows.cols[s + t]!;
      vals[2 * (o + t)] = rows.vals[2 * (s + t)]!;
      vals[2 * (o + t) + 1] = rows.vals[2 * (s + t) + 1]!;
    }
  }
  return { ptr, cols, vals, diag: rows.diag.slice() };
}

/**
 * Pool slots to reserve for the copied rows of {@link buildHierarchy}, from the row capacities:
 * the smoothing sets hold about 2 rows per vertex, and the copied ones take about 1.15 times the
 * fine capacity in d = 2 and 0.7 times in d = 1 (measured on uniform and graded bisection meshes);
 * a larger need grows the pool.
 */
export function snapshotReserve(capacity: Int32Array): number {
  let total = 0;
  for (let i = 0; i < capacity.length; i++) total += capacity[i]!;
  return Math.ceil(1.25 * total);
}

/**
 * Builds the hierarchy; consumes (coarsens) `rows`, which must hold the fine nodal matrices, and
 * keeps its pool as row storage.
 */
export function buildHierarchy(mesh: LeafMesh, rows: PairedRows): LevelHierarchy {
  const n = mesh.vertexCount;
  const gen = mesh.generation;
  const pa = mesh.parentA;
  const pb = mesh.parentB;
  const free = mesh.isFree;
  const levels = gen[n - 1]! + 1;
  const levelStart = new Int32Array(levels + 1);
  for (let m = 0; m < n; m++) levelStart[gen[m]! + 1] = levelStart[gen[m]! + 1]! + 1;
  for (let g = 0; g < levels; g++) levelStart[g + 1] = levelStart[g + 1]! + levelStart[g]!;

  // Smoothing sets S_g, chosen level by level on the current (level-g) matrix rows: the new free
  // vertices of generation g, their free interpolation parents, then their other free neighbours
  // in mesh_g (bounded in number per new vertex, so the total stays linear).
  const mark = new Int32Array(n).fill(-1);
  const setBegin = new Int32Array(levels);
  const setEnd = new Int32Array(levels);
  const narrowEnd = new Int32Array(levels);
  let setCap = Math.max(16, 2 * n);
  let setVerts = new Int32Array(setCap);
  let total = 0;
  const push = (v: number, g: number): void => {
    if (!free[v] || mark[v] === g) return;
    mark[v] = g;
    if (total === setCap) {
      setCap *= 2;
      const s2 = new Int32Array(setCap);
      s2.set(setVerts);
      setVerts = s2;
    }
    setVerts[total++] = v;
  };

  let rowStart = new Int32Array(setCap);
  let rowEnd = new Int32Array(setCap);
  let rowDiag = new Float64Array(2 * setCap);

  for (let g = levels - 1; g >= 1; g--) {
    setBegin[g] = total;
    for (let m = levelStart[g]!; m < levelStart[g + 1]!; m++) push(m, g);
    for (let m = levelStart[g]!; m < levelStart[g + 1]!; m++) {
      if (!free[m]) continue;
      push(pa[m]!, g);
      push(pb[m]!, g);
    }
    narrowEnd[g] = total;
    for (let m = levelStart[g]!; m < levelStart[g + 1]!; m++) {
      if (!free[m]) continue;
      const s0 = rows.start[m]!;
      for (let t = 0; t < rows.len[m]!; t++) push(rows.cols[s0 + t]!, g);
    }
    setEnd[g] = total;
    if (rowStart.length < total) {
      const p2 = new Int32Array(setCap);
      p2.set(rowStart);
      rowStart = p2;
      const e2 = new Int32Array(setCap);
      e2.set(rowEnd);
      rowEnd = e2;
      const d2 = new Float64Array(2 * setCap);
      d2.set(rowDiag);
      rowDiag = d2;
    }
    // 1. keep the rows of A_g, M_g needed by the smoother of level g (in place or copied)
    for (let k = setBegin[g]!; k < setEnd[g]!; k++) {
      const v = setVerts[k]!;
      let s = rows.start[v]!;
      const l = rows.len[v]!;
      if (gen[v] !== g || hasNeighbourOfGeneration(rows, v, gen, g)) s = rows.appendCopy(v);
      rowStart[k] = s;
      rowEnd[k] = s + l;
      rowDiag[2 * k] = rows.diag[2 * v]!;
      rowDiag[2 * k + 1] = rows.diag[2 * v + 1]!;
    }
    // 2. coarsen: A_{g−1} = P_gᵀ A_g P_g
    for (let m = levelStart[g]!; m < levelStart[g + 1]!; m++) {
      if (free[m]) eliminate(rows, m, free[pa[m]!] ? pa[m]! : -1, free[pb[m]!] ? pb[m]! : -1);
    }
  }
  setBegin[0] = total;
  setEnd[0] = total;
  narrowEnd[0] = total;
  setVerts = setVerts.slice(0, total);
  rowStart = rowStart.slice(0, total);
  rowEnd = rowEnd.slice(0, total);
  rowDiag = rowDiag.slice(0, 2 * total);

  // Coarse matrices on the free initial vertices.
  const n0 = levelStart[1]!;
  const local = new Int32Array(n0).fill(-1);
  let nc = 0;
  for (let v = 0; v < n0; v++) if (free[v]) local[v] = nc++;
  const coarseVerts = new Int32Array(nc);
  for (let v = 0; v < n0; v++) if (free[v]) coarseVerts[local[v]!] = v;
  const coarsePtr = new Int32Array(nc + 1);
  for (let i = 0; i < nc; i++) coarsePtr[i + 1] = coarsePtr[i]! + rows.len[coarseVerts[i]!]!;
  const coarseCols = new Int32Array(coarsePtr[nc]!);
  const coarseVals = new Float64Array(2 * coarsePtr[nc]!);
  const coarseDiag = new Float64Array(2 * nc);
  for (let i = 0; i < nc; i++) {
    const v = coarseVerts[i]!;
    const s = rows.start[v]!;
    const l = rows.len[v]!;
    for (let t = 0; t < l; t++) {
      coarseCols[coarsePtr[i]! + t] = local[rows.cols[s + t]!]!;
    }
    coarseVals.set(rows.vals.subarray(2 * s, 2 * (s + l)), 2 * coarsePtr[i]!);
    coarseDiag[2 * i] = rows.diag[2 * v]!;
    coarseDiag[2 * i + 1] = rows.diag[2 * v + 1]!;
  }
  const compact = compactRows(rowStart, rowEnd, rows.cols, rows.vals);
  return {
    levels, levelStart, setBegin, setEnd, narrowEnd, setVerts,
    rowStart: compact.rowStart, rowEnd: compact.rowEnd, rowCols: compact.cols, rowPair: compact.pair, pairValues: compact.pairValues,
    rowDiag, coarseVerts, coarsePtr, coarseCols, coarseVals, coarseDiag,
  };
}

/** True if row v has a column of generation g (then eliminating level g may change the row). */
function hasNeighbourOfGeneration(rows: PairedRows, v: number, gen: Int32Array, g: number): boolean {
  const cols = rows.cols;
  const s = rows.start[v]!;
  const e = s + rows.len[v]!;
  for (let t = s; t < e; t++) if (gen[cols[t]!] === g) return true;
  return false;
}

/**
 * Eliminates vertex m with free parents p, q (−1 if Dirichlet) by the midpoint
 * prolongation: K ← Eᵀ K E restricted to the remaining vertices, i.e.
 * K[x,j] += ½K[m,j] for x ∈ {p, q}, both triangles, K[x,y] += ¼K[m,m] for x, y ∈ {p, q},
 * and row/column m removed.
 */
function eliminate(rows: PairedRows, m: number, p: number, q: number): void {
  const s = rows.start[m]!;
  const l = rows.len[m]!;
  let kmp = 0, mmp = 0, kmq = 0, mmq = 0;
  for (let t = 0; t < l; t++) {
    // the pool arrays may be reallocated by add(); read them afresh
    const j = rows.cols[s + t]!;
    const k = rows.vals[2 * (s + t)]!;
    const mm = rows.vals[2 * (s + t) + 1]!;
    if (j === p) { kmp = k; mmp = mm; continue; }
    if (j === q) { kmq = k; mmq = mm; continue; }
    if (p >= 0) rows.add(p, j, 0.5 * k, 0.5 * mm);
    if (q >= 0) rows.add(q, j, 0.5 * k, 0.5 * mm);
    redirect(rows, j, m, p, q, 0.5 * k, 0.5 * mm);
  }
  const dk = 0.25 * rows.diag[2 * m]!;
  const dm = 0.25 * rows.diag[2 * m + 1]!;
  // K[p,p] += ½K[m,p] + ½K[p,m] + ¼K[m,m]; K[p,q] += ½K[m,q] + ½K[p,m] + ¼K[m,m]
  if (p >= 0) addDiag(rows, p, kmp + dk, mmp + dm);
  if (q >= 0) addDiag(rows, q, kmq + dk, mmq + dm);
  const kpq = 0.5 * (kmp + kmq) + dk;
  const mpq = 0.5 * (mmp + mmq) + dm;
  if (p >= 0) redirect(rows, p, m, q, -1, kpq, mpq);
  if (q >= 0) redirect(rows, q, m, p, -1, kpq, mpq);
  rows.len[m] = 0;
}

/**
 * In row j: adds (k, mm) to the entries of columns x and y (each if ≥ 0) and
 * removes column m, reusing m's slot for a missing x or y. One scan of the row.
 */
function redirect(rows: PairedRows, j: number, m: number, x: number, y: number, k: number, mm: number): void {
  const cols = rows.cols;
  const vals = rows.vals;
  const s = rows.start[j]!;
  const e = s + rows.len[j]!;
  let sx = -1, sy = -1, sm = -1;
  for (let t = s; t < e; t++) {
    const c = cols[t]!;
    if (c === x) sx = t;
    else if (c === y) sy = t;
    else if (c === m) sm = t;
  }
  let addX = false, addY = false;
  if (x >= 0) {
    if (sx >= 0) { vals[2 * sx] = vals[2 * sx]! + k; vals[2 * sx + 1] = vals[2 * sx + 1]! + mm; }
    else if (sm >= 0) { cols[sm] = x; vals[2 * sm] = k; vals[2 * sm + 1] = mm; sm = -1; }
    else addX = true;
  }
  if (y >= 0) {
    if (sy >= 0) { vals[2 * sy] = vals[2 * sy]! + k; vals[2 * sy + 1] = vals[2 * sy + 1]! + mm; }
    else if (sm >= 0) { cols[sm] = y; vals[2 * sm] = k; vals[2 * sm + 1] = mm; sm = -1; }
    else addY = true;
  }
  if (sm >= 0) {
    const last = e - 1;
    cols[sm] = cols[last]!;
    vals[2 * sm] = vals[2 * last]!;
    vals[2 * sm + 1] = vals[2 * last + 1]!;
    rows.len[j] = rows.len[j]! - 1;
  }
  if (addX) rows.add(j, x, k, mm);
  if (addY) rows.add(j, y, k, mm);
}

function addDiag(rows: PairedRows, p: number, k: number, mm: number): void {
  rows.diag[2 * p] = rows.diag[2 * p]! + k;
  rows.diag[2 * p + 1] = rows.diag[2 * p + 1]! + mm;
}
