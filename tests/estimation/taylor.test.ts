/**
 * Gradient checks of every functional × parameter kind, d = 1 and 2, sparse and adaptive index
 * sets, by the Taylor test (common practice in adjoint-based optimisation, e.g. Farrell et al.,
 * SIAM J. Sci. Comput. 35 (2013), §4 "Taylor remainder convergence"): with J twice differentiable,
 * |J(m + εδ) − J(m) − ε ∇J·δ| = O(ε²) exactly when ∇J is the gradient of the computed J, and
 * only O(ε) otherwise. J is a fresh forward solve for every ε. Since J is quadratic in m here,
 * the central difference (J(m + εδ) − J(m − εδ)) / 2ε equals ∇J·δ up to solver error — a second,
 * sharper check.
 */
import { describe, expect, it } from 'vitest';
import { ReducedFunctional, type SpaceTimeSystem } from '../../src/index';
import { rng } from '../helpers/random';
import { FUNCTIONAL_KINDS, PARAM_KINDS, functionalFor, logSlope, paramsFor, systemFor, type Dim, type SetKind } from './fixtures';

const cases: Array<[Dim, SetKind]> = [[1, 'sparse'], [1, 'adaptive'], [2, 'sparse'], [2, 'adaptive']];
const report: string[] = [];

describe.each(cases)('Taylor test, d = %i, %s set', (d, setKind) => {
  let system: SpaceTimeSystem;
  it.each(PARAM_KINDS)('parameters: %s', (pk) => {
    system ??= systemFor(d, setKind);
    const params = paramsFor(system, pk);
    const r = rng(11);
    const m = Float64Array.from({ length: params.size }, () => 0.5 + r());
    const delta = Float64Array.from({ length: params.size }, () => r() - 0.5);
    for (const fk of FUNCTIONAL_KINDS) {
      const J = new ReducedFunctional(system, params, functionalFor(system, fk), { accuracy: 1e-12 });
      const g = J.gradient(m);
      const gd = g.gradient.reduce((s, v, i) => s + v * delta[i]!, 0);
      const at = (e: number) => J.value(m.map((v, i) => v + e * delta[i]!));
      // Start where the remainder is comparable to J itself, then go down three decades.
      const r1 = Math.abs(at(1) - g.value - gd);
      const e0 = Math.max(1, Math.sqrt(Math.abs(g.value) / r1));
      const eps = [e0, e0 / 10, e0 / 100, e0 / 1000];
      const rem = eps.map((e) => Math.abs(at(e) - g.value - e * gd));
      const slope = logSlope(eps, rem);
      const e = e0 / 100;
      const central = (at(e) - at(-e)) / (2 * e);
      const relCentral = Math.abs(central - gd) / Math.max(Math.abs(gd), 1e-300);
      report.push(`d=${d} ${setKind} N=${system.size} ${pk}(${params.size}) ${fk}: slope ${slope.toFixed(4)}, central-difference rel. error ${relCentral.toExponential(1)}`);
      expect(Math.abs(slope - 2), `${pk} × ${fk}: remainders ${rem.map((x) => x.toExponential(2)).join(', ')}`).toBeLessThan(0.1);
      expect(relCentral).toBeLessThan(1e-6);
    }
  });
});

describe('Taylor report', () => {
  it('prints the measured slopes', () => {
    if (process.env.CHRONOMESH_REPORT) console.log(report.join('\n'));
    expect(report.length).toBe(cases.length * PARAM_KINDS.length * FUNCTIONAL_KINDS.length);
  });
});
