/**
 * Double trees: space-time index sets (docs/method.md §5.1).
 *
 * A double tree Λ is a set of pairs (λ, ν) — λ a temporal node, ν a free
 * spatial vertex — closed under temporal parents in the first slot and under
 * spatial godparents in the second. Storage is temporal-major: the temporal
 * projection as a {@link TemporalTree}, and for every temporal node an
 * interned sorted fibre of vertex ids. Coefficients of node i occupy one
 * contiguous block; for a test-type (Ψ) set the block holds the two functions
 * of the node one after the other. Fibres may be empty (intermediate sets of
 * the tensor apply share the temporal projection of Λ_in or Λ_out).
 */
import { InvalidArgumentError, InvalidIndexSetError, describeValue } from '../errors';
import { TemporalTree, nodeParents, type TemporalBasisKind } from '../time/index';
import { SpatialDomain } from '../space/index';
import { checkInstance, checkNumber, checkNumberArray, checkObject, checkOptions } from '../validation/index';
import { FibrePool, isSortedSubset, unionSorted } from './fibre-pool';


/**
 * A space-time index set (double tree) with temporal-major storage; see the module comment.
 *
 * @example
 * ```ts
 * import { DoubleTree, rectangleDomain } from 'chronomesh';
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const sparse = DoubleTree.sparseGrid(domain, 3);          // |λ| + ℓx(ν) ≤ 3
 * const v = domain.uniformSet(1)[0]!;
 * const local = DoubleTree.fromPairs(domain, { levels: [6], indices: [0], vertices: [v] }, { close: true });
 * console.log(sparse.size, local.size, local.tree.maxLevel); // local: level 6 near t = 0 plus its ancestors
 * ```
 */
export class DoubleTree {
  /** Temporal basis of the first slot: `'trial'` (Σ, for Λ) or `'test'` (Ψ, for Λ_Y). */
  readonly kind: TemporalBasisKind;
  /** Temporal projection. */
  readonly tree: TemporalTree;
  /** Pool the fibres are interned in (shared by all sets of one problem). */
  readonly pool: FibrePool;
  /** Fibre id of each temporal node. */
  readonly nodeFibre: Int32Array;
  /** Fibre id of each temporal function (test nodes have two functions). */
  readonly functionFibre: Int32Array;
  /** Coefficient block of temporal function f is [functionOffset[f], functionOffset[f + 1]). */
  readonly functionOffset: Int32Array;
  /** Number of coefficients (unknowns). */
  readonly size: number;

  constructor(kind: TemporalBasisKind, tree: TemporalTree, nodeFibre: Int32Array, pool: FibrePool) {
    if (tree.kind !== kind) throw new InvalidArgumentError(`temporal tree is of kind '${tree.kind}', expected '${kind}'`, { field: 'tree' });
    if (nodeFibre.length !== tree.size) {
      throw new InvalidArgumentError(`nodeFibre has length ${nodeFibre.length}, expected ${tree.size} (one per temporal node)`, { field: 'nodeFibre' });
    }
    this.kind = kind;
    this.tree = tree;
    this.pool = pool;
    this.nodeFibre = nodeFibre;
    const fpn = kind === 'test' ? 2 : 1;
    const nf = tree.size * fpn;
    this.functionFibre = new Int32Array(nf);
    this.functionOffset = new Int32Array(nf + 1);
    let off = 0;
    for (let f = 0; f < nf; f++) {
      const id = nodeFibre[fpn === 2 ? f >> 1 : f]!;
      this.functionFibre[f] = id;
      this.functionOffset[f] = off;
      off += pool.get(id).length;
    }
    this.functionOffset[nf] = off;
    this.size = off;
  }

  /** Number of temporal functions (`tree.functionCount`). */
  get functionCount(): number {
    return this.functionFibre.length;
  }

  /** The fibre (sorted free vertex ids) of temporal node `i`. */
  fibre(i: number): Int32Array {
    return this.pool.get(this.nodeFibre[i]!);
  }

