/**
 * `chronomesh demo`: runs the library on built-in example scenarios and prints
 * what a user would check first — basis constants, a space-time solve with
 * its PCG history against a closed-form solution, a 2D solve on a
 * non-convex domain, the cost of one operator application — and then runs the
 * shipped problem files of examples/ through `chronomesh solve`.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  DoubleTree, HeatProblem, SpaceTimeSystem, convergencePlotSvg, intervalDomain, lShapeDomain, measureOperatorCost,
  enlargeDoubleTree, probeTableCsv, residualIndicators, sliceToSvg, sliceToVtu, solveAdaptive, spaceTimeErrors, vtkCollection,
  type SpaceTimeSolution,
} from '../index';
import { stateToJson } from '../problem-file/index';
import { rieszConditionNumbers } from './riesz';
import { runShippedExamples } from './demo-examples';

const written: string[] = [];
function save(dir: string, name: string, content: string): void {
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, name), content);
  written.push(join(dir, name));
}

/** Writes slices at the given times as .vtu files plus a .pvd collection. */
function saveSlices(dir: string, base: string, solution: SpaceTimeSolution, times: number[]): void {
  const entries = times.map((t, i) => {
    const file = `${base}-${String(i).padStart(4, '0')}.vtu`;
    save(dir, file, sliceToVtu(solution.slice(t), 'temperature'));
    return { t, file };
  });
  save(dir, `${base}.pvd`, vtkCollection(entries));
}

function heading(s: string): void {
  console.log(`\n== ${s} ${'='.repeat(Math.max(0, 72 - s.length))}`);
}

/** u(t, x) for u0 ≡ 1 on (0, 1), u = 0 at both ends (Fourier series; Carslaw & Jaeger §3.3). */
function rodSeries(t: number, x: number): number {
  let s = 0;
  for (let n = 1; n < 4001; n += 2) s += (4 / (n * Math.PI)) * Math.sin(n * Math.PI * x) * Math.exp(-n * n * Math.PI * Math.PI * t);
  return s;
}

function basisConstants(quick: boolean): void {
  heading('Temporal trial wavelets: Riesz condition numbers (Gram matrix of levels ≤ L)');
  console.log('   L   cond L2   cond H1 (rescaled)');
  for (let L = 1; L <= (quick ? 4 : 7); L++) {
    const r = rieszConditionNumbers(L);
    console.log(`${String(L).padStart(4)} ${r.l2.toFixed(3).padStart(9)} ${r.h1.toFixed(3).padStart(9)}`);
  }
}

function rodCooling(quick: boolean, out: string): void {
  heading('Rod cooling: u0 = 1 on (0,1), ends held at 0 (boundary-incompatible data)');
  const domain = intervalDomain(0, 1, 2);
  const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
  const L = quick ? 7 : 10;
  const t0 = performance.now();
  const system = new SpaceTimeSystem(problem, DoubleTree.sparseGrid(domain, L));
  const { solution, pcg } = system.solve({ relTol: 1e-8, estimateSpectrum: true });
  const ms = performance.now() - t0;
  console.log(`sparse grid L = ${L}: ${system.size} unknowns (${system.testSet.size} test), solved in ${ms.toFixed(0)} ms`);
  console.log(`PCG with K_X: ${pcg.iterations} iterations, converged = ${pcg.converged}, cond(K_X S) ≈ ${pcg.spectrum!.condition.toFixed(2)}`);
  const hist = pcg.residualHistory;
  const picks = [0, 5, 10, 15, 20, 25, 30, 35, 40].filter((i) => i < hist.length);
  if (picks[picks.length - 1] !== hist.length - 1) picks.push(hist.length - 1);
  console.log('  iteration  relative residual ‖r‖_K');
  for (const i of picks) console.log(`  ${String(i).padStart(9)}  ${(hist[i]! / hist[0]!).toExponential(3)}`);
  console.log('\n     t      x   computed   Fourier series   |difference|');
  for (const t of [0.02, 0.05, 0.1, 0.3]) {
    const xs = [0.1, 0.5];
    const v = solution.evaluate(t, xs);
    xs.forEach((x, i) => {
      const ref = rodSeries(t, x);
      console.log(`  ${t.toFixed(2).padStart(4)}  ${x.toFixed(2)}  ${v[i]!.toFixed(6)}   ${ref.toFixed(6)}        ${Math.abs(v[i]! - ref).toExponential(2)}`);
    });
  }
  const times = Array.from({ length: 21 }, (_, i) => (i / 20) ** 2);
  saveSlices(out, 'rod', solution, times);
  save(out, 'rod-t0.02.svg', sliceToSvg(solution.slice(0.02), { title: 'rod, temperature at t = 0.02' }));
  save(out, 'rod-probes.csv', probeTableCsv(solution, times, [[0.1], [0.5]]));
}

