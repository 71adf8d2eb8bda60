/**
 * The enlarged index set Λ̲ of the adaptive loop (docs/adaptivity.md §2): for every temporal
 * node λ of Λ add
 *   - (child(λ), ν) for the temporal children of λ (and their descendants, `temporalLevels` > 1)
 *     and every ν in the fibre of λ, and
 *   - (λ, ν′) for the free vertices ν′ of the *interior refinement* of the fibre mesh of λ:
 *     every leaf bisected `dim` times (the mesh size halves) and further where that created only
 *     Dirichlet midpoints (see SpatialDomain.refineInterior);
 * and, along the problem's concentrated sources (`along`), candidates `dim` generations deeper;
 * then close. A node whose fibre is empty (no unknowns yet — e.g. a coarse mesh without free
 * initial vertices) gets the interior refinement of the initial mesh as candidates, so that
 * every temporal node can receive its first spatial unknowns.
 */
import { MAX_TEMPORAL_LEVEL, nodeChildren } from '../time/index';
import { SpatialDomain } from '../space/index';
import { checkSetOnDomain } from '../spacetime/set-checks';
import { checkInstance, checkInteger, checkOptions } from '../validation/index';
import { DoubleTree } from '../spacetime/double-tree';
import { unionSorted } from '../spacetime/fibre-pool';

/** Options of {@link enlargeDoubleTree}. */
export interface EnlargementOptions {
  /**
   * Generations of bisection of every leaf in the spatial candidates (default: the dimension,
   * so that h halves in 2D as in 1D).
   */
  spatialGenerations?: number;
  /**
   * Levels below each temporal node that the temporal candidates reach (1 to 4, default 1). Data
   * with short pulses or sudden switches in time take fewer, larger steps with 2 at the same error
   * per unknown (docs/adaptivity.md §2.2).
   */
  temporalLevels?: number;
}

const ENLARGEMENT_KEYS: Record<keyof Required<EnlargementOptions>, true> = { spatialGenerations: true, temporalLevels: true };

/**
 * Λ̲ ⊇ Λ, sharing Λ's fibre pool. Grows the domain's bisection forest. `along`: points (`[x]`) or
 * segments (`[x0, y0, x1, y1]`) of concentrated sources, where the spatial candidates go `dim`
 * generations deeper ({@link solveAdaptive} passes the problem's `curveSources`).
 *
 * @example
 * ```ts
 * import { DoubleTree, enlargeDoubleTree, rectangleDomain } from 'chronomesh';
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const set = DoubleTree.sparseGrid(domain, 2);
 * console.log(set.size, enlargeDoubleTree(domain, set).size);
 * ```
 */
export function enlargeDoubleTree(domain: SpatialDomain, set: DoubleTree, opts: EnlargementOptions = {}, along: readonly number[][] = []): DoubleTree {
  checkInstance(domain, SpatialDomain, 'domain', 'a SpatialDomain');
  checkSetOnDomain(set, domain, 'set');
  const o = checkOptions<EnlargementOptions>(opts, 'opts', ENLARGEMENT_KEYS);
  if (o.spatialGenerations !== undefined) checkInteger(o.spatialGenerations, 'opts.spatialGenerations', 1, 8);
  if (o.temporalLevels !== undefined) checkInteger(o.temporalLevels, 'opts.temporalLevels', 1, 4);
  const generations = opts.spatialGenerations ?? domain.dim;
  const depth = opts.temporalLevels ?? 1;
  const { tree } = set;
  const levels: number[] = [];
  const indices: number[] = [];
  const sets: Int32Array[] = [];
  // Refinements per fibre id (fibres repeat across temporal nodes: a sparse grid has L + 1).
  const refined: (Int32Array | undefined)[] = [];
  const empty = new Int32Array(0);
  let refinedEmpty: Int32Array | null = null;
  const ch = new Float64Array(4);
  for (let i = 0; i < tree.size; i++) {
    const id = set.nodeFibre[i]!;
    const f = set.pool.get(id);
    const l = tree.level[i]!;
    const k = tree.index[i]!;
    if (f.length === 0) {
      refinedEmpty ??= domain.refineInterior(empty, generations);
      if (refinedEmpty.length > 0) {
        levels.push(l);
        indices.push(k);
        sets.push(refinedEmpty);
      }
      continue;
    }
    let g = refined[id];
    if (g === undefined) {
      // Along concentrated sources (points, segments of `along`) the candidates go dim generations
      // deeper (mesh size a quarter instead of a half): the solution's gradient jumps across such a
      // source, and a jump close to a vertex is barely seen by candidates half a mesh size away
      // (docs/adaptivity.md §2.1).
      const parts = [f, domain.refineInterior(f, generations)];
      for (const q of along) parts.push(domain.refineTowards(f, q, generations + domain.dim));
      g = unionSorted(parts);
      refined[id] = g;
    }
    levels.push(l);
    indices.push(k);
    sets.push(g);
    // temporal candidates: the children of (l, k) (and with depth > 1 their descendants down to
    // `depth` levels), each with the fibre f
    const nc = nodeChildren('trial', l, k, ch);
    for (let c = 0; c < nc; c++) {
      levels.push(ch[2 * c]!);
      indices.push(ch[2 * c + 1]!);
      sets.push(f);
    }
    if (depth === 1) continue;
    let front: number[] = [];
    for (let c = 0; c < nc; c++) front.push(ch[2 * c]!, ch[2 * c + 1]!);
    for (let d = 1; d < depth && front.length > 0; d++) {
      const next: number[] = [];
      for (let q = 0; q < front.length; q += 2) {
        if (front[q]! + 1 > MAX_TEMPORAL_LEVEL) continue;
        const m = nodeChildren('trial', front[q]!, front[q + 1]!, ch);
        for (let c = 0; c < m; c++) {
          levels.push(ch[2 * c]!);
          indices.push(ch[2 * c + 1]!);
          sets.push(f);
          next.push(ch[2 * c]!, ch[2 * c + 1]!);
        }
      }
      front = next;
    }
  }
  return DoubleTree.fromNodeSets(domain, levels, indices, sets, { close: true, pool: set.pool });
}
