/**
 * The tracking functionals against a dense reference that shares no code with them. With the whole
 * domain as region, the whole interval as window and no target,
 *   regionTracking: J(u) = ½ ∫₀ᵀ ∫_Ω u² = ½ uᵀ (M_t ⊗ M_x) u,
 * exactly: u is linear in t between the trial breakpoints (2-point Gauss–Legendre is exact for u²)
 * and P1 in x on the leaf mesh of each time (the degree-5 rule is exact for u²). So the gradient is
 * (M_t ⊗ M_x) u and the Hessian is M_t ⊗ M_x, with M_t the temporal mass matrix of the trial
 * wavelets (tests/time/reference.ts: quadrature of the basis functions) and M_x the spatial mass
 * matrix of the hierarchical hats (tests/space/reference.ts: textbook element matrices); the
 * Kronecker structure of the mass form of u(t, x) = Σ c σ_λ(t) φ_ν(x) is common practice.
 * terminalTracking: J(u) = ½ u(T)ᵀ M_x u(T) with u(T) = Σ σ_λ(T) c_λν φ_ν.
 * Checked on adaptive sets (not sparse grids), in 1D and 2D, to 1e-12 relative.
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, SpaceTimeSystem, combineFunctionals, intervalDomain, lShapeDomain, regionTracking, solveAdaptive, terminalTracking } from '../../src/index';
import { evaluateTemporal } from '../../src/time/index';
import { denseTemporalMatrix } from '../time/reference';
import { denseSpatialOnUnion, labels, randomVector, relativeError, seededRandom, temporalNodes } from '../spacetime/reference';

function cases() {
  return [
    new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5, initial: () => 1 }),
    new HeatProblem({ domain: lShapeDomain(1), T: 0.3, initial: () => 1 }),
  ].map((problem) => {
    const set = solveAdaptive(problem, { maxUnknowns: problem.domain.dim === 1 ? 300 : 700 }).set;
    return { problem, set };
  });
}

describe('tracking functionals against dense M_t ⊗ M_x', () => {
  for (const { problem, set } of cases()) {
    const d = problem.domain.dim;
    const T = problem.T;
    const system = new SpaceTimeSystem(problem, set);
    const lab = labels(set);
    const nodes = temporalNodes(set);
    const CM = denseTemporalMatrix('mass', 'trial', nodes, 'trial', nodes, T);
    const sp = denseSpatialOnUnion(problem.domain, [set]);
    const pos = lab.map((l) => sp.pos.get(l.vertex)!);
    const u = randomVector(set.size, seededRandom(d * 17 + 3));

    it(`${d}D: region tracking value, gradient and Hessian equal the dense form (${set.size} unknowns, ${set.tree.maxLevel + 1} temporal levels)`, () => {
      const Ku = new Float64Array(set.size);
      for (let r = 0; r < set.size; r++) {
        let s = 0;
        for (let c = 0; c < set.size; c++) s += CM[lab[r]!.fn]![lab[c]!.fn]! * sp.M[pos[r]!]![pos[c]!]! * u[c]!;
        Ku[r] = s;
      }
      let uKu = 0;
      for (let r = 0; r < set.size; r++) uKu += u[r]! * Ku[r]!;
      const J = regionTracking(system);
      expect(Math.abs(J.value(u) - 0.5 * uKu) / (0.5 * uKu)).toBeLessThan(1e-12);
      expect(relativeError(J.gradient(u), Ku)).toBeLessThan(1e-12);
      expect(relativeError(J.hessianApply(u), Ku)).toBeLessThan(1e-12);
      // a weighted sum scales the rows' weights, sharing them
      expect(relativeError(combineFunctionals([[2.5, J]]).gradient(u), Ku.map((v) => 2.5 * v))).toBeLessThan(1e-12);
    });

    it(`${d}D: terminal tracking value and gradient equal the dense form at t = T`, () => {
      // σ_λ(T) per temporal node
      const sigma = nodes.map((n) => evaluateTemporal('trial', n.level, n.index, 0, T, T).value);
      const g = new Float64Array(set.size);
      let val = 0;
      for (let r = 0; r < set.size; r++) {
        let s = 0;
        for (let c = 0; c < set.size; c++) s += sigma[lab[r]!.fn]! * sigma[lab[c]!.fn]! * sp.M[pos[r]!]![pos[c]!]! * u[c]!;
        g[r] = s;
        val += 0.5 * u[r]! * s;
      }
      const J = terminalTracking(system);
      expect(Math.abs(J.value(u) - val) / val).toBeLessThan(1e-12);
      expect(relativeError(J.gradient(u), g)).toBeLessThan(1e-12);
    });
  }
});