  /** Builds a double tree from one fibre per temporal node of `tree`. */
  static fromNodeFibres(kind: TemporalBasisKind, tree: TemporalTree, fibres: Int32Array[], pool: FibrePool): DoubleTree {
    const ids = new Int32Array(tree.size);
    for (let i = 0; i < tree.size; i++) ids[i] = pool.intern(fibres[i]!);
    return new DoubleTree(kind, tree, ids, pool);
  }

  /**
   * The sparse grid of level L: all pairs with `|λ| + ℓ_x(ν) ≤ L`
   * ({@link DoubleTree.fullGrid} gives the full grid).
   */
  static sparseGrid(domain: SpatialDomain, L: number, pool: FibrePool = new FibrePool(), maxUnknowns = DEFAULT_MAX_UNKNOWNS): DoubleTree {
    checkDomain(domain);
    checkLevel(L, 'L');
    checkNumber(maxUnknowns, 'maxUnknowns', { min: 1 });
    const estimate = sparseGridUnknownEstimate(domain, L);
    checkSize(estimate, maxUnknowns, `sparse grid of level ${L}`);
    const tree = TemporalTree.full('trial', L);
    const byLevel: Int32Array[] = [];
    for (let l = 0; l <= L; l++) byLevel.push(domain.uniformSet(L - l));
    const fibres = Array.from({ length: tree.size }, (_, i) => byLevel[tree.level[i]!]!);
    return DoubleTree.fromNodeFibres('trial', tree, fibres, pool);
  }

  /** All pairs with |λ| ≤ Lt and ℓ_x(ν) ≤ Lx (tensor-product full grid). */
  static fullGrid(domain: SpatialDomain, Lt: number, Lx: number = Lt, pool: FibrePool = new FibrePool(), maxUnknowns = DEFAULT_MAX_UNKNOWNS): DoubleTree {
    checkDomain(domain);
    checkLevel(Lt, 'Lt');
    checkLevel(Lx, 'Lx');
    checkNumber(maxUnknowns, 'maxUnknowns', { min: 1 });
    checkSize(2 ** Lt * spatialEstimate(domain, Lx), maxUnknowns, `full grid of levels (${Lt}, ${Lx})`);
    const tree = TemporalTree.full('trial', Lt);
    const set = domain.uniformSet(Lx);
    return DoubleTree.fromNodeFibres('trial', tree, Array.from({ length: tree.size }, () => set), pool);
  }

  /**
   * A trial double tree from user pairs `(level, index, vertex)`. With
   * `close: true` the smallest double tree containing the pairs is returned
   * (Dirichlet vertices met on the way are dropped); otherwise the set must
   * already be closed and a missing parent is reported by name.
   */
  static fromPairs(
    domain: SpatialDomain,
    pairs: { levels: ArrayLike<number>; indices: ArrayLike<number>; vertices: ArrayLike<number> },
    opts: { close?: boolean; pool?: FibrePool } = {},
  ): DoubleTree {
    checkDomain(domain);
    checkObject(pairs, 'pairs', 'an object { levels, indices, vertices } of equal-length arrays');
    const { levels, indices, vertices } = pairs;
    checkNumberArray(levels, 'pairs.levels');
    checkNumberArray(indices, 'pairs.indices');
    checkNumberArray(vertices, 'pairs.vertices');
    checkOptions(opts, 'opts', ['close', 'pool']);
    const n = levels.length;
    if (indices.length !== n || vertices.length !== n) {
      throw new InvalidArgumentError(`pairs.levels, pairs.indices and pairs.vertices must have equal lengths (got ${n}, ${indices.length}, ${vertices.length})`, { field: 'pairs' });
    }
    const nv = domain.vertexCount;
    for (let p = 0; p < n; p++) {
      const v = vertices[p]!;
      if (!Number.isInteger(v) || v < 0 || v >= nv) {
        throw new InvalidArgumentError(`pairs.vertices[${p}] = ${v} is not a vertex id in [0, ${nv})`, { field: `pairs.vertices[${p}]`, received: v });
      }
      if (!domain.isFree(v)) {
        throw new InvalidArgumentError(`pairs.vertices[${p}] = ${v} is a Dirichlet vertex and carries no unknown`, { field: `pairs.vertices[${p}]`, received: v });
      }
    }
    // Group the pairs by temporal node; duplicates are merged by fromNodeSets.
    const byNode = new Map<string, { l: number; k: number; v: number[] }>();
    for (let p = 0; p < n; p++) {
      const key = `${levels[p]}:${indices[p]}`;
      let e = byNode.get(key);
      if (!e) byNode.set(key, (e = { l: levels[p]!, k: indices[p]!, v: [] }));
      e.v.push(vertices[p]!);
    }
    const groups = [...byNode.values()];
    return DoubleTree.fromNodeSets(
      domain,
      groups.map((g) => g.l),
      groups.map((g) => g.k),
      groups.map((g) => Int32Array.from(new Set(g.v)).sort()),
      opts,
    );
  }