function bracketHotSpot(quick: boolean, out: string): void {
  heading('L-shaped bracket: starts at 1, edges at 0, hot spot switched on at t = 0.25');
  const domain = lShapeDomain(1);
  const hot = (t: number, x: number, y: number) => (t >= 0.25 ? 40 * Math.exp(-((x + 0.5) ** 2 + (y - 0.5) ** 2) / 0.02) : 0);
  const problem = new HeatProblem({ domain, T: 1, initial: () => 1, source: hot });
  const L = quick ? 4 : 6;
  const t0 = performance.now();
  const system = new SpaceTimeSystem(problem, DoubleTree.sparseGrid(domain, L));
  const { solution, pcg } = system.solve({ relTol: 1e-7 });
  console.log(`sparse grid L = ${L}: ${system.size} unknowns, ${pcg.iterations} PCG iterations, ${(performance.now() - t0).toFixed(0)} ms`);
  console.log('     t   u(−0.5, 0.5) hot spot   u(0.5, 0.5)   u(−0.5, −0.5)');
  for (const t of [0.05, 0.2, 0.3, 0.5, 1]) {
    const v = solution.evaluate(t, [-0.5, 0.5, 0.5, 0.5, -0.5, -0.5]);
    console.log(`  ${t.toFixed(2).padStart(4)}   ${v[0]!.toFixed(4).padStart(10)}            ${v[1]!.toFixed(4).padStart(8)}      ${v[2]!.toFixed(4).padStart(8)}`);
  }
  const times = Array.from({ length: 11 }, (_, i) => i / 10);
  saveSlices(out, 'bracket', solution, times);
  for (const t of [0.05, 0.5]) save(out, `bracket-t${t}.svg`, sliceToSvg(solution.slice(t), { title: `L-shaped bracket, temperature at t = ${t}`, quantity: 'temperature' }));
  save(out, 'bracket-probes.csv', probeTableCsv(solution, times, [[-0.5, 0.5], [0.5, 0.5], [-0.5, -0.5]]));
}

/** Smooth manufactured solution u = (1 + t²) sin(πx) on (0,1): L2(H¹) error of sparse and full grids. */
function convergenceStudy(quick: boolean, out: string): void {
  heading('Convergence study: u = (1 + t²) sin(πx), L2(0,1; H¹) error');
  const PI = Math.PI;
  const domain = intervalDomain(0, 1, 2);
  const problem = new HeatProblem({
    domain, T: 1, initial: (x) => Math.sin(PI * x),
    source: [{ time: (t) => 2 * t + PI * PI * (1 + t * t), space: (x) => Math.sin(PI * x) }],
  });
  const exact = {
    value: (t: number, x: number) => (1 + t * t) * Math.sin(PI * x),
    gradient: (t: number, x: number, _y: number, g: Float64Array) => { g[0] = (1 + t * t) * PI * Math.cos(PI * x); },
  };
  const study: Record<string, { level: number; unknowns: number; error: number; iterations: number }[]> = { sparse: [], full: [] };
  console.log('  grid    L   unknowns   L2(H1) error   PCG its');
  for (const grid of ['sparse', 'full'] as const) {
    const levels = grid === 'sparse' ? (quick ? [3, 4, 5] : [3, 4, 5, 6, 7, 8]) : quick ? [2, 3] : [2, 3, 4, 5];
    for (const L of levels) {
      const set = grid === 'sparse' ? DoubleTree.sparseGrid(domain, L) : DoubleTree.fullGrid(domain, L, L);
      const { solution, pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-10 });
      const e = spaceTimeErrors(solution, exact).gradientL2;
      study[grid]!.push({ level: L, unknowns: set.size, error: e, iterations: pcg.iterations });
      console.log(`  ${grid.padEnd(6)} ${String(L).padStart(3)} ${String(set.size).padStart(10)}   ${e.toExponential(3).padStart(12)}   ${String(pcg.iterations).padStart(7)}`);
    }
  }
  save(out, 'convergence.json', JSON.stringify(study, null, 2) + '\n');
  save(out, 'convergence.svg', convergencePlotSvg(
    Object.entries(study).map(([label, rows]) => ({ label: `${label} grids`, points: rows.map((r) => [r.unknowns, r.error] as [number, number]) })),
    { title: 'heat equation on (0,1): smooth solution', yLabel: 'L2(H1) error', referenceSlopes: [-0.5, -1] },
  ));
}

