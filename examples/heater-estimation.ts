/**
 * Example: a plate with three buried heaters of unknown power and eight thermocouples.
 *
 * The plate (0, 2) × (0, 1) is held at ambient temperature along its lower edge y = 0 and
 * insulated elsewhere; temperatures are measured relative to ambient. Heater i has a known
 * footprint h_i(x, y) and schedule g_i(t) and unknown power P_i, so the source is
 * f = Σ P_i g_i(t) h_i(x, y). Eight thermocouples record 20 readings each. We recover P from the
 * readings by Tikhonov-regularised least squares (CG on the normal equations, adjoint gradients),
 * report the sensitivities ∂reading/∂P_i and the uncertainty the Hessian predicts, and draw the
 * fitted against the measured curves as an SVG.
 *
 * Run: node --import tsx examples/heater-estimation.ts [out.svg] [noise, default 0.01]
 *
 * Synthetic data come from the same discretisation as the estimate ("inverse crime"), so the
 * noise-free recovery is exact up to solver tolerance; real data also carry model error.
 */
import { writeFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import {
  DoubleTree, HeatProblem, ReducedFunctional, SpaceTimeSystem, estimateParameters, parameterCovariance,
  probeMisfit, rectangleDomain, sourceAmplitudes, type ParameterMap, type SeparableTerm, type SpaceTimeSolution,
} from '../src/index';

export const TRUE_POWERS = [3, 1.5, 2.2];
export const SENSORS: [number, number][] = [
  [0.25, 0.5], [0.5, 0.8], [0.75, 0.3], [1.0, 0.2], [1.0, 0.85], [1.25, 0.6], [1.6, 0.7], [1.8, 0.25],
];
export const T = 1;
export const TIMES = Array.from({ length: 20 }, (_, j) => ((j + 1) * T) / 20);

// Footprints normalised to unit total heat (∫ h_i ≈ 1), so P_i is the power of heater i.
const gauss = (cx: number, cy: number, r: number) => (x: number, y: number) => Math.exp(-((x - cx) ** 2 + (y - cy) ** 2) / (r * r)) / (Math.PI * r * r);
export const HEATERS: SeparableTerm[] = [
  { time: () => 1, space: gauss(0.5, 0.45, 0.12) }, // on from the start
  { time: (t) => 1 - Math.exp(-t / 0.15), space: gauss(1.05, 0.6, 0.12) }, // slow warm-up
  { time: (t) => (t < 0.6 ? Math.sin((Math.PI * t) / 0.6) ** 2 : 0), space: gauss(1.5, 0.4, 0.12) }, // one pulse
];

/** Standard normal deviates from a seeded generator (Box–Muller; common practice). */
function normal(seed: number): () => number {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 1) / 4294967297;
  };
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

export interface HeaterStudy {
  estimate: number[];
  standardDeviations: number[];
  /** ∂reading/∂P_i: rows (time-major, then sensor) × heaters. */
  sensitivities: Float64Array;
  measured: number[][];
  fitted: SpaceTimeSolution;
  sigma: number;
  unknowns: number;
  cgIterations: number;
  seconds: number;
}

/** The discretised plate, the power-to-source map and the noise-free readings of the true powers. */
export interface HeaterModel {
  system: SpaceTimeSystem;
  powers: ParameterMap;
  clean: number[][];
  /** Nominal noise scale: the largest clean reading. */
  peak: number;
}

/** Builds the model on the sparse grid of the given level and synthesises noise-free readings. */
export function buildHeaterModel(level = 5): HeaterModel {
  const domain = rectangleDomain(0, 2, 0, 1, 4, 2, { insulated: (_mx, my) => my > 1e-9 });
  const system = new SpaceTimeSystem(new HeatProblem({ domain, T }), DoubleTree.sparseGrid(domain, level));
  const powers = sourceAmplitudes(system, HEATERS);
  const truthRhs = new Float64Array(system.size);
  powers.addTo(Float64Array.from(TRUE_POWERS), truthRhs);
  const truth = system.solve({ rightHandSide: truthRhs, relTol: 1e-12 }).solution;
  const clean = TIMES.map((t) => Array.from(truth.evaluate(t, SENSORS.flat())));
  return { system, powers, clean, peak: Math.max(...clean.flat().map(Math.abs)) };
}

