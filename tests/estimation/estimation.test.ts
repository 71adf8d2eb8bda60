/**
 * Estimation checks. The heater example (examples/heater-estimation.ts) with synthetic data:
 * noise-free recovery to 1e-4 relative; with 1 % Gaussian noise, errors within the spread the
 * Hessian predicts — for one seed (|error| ≤ 3σ) and over repeated seeds (the mean of (error/σ)²
 * is a χ²_n/n variable; its 99.9 % range for n = 24 is about [0.35, 2.0], from χ² tables, e.g.
 * Abramowitz & Stegun, Handbook of Mathematical Functions, Table 26.8, values from memory).
 * The Tikhonov CG solution is compared with a dense solve of the same least-squares problem built
 * from forward sensitivities alone (ml-matrix, an independent general-purpose library), and the
 * functional values with closed forms by separation of variables.
 */
import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import {
  DoubleTree, HeatProblem, ReducedFunctional, SpaceTimeSystem, estimateParameters, initialState, intervalDomain,
  probeMisfit, regionTracking, terminalTracking,
} from '../../src/index';
import { TRUE_POWERS, buildHeaterModel, runHeaterStudy, type HeaterModel } from '../../examples/heater-estimation';

const report: string[] = [];
let model: HeaterModel;
const getModel = () => (model ??= buildHeaterModel(3));

describe('heater powers from thermocouple readings', () => {
  it('noise-free data: powers recovered to 1e-4 relative', () => {
    const s = runHeaterStudy({ noise: 0, model: getModel(), full: false, covariance: false });
    const rel = s.estimate.map((e, i) => Math.abs(e - TRUE_POWERS[i]!) / TRUE_POWERS[i]!);
    report.push(`noise-free (N=${s.unknowns}): relative errors ${rel.map((r) => r.toExponential(1)).join(', ')}, ${s.cgIterations} CG iterations`);
    for (const r of rel) expect(r).toBeLessThan(1e-4);
  });

  it('1 % noise: errors within the Hessian-predicted uncertainty', () => {
    const s = runHeaterStudy({ noise: 0.01, model: getModel(), full: true });
    const z = s.estimate.map((e, i) => (e - TRUE_POWERS[i]!) / s.standardDeviations[i]!);
    report.push(`1 % noise, seed 2024: estimates ${s.estimate.map((e, i) => `${e.toFixed(4)} ± ${s.standardDeviations[i]!.toFixed(4)}`).join(', ')}; error/σ ${z.map((v) => v.toFixed(2)).join(', ')}`);
    for (const v of z) expect(Math.abs(v)).toBeLessThan(3);
    expect(s.sensitivities.length).toBe(20 * 8 * 3);
    // Every heater warms every thermocouple (sensitivities positive at t = T).
    for (let j = 0; j < 24; j++) expect(s.sensitivities[s.sensitivities.length - 24 + j]!).toBeGreaterThan(0);
    let chi = 0;
    let n = 0;
    for (let seed = 1; seed <= 8; seed++) {
      const r = runHeaterStudy({ noise: 0.01, model: getModel(), full: false, covariance: false, seed });
      r.estimate.forEach((e, i) => {
        chi += ((e - TRUE_POWERS[i]!) / s.standardDeviations[i]!) ** 2;
        n++;
      });
    }
    report.push(`1 % noise, 8 seeds: mean (error/σ)² = ${(chi / n).toFixed(2)} over ${n} estimates (expected 1)`);
    expect(chi / n).toBeGreaterThan(0.35);
    expect(chi / n).toBeLessThan(2.0);
  });
});