  /**
   * A trial double tree from one sorted free-vertex set per temporal node
   * (nodes may repeat; their sets are merged). With `close: true` the result
   * is the smallest double tree containing all pairs; otherwise the pairs must
   * already form one, and a missing pair is reported by name.
   */
  static fromNodeSets(
    domain: SpatialDomain,
    levels: ArrayLike<number>,
    indices: ArrayLike<number>,
    sets: Int32Array[],
    opts: { close?: boolean; pool?: FibrePool } = {},
  ): DoubleTree {
    checkDomain(domain);
    checkNumberArray(levels, 'levels');
    checkNumberArray(indices, 'indices');
    if (!Array.isArray(sets)) checkObject(sets, 'sets', 'an array of Int32Array vertex sets');
    if (sets.length !== levels.length || indices.length !== levels.length) {
      throw new InvalidArgumentError(`levels, indices and sets must have equal lengths (got ${levels.length}, ${indices.length}, ${sets.length})`, { field: 'sets', expected: `length ${levels.length}`, received: sets.length });
    }
    sets.forEach((s, i) => checkInstance(s, Int32Array, `sets[${i}]`, 'an Int32Array of free vertex ids'));
    checkOptions(opts, 'opts', ['close', 'pool']);
    const close = opts.close ?? false;
    const pool = opts.pool ?? new FibrePool();
    // Temporal projection (validated by TemporalTree: levels/indices in range; closed unless `close`).
    const tree = TemporalTree.fromNodes('trial', levels, indices, { close });
    const parts: Int32Array[][] = Array.from({ length: tree.size }, () => []);
    for (let e = 0; e < sets.length; e++) parts[tree.find(levels[e]!, indices[e]!)]!.push(sets[e]!);
    const par = new Float64Array(4);
    const fibres: Int32Array[] = new Array(tree.size);
    if (close) {
      // Deepest level first: F_λ = close(own pairs ∪ children's fibres), then hand F_λ to the parents.
      for (let i = tree.size - 1; i >= 0; i--) {
        const f = domain.close(unionSorted(parts[i]!));
        fibres[i] = f;
        const np = nodeParents('trial', tree.level[i]!, tree.index[i]!, par);
        for (let q = 0; q < np; q++) parts[tree.find(par[2 * q]!, par[2 * q + 1]!)]!.push(f);
      }
      return DoubleTree.fromNodeFibres('trial', tree, fibres, pool);
    }
    const own = parts.map(unionSorted);
    for (let i = 0; i < tree.size; i++) {
      const f = own[i]!;
      const l = tree.level[i]!;
      const k = tree.index[i]!;
      const closed = domain.close(f);
      if (closed.length !== f.length) {
        const v = firstMissing(closed, f);
        throw new InvalidIndexSetError(
          `pair (level ${l}, index ${k}, vertex ${v}) is missing: the spatial fibre of temporal node (${l}, ${k}) is not closed under godparents`,
          { field: 'pairs', received: v },
        );
      }
      const np = nodeParents('trial', l, k, par);
      for (let q = 0; q < np; q++) {
        const pl = par[2 * q]!;
        const pk = par[2 * q + 1]!;
        const pf = own[tree.find(pl, pk)]!;
        if (!isSortedSubset(f, pf)) {
          const v = firstMissing(f, pf);
          throw new InvalidIndexSetError(
            `pair (level ${pl}, index ${pk}, vertex ${v}) is missing: it is the temporal parent of pair (level ${l}, index ${k}, vertex ${v})`,
            { field: 'pairs', received: v },
          );
        }
      }
      fibres[i] = f;
    }
    return DoubleTree.fromNodeFibres('trial', tree, fibres, pool);
  }

