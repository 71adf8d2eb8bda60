/**
 * Tree-operator plans: the algorithms of docs/method.md §3.3 compiled once per (form, input tree,
 * output tree, part) into a {@link SparseProgram}; apply is allocation-free.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { checkT } from './levels';
import type { TemporalForm } from './single-scale';
import { TemporalTree } from './tree';
import { PlanCompiler } from './plan-compiler';
import { ProgramBuilder, runProgram, type SparseProgram } from './sparse-program';

/** Which level pairs of the operator: lower |out| > |in|, upper |out| ≤ |in|, full = both. */
export type LevelPart = 'lower' | 'upper' | 'full';

const FORMS: readonly TemporalForm[] = ['mass', 'derivIn', 'derivOut', 'stiffness'];
const PARTS: readonly LevelPart[] = ['lower', 'upper', 'full'];

/**
 * Applies the level-restricted Galerkin matrix C[i][j] = ∫_0^T q_i·p_j (with the derivatives
 * of the form) between the functions of an input tree (p) and an output tree (q), by the
 * linear-time algorithms of docs/method.md §3.3. Forms: `mass` ∫ q p, `derivIn` ∫ q p′, `derivOut`
 * ∫ q′ p, `stiffness` ∫ q′ p′ (derivatives of test functions are taken piecewise).
 * Built once per (form, trees, part, T); `apply` does not allocate.
 *
 * @example
 * ```ts
 * import { TemporalTree, TreeOperatorPlan } from 'chronomesh';
 * const sigma = TemporalTree.full('trial', 3), psi = TemporalTree.full('test', 3);
 * const D = new TreeOperatorPlan('derivIn', sigma, psi, 'full', 2.0); // ∫ ψ ∂t σ on (0, 2)
 * const x = new Float64Array(sigma.functionCount).fill(1), y = new Float64Array(psi.functionCount);
 * D.apply(x, y);
 * ```
 */
export class TreeOperatorPlan {
  readonly form: TemporalForm;
  readonly inTree: TemporalTree;
  readonly outTree: TemporalTree;
  readonly part: LevelPart;
  readonly T: number;
  private readonly program: SparseProgram;
  // Own scratch, allocated on the first `apply` (callers that run many plans in a row pass one
  // shared scratch to `applyWithWork` instead, so no plan keeps a buffer of its own).
  private work: Float64Array | null = null;
  private workBatch = 0;

  constructor(form: TemporalForm, inTree: TemporalTree, outTree: TemporalTree, part: LevelPart, T = 1) {
    if (!FORMS.includes(form)) {
      throw new InvalidArgumentError(`form must be one of ${FORMS.join(', ')}; received ${describeValue(form)}`, {
        field: 'form', expected: FORMS.join(' | '), received: form,
      });
    }
    if (!PARTS.includes(part)) {
      throw new InvalidArgumentError(`part must be one of ${PARTS.join(', ')}; received ${describeValue(part)}`, {
        field: 'part', expected: PARTS.join(' | '), received: part,
      });
    }
    if (!(inTree instanceof TemporalTree)) {
      throw new InvalidArgumentError(`inTree must be a TemporalTree; received ${describeValue(inTree)}`, { field: 'inTree', received: inTree });
    }
    if (!(outTree instanceof TemporalTree)) {
      throw new InvalidArgumentError(`outTree must be a TemporalTree; received ${describeValue(outTree)}`, { field: 'outTree', received: outTree });
    }
    checkT(T);
    this.form = form;
    this.inTree = inTree;
    this.outTree = outTree;
    this.part = part;
    this.T = T;
    const b = new ProgramBuilder();
    const c = new PlanCompiler(b, form, inTree, outTree, T);
    if (part !== 'upper') c.lower();
    if (part !== 'lower') c.upper();
    this.program = b.finish();
  }

  /** Scratch entries one column needs (`applyWithWork` takes ≥ workSize · batch). @internal */
  get workSize(): number {
    return this.program.workSize;
  }

  /** Number of stored matrix entries of the compiled program (a measure of its cost). */
  get entryCount(): number {
    return this.program.col.length;
  }

  /**
   * y[i·batch + b] = Σ_j C[i][j] x[j·batch + b] for every output function i and column b;
   * overwrites y. Allocation-free (the scratch buffer grows once for a larger batch).
   *
   * @example
   * ```ts
   * import { TemporalTree, TreeOperatorPlan } from 'chronomesh';
   * const t = TemporalTree.full('trial', 2);
   * const M = new TreeOperatorPlan('mass', t, t, 'full');
   * const x = new Float64Array(2 * t.functionCount).fill(1), y = new Float64Array(2 * t.functionCount);
   * M.apply(x, y, 2); // two columns at once
   * ```
   */
  apply(x: Float64Array, y: Float64Array, batch = 1): void {
    if (!Number.isInteger(batch) || batch < 1) {
      throw new InvalidArgumentError(`batch must be an integer ≥ 1; received ${describeValue(batch)}`, {
        field: 'batch', expected: 'integer ≥ 1', received: batch,
      });
    }
    const nIn = this.inTree.functionCount * batch;
    const nOut = this.outTree.functionCount * batch;
    if (!(x instanceof Float64Array) || x.length < nIn) {
      throw new InvalidArgumentError(`x must be a Float64Array of length ≥ ${nIn} (input functions × batch); received ${describeValue(x)}`, {
        field: 'x', expected: `Float64Array, length ≥ ${nIn}`, received: x instanceof Float64Array ? x.length : x,
      });
    }
    if (!(y instanceof Float64Array) || y.length < nOut) {
      throw new InvalidArgumentError(`y must be a Float64Array of length ≥ ${nOut} (output functions × batch); received ${describeValue(y)}`, {
        field: 'y', expected: `Float64Array, length ≥ ${nOut}`, received: y instanceof Float64Array ? y.length : y,
      });
    }
    if (this.work === null || batch > this.workBatch) {
      this.work = new Float64Array(this.program.workSize * batch);
      this.workBatch = batch;
    }
    this.applyWithWork(x, y, batch, this.work);
  }

  /**
   * `apply` without argument checks, with caller-owned scratch of ≥ workSize · batch entries (its
   * contents are overwritten). For hot loops that run many plans in a row. @internal
   */
  applyWithWork(x: Float64Array, y: Float64Array, batch: number, work: Float64Array): void {
    work.fill(0, 0, this.program.workSize * batch);
    y.fill(0, 0, this.outTree.functionCount * batch);
    runProgram(this.program, x, work, y, batch);
  }
}
