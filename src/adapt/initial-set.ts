/**
 * The set an adaptive run starts from when the user gives none (docs/adaptivity.md §2): the
 * smallest sparse grid with unknowns, graded toward t = 0 down to the shortest diffusion time of
 * the initial mesh; and the deepest temporal level a set of the loop may hold (§6).
 */
import { DoubleTree } from '../spacetime/double-tree';
import { shortestDiffusionTime } from '../space/diffusion-time';
import { MAX_TEMPORAL_LEVEL } from '../time/index';
import type { HeatProblem } from '../system/heat-problem';
import { dataResolvedSet, type SampledDatum } from '../space/data-resolution';
import { boundaryDataResolvedSet } from '../space/boundary-data-resolution';
import { curveResolvedSet } from '../space/curve-resolution';
import { layerResolvedSet } from '../space/layer-resolution';
import { frontResolvedSet } from '../space/front-resolution';
import { loadTimeBreakpoints } from '../system/load-time-rule';
import { unionOfTwoSorted } from '../space/operator-plan';

/**
 * Deepest temporal level a set of the loop may hold; its enlarged set reaches one level more
 * (docs/adaptivity.md §6). With κT/L² = 10¹⁴ E rose by 30 % on the first set at level 51, and the
 * rise survived the rise check (it is not the solve's); at MAX_TEMPORAL_LEVEL the enlarged set
 * would have no finer temporal candidates. Up to level 50 both that run and u0 ≡ 1 on (0, 1),
 * T = 0.5, showed no rise that survived the check (err/E 1.02–1.07 on level 50; the rises of E
 * measured there before the checks were the algebraic error's).
 */
export const DEEPEST_SET_LEVEL = MAX_TEMPORAL_LEVEL - 2;

/**
 * The smallest sparse grid with at least one unknown (level 1 unless the mesh is very coarse),
 * with every fibre refined where the load quadrature would miss features of the source or the
 * initial state, near concentrated sources close to a held boundary (§2.1) and, for short
 * horizons, next to held edges where the initial state jumps against the held value (§2.4) and across
 * jumps of the initial state inside the domain (§2.5), graded toward
 * t = 0 down to the shortest diffusion time of the initial mesh and of the elements that resolve
 * the initial state.
 */
export function defaultInitialSet(problem: HeatProblem): DoubleTree {
  for (let L = 1; ; L++) {
    const set = DoubleTree.sparseGrid(problem.domain, L);
    if (set.size > 0 || L >= 8) {
      const closure = problem.domain.vertexClosure();
      const initial = dataResolvedSet(closure, initialData(problem));
      const source = dataResolvedSet(closure, sourceData(problem));
      const boundary = boundaryDataResolvedSet(closure, sampleTimes(problem.T));
      const curves = curveResolvedSet(closure, (problem.curveSources ?? []).map((c) => c.curve));
      const layer = layerResolvedSet(closure, problem.initial, problem.T, problem.source);
      const front = frontResolvedSet(closure, problem.initial, problem.T);
      const tau = Math.min(shortestDiffusionTime(problem.domain), initial.tau, layer.tau, front.tau);
      const extra = [source.set, boundary, curves, layer.set, front.set].reduce(unionOfTwoSorted, initial.set);
      return withPulseNodes(problem, withVertices(problem, gradedTowardsStart(problem, set, tau), extra));
    }
  }
}

/** Times at which time-dependent sources and boundary data are sampled for the data resolution: T·k/8. */
const DATA_SAMPLES = 9;

function sampleTimes(T: number): number[] {
  return Array.from({ length: DATA_SAMPLES }, (_, k) => (T * k) / (DATA_SAMPLES - 1));
}

function initialData(problem: HeatProblem): SampledDatum[] {
  const initial = problem.initial;
  return initial ? [{ field: 'initial', value: initial }] : [];
}

function sourceData(problem: HeatProblem): SampledDatum[] {
  const data: SampledDatum[] = [];
  const f = problem.source;
  const terms = problem.separableSource;
  if (!f && !terms) return data;
  for (const t of sampleTimes(problem.T)) {
    if (f) data.push({ field: `source (at t = ${t})`, value: (x, y) => f(t, x, y) });
    else if (terms) {
      const w = terms.map((term) => term.time(t));
      data.push({ field: `source (at t = ${t})`, value: (x, y) => terms.reduce((acc, term, i) => acc + w[i]! * term.space(x, y), 0) });
    }
  }
  return data;
}

/** The nodes of `set` with their fibres, as lists to extend and pass to DoubleTree.fromNodeSets. */
function nodeLists(set: DoubleTree): { levels: number[]; indices: number[]; sets: Int32Array[] } {
  const { tree } = set;
  const levels: number[] = [], indices: number[] = [], sets: Int32Array[] = [];
  for (let i = 0; i < tree.size; i++) {
    levels.push(tree.level[i]!);
    indices.push(tree.index[i]!);
    sets.push(set.fibre(i));
  }
  return { levels, indices, sets };
}

