/**
 * Linear-time application of C = C_M ⊗ M_x + C_A ⊗ A_x from Λ_in to Λ_out by
 * the unidirectional principle (docs/method.md §5.2).
 *
 * Each temporal factor splits by levels into L (output strictly finer) and
 * U (output not finer). With the intermediate double trees
 *   Θ(μ,·) = ∪{Λ_in(λ,·) : |λ| = |μ|,     supp λ ∩ supp μ of positive length},  μ ∈ π_t(Λ_out)
 *   Σ(λ,·) = ∪{Λ_out(μ,·) : |μ| = |λ| + 1, supp μ ∩ supp λ of positive length},  λ ∈ π_t(Λ_in)
 * the result on Λ_out is exactly
 *   y = (I ⊗ C_x)_{Λout←Θ} (U ⊗ I)_{Θ←Λin} x + (L ⊗ I)_{Λout←Σ} (I ⊗ C_x)_{Σ←Λin} x.
 *
 * Why this is exact (nested supports, docs/method.md §3.1): an entry U[μ,λ] ≠ 0
 * needs |λ| ≥ |μ| and overlapping supports; the ancestor λ' of λ at level |μ|
 * has a larger support, so it overlaps μ too, and it carries every vertex ν
 * of λ (Λ_in is a double tree) — hence ν ∈ Θ(μ,·) and the time-first pass
 * sees every term. Likewise L[μ,λ] ≠ 0 needs |μ| > |λ|; the ancestor μ' of μ
 * at level |λ| + 1 overlaps λ and carries every vertex of μ, so the
 * space-first pass has produced the spatial result on all of Λ_out(μ,·).
 * Both intermediate sets are double trees whose temporal fibres are trees,
 * by the same ancestor argument.
 */
import type { LevelPart, TemporalForm } from '../time/index';
import { checkNotAliased, type LinearOperator } from '../numerics/linear-operator';
import { WorkVectors } from '../numerics/work-vectors';
import { DoubleTree } from './double-tree';
import { overlapUnionFibres } from './overlap-unions';
import { SpatialPassPlan } from './spatial-pass';
import type { SpatialPlanCache } from './spatial-plan-cache';
import { CompiledShapes, TemporalPassPlan } from './temporal-pass';

/**
 * Reusable plan for C_M ⊗ M_x + C_A ⊗ A_x from one double tree to another (module comment: why it is exact).
 *
 * @example
 * ```ts
 * import { DoubleTree, SpatialPlanCache, TensorOperatorPlan, intervalDomain, testIndexSet } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const trial = DoubleTree.sparseGrid(domain, 4);
 * const test = testIndexSet(trial);
 * const B = new TensorOperatorPlan('derivIn', 'mass', trial, test, new SpatialPlanCache(domain, trial.pool), 1);
 * const y = new Float64Array(test.size);
 * B.apply(new Float64Array(trial.size).fill(1), y); // y = (D ⊗ M + N ⊗ A) x
 * ```
 */
export class TensorOperatorPlan implements LinearOperator {
  readonly input: DoubleTree;
  readonly inSize: number;
  readonly outSize: number;
  readonly output: DoubleTree;
  /** Θ: time-first intermediate set (temporal projection of Λ_out). */
  readonly timeFirstSet: DoubleTree;
  /** Σ: space-first intermediate set (temporal projection of Λ_in). */
  readonly spaceFirstSet: DoubleTree;
  private readonly upperTime: TemporalPassPlan;
  private readonly upperSpace: SpatialPassPlan;
  private readonly lowerSpace: SpatialPassPlan;
  private readonly lowerTime: TemporalPassPlan;
  // Scratch on the intermediate sets, split by spatial factor (slot 0: with M_x, slot 1: with A_x):
  // on Θ after the time-first pass, then on Σ after the space-first pass. Both halves use the same
  // two vectors one after the other, and operators applied in turn (B and Bᵀ of a system) may
  // share them (useWorkVectors).
  private work = new WorkVectors();
  private readonly scratchSize: number;

