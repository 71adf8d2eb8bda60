/**
 * The test index set Λ_Y of a trial double tree Λ (docs/method.md §5.1):
 *   Λ_Y = ∪_{(λ,ν)∈Λ} {(μ, ν) : μ a Ψ-node, |μ| ≤ |λ|, |supp ψ_μ ∩ supp σ_λ| > 0}.
 * Because supports nest, the pairs with |μ| < |λ| are already produced by
 * the ancestors of λ (which carry ν too), so only same-level overlaps are
 * needed: Λ_Y(μ, ·) = ∪{Λ(λ, ·) : |λ| = |μ|, supports overlap}.
 */
import { InvalidArgumentError } from '../errors';
import { checkInstance } from '../validation/index';
import { TemporalTree } from '../time/index';
import { DoubleTree } from './double-tree';
import { overlapUnionFibres } from './overlap-unions';

/** Builds Λ_Y for a trial double tree `trial`, sharing its fibre pool. *
 * @example
 * ```ts
 * import { DoubleTree, intervalDomain, testIndexSet } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const trial = DoubleTree.sparseGrid(domain, 3);
 * const test = testIndexSet(trial);
 * console.log(trial.size, test.size, test.kind); // test: 'test'
 * ```
 */
export function testIndexSet(trial: DoubleTree): DoubleTree {
  checkInstance(trial, DoubleTree, 'trial', 'a trial DoubleTree');
  if (trial.kind !== 'trial') throw new InvalidArgumentError(`trial is a ${trial.kind} double tree, expected a trial one`, { field: 'trial', expected: 'trial', received: trial.kind });
  const tree = trial.tree;
  const levels: number[] = [];
  const indices: number[] = [];
  for (let i = 0; i < tree.size; i++) {
    const l = tree.level[i]!;
    if (l === 0) {
      levels.push(0);
      indices.push(0);
      continue;
    }
    // σ_{l,k} is supported on [s_{l−1,k−1}, s_{l−1,k+2}]: it meets the Ψ-nodes (intervals I_{l−1,j}) j = k−1, k, k+1.
    const k = tree.index[i]!;
    const jMax = 2 ** (l - 1) - 1;
    for (let j = Math.max(0, k - 1); j <= Math.min(jMax, k + 1); j++) {
      levels.push(l);
      indices.push(j);
    }
  }
  const testTree = TemporalTree.fromNodes('test', levels, indices, { close: true });
  return DoubleTree.fromNodeFibres('test', testTree, overlapUnionFibres(testTree, trial, 0), trial.pool);
}