/**
 * `set` with the vertices `extra` that resolve the problem's data (docs/adaptivity.md §2.1) added
 * to every fibre. The loads are integrated on each fibre's leaf mesh with fixed rules per element;
 * a source or an initial state with features far below the initial mesh size falls between their
 * points, its loads vanish, and so do the residual and E: a localized source of width 0.003 on the
 * 2 × 2 unit square gave E = 3·10⁻¹⁶ at the first step, which stopped the run as converged with
 * u ≈ 0. With the data resolved in the first set, the residual sees them and the loop refines from
 * there. Smooth data (and u0 ≡ 1, f = 0) add nothing.
 */
function withVertices(problem: HeatProblem, set: DoubleTree, extra: Int32Array): DoubleTree {
  if (extra.length === 0) return set;
  const { levels, indices, sets } = nodeLists(set);
  let grows = false;
  for (let i = 0; i < sets.length; i++) {
    const merged = unionOfTwoSorted(sets[i]!, extra);
    if (merged.length > sets[i]!.length) grows = true;
    sets[i] = merged;
  }
  return grows ? DoubleTree.fromNodeSets(problem.domain, levels, indices, sets, { close: true, pool: set.pool }) : set;
}

/**
 * `set` with the temporal nodes whose test functions live on both halves of every interval the
 * loads' composite time rule split (src/system/load-time-rule.ts), each with the fibre of the
 * set's level-1 node. The loads integrate a pulse correctly on every level, but on a set without
 * nodes near it the residual sees only its coarse-scale part: with a pulse of length 0.001 on
 * (0, 1), E rose twelvefold over the first 8 steps while the loop descended toward it. A breakpoint
 * at the midpoint (2k + 1)·T·2^{−(l+1)} of the split interval I_{l,k} gives the trial wavelets
 * (l + 2, 2k) and (l + 2, 2k + 1), centred in its halves.
 */
function withPulseNodes(problem: HeatProblem, set: DoubleTree): DoubleTree {
  const breaks = loadTimeBreakpoints(problem);
  if (breaks.times.length === 0) return set;
  const { tree } = set;
  let fibre = set.fibre(Math.max(0, tree.find(1, 0)));
  if (fibre.length === 0) fibre = set.fibre(0);
  const { levels, indices, sets } = nodeLists(set);
  for (let i = 0; i < breaks.times.length; i++) {
    const l = breaks.level[i]!, k = breaks.index[i]!;
    if (l + 2 > DEEPEST_SET_LEVEL) continue;
    for (const j of [2 * k, 2 * k + 1]) {
      levels.push(l + 2);
      indices.push(j);
      sets.push(fibre);
    }
  }
  return DoubleTree.fromNodeSets(problem.domain, levels, indices, sets, { close: true, pool: set.pool });
}

/**
 * `set` with its leftmost temporal node repeated on every level down to the diffusion time τ
 * (level ⌈log2(T/τ)⌉, at most DEEPEST_SET_LEVEL), with the fibre of
 * the deepest leftmost node that has one (docs/adaptivity.md §2). Without it a horizon of many
 * diffusion times leaves the layer of data that start off the boundary values far below the set's
 * levels, and the estimator, whose candidates reach one level deeper, cannot see it: u0 ≡ 1 on (0, 1) in 2 cells with κT = 10⁴
 * gave E = 6.8·10⁻³ for a true error of 0.71 at the first step, and the run needed 13 steps of
 * growing E to reach the layer. A set already that deep, or T of a few diffusion times, is
 * returned as it is.
 */
function gradedTowardsStart(problem: HeatProblem, set: DoubleTree, tau: number): DoubleTree {
  const { tree } = set;
  const deepest = Math.min(DEEPEST_SET_LEVEL, Math.ceil(Math.log2(problem.T / tau)));
  if (!(deepest > tree.maxLevel)) return set;
  const { levels, indices, sets } = nodeLists(set);
  // The deepest non-empty leftmost fibre (on the coarsest meshes the finest levels of a sparse
  // grid may have none, and a node without unknowns gets no temporal candidates).
  let leftmost = set.fibre(tree.find(tree.maxLevel, 0));
  for (let l = tree.maxLevel - 1; l >= 0 && leftmost.length === 0; l--) leftmost = set.fibre(tree.find(l, 0));
  for (let l = tree.maxLevel + 1; l <= deepest; l++) {
    levels.push(l);
    indices.push(0);
    sets.push(leftmost);
  }
  return DoubleTree.fromNodeSets(problem.domain, levels, indices, sets, { close: true, pool: set.pool });
}