  /**
   * @param timeFormWithMass temporal factor of the term with the spatial mass M_x (for B: the
   *   derivative form D, since B = D ⊗ M_x + N ⊗ A_x)
   * @param timeFormWithStiffness temporal factor of the term with the spatial stiffness A_x
   *   (for B: the mass form N)
   */
  constructor(timeFormWithMass: TemporalForm, timeFormWithStiffness: TemporalForm, input: DoubleTree, output: DoubleTree, cache: SpatialPlanCache, T: number) {
    this.input = input;
    this.output = output;
    this.inSize = input.size;
    this.outSize = output.size;
    const theta = timeFirstSet(input, output);
    const sigma = spaceFirstSet(input, output);
    this.timeFirstSet = theta;
    this.spaceFirstSet = sigma;
    const forms = [timeFormWithMass, timeFormWithStiffness] as const;
    this.upperTime = new TemporalPassPlan(forms, input, theta, 'upper', T);
    this.upperSpace = new SpatialPassPlan(theta, output, cache);
    this.lowerSpace = new SpatialPassPlan(input, sigma, cache);
    this.lowerTime = new TemporalPassPlan(forms, sigma, output, 'lower', T);
    this.scratchSize = Math.max(theta.size, sigma.size);
  }

  /**
   * Shares the scratch vectors (slots 0 and 1) with other operators that are never applied at the
   * same time, such as B and Bᵀ inside S. @internal
   */
  useWorkVectors(work: WorkVectors): this {
    this.work = work;
    return this;
  }

  /** y = C x on Λ_out (overwrites y; x has `input.size`, y `output.size` entries). */
  apply(x: Float64Array, y: Float64Array): void {
    checkNotAliased(x, y, 'TensorOperatorPlan');
    const withM = this.work.get(0, this.scratchSize);
    const withA = this.work.get(1, this.scratchSize);
    const pair = [withM, withA];
    this.upperTime.applyEach(x, pair);
    this.upperSpace.applySum(withM, withA, y);
    this.lowerSpace.applySplit(x, withM, withA);
    this.lowerTime.applySummed(pair, y, true);
  }

}

/**
 * y = C x (or y += C x with `accumulate`) as {@link TensorOperatorPlan} computes it, for an operator applied once (the estimator,
 * docs/adaptivity.md §3): the two halves run one after the other and each builds its intermediate
 * set, temporal plan and scratch only while it runs, and its spatial plans one at a time during the
 * sweep (nothing is added to `cache`). Same cost as building the plan and applying it once; the
 * memory alive at any time is one half's instead of the whole plan's. @internal
 */
export function applyTensorOperatorOnce(
  timeFormWithMass: TemporalForm, timeFormWithStiffness: TemporalForm,
  input: DoubleTree, output: DoubleTree, cache: SpatialPlanCache, T: number,
  x: Float64Array, y: Float64Array, accumulate = false, work: WorkVectors = new WorkVectors(),
  partCoefficients = PART_COEFFICIENTS,
): void {
  checkNotAliased(x, y, 'applyTensorOperatorOnce');
  // Both halves use the scratch slots 0 and 1 of `work` in turn (callers applying several
  // operators once may pass one WorkVectors to all of them).
  // Time first: z = (U ⊗ I) x on Θ, then y = (I ⊗ M_x) z_M + (I ⊗ A_x) z_A.
  const { theta, zM, zA } = timeFirstTemporalOnce(timeFormWithMass, timeFormWithStiffness, input, output, T, x, work, partCoefficients);
  new SpatialPassPlan(theta, output, cache, true).applySum(zM, zA, y, accumulate);
  applySpaceFirstHalfOnce(timeFormWithMass, timeFormWithStiffness, input, output, cache, T, x, y, work, partCoefficients);
}

/**
 * The temporal pass of the time-first half of {@link applyTensorOperatorOnce}: z = (U ⊗ I) x on Θ,
 * split by the spatial factor it still needs (zM for M_x, zA for A_x; scratch slots 0 and 1 of
 * `work`). Θ has the temporal tree of `output`, so its function f is output's function f, and
 * Θ's fibre of f lies inside output's (a union of the input fibres overlapping f on its level).
 * For callers that run the spatial half themselves, fused with other work on output's fibres
 * (the estimator, ../system/enlarged-residual.ts). @internal
 */
export function timeFirstTemporalOnce(
  timeFormWithMass: TemporalForm, timeFormWithStiffness: TemporalForm,
  input: DoubleTree, output: DoubleTree, T: number, x: Float64Array, work: WorkVectors,
  partCoefficients = PART_COEFFICIENTS,
): { theta: DoubleTree; zM: Float64Array; zA: Float64Array } {
  const forms = [timeFormWithMass, timeFormWithStiffness] as const;
  const theta = timeFirstSet(input, output);
  const zM = work.get(0, theta.size);
  const zA = work.get(1, theta.size);
  zM.fill(0, 0, theta.size);
  zA.fill(0, 0, theta.size);
  inParts(forms, input, theta, 'upper', T, partCoefficients, (plan) => plan.applyEach(x, [zM, zA]));
  return { theta, zM, zA };
}

/**
 * The space-first half of {@link applyTensorOperatorOnce}, applied once and added to y:
 * w = (I ⊗ M_x) x, (I ⊗ A_x) x on Σ, then y += (L ⊗ I) w. @internal
 */
