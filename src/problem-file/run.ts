/**
 * Runs a built problem with the strategy of its file (adaptive, or a sequence of sparse or full
 * grids of growing level) within its budgets, and collects what the command line reports: one
 * record per step, the probe values and the observed convergence rate of the estimator.
 */
import {
  DoubleTree, InvalidArgumentError, SpaceTimeSystem, convergenceRate, enlargeDoubleTree, residualIndicators, solveAdaptive, spaceTimeErrors,
  type AdaptiveOptions, type AdaptiveStep, type SpaceTimeErrors, type SpaceTimeSolution,
} from './core';
import type { BuiltProblem } from './build';
import { knownSolution } from './exact-solution';
import { systemNorm } from '../system/system-norm';

/** One step of a run, as reported by `chronomesh solve --json`. */
export interface RunStep {
  /** Number of trial unknowns #Λ. */
  dofs: number;
  /** Residual estimator E of the step's solution. */
  estimate: number;
  /**
   * E relative to the size of the step's solution in the norm E measures (E / ‖u_δ‖_S,
   * `AdaptiveStep.solutionNorm`); null where that size is 0 or was not recorded (steps restored
   * from an older checkpoint).
   */
  relativeEstimate: number | null;
  /** PCG iterations of the step. */
  iterations: number;
  /**
   * Tighter re-solves because E came out above the previous step's (adaptive runs; 0 otherwise).
   * A step reported above its predecessor with riseChecks > 0 rose genuinely, not by the solve.
   */
  riseChecks: number;
  /** Wall time of the step in seconds (without the true error below). */
  seconds: number;
  /**
   * With a known solution in the file (`exact`): the step's true error in the energy norm
   * (∫∫ κ|∇e|² + c e² + ∫∫_Γ h e²)^{1/2}, the norm E measures (= L2(0, T; H¹₀) for κ = 1, c = 0
   * and no convection; see
   * {@link ExactErrors.energyL2}); null for steps restored from a checkpoint, whose solutions are
   * gone. Absent otherwise.
   */
  trueError?: number | null;
}

/** A probe value u(t, x[, y]). */
export interface ProbeValue {
  t: number;
  x: number;
  /** null in 1D. */
  y: number | null;
  value: number;
  /**
   * The value at the same point from the step before the last (null after a single step). E bounds
   * a global norm, not point values; how much a probe still moved in the last refinement is the
   * practical check of its accuracy (common practice in solution verification). Its change is an
   * indication, not a bound.
   */
  previous: number | null;
}

/** Result of {@link runProblem}. */
export interface RunResult {
  steps: RunStep[];
  probes: ProbeValue[];
  /**
   * The file's sensor histories, `values[k][i]` = u(times[k], points[i]) (absolute times), read
   * with `SpaceTimeSolution.sampleAtPoints`; null when the file has no `sensors`.
   */
  sensors: { times: number[]; points: number[][]; values: number[][] } | null;
  /** Least-squares slope of −log E against log N over the second half of the steps (null with < 2 points). */
  rate: number | null;
  solution: SpaceTimeSolution;
  set: DoubleTree;
  /** Why the run stopped. */
  stopReason: string;
  /**
   * The E a run had to reach: the file's tolerance + relativeTolerance × the last step's solution
   * norm (0 when the file asks for neither).
   */
  target: number;
  /** True errors of the last solution against the file's known solution (`exact`); null without one. */
  exactErrors: ExactErrors | null;
  /**
   * The estimated error of held values interpolated linearly along the initial boundary edges, which
   * the estimator does not include and refinement does not reduce (`HeatProblem.heldDataError`; 0
   * when they are affine there).
   */
  heldDataError: number;
}

/**
 * True errors of a run's last solution against the problem file's known solution.
 *
 * @example
 * ```ts
 * import { buildProblem, parseProblem, runProblem, type ExactErrors } from 'chronomesh/problem-file';
 * const spec = parseProblem({ domain: { shape: 'interval', from: 0, to: 1 }, horizon: 0.5, initial: 'sin(pi*x)', exact: 'exp(-pi^2*t)*sin(pi*x)', maxDofs: 300 });
 * const e: ExactErrors | null = runProblem(buildProblem(spec)).exactErrors;
 * console.log(e !== null && e.gradientL2 > 0 && e.ratioRange[0] > 0.5 && e.ratioRange[1] < 2); // → true
 * ```
 */
