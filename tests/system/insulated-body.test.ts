/**
 * A body insulated all round, posed through the substitution v = e^{−λt}u of docs/method.md §1.1
 * (the direct form is refused: the spatial form is not coercive), on the flash experiment.
 *
 * References outside the project:
 * - A slab 0 < x < L insulated at both faces that receives the energy Q per area at x = 0 at time s
 *   has the back-face temperature (Q/L)[1 + 2 Σ_{n≥1} (−1)ⁿ exp(−n²π²κ(t − s)/L²)] (Carslaw &
 *   Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, §3.3; Parker, Jenkins, Butler & Abbott,
 *   J. Appl. Phys. 32 (1961) 1679, eq. (3)). A pulse of finite length is the convolution of it.
 * - The back face reaches half its final rise at t½ = 0.1388 L²/κ (Parker et al. 1961: 1.38/π²).
 */
import { describe, expect, it } from 'vitest';
import { HeatProblem, InvalidMeshError, intervalDomain, solveAdaptive } from '../../src/index';
import { SAMPLE, flashExperiment } from '../../examples/flash-diffusivity';

const PI = Math.PI;

/** Back-face rise of the unit slab (κ = 1) for the flux q during 0 < t < tau: the series convolved with the pulse. */
function backFace(t: number, q: number, tau: number): number {
  const te = Math.min(t, tau);
  let s = te;
  for (let n = 1; n < 400; n++) {
    const k = n * n * PI * PI;
    s += (2 * (-1) ** n * (Math.exp(-k * (t - te)) - Math.exp(-k * t))) / k;
  }
  return q * s;
}

/** The t in (lo, hi) where the increasing f crosses ½, by bisection. */
function halfRise(f: (t: number) => number, lo = 0.01, hi = 0.5): number {
  for (let i = 0; i < 60; i++) {
    const m = (lo + hi) / 2;
    if (f(m) < 0.5) lo = m;
    else hi = m;
  }
  return (lo + hi) / 2;
}

describe('a body insulated all round (flash experiment)', () => {
  const T = 0.5, tau = 0.002, q = 1 / tau; // unit energy in a pulse of length 0.002

  it('the reference: the series gives Parker’s half-rise time for an instantaneous pulse', () => {
    const instant = (t: number) => {
      let s = 1;
      for (let n = 1; n < 400; n++) s += 2 * (-1) ** n * Math.exp(-n * n * PI * PI * t);
      return s;
    };
    expect(halfRise(instant)).toBeCloseTo(0.1388, 4);
    // the finite pulse shifts it by about half its length
    expect(halfRise((t) => backFace(t, q, tau))).toBeCloseTo(0.1388 + tau / 2, 4);
  });

  it('is refused as posed, with the way round named', () => {
    const insulated = () => intervalDomain(0, 1, 4, { boundary: [{ kind: 'flux', where: [[0]], flux: (t) => (t < tau ? q : 0) }, { kind: 'flux', where: [[4]], flux: 0 }] });
    expect(insulated).toThrow(InvalidMeshError);
    expect(insulated).toThrow(/v = e\^\{-λt\}·u .*docs\/method\.md §1\.1/);
  });

  it('solved for v = e^{−λt}u, the back face follows the series and rises to half at t½', () => {
    const lambda = 1 / T;
    const domain = intervalDomain(0, 1, 4, {
      reaction: lambda,
      boundary: [{ kind: 'flux', where: [[0]], flux: (t) => (t < tau ? q * Math.exp(-lambda * t) : 0) }, { kind: 'flux', where: [[4]], flux: 0 }],
    });
    const r = solveAdaptive(new HeatProblem({ domain, T }), { maxUnknowns: 3000 });
    // the pulse is seen from the first step (measured E = 10.2; E = 0 and u ≡ 0 before the loads'
    // time rule watched boundary fluxes)
    expect(r.history[0]!.estimate).toBeGreaterThan(1);
    const u = (t: number) => Math.exp(lambda * t) * r.solution.evaluate(t, [1])[0]!;
    // measured at 2 606 unknowns: largest deviation 0.0066 (at t = 0.1) of a rise of 1
    for (const t of [0.1, 0.1388, 0.2, 0.3, 0.5]) expect(Math.abs(u(t) - backFace(t, q, tau))).toBeLessThan(0.02);
    // measured 0.14018 against 0.13979
    expect(Math.abs(halfRise(u) - halfRise((t) => backFace(t, q, tau)))).toBeLessThan(0.002);
  });

  it('examples/flash-diffusivity.ts recovers the diffusivity by Parker’s formula in physical units', () => {
    // 2 mm, α = 1.2·10⁻⁵ m²/s, 1 ms pulse; measured at 3 425 unknowns: α within 0.36 %, final rise
    // 2.0096 K of 2 K
    const r = flashExperiment({ ...SAMPLE, maxUnknowns: 2000 });
    expect(Math.abs(r.diffusivityEstimate / SAMPLE.diffusivity - 1)).toBeLessThan(0.02);
    const T = (2 * SAMPLE.thickness ** 2) / SAMPLE.diffusivity;
    expect(Math.abs(r.backFace(T) / SAMPLE.rise - 1)).toBeLessThan(0.02);
  });
});