export function applySpaceFirstHalfOnce(
  timeFormWithMass: TemporalForm, timeFormWithStiffness: TemporalForm,
  input: DoubleTree, output: DoubleTree, cache: SpatialPlanCache, T: number,
  x: Float64Array, y: Float64Array, work: WorkVectors, partCoefficients = PART_COEFFICIENTS,
): void {
  const sigma = spaceFirstSet(input, output);
  const wM = work.get(0, sigma.size);
  const wA = work.get(1, sigma.size);
  new SpatialPassPlan(input, sigma, cache, true).applySplit(x, wM, wA);
  spaceFirstTemporalOnce(timeFormWithMass, timeFormWithStiffness, sigma, output, T, wM, wA, y, partCoefficients);
}

/**
 * The temporal pass of the space-first half: y += (L ⊗ I) w from Σ (with wM the part that went
 * through M_x, wA through A_x) to `output`. For callers that run the spatial half themselves
 * (../system/enlarged-residual.ts). @internal
 */
export function spaceFirstTemporalOnce(
  timeFormWithMass: TemporalForm, timeFormWithStiffness: TemporalForm,
  sigma: DoubleTree, output: DoubleTree, T: number, wM: Float64Array, wA: Float64Array, y: Float64Array,
  partCoefficients = PART_COEFFICIENTS,
): void {
  const forms = [timeFormWithMass, timeFormWithStiffness] as const;
  inParts(forms, sigma, output, 'lower', T, partCoefficients, (plan) => plan.applySummed([wM, wA], y, true));
}

/**
 * Coefficients (input plus output) of one part of a one-shot time-direction pass: 2²⁰, so that the
 * part's plan and the temporary arrays that build it take a few MB, not several bytes per
 * coefficient of the whole sets (those temporaries set the estimator's peak, docs/adaptivity.md §5).
 */
const PART_COEFFICIENTS = 1 << 20;

/**
 * Builds and applies a time-direction pass once, in parts over ranges of spatial vertices (the
 * pass is independent per vertex), each part with its own small plan; shapes are compiled once
 * for all parts. The parts write disjoint outputs and never zero them.
 */
function inParts(
  forms: readonly TemporalForm[], input: DoubleTree, output: DoubleTree, part: LevelPart, T: number,
  partCoefficients: number, apply: (plan: TemporalPassPlan) => void,
): void {
  const bounds = vertexRanges(input, output, partCoefficients);
  const compiled = new CompiledShapes();
  for (let k = 0; k + 1 < bounds.length; k++) {
    apply(new TemporalPassPlan(forms, input, output, part, T, { vertices: [bounds[k]!, bounds[k + 1]!], compiled }));
  }
}

/** Vertex ids 0 = b_0 < b_1 < … < b_m = (largest vertex + 1) such that each range holds about `budget` coefficients of both sets. */
function vertexRanges(a: DoubleTree, b: DoubleTree, budget: number): number[] {
  let vb = 0;
  for (const dt of [a, b]) {
    for (let i = 0; i < dt.tree.size; i++) {
      const f = dt.fibre(i);
      if (f.length > 0) vb = Math.max(vb, f[f.length - 1]! + 1);
    }
  }
  const count = new Int32Array(vb);
  for (const dt of [a, b]) {
    const fpn = dt.kind === 'test' ? 2 : 1;
    for (let i = 0; i < dt.tree.size; i++) {
      const f = dt.fibre(i);
      for (let p = 0; p < f.length; p++) count[f[p]!]! += fpn;
    }
  }
  const bounds = [0];
  let acc = 0;
  for (let v = 0; v < vb; v++) {
    acc += count[v]!;
    if (acc >= budget && v + 1 < vb) {
      bounds.push(v + 1);
      acc = 0;
    }
  }
  bounds.push(vb);
  return bounds;
}

/** Θ of the module comment: the temporal projection of Λ_out with the overlapping input fibres. */
function timeFirstSet(input: DoubleTree, output: DoubleTree): DoubleTree {
  return DoubleTree.fromNodeFibres(output.kind, output.tree, overlapUnionFibres(output.tree, input, 0), input.pool);
}

/**
 * Σ of the module comment: the temporal projection of Λ_in with the overlapping output fibres one
 * level finer. Its function f is Λ_in's function f. @internal
 */
export function spaceFirstSet(input: DoubleTree, output: DoubleTree): DoubleTree {
  return DoubleTree.fromNodeFibres(input.kind, input.tree, overlapUnionFibres(input.tree, output, 1), input.pool);
}
