/** Shared small problems for the estimation tests: d = 1 and 2, sparse and adaptive index sets. */
import {
  DoubleTree, HeatProblem, SpaceTimeSystem, combineFunctionals, controlAmplitude, initialState, intervalDomain,
  probeMisfit, rectangleDomain, regionTracking, solveAdaptive, sourceAmplitudes, terminalTracking,
  type LeastSquaresFunctional, type ParameterMap, type SpatialDomain,
} from '../../src/index';

export type Dim = 1 | 2;
export type SetKind = 'sparse' | 'adaptive';

export function domainFor(d: Dim): SpatialDomain {
  return d === 1 ? intervalDomain(0, 1, 2) : rectangleDomain(0, 1, 0, 1, 2, 2);
}

const bump = (cx: number, cy: number) => (x: number, y: number) => Math.exp(-20 * ((x - cx) ** 2 + (y - cy) ** 2));

/** A system on a sparse grid or on the set an adaptive run for u0 ≡ 1 ended with. */
export function systemFor(d: Dim, kind: SetKind): SpaceTimeSystem {
  const domain = domainFor(d);
  const T = 0.5;
  let set: DoubleTree;
  if (kind === 'sparse') set = DoubleTree.sparseGrid(domain, d === 1 ? 5 : 3);
  else set = solveAdaptive(new HeatProblem({ domain, T, initial: () => 1 }), { maxUnknowns: 300, maxSteps: 40 }).set;
  // The system's own data (b₀): a known source, so the state does not vanish at m = 0.
  return new SpaceTimeSystem(new HeatProblem({ domain, T, source: [{ time: () => 1, space: bump(0.5, 0.5) }] }), set);
}

export type ParamKind = 'source' | 'control-constant' | 'control-linear' | 'initial';
export const PARAM_KINDS: ParamKind[] = ['source', 'control-constant', 'control-linear', 'initial'];

export function paramsFor(system: SpaceTimeSystem, kind: ParamKind): ParameterMap {
  const T = system.problem.T;
  switch (kind) {
    case 'source':
      return sourceAmplitudes(system, [
        { time: () => 1, space: bump(0.3, 0.4) },
        { time: (t) => Math.sin(6 * t), space: bump(0.7, 0.6) },
      ]);
    case 'control-constant':
      return controlAmplitude(system, { grid: [0, 0.3 * T, 0.55 * T, T], kind: 'piecewise-constant', space: bump(0.4, 0.5) });
    case 'control-linear':
      return controlAmplitude(system, { grid: [0, 0.3 * T, 0.55 * T, T], kind: 'piecewise-linear', space: bump(0.4, 0.5) });
    case 'initial':
      return initialState(system, 1);
  }
}

export type FunctionalKind = 'probe' | 'terminal' | 'region' | 'sum';
export const FUNCTIONAL_KINDS: FunctionalKind[] = ['probe', 'terminal', 'region', 'sum'];

export function functionalFor(system: SpaceTimeSystem, kind: FunctionalKind): LeastSquaresFunctional {
  const d = system.problem.domain.dim;
  const T = system.problem.T;
  const pts = d === 1 ? [[0.3], [0.62]] : [[0.3, 0.4], [0.62, 0.55], [0.5, 0.2]];
  const probe = () => probeMisfit(system, {
    times: [0.1 * T, 0.37 * T, T],
    points: pts,
    data: [0, 1, 2].map((i) => pts.map((_, k) => 0.05 * (i + 1) + 0.01 * k)),
    weights: 3,
  });
  const terminal = () => terminalTracking(system, (x, y) => 0.2 * Math.sin(Math.PI * x) * (d === 2 ? Math.sin(Math.PI * y) : 1));
  const region = () => regionTracking(system, { from: 0.25 * T, to: 0.9 * T, inside: (x) => x > 0.4, target: (t, x) => 0.1 * t * x });
  switch (kind) {
    case 'probe': return probe();
    case 'terminal': return terminal();
    case 'region': return region();
    case 'sum': return combineFunctionals([[0.5, probe()], [2, terminal()], [1, region()]]);
  }
}

/** Least-squares slope of log y against log x. */
export function logSlope(xs: number[], ys: number[]): number {
  const lx = xs.map(Math.log), ly = ys.map(Math.log);
  const mx = lx.reduce((a, b) => a + b) / lx.length, my = ly.reduce((a, b) => a + b) / ly.length;
  let num = 0, den = 0;
  for (let i = 0; i < lx.length; i++) {
    num += (lx[i]! - mx) * (ly[i]! - my);
    den += (lx[i]! - mx) ** 2;
  }
  return num / den;
}
