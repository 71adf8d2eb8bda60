/**
 * Adjoint consistency: S⁻¹ is symmetric to solver tolerance (S is SPD by construction, docs/method.md
 * §2), the Hessian–vector product is symmetric, every parameter map and the evaluation map pass
 * the dot-product test ⟨A x, y⟩ = ⟨x, Aᵀ y⟩ (common practice for hand-written adjoints, e.g.
 * Claerbout, Earth Soundings Analysis, 1992, §5.6), the requested accuracy bounds the gradient
 * error, and an unconverged adjoint solve raises a typed error.
 */
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, InvalidArgumentError, NotConvergedError, ReducedFunctional, SpaceTimeSystem, pcg, rectangleDomain } from '../../src/index';
import { rng } from '../helpers/random';
import { FUNCTIONAL_KINDS, PARAM_KINDS, functionalFor, paramsFor, systemFor } from './fixtures';

const dot = (a: Float64Array, b: Float64Array) => a.reduce((s, v, i) => s + v * b[i]!, 0);
const rand = (n: number, r: () => number) => Float64Array.from({ length: n }, () => r() - 0.5);
const report: string[] = [];

describe('symmetry and adjoint consistency', () => {
  it.each([1, 2] as const)('⟨S⁻¹a, b⟩ = ⟨a, S⁻¹b⟩ on random vectors (d = %i, sparse)', (d) => {
    const system = systemFor(d, 'sparse');
    const r = rng(3);
    for (let trial = 0; trial < 3; trial++) {
      const a = rand(system.size, r), b = rand(system.size, r);
      const solve = (x: Float64Array) => pcg(system.S, x, { preconditioner: system.KX, relTol: 1e-12, maxIterations: 1000 }).solution;
      const lhs = dot(solve(a), b), rhs = dot(a, solve(b));
      const rel = Math.abs(lhs - rhs) / Math.abs(lhs);
      report.push(`d=${d} N=${system.size}: |⟨S⁻¹a,b⟩ − ⟨a,S⁻¹b⟩| / |⟨S⁻¹a,b⟩| = ${rel.toExponential(1)} (relTol 1e-12)`);
      expect(rel).toBeLessThan(1e-9);
    }
  });

  it('S, K_Y and K_X stay symmetric with a rotated diffusion tensor and several inner V-cycles', () => {
    // eigenvalue ratio 10 at 30°: the inner solvers run ⌈A/8⌉ = 4 cycles (docs/method.md §4.4)
    const c = Math.cos(Math.PI / 6), s = Math.sin(Math.PI / 6);
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { diffusionTensor: { xx: c * c + 0.1 * s * s, xy: 0.9 * c * s, yy: s * s + 0.1 * c * c } });
    const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 0.5, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4));
    const r = rng(9);
    for (const [name, op] of [['S', system.S], ['K_Y', system.KY], ['K_X', system.KX]] as const) {
      const a = rand(op.inSize, r), b = rand(op.inSize, r);
      const ya = new Float64Array(op.outSize), yb = new Float64Array(op.outSize);
      op.apply(a, ya);
      op.apply(b, yb);
      const rel = Math.abs(dot(ya, b) - dot(a, yb)) / Math.abs(dot(ya, b));
      report.push(`anisotropic d=2 N=${system.size}: ${name} asymmetry ${rel.toExponential(1)}`);
      expect(rel, name).toBeLessThan(1e-12);
      expect(dot(ya, a), `${name} positive`).toBeGreaterThan(0);
    }
  });

  it.each([1, 2] as const)('dot-product test of every parameter map and functional, Hessian symmetry (d = %i, adaptive)', (d) => {
    const system = systemFor(d, 'adaptive');
    const r = rng(5);
    for (const pk of PARAM_KINDS) {
      const params = paramsFor(system, pk);
      const x = rand(params.size, r), v = rand(system.size, r);
      const bx = new Float64Array(system.size);
      params.addTo(x, bx);
      const g = new Float64Array(params.size);
      params.transpose(v, g);
      const rel = Math.abs(dot(bx, v) - dot(x, g)) / Math.abs(dot(bx, v));
      expect(rel, pk).toBeLessThan(1e-12);
      for (const fk of FUNCTIONAL_KINDS) {
        const F = functionalFor(system, fk);
        const u = rand(system.size, r), w = rand(system.size, r);
        // ⟨∇²J u, w⟩ = ⟨u, ∇²J w⟩ for the state Hessian Eᵀ W E …
        const hu = F.hessianApply(u), hw = F.hessianApply(w);
        expect(Math.abs(dot(hu, w) - dot(u, hw)) / Math.abs(dot(hu, w)), fk).toBeLessThan(1e-12);
        // … and for the reduced Hessian through two solves each.
        const J = new ReducedFunctional(system, params, F, { accuracy: 1e-12 });
        const p = rand(params.size, r), q = rand(params.size, r);
        const Hp = J.hessianVector(p), Hq = J.hessianVector(q);
        const relH = Math.abs(dot(Hp, q) - dot(p, Hq)) / Math.abs(dot(Hp, q));
        report.push(`d=${d} N=${system.size} ${pk} × ${fk}: map dot-test ${rel.toExponential(1)}, Hessian asymmetry ${relH.toExponential(1)}`);
        expect(relH, `${pk} × ${fk}`).toBeLessThan(1e-9);
      }
    }
  });

  it('the gradient error follows the requested accuracy', () => {
    const system = systemFor(2, 'sparse');
    const params = paramsFor(system, 'initial');
    const J = new ReducedFunctional(system, params, functionalFor(system, 'sum'));
    const m = Float64Array.from({ length: params.size }, (_, i) => Math.sin(i));
    const exact = J.gradient(m, { accuracy: 1e-13 }).gradient;
    const norm = Math.sqrt(dot(exact, exact));
    for (const acc of [1e-2, 1e-4, 1e-6]) {
      const g = J.gradient(m, { accuracy: acc });
      const diff = exact.map((v, i) => v - g.gradient[i]!);
      const rel = Math.sqrt(dot(diff, diff)) / norm;
      report.push(`accuracy ${acc}: gradient rel. error ${rel.toExponential(1)} (forward ${g.forwardIterations}, adjoint ${g.adjointIterations} PCG iterations)`);
      expect(rel).toBeLessThan(acc);
    }
  });

  it('an unconverged adjoint solve raises NotConvergedError; bad input is rejected before work', () => {
    const system = systemFor(1, 'sparse');
    const params = paramsFor(system, 'source');
    const J = new ReducedFunctional(system, params, functionalFor(system, 'probe'), { maxIterations: 2 });
    try {
      J.gradient(Float64Array.of(1, 1), { accuracy: 1e-12 });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(NotConvergedError);
      expect((e as NotConvergedError).field).toBe('forward');
      expect((e as NotConvergedError).iterations).toBe(2);
    }
    // Forward solve converges loosely, adjoint does not: the error names the adjoint solve.
    const J2 = new ReducedFunctional(system, params, functionalFor(system, 'probe'), { maxIterations: 6 });
    const fwd = J2.solveWith(J2.rightHandSide(Float64Array.of(1, 1)), 1e-1, 'forward');
    expect(() => J2.solveWith(J2.functional.gradient(fwd.solution), 1e-13, 'adjoint')).toThrow(/adjoint PCG solve stopped/);
    expect(() => J.gradient(Float64Array.of(1))).toThrow(InvalidArgumentError);
    expect(() => J.gradient(Float64Array.of(1, NaN))).toThrow(/m\[1\]/);
    expect(() => J.value(Float64Array.of(1, 1), { accuracy: 2 })).toThrow(InvalidArgumentError);
  });

  it('report', () => {
    if (process.env.CHRONOMESH_REPORT) console.log(report.join('\n'));
    expect(report.length).toBeGreaterThan(0);
  });
});

describe('option keys', () => {
  it('an unknown option key is refused with the nearest valid name', () => {
    const system = systemFor(1, 'sparse');
    const J = new ReducedFunctional(system, paramsFor(system, 'source'), functionalFor(system, 'probe'));
    expect(() => J.gradient(Float64Array.of(1, 1), { accuray: 1e-3 } as never)).toThrow(/did you mean 'accuracy'/);
  });
});