/**
 * Adds Gaussian noise of standard deviation `noise` × peak reading (seeded) and estimates the
 * powers; `full` also computes sensitivities and the fitted state (for reports and the plot),
 * `covariance: false` skips the Hessian assembly.
 */
export function runHeaterStudy(
  opts: { noise?: number; seed?: number; level?: number; beta?: number; model?: HeaterModel; full?: boolean; covariance?: boolean } = {},
): HeaterStudy {
  const start = performance.now();
  const noise = opts.noise ?? 0.01;
  const model = opts.model ?? buildHeaterModel(opts.level ?? 5);
  const { system, powers } = model;
  // Noise level σ (the nominal 1 % when the data are noise-free, so that the weights stay finite).
  const sigma = (noise > 0 ? noise : 0.01) * model.peak;
  const z = normal(opts.seed ?? 2024);
  const measured = model.clean.map((row) => row.map((v) => v + (noise > 0 ? noise * model.peak * z() : 0)));
  // Readings weighted by 1/σ²: then (H + βI)⁻¹ is the covariance of the estimate.
  const misfit = probeMisfit(system, { times: TIMES, points: SENSORS.map((p) => [...p]), data: measured, weights: 1 / (sigma * sigma) });
  const J = new ReducedFunctional(system, powers, misfit, { accuracy: 1e-11 });
  const beta = opts.beta ?? 1e-8;
  const est = estimateParameters(J, { beta, tolerance: 1e-10 });
  const cov = opts.covariance === false ? null : parameterCovariance(J, { beta });
  const full = opts.full ?? true;
  return {
    estimate: Array.from(est.parameters),
    standardDeviations: cov ? Array.from(cov.standardDeviations) : [],
    sensitivities: full ? J.sensitivities({ accuracy: 1e-10 }) : new Float64Array(0),
    measured,
    fitted: full ? J.state(est.parameters, { accuracy: 1e-10 }) : J.state(new Float64Array(3), { accuracy: 0.5 }),
    sigma,
    unknowns: system.size,
    cgIterations: est.iterations,
    seconds: (performance.now() - start) / 1000,
  };
}

/** A 1-2-5 step near `raw` (common practice for axis ticks). */
function niceStep(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(raw));
  const r = raw / p;
  return (r <= 1 ? 1 : r <= 2 ? 2 : r <= 5 ? 5 : 10) * p;
}