/** Adaptive vs sparse grids on the rod with incompatible data: estimator against unknowns. */
function adaptiveRod(quick: boolean, out: string): void {
  heading('Adaptive loop on the rod (u0 = 1, ends at 0): estimator vs unknowns');
  const domain = intervalDomain(0, 1, 2);
  const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
  const t0 = performance.now();
  const res = solveAdaptive(problem, { maxUnknowns: quick ? 1500 : 15000, maxSteps: 200, theta: 0.5 });
  const h = res.history;
  console.log(`${h.length} steps in ${((performance.now() - t0) / 1000).toFixed(1)} s, stopped by: ${res.stopReason}`);
  console.log('  step   unknowns    estimator   E / ‖u‖   PCG its   deepest time level');
  for (let i = 0; i < h.length; i += Math.max(1, Math.floor(h.length / 12))) {
    const x = h[i]!;
    const rel = x.solutionNorm ? `${(100 * x.estimate / x.solutionNorm).toPrecision(2)} %` : '—';
    console.log(`  ${String(x.step).padStart(4)} ${String(x.unknowns).padStart(10)}   ${x.estimate.toExponential(3)}   ${rel.padStart(7)}   ${String(x.pcgIterations).padStart(7)}   ${String(x.maxTimeLevel).padStart(18)}`);
  }
  const sparse: { unknowns: number; estimate: number }[] = [];
  for (let L = 3; L <= (quick ? 7 : 10); L++) {
    const set = DoubleTree.sparseGrid(domain, L);
    const { pcg } = new SpaceTimeSystem(problem, set).solve({ relTol: 1e-8 });
    const e = residualIndicators(new SpaceTimeSystem(problem, enlargeDoubleTree(domain, set)), set, pcg.solution).estimate;
    sparse.push({ unknowns: set.size, estimate: e });
  }
  const rate = (a: { unknowns: number; estimate: number }, b: { unknowns: number; estimate: number }) =>
    Math.log(a.estimate / b.estimate) / Math.log(b.unknowns / a.unknowns);
  const a0 = h.find((x) => x.unknowns >= 200) ?? h[0]!;
  console.log(`estimator rate: adaptive ${rate(a0, h[h.length - 1]!).toFixed(2)}, sparse grids ${rate(sparse[0]!, sparse[sparse.length - 1]!).toFixed(2)}`);
  save(out, 'adaptive-rod.json', JSON.stringify({ adaptive: h, sparse }, null, 2) + '\n');
  save(out, 'adaptive-rod.svg', convergencePlotSvg([
    { label: 'adaptive', points: h.map((x) => [x.unknowns, x.estimate] as [number, number]) },
    { label: 'sparse grids', points: sparse.map((x) => [x.unknowns, x.estimate] as [number, number]) },
  ], { title: 'rod with u0 = 1: residual estimator', yLabel: 'estimator E', referenceSlopes: [-1] }));
}