export interface ExactErrors {
  /**
   * (∫₀ᵀ a(u − u_δ, u − u_δ) dt)^{1/2} with a(v, v) = ∫ κ|∇v|² + c v² (K∇v·∇v for a diffusion
   * tensor): the error in the norm the estimator measures, which the ratios and the rate use
   * (docs/error-norms.md §9). Equal to gradientL2 for κ = 1, c = 0.
   */
  energyL2: number;
  /** (∫₀ᵀ ‖∇(u − u_δ)‖² dt)^{1/2}, the error in L2(0, T; H¹₀) (docs/error-norms.md). */
  gradientL2: number;
  /** (∫₀ᵀ ‖u − u_δ‖² dt)^{1/2}. */
  valueL2: number;
  /** energyL2 / E of the last step: how far the estimator was from the true error. */
  ratioToEstimate: number;
  /** Smallest and largest true error / E over the steps (the estimator's band on this problem). */
  ratioRange: [number, number];
  /** Least-squares slope of −log(true error) against log N over the second half of the steps, as `rate` for E. */
  rate: number | null;
  /**
   * The last solution's errors again with every element split into 3 per edge for the spatial
   * rule (`elementSplits`): a check of the quadrature. `agrees` is false when the two energy
   * errors differ by more than 5 %: the exact solution is then not smooth inside elements (a kink
   * or jump, e.g. along a curve source off the mesh lines), the figures above and the per-step
   * ratios come from a rule that does not resolve it, and the split figures are nearer the truth.
   */
  splitCheck: { elementSplits: number; energyL2: number; gradientL2: number; valueL2: number; agrees: boolean };
}

/**
 * Least-squares slope of −log E against log N over the second half of the steps (the later,
 * asymptotic part); null when that half has fewer than two distinct N. The core's
 * `convergenceRate` for the steps of a problem-file run.
 *
 * @example
 * ```ts
 * import { observedRate } from 'chronomesh/problem-file';
 * console.log(observedRate([{ dofs: 100, estimate: 1 }, { dofs: 400, estimate: 0.5 }, { dofs: 1600, estimate: 0.25 }])); // → 0.5
 * ```
 */
export function observedRate(steps: { dofs: number; estimate: number }[]): number | null {
  return convergenceRate(steps.map((s) => ({ unknowns: s.dofs, estimate: s.estimate })));
}

/** Checkpoint and resume of the adaptive strategy (see `AdaptiveOptions.checkpoint` / `resume`). */
export type RunAdaptiveOptions = Pick<AdaptiveOptions, 'checkpoint' | 'resume'>;

/**
 * `problem.heldDataError().estimate`, with a refused jump of a held value reported at the file's
 * time: the core check reports the solver's time, which runs from 0 at the file's `start`.
 */
function heldDataOnFileClock({ spec, problem }: BuiltProblem): number {
  try {
    return problem.heldDataError().estimate;
  } catch (e) {
    if (spec.start > 0 && e instanceof InvalidArgumentError && /^boundary\[\d+\]\.value$/.test(e.field ?? '')) {
      const message = e.message.replace(/ at t ≈ ([-+0-9.e]+)/, (_, t: string) => ` at t ≈ ${Number((Number(t) + spec.start).toPrecision(6))}`);
      if (message !== e.message) throw new InvalidArgumentError(message, { field: e.field!, expected: e.expected, received: e.received });
    }
    throw e;
  }
}

/**
 * Solves a built problem with its file's strategy and budgets; with the adaptive strategy,
 * `adaptive` can save a checkpoint after every step and resume from one.
 *
 * @example
 * ```ts
 * import { buildProblem, parseProblem, runProblem } from 'chronomesh/problem-file';
 * const spec = parseProblem({ domain: { shape: 'interval', from: 0, to: 1 }, horizon: 1, initial: '1', maxDofs: 300, probes: [[0.1, 0.5]] });
 * const run = runProblem(buildProblem(spec));
 * console.log(run.steps.length, run.probes[0]?.value);
 * ```
 */
