/**
 * Exact sparse direct solver for the coarse level: reverse Cuthill–McKee
 * ordering followed by envelope (profile) Cholesky, both common practice
 * (George & Liu, Computer Solution of Large Sparse Positive Definite Systems,
 * 1981, ch. 4). Within the envelope of each row there is no further fill, so
 * the factor is stored densely row by row from the first nonzero column to the
 * diagonal.
 */
import { SolverBreakdownError } from '../../errors';

export interface EnvelopeStructure {
  readonly n: number;
  /** perm[i] = original index of the i-th unknown in elimination order. */
  readonly perm: Int32Array;
  /** first[i] = first column (elimination order) of row i of the envelope. */
  readonly first: Int32Array;
  /** Row i of the factor occupies [rowStart[i], rowStart[i] + i − first[i] + 1); last slot is the diagonal. */
  readonly rowStart: Int32Array;
  readonly size: number;
}

/** Reverse Cuthill–McKee order of a symmetric pattern given in CSR (off-diagonals only). */
export function reverseCuthillMcKee(n: number, ptr: Int32Array, cols: Int32Array): Int32Array {
  const degree = new Int32Array(n);
  for (let i = 0; i < n; i++) degree[i] = ptr[i + 1]! - ptr[i]!;
  const order = new Int32Array(n);
  const level = new Int32Array(n);
  const placed = new Uint8Array(n);
  const seen = new Int32Array(n);
  let stamp = 0;
  let filled = 0;
  const bfs = (root: number, out: Int32Array, offset: number, sortByDegree: boolean): number => {
    // breadth-first search from root over unplaced vertices; returns the number of vertices reached
    stamp++;
    let head = offset;
    let tail = offset;
    out[tail++] = root;
    seen[root] = stamp;
    level[root] = 0;
    const nb: number[] = [];
    while (head < tail) {
      const v = out[head++]!;
      nb.length = 0;
      for (let t = ptr[v]!; t < ptr[v + 1]!; t++) {
        const w = cols[t]!;
        if (seen[w] !== stamp && !placed[w]) { seen[w] = stamp; nb.push(w); }
      }
      if (sortByDegree) nb.sort((x, y) => degree[x]! - degree[y]! || x - y);
      for (const w of nb) { level[w] = level[v]! + 1; out[tail++] = w; }
    }
    return tail - offset;
  };
  const scratch = new Int32Array(n);
  for (let s = 0; s < n; s++) {
    if (placed[s]) continue;
    // pseudo-peripheral start: repeat BFS from a farthest vertex of minimal degree while the depth grows
    let root = s;
    let depth = -1;
    for (let it = 0; it < 8; it++) {
      const cnt = bfs(root, scratch, 0, false);
      let far = root;
      let maxLevel = 0;
      for (let i = 0; i < cnt; i++) {
        const v = scratch[i]!;
        if (level[v]! > maxLevel || (level[v] === maxLevel && degree[v]! < degree[far]!)) { maxLevel = level[v]!; far = v; }
      }
      if (maxLevel <= depth) break;
      depth = maxLevel;
      root = far;
    }
    const cnt = bfs(root, order, filled, true);
    for (let i = filled; i < filled + cnt; i++) placed[order[i]!] = 1;
    filled += cnt;
  }
  order.reverse();
  return order;
}

export function envelopeStructure(n: number, ptr: Int32Array, cols: Int32Array): EnvelopeStructure {
  const perm = reverseCuthillMcKee(n, ptr, cols);
  const inv = new Int32Array(n);
  for (let i = 0; i < n; i++) inv[perm[i]!] = i;
  const first = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const v = perm[i]!;
    let f = i;
    for (let t = ptr[v]!; t < ptr[v + 1]!; t++) f = Math.min(f, inv[cols[t]!]!);
    first[i] = f;
  }
  const rowStart = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) rowStart[i + 1] = rowStart[i]! + (i - first[i]! + 1);
  return { n, perm, first, rowStart, size: rowStart[n]! };
}

/**
 * Factor L (envelope storage) of K + αM, with K, M given by CSR off-diagonals
 * (values interleaved (k, m)) and interleaved diagonals, in original numbering.
 */
export function envelopeFactor(
  st: EnvelopeStructure, ptr: Int32Array, cols: Int32Array, vals: Float64Array, diag: Float64Array, alpha: number,
): Float64Array {
  const { n, perm, first, rowStart } = st;
  const inv = new Int32Array(n);
  for (let i = 0; i < n; i++) inv[perm[i]!] = i;
  const L = new Float64Array(st.size);
  for (let i = 0; i < n; i++) {
    const v = perm[i]!;
    const fi = first[i]!;
    const ri = rowStart[i]! - fi; // L[i,k] = L[ri + k]
    for (let t = ptr[v]!; t < ptr[v + 1]!; t++) {
      const k = inv[cols[t]!]!;
      if (k < i) L[ri + k] = L[ri + k]! + vals[2 * t]! + alpha * vals[2 * t + 1]!;
    }
    for (let j = fi; j < i; j++) {
      const fj = first[j]!;
      const rj = rowStart[j]! - fj;
      let s = L[ri + j]!;
      for (let k = Math.max(fi, fj); k < j; k++) s -= L[ri + k]! * L[rj + k]!;
      L[ri + j] = s / L[rj + j]!;
    }
    const d0 = diag[2 * v]! + alpha * diag[2 * v + 1]!;
    let s = d0;
    for (let k = fi; k < i; k++) s -= L[ri + k]! * L[ri + k]!;
    if (!(s > 1e-13 * d0) || !Number.isFinite(s)) {
      throw new SolverBreakdownError(
        `coarse matrix A0 + alpha*M0 is not positive definite (pivot ${i}, alpha = ${alpha}); ` +
          'with alpha = 0 this happens when there is no Dirichlet boundary and the reaction is zero',
        { field: 'alpha', expected: 'a value making A0 + alpha*M0 positive definite', received: alpha },
      );
    }
    L[ri + i] = Math.sqrt(s);
  }
  return L;
}

/** Solves L Lᵀ x = b in elimination order, in place on `x` (which holds b on entry). */
export function envelopeSolveInPlace(st: EnvelopeStructure, L: Float64Array, x: Float64Array): void {
  const { n, first, rowStart } = st;
  for (let i = 0; i < n; i++) {
    const fi = first[i]!;
    const ri = rowStart[i]! - fi;
    let s = x[i]!;
    for (let k = fi; k < i; k++) s -= L[ri + k]! * x[k]!;
    x[i] = s / L[ri + i]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    const fi = first[i]!;
    const ri = rowStart[i]! - fi;
    const xi = x[i]! / L[ri + i]!;
    x[i] = xi;
    for (let k = fi; k < i; k++) x[k] = x[k]! - L[ri + k]! * xi;
  }
}