describe('Tikhonov estimate of an initial state (d = 1)', () => {
  it('CG on the normal equations agrees with a dense least-squares solve from forward sensitivities', () => {
    const domain = intervalDomain(0, 1, 2);
    const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 0.2 }), DoubleTree.sparseGrid(domain, 6));
    const u0 = initialState(system, 2); // 9 nodal values, boundary included
    const truthM = Float64Array.from(u0.mesh.coords, (x) => Math.sin(Math.PI * x) + 0.5 * x);
    const b = new Float64Array(system.size);
    u0.addTo(truthM, b);
    const truth = system.solve({ rightHandSide: b, relTol: 1e-12 }).solution;
    const times = [0.01, 0.02, 0.05];
    const points = [0.1, 0.2, 0.35, 0.5, 0.65, 0.8, 0.9].map((x) => [x]);
    const data = times.map((t) => Array.from(truth.evaluate(t, points.flat())));
    const J = new ReducedFunctional(system, u0, probeMisfit(system, { times, points, data }), { accuracy: 1e-12 });
    const beta = 1e-6;
    const est = estimateParameters(J, { beta, tolerance: 1e-10 });
    // Independent route: Jacobian G from one forward solve per parameter, then (GᵀG + βI) m = Gᵀd.
    const G = J.sensitivities({ accuracy: 1e-12 });
    const rows = J.functional.rowCount, n = J.size;
    const Gm = new Matrix(rows, n);
    for (let k = 0; k < rows; k++) for (let j = 0; j < n; j++) Gm.set(k, j, G[k * n + j]!);
    const d = Matrix.columnVector(data.flat());
    const A = Gm.transpose().mmul(Gm).add(Matrix.eye(n, n).mul(beta));
    const dense = solve(A, Gm.transpose().mmul(d)).getColumn(0);
    const diff = Math.max(...dense.map((v, j) => Math.abs(v - est.parameters[j]!)));
    const scale = Math.max(...dense.map(Math.abs));
    const trueErr = Math.max(...truthM.map((v, j) => Math.abs(v - est.parameters[j]!)));
    report.push(`initial state (9 nodal values, β = ${beta}): CG vs dense ${(diff / scale).toExponential(1)} relative, ${est.iterations} CG iterations; max |m − m_true| = ${trueErr.toExponential(1)}`);
    expect(diff / scale).toBeLessThan(1e-6);
    // The gradient of the regularised objective vanishes at the estimate.
    const g = J.gradient(est.parameters).gradient.map((v, j) => v + beta * est.parameters[j]!);
    const g0 = J.gradient(new Float64Array(n)).gradient;
    expect(Math.hypot(...g) / Math.hypot(...g0)).toBeLessThan(1e-7);
  });
});

describe('functional values against closed forms', () => {
  // u = e^{−π²t} sin(πx) solves the heat equation on (0,1) with u0 = sin(πx) (separation of variables).
  const domain = intervalDomain(0, 1, 2);
  const T = 0.1;
  const system = new SpaceTimeSystem(new HeatProblem({ domain, T, initial: (x) => Math.sin(Math.PI * x) }), DoubleTree.sparseGrid(domain, 9));
  const u = () => system.solve({ relTol: 1e-10 }).solution.coefficients;
  it('terminal tracking: ½‖u(T)‖² = ¼ e^{−2π²T}', () => {
    const v = terminalTracking(system).value(u());
    const exact = 0.25 * Math.exp(-2 * Math.PI * Math.PI * T);
    report.push(`terminal tracking value: rel. error ${(Math.abs(v - exact) / exact).toExponential(1)}`);
    expect(Math.abs(v - exact) / exact).toBeLessThan(1e-3);
  });
  it('space-time tracking: ½∫∫ u² = (1 − e^{−2π²T}) / (8π²), and over a half window and region', () => {
    const c = u();
    const v = regionTracking(system).value(c);
    const exact = (1 - Math.exp(-2 * Math.PI * Math.PI * T)) / (8 * Math.PI * Math.PI);
    expect(Math.abs(v - exact) / exact).toBeLessThan(1e-3);
    // Region x < ½ holds half of sin² by symmetry; window [T/2, T].
    const h = regionTracking(system, { from: T / 2, inside: (x) => x < 0.5 }).value(c);
    const exactH = (Math.exp(-Math.PI * Math.PI * T) - Math.exp(-2 * Math.PI * Math.PI * T)) / (16 * Math.PI * Math.PI);
    report.push(`region tracking values: rel. errors ${(Math.abs(v - exact) / exact).toExponential(1)}, ${(Math.abs(h - exactH) / exactH).toExponential(1)}`);
    expect(Math.abs(h - exactH) / exactH).toBeLessThan(1e-3);
  });
});

describe('estimation report', () => {
  it('prints', () => {
    if (process.env.CHRONOMESH_REPORT) console.log(report.join('\n'));
    expect(report.length).toBeGreaterThan(0);
  });
});