/** Fitted (lines) against measured (dots) temperature curves of the eight thermocouples. */
export function fitSvg(study: HeaterStudy): string {
  const W = 720, H = 440, L = 60, R = 150, Tp = 30, B = 50;
  const samples = Array.from({ length: 101 }, (_, j) => (j * T) / 100);
  const curves = samples.map((t) => Array.from(study.fitted.evaluate(t, SENSORS.flat())));
  const hi = Math.max(...study.measured.flat(), ...curves.flat());
  const step = niceStep(hi / 5);
  const ymax = Math.ceil((hi * 1.02) / step) * step;
  const ymin = Math.min(0, Math.min(...study.measured.flat()) - 0.02 * hi);
  const X = (t: number) => L + ((W - L - R) * t) / T;
  const Y = (v: number) => H - B - ((H - B - Tp) * (v - ymin)) / (ymax - ymin);
  const colors = ['#1f77b4', '#ff7f0e', '#2ca02c', '#d62728', '#9467bd', '#8c564b', '#e377c2', '#17becf'];
  const out: string[] = [`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" font-family="sans-serif" font-size="12">`];
  out.push(`<rect width="${W}" height="${H}" fill="white"/>`);
  out.push(`<text x="${L}" y="18" font-size="14">Thermocouples: measured (dots, σ = ${study.sigma.toPrecision(2)}) and fitted (lines)</text>`);
  out.push(`<line x1="${L}" y1="${H - B}" x2="${W - R}" y2="${H - B}" stroke="black"/><line x1="${L}" y1="${Tp}" x2="${L}" y2="${H - B}" stroke="black"/>`);
  for (let k = 0; k <= 5; k++) {
    const t = (k * T) / 5;
    out.push(`<line x1="${X(t)}" y1="${H - B}" x2="${X(t)}" y2="${H - B + 5}" stroke="black"/><text x="${X(t)}" y="${H - B + 18}" text-anchor="middle">${t.toFixed(1)}</text>`);
  }
  const digits = Math.max(0, -Math.floor(Math.log10(step)));
  for (let v = Math.ceil(ymin / step) * step; v <= ymax + step / 2; v += step) {
    out.push(`<line x1="${L - 5}" y1="${Y(v)}" x2="${W - R}" y2="${Y(v)}" stroke="#ddd"/><text x="${L - 8}" y="${Y(v) + 4}" text-anchor="end">${v.toFixed(digits)}</text>`);
  }
  out.push(`<text x="${(L + W - R) / 2}" y="${H - 12}" text-anchor="middle">time t</text>`);
  out.push(`<text transform="translate(16 ${(Tp + H - B) / 2}) rotate(-90)" text-anchor="middle">temperature above ambient</text>`);
  SENSORS.forEach((p, k) => {
    const c = colors[k]!;
    out.push(`<polyline fill="none" stroke="${c}" stroke-width="1.5" points="${samples.map((t, j) => `${X(t).toFixed(1)},${Y(curves[j]![k]!).toFixed(1)}`).join(' ')}"/>`);
    TIMES.forEach((t, j) => out.push(`<circle cx="${X(t).toFixed(1)}" cy="${Y(study.measured[j]![k]!).toFixed(1)}" r="2.8" fill="${c}"/>`));
    out.push(`<circle cx="${W - R + 18}" cy="${Tp + 10 + 20 * k}" r="4" fill="${c}"/><text x="${W - R + 28}" y="${Tp + 14 + 20 * k}">TC${k + 1} (${p[0]}, ${p[1]})</text>`);
  });
  study.estimate.forEach((P, i) => {
    out.push(`<text x="${W - R + 10}" y="${Tp + 200 + 18 * i}">P${i + 1} = ${P.toFixed(3)} ± ${study.standardDeviations[i]!.toFixed(3)}</text>`);
  });
  out.push(`<text x="${W - R + 10}" y="${Tp + 200 + 18 * 3}" fill="#555">(true ${TRUE_POWERS.join(', ')})</text>`);
  out.push('</svg>');
  return out.join('\n') + '\n';
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const file = process.argv[2] ?? 'heater-fit.svg';
  const noise = process.argv[3] !== undefined ? Number(process.argv[3]) : 0.01;
  const model = buildHeaterModel(5);
  const clean = runHeaterStudy({ noise: 0, model, full: false });
  const study = runHeaterStudy({ noise, model });
  console.log(`space-time unknowns: ${study.unknowns}; CG iterations on the normal equations: ${study.cgIterations}; ${study.seconds.toFixed(1)} s`);
  console.log('heater  true    noise-free estimate (rel. error)   noisy estimate ± σ (Hessian)   |error|/σ');
  TRUE_POWERS.forEach((P, i) => {
    const e0 = clean.estimate[i]!, e1 = study.estimate[i]!, s = study.standardDeviations[i]!;
    console.log(`P${i + 1}      ${P.toFixed(3)}   ${e0.toFixed(6)} (${(Math.abs(e0 - P) / P).toExponential(1)})           ${e1.toFixed(4)} ± ${s.toFixed(4)}            ${(Math.abs(e1 - P) / s).toFixed(2)}`);
  });
  console.log('sensitivity ∂reading/∂P_i at t = T:');
  const last = TIMES.length - 1;
  SENSORS.forEach((p, k) => {
    const row = study.sensitivities.subarray((last * SENSORS.length + k) * 3, (last * SENSORS.length + k) * 3 + 3);
    console.log(`  TC${k + 1} (${p.join(', ')}): ${Array.from(row).map((v) => v.toExponential(2)).join('  ')}`);
  });
  writeFileSync(file, fitSvg(study));
  console.log(`wrote ${file}`);
}