  /** The pairs of the set as parallel arrays (for inspection and export). */
  pairs(): { levels: Int32Array; indices: Float64Array; vertices: Int32Array; slots: Int32Array } {
    const levels = new Int32Array(this.size);
    const indices = new Float64Array(this.size);
    const vertices = new Int32Array(this.size);
    const slots = new Int32Array(this.size);
    const fpn = this.kind === 'test' ? 2 : 1;
    for (let f = 0; f < this.functionCount; f++) {
      const node = fpn === 2 ? f >> 1 : f;
      const fib = this.pool.get(this.functionFibre[f]!);
      const o = this.functionOffset[f]!;
      for (let p = 0; p < fib.length; p++) {
        levels[o + p] = this.tree.level[node]!;
        indices[o + p] = this.tree.index[node]!;
        vertices[o + p] = fib[p]!;
        slots[o + p] = fpn === 2 ? f & 1 : 0;
      }
    }
    return { levels, indices, vertices, slots };
  }
}

/** Uniform grids larger than this are refused unless a larger `maxUnknowns` is passed (memory guard). */
const DEFAULT_MAX_UNKNOWNS = 5e7;

/** About how many unknowns the sparse grid of level L on `domain` has (memory estimates before building it). */
export function sparseGridUnknownEstimate(domain: SpatialDomain, L: number): number {
  let estimate = 0;
  for (let l = 0; l <= L; l++) estimate += temporalCount(l) * spatialEstimate(domain, L - l);
  return estimate;
}

function temporalCount(level: number): number {
  return level === 0 ? 2 : 2 ** (level - 1);
}

/** About how many vertices uniform level `level` has: h halves per level, so ×2^d per level. */
function spatialEstimate(domain: SpatialDomain, level: number): number {
  return Math.max(1, domain.initialVertexCount) * 2 ** (domain.dim * level);
}

function checkSize(estimate: number, maxUnknowns: number, what: string): void {
  if (estimate > maxUnknowns) {
    throw new InvalidArgumentError(
      `${what} would have about ${estimate.toExponential(1)} unknowns, more than maxUnknowns = ${maxUnknowns}; choose a lower level or pass a larger maxUnknowns`,
      { field: 'maxUnknowns', expected: `≥ ${estimate.toExponential(1)}`, received: maxUnknowns },
    );
  }
}

function checkDomain(domain: unknown): void {
  checkInstance(domain, SpatialDomain, 'domain', 'a SpatialDomain (from intervalDomain, rectangleDomain, …)');
}

function checkLevel(L: number, field: string): void {
  if (!Number.isInteger(L) || L < 0 || L > 40) {
    throw new InvalidArgumentError(`${field} = ${describeValue(L)} must be an integer level in [0, 40]`, { field, expected: 'integer in [0, 40]', received: L });
  }
}

/** First element of sorted `a` that is not in sorted `b`. */
function firstMissing(a: Int32Array, b: Int32Array): number {
  let j = 0;
  for (let i = 0; i < a.length; i++) {
    while (j < b.length && b[j]! < a[i]!) j++;
    if (j >= b.length || b[j] !== a[i]) return a[i]!;
  }
  return -1;
}