export function runProblem(built: BuiltProblem, onStep?: (step: RunStep, index: number) => void, adaptive: RunAdaptiveOptions = {}): RunResult {
  const { spec, domain, problem } = built;
  // Before any work: the held values' data error, and a tolerance below it refused (field 'tolerance').
  const heldDataError = heldDataOnFileClock(built);
  problem.checkTolerance(spec.tolerance, 'tolerance');
  const steps: RunStep[] = [];
  let solution: SpaceTimeSolution;
  let set: DoubleTree;
  let stopReason: string;
  let lastNorm: number | null = null; // ‖u_δ‖_S of the last step (null: not recorded)
  // With a known solution, every step's solution is measured against it as it comes (the
  // solutions of earlier steps are not kept).
  const known = spec.exact ? knownSolution(spec.exact) : null;
  // The last measured solution and its errors, so the final report does not measure it again.
  const last: { solution: SpaceTimeSolution | null; errors: SpaceTimeErrors | null } = { solution: null, errors: null };
  const trueError = (s: SpaceTimeSolution): number => {
    last.solution = s;
    last.errors = spaceTimeErrors(s, known!);
    return last.errors.energyL2;
  };
  const measured = new Map<number, number>(); // adaptive step number → true error
  // Probe values of the last two steps' solutions (ProbeValue.previous); probes are in absolute time.
  const readProbes = (s: SpaceTimeSolution): number[] => spec.probes.map((p) => s.evaluate(p[0]! - spec.start, p.slice(1))[0]!);
  let probesBefore: number[] | null = null;
  let probesLast: number[] | null = null;
  const recordProbes = (s: SpaceTimeSolution): void => {
    if (spec.probes.length === 0) return;
    probesBefore = probesLast;
    probesLast = readProbes(s);
  };
  const toStep = (h: AdaptiveStep): RunStep => ({
    dofs: h.unknowns, estimate: h.estimate, relativeEstimate: relativeTo(h.estimate, h.solutionNorm), iterations: h.pcgIterations, riseChecks: h.riseChecks, seconds: h.seconds,
    ...(known ? { trueError: measured.get(h.step) ?? null } : {}),
  });
  if (spec.strategy !== 'adaptive' && (adaptive.checkpoint !== undefined || adaptive.resume !== undefined)) {
    throw new InvalidArgumentError(`checkpoints need the adaptive strategy; this problem's strategy is '${spec.strategy}'`, { field: 'strategy', expected: "'adaptive'", received: spec.strategy });
  }
  if (spec.strategy === 'adaptive') {
    const r = solveAdaptive(problem, {
      ...(spec.bulk === null ? {} : { theta: spec.bulk }), tolerance: spec.tolerance, relativeTolerance: spec.relativeTolerance, maxUnknowns: spec.maxDofs, maxSteps: spec.maxSteps, maxSeconds: spec.maxSeconds, acceptFlatElements: spec.acceptFlatElements,
      ...(adaptive.checkpoint ? { checkpoint: adaptive.checkpoint } : {}),
      ...(adaptive.resume ? { resume: adaptive.resume } : {}),
      onStep: (h, solution) => {
        if (known) measured.set(h.step, trueError(solution));
        recordProbes(solution);
        onStep?.(toStep(h), h.step);
      },
    });
    // with resume the history starts with the saved steps
    steps.push(...r.history.map(toStep));
    lastNorm = r.history[r.history.length - 1]!.solutionNorm;
    ({ solution, set } = r);
    stopReason = r.stopReason;
  } else {
    const start = performance.now();
    let last: { solution: SpaceTimeSolution; set: DoubleTree } | null = null;
    stopReason = 'steps';
    for (let L = 1; L <= 60 && steps.length < spec.maxSteps; L++) {
      let next: DoubleTree;
      try {
        next = spec.strategy === 'sparse' ? DoubleTree.sparseGrid(domain, L, undefined, 4 * spec.maxDofs) : DoubleTree.fullGrid(domain, L, L, undefined, 4 * spec.maxDofs);
      } catch (e) {
        if (!(e instanceof InvalidArgumentError)) throw e;
        next = null as unknown as DoubleTree;
      }
      if (!next || next.size > spec.maxDofs) {
        if (!last) {
          throw new InvalidArgumentError(`maxDofs: ${spec.maxDofs} is smaller than the ${spec.strategy} grid of level 1${next ? ` (${next.size} unknowns)` : ''}`, { field: 'maxDofs' });
        }
        stopReason = 'unknowns';
        break;
      }
      const t0 = performance.now();
      const system = new SpaceTimeSystem(problem, next);
      const solved = system.solve({ relTol: 1e-8, maxIterations: 500 });
      const estimate = residualIndicators(new SpaceTimeSystem(problem, enlargeDoubleTree(domain, next)), next, solved.pcg.solution).estimate;
      const norm = systemNorm(solved.pcg.solution, system.rightHandSide());
      lastNorm = norm;
      const s: RunStep = { dofs: next.size, estimate, relativeEstimate: relativeTo(estimate, norm), iterations: solved.pcg.iterations, riseChecks: 0, seconds: (performance.now() - t0) / 1000 };
      if (known) s.trueError = trueError(solved.solution);
      recordProbes(solved.solution);
      steps.push(s);
      onStep?.(s, steps.length - 1);
      last = { solution: solved.solution, set: next };
      if (estimate <= spec.tolerance + spec.relativeTolerance * norm) { stopReason = 'tolerance'; break; }
      if ((performance.now() - start) / 1000 >= spec.maxSeconds) { stopReason = 'time'; break; }
    }
    ({ solution, set } = last!);
  }
  // The last step's values are the final solution's; a resumed run without a new step has none.
  const before = probesBefore as number[] | null; // assigned in the step callbacks
  const values = (probesLast as number[] | null) ?? readProbes(solution);
  const probes = spec.probes.map((p, i) => {
    const pt = p.slice(1);
    return { t: p[0]!, x: pt[0]!, y: pt.length > 1 ? pt[1]! : null, value: values[i]!, previous: before === null ? null : before[i]! };
  });
  let sensors: RunResult['sensors'] = null;
  if (spec.sensors !== null) {
    const { points, times } = spec.sensors;
    const h = solution.sampleAtPoints(times.map((t) => t - spec.start), points.flat()); // absolute → the solver's clock
    sensors = { times, points, values: times.map((_, k) => points.map((__, i) => h.get(k, i))) };
  }
  let exactErrors: ExactErrors | null = null;
  if (known) {
    const e = last.errors !== null && last.solution === solution ? last.errors : spaceTimeErrors(solution, known);
    const ratioToEstimate = e.energyL2 / steps[steps.length - 1]!.estimate;
    const withError = steps.filter((s) => typeof s.trueError === 'number' && s.estimate > 0);
    // A run resumed from a checkpoint without a new step has no measured step: the last ratio alone.
    const ratios = withError.length > 0 ? withError.map((s) => s.trueError! / s.estimate) : [ratioToEstimate];
    const split = spaceTimeErrors(solution, known, { elementSplits: SPLIT_CHECK });
    exactErrors = {
      splitCheck: { elementSplits: SPLIT_CHECK, energyL2: split.energyL2, gradientL2: split.gradientL2, valueL2: split.valueL2, agrees: Math.abs(split.energyL2 - e.energyL2) <= 0.05 * Math.max(split.energyL2, e.energyL2) },
      energyL2: e.energyL2, gradientL2: e.gradientL2, valueL2: e.valueL2, ratioToEstimate,
      ratioRange: [Math.min(...ratios), Math.max(...ratios)],
      rate: observedRate(withError.map((s) => ({ dofs: s.dofs, estimate: s.trueError! }))),
    };
  }
  const target = spec.tolerance + spec.relativeTolerance * (lastNorm ?? 0);
  return { steps, probes, sensors, rate: observedRate(steps), solution, set, stopReason, target, exactErrors, heldDataError };
}

/**
 * Pieces per element edge of the quadrature check of the final true error (ExactErrors.splitCheck):
 * odd, so that a kink on a dyadic line is not met by sub-element edges by chance.
 */
const SPLIT_CHECK = 3;

/** E / ‖u_δ‖_S, or null where the norm is 0 or unknown. */
function relativeTo(estimate: number, norm: number | null): number | null {
  return norm !== null && norm > 0 ? estimate / norm : null;
}