/** Adaptive loop on the L-shaped bracket with incompatible data; pictures of the adapted slices. */
function adaptiveBracket(quick: boolean, out: string): void {
  heading('Adaptive loop on the L-shaped bracket (starts at 1, edges at 0)');
  const domain = lShapeDomain(1);
  const problem = new HeatProblem({ domain, T: 1, initial: () => 1 });
  const t0 = performance.now();
  const res = solveAdaptive(problem, { maxUnknowns: quick ? 1500 : 12000, maxSteps: 200 });
  const last = res.history[res.history.length - 1]!;
  console.log(`${res.history.length} steps, ${last.unknowns} unknowns, estimator ${last.estimate.toExponential(3)}, ` +
    `deepest time level ${last.maxTimeLevel}, ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  for (const t of [1e-3, 0.05]) {
    const slice = res.solution.slice(t);
    console.log(`  slice t = ${t}: leaf mesh with ${slice.mesh.vertexCount} vertices, ${slice.mesh.elementCount} triangles`);
    save(out, `bracket-adaptive-t${t}.svg`, sliceToSvg(slice, { title: `adaptive solution at t = ${t}`, quantity: 'temperature' }));
  }
  save(out, 'bracket-adaptive.json', JSON.stringify(res.history, null, 2) + '\n');
}

/** u(t, x) of the rod 0 < x < 1, u0 = 0, held at 1 at x = 0 and at 0 at x = 1 (Carslaw & Jaeger §3.4). */
function stepResponse(t: number, x: number): number {
  if (t <= 0) return 0;
  let s = 1 - x;
  for (let n = 1; n < 4001; n++) s -= (2 / (n * Math.PI)) * Math.exp(-n * n * Math.PI * Math.PI * t) * Math.sin(n * Math.PI * x);
  return s;
}

/** A held value that jumps (a quench) is refused as one run; two runs joined by a state instead. */
function quenchInTwoRuns(quick: boolean, out: string): void {
  heading('A quench in two runs: rod held at 1 at x = 0 until t = 0.3, then at 0');
  const ts = 0.3;
  const held = (value: (t: number) => number) => intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value }] });
  try {
    solveAdaptive(new HeatProblem({ domain: held((t) => (t < ts ? 1 : 0)), T: 0.5 }), { maxUnknowns: 100 });
  } catch (e) {
    console.log(`as one run: refused: ${(e as Error).message.slice(0, 150)}…`);
  }
  const budget = { maxUnknowns: quick ? 1000 : 3000 };
  const first = solveAdaptive(new HeatProblem({ domain: held(() => 1), T: ts }), budget);
  const end = first.solution.state(ts);
  save(out, 'quench-state-0.3.json', stateToJson(end, ts, 'rod held at 1 at x = 0, at t = 0.3') + '\n');
  const second = solveAdaptive(new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 0.5 - ts, initial: end }), budget);
  for (const [name, r] of [['held to t = 0.3', first], ['quenched, from its end state', second]] as const) {
    const last = r.history[r.history.length - 1]!;
    console.log(`${name}: ${r.history.length} steps, ${last.unknowns} unknowns, estimator ${last.estimate.toExponential(3)}`);
  }
  console.log('     t      x   computed   exact (superposition)   |difference|');
  for (const t of [0.1, 0.3, 0.31, 0.35, 0.45]) {
    for (const x of [0.1, 0.5]) {
      const v = t <= ts ? first.solution.evaluate(t, [x])[0]! : second.solution.evaluate(t - ts, [x])[0]!;
      const ref = stepResponse(t, x) - stepResponse(t - ts, x);
      console.log(`  ${t.toFixed(2).padStart(4)}  ${x.toFixed(2)}  ${v.toFixed(6)}   ${ref.toFixed(6)}               ${Math.abs(v - ref).toExponential(2)}`);
    }
  }
}

function operatorCosts(quick: boolean): void {
  heading('Cost of one operator application (ns per unknown, median)');
  console.log('   d   L   unknowns        S        B      K_X   PCG its (1e-6)');
  const rows: [1 | 2, number][] = quick ? [[1, 8], [2, 4]] : [[1, 10], [1, 12], [2, 5], [2, 6]];
  for (const [dim, level] of rows) {
    const c = measureOperatorCost({ dim, level, measurePcg: true });
    const n = c.nsPerUnknown;
    console.log(`${String(dim).padStart(4)} ${String(level).padStart(3)} ${String(c.unknowns).padStart(10)} ${n.schur.toFixed(0).padStart(8)} ${n.B.toFixed(0).padStart(8)} ${n.precond.toFixed(0).padStart(8)} ${String(c.pcgIterations).padStart(8)}`);
  }
}

/** Runs the whole demo; `out` is the output folder. */
export function runDemo(quick: boolean, out: string): void {
  console.log('chronomesh demo — space-time solver for parabolic problems');
  basisConstants(quick);
  rodCooling(quick, out);
  bracketHotSpot(quick, out);
  convergenceStudy(quick, out);
  adaptiveRod(quick, out);
  adaptiveBracket(quick, out);
  quenchInTwoRuns(quick, out);
  operatorCosts(quick);
  heading('Shipped problem files (examples/) through `chronomesh solve`');
  runShippedExamples(quick, join(out, 'examples'), (f) => written.push(f));
  heading(`Files written (${written.length})`);
  for (const f of written.filter((f) => !/-\d{4}\.vtu$/.test(f))) console.log(`  ${f}`);
  console.log(`  … and ${written.filter((f) => /-\d{4}\.vtu$/.test(f)).length} .vtu slice files listed in the .pvd collections`);
}
