/** `chronomesh solve PROBLEM.json [--json] [--out DIR] [--checkpoint FILE] [--resume FILE] [--quiet] [--debug]`. */
import { FLAT_ELEMENT_LIMIT, innerCycles, meshFlatness } from '../space/flat-elements';
import { HIGH_BIOT, HIGH_CONTRAST, diffusionContrast, stiffestTransfer } from '../space/coefficient-contrast';
import { EdgeKind } from '../space/boundary';
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { buildProblem, parseProblem, runProblem, type RunResult } from '../problem-file/index';
import { ChronomeshError, adaptiveStepBytes, memoryBudget, toleranceForecast } from '../index';
import { checkpointToFile, readFileBytes } from '../files/index';
import { resolutionAdvice } from '../adapt/forecast';
import { parseCommandArgs } from './args';
import { CliError } from './cli-error';
import { SOLVE_HELP } from './help';
import { checkWritable, writeOutputs } from './write-outputs';

/** Relative variation of κ or c inside an initial element above which `solve` warns (1 %). */
const COEFFICIENT_SPREAD_WARNING = 0.01;

/** Options of {@link solveFile} (the parsed command line). */
export interface SolveFileOptions {
  json?: boolean;
  out?: string;
  quiet?: boolean;
  /** Write a checkpoint of the adaptive run to this file after every step (atomically). */
  checkpoint?: string;
  /** Continue the adaptive run saved in this checkpoint file. */
  resume?: string;
  /** Caps on the file's budgets (the smaller value wins), e.g. for the demo's quick mode. */
  budget?: { maxDofs?: number; maxSeconds?: number };
  /** Where progress and human-readable output go (defaults: process streams). */
  log?: (line: string) => void;
  progress?: (line: string) => void;
}

/** Exit status of a run that finished but did not reach the tolerance its file asked for. */
export const TOLERANCE_NOT_REACHED = 3;

/**
 * Reads, validates, solves and reports one problem file. Input errors throw {@link CliError}.
 * `toleranceReached` is null when the file asks for no tolerance (0), else whether the last
 * estimator is within it (or at the rounding level, stop reason 'rounding'); a miss is also
 * reported on the progress stream, never only implied by the stop reason.
 */
export function solveFile(file: string, opts: SolveFileOptions = {}): { run: RunResult; written: string[]; toleranceReached: boolean | null } {
  const log = opts.log ?? ((l: string) => process.stdout.write(l + '\n'));
  const progress = opts.progress ?? ((l: string) => process.stderr.write(l + '\n'));
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    throw new CliError(`${file}: cannot read the problem file (${(e as { code?: string }).code ?? 'error'})`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new CliError(`${file}: invalid JSON: ${(e as Error).message.split('\n')[0]}`);
  }
  const inputError = (e: unknown): never => {
    if (e instanceof ChronomeshError) throw new CliError(`${file}: ${e.message}`);
    throw e;
  };
  let built;
  try {
    // A state file named in the problem is read relative to the problem file's folder.
    const spec = parseProblem(json, { readText: (path) => readFileSync(resolve(dirname(file), path), 'utf8') });
    if (opts.budget?.maxDofs !== undefined) spec.maxDofs = Math.min(spec.maxDofs, opts.budget.maxDofs);
    if (opts.budget?.maxSeconds !== undefined) spec.maxSeconds = Math.min(spec.maxSeconds, opts.budget.maxSeconds);
    built = buildProblem(spec);
  } catch (e) {
    return inputError(e);
  }
  for (const c of built.coefficientSpread) {
    if (c.relative < COEFFICIENT_SPREAD_WARNING) continue;
    const where = c.centroid.map((v) => Number(v.toPrecision(6))).join(', ');
    const edge = c.field.startsWith('boundary');
    progress(
      `warning: ${c.field} varies by up to ${(100 * c.relative).toPrecision(2)} % ${edge ? `along the initial boundary edge with midpoint (${where})` : `inside the initial element with centroid (${where})`}; ` +
        `it is taken constant per initial ${edge ? 'boundary edge (at its midpoint)' : 'element (at the centroid)'}, a change of the problem that refinement does not undo and the estimator does not see: ` +
        'give the initial mesh more cells where it varies',
    );
  }
  // With the first step, so that a file refused before any step prints nothing.
  let defaultEdgesNote = opts.quiet ? null : defaultEdges(built);
  if (built.domain.anisotropic) {
    // The inner V-cycles lose efficiency as the elements mapped by K^{-1/2} flatten; more cycles make
    // up for it until they reach 16 (docs/method.md §4.4).
    const r = built.domain.anisotropyRatio;
    const A = built.domain.mappedAnisotropy;
    const cycles = innerCycles(built.domain);
    const note = `diffusion tensor with eigenvalue ratio up to ${Number(r.toPrecision(3))}; mapped by K^(-1/2) the elements have anisotropy up to ` +
      `${Number(A.toPrecision(3))}, so the spatial inner solvers run ${cycles} V-cycle${cycles === 1 ? '' : 's'} per application`;
    progress(cycles >= 16 && A > 8 * 16
      ? `warning: ${note}, the most they run: PCG iterations grow beyond it; initial elements stretched along the strong direction by about √${Number(r.toPrecision(3))} help (docs/method.md §4.4)`
      : `${note} (docs/method.md §4.4)`);
  }
  const flat = meshFlatness(built.domain);
  if (flat !== null && flat.flatCount > 0 && flat.bulk <= FLAT_ELEMENT_LIMIT && built.spec.strategy === 'adaptive') {
    // A few flat elements in a mesh of fat ones are accepted (docs/adaptivity.md §2.6); say where they are.
    progress(`warning: ${flat.flatCount} initial element${flat.flatCount === 1 ? ' is' : 's are'} flat (mapped anisotropy up to ${Number(flat.anisotropy.toPrecision(3))}, ` +
      `${Number((100 * flat.flatShare).toPrecision(2))} % of the area; the flattest is element ${flat.element}): where the solution varies along them, the estimator ` +
      'can read below the error there; more vertices along their long sides help (docs/adaptivity.md §2.6)');
  }
  if (!built.domain.anisotropic && built.domain.mappedAnisotropy > 8) {
    // Flat isotropic elements slow the V-cycles as anisotropic K does (docs/adaptivity.md §2.6).
    const A = built.domain.mappedAnisotropy;
    const cycles = innerCycles(built.domain);
    const estimator = built.spec.strategy === 'adaptive' ? ', and the estimator reads further below the error the flatter they are' : '';
    progress(`flat initial elements (mapped anisotropy up to ${Number(A.toPrecision(3))}): the spatial inner solvers run ${cycles} V-cycles per application` +
      `${estimator}; more vertices along their long sides help (docs/adaptivity.md §2.6)`);
  }
  const contrast = diffusionContrast(built.domain);
  if (contrast !== null && contrast.ratio >= HIGH_CONTRAST) {
    // The block-diagonal preconditioner misprices hats that straddle such an interface (docs/method.md §6.2).
    const at = contrast.at.slice(0, built.domain.dim).map((v) => Number(v.toPrecision(6))).join(', ');
    progress(`warning: the diffusivity jumps by a factor ${Number(contrast.ratio.toPrecision(3))} across the interface at (${at}) (initial elements ${contrast.elements[0]} and ${contrast.elements[1]}); ` +
      'beyond a contrast of about 100 the preconditioner loses robustness there: PCG may need hundreds of iterations per step or stop unconverged with an error (docs/method.md §6.2)');
  }
  const stiff = stiffestTransfer(built.domain);
  if (stiff !== null && stiff.biot >= HIGH_BIOT) {
    const at = stiff.at.slice(0, built.domain.dim).map((v) => Number(v.toPrecision(6))).join(', ');
    progress(`warning: the convection edge at (${at}) has a Biot number hL/κ of ${Number(stiff.biot.toPrecision(3))} (h = ${Number(stiff.h.toPrecision(3))}): such a stiff surface ` +
      "slows the solver, and PCG may need hundreds of iterations per step; a surface meant to follow the ambient is better held at it (kind 'value'; docs/method.md §6.2)");
  }
  if (opts.out !== undefined) checkWritable(opts.out);
  if ((opts.checkpoint !== undefined || opts.resume !== undefined) && built.spec.strategy !== 'adaptive') {
    throw new CliError(`${file}: --checkpoint and --resume need the adaptive strategy, the file asks for '${built.spec.strategy}'`);
  }
  let resume: Uint8Array | undefined;
  if (opts.resume !== undefined) {
    try {
      resume = readFileBytes(opts.resume, '--resume');
    } catch (e) {
      throw new CliError((e as Error).message);
    }
  }
  let run: RunResult;
  try {
    run = runProblem(built, (s, i) => {
      if (defaultEdgesNote !== null) {
        progress(defaultEdgesNote);
        defaultEdgesNote = null;
      }
      const truth = typeof s.trueError === 'number' ? `, true error ${s.trueError.toExponential(3)}` : '';
      if (!opts.quiet) progress(`step ${i}: ${s.dofs} dofs, estimate ${s.estimate.toExponential(3)}${relativeText(s.relativeEstimate)}${truth}, ${s.iterations} PCG iterations${s.riseChecks > 0 ? ` (re-solved ${s.riseChecks === 1 ? 'once' : 'twice'} after E rose)` : ''}, ${s.seconds.toFixed(2)} s`);
    }, {
      ...(opts.checkpoint !== undefined ? { checkpoint: checkpointToFile(opts.checkpoint) } : {}),
      ...(resume !== undefined ? { resume } : {}),
    });
  } catch (e) {
    // A damaged or foreign checkpoint, or one of another problem, is an input error.
    if (e instanceof ChronomeshError && (e.code === 'corrupt-file' || (opts.resume !== undefined && e.field === 'problem'))) throw new CliError(`${opts.resume}: ${e.message}`);
    // The library names its own option (opts.domain); on the command line it is the file's domain.
    if (e instanceof ChronomeshError && opts.resume !== undefined && e.field === 'opts.domain') {
      throw new CliError(`${opts.resume}: the checkpoint was written for another problem: ${file}'s domain differs from the saved one (initial mesh, κ or diffusion tensor, c and boundary parts must be the same)`);
    }
    // Expression values met during the solve (NaN, ∞, κ ≤ 0) are input errors too.
    if (e instanceof ChronomeshError && e.code === 'invalid-argument') return inputError(e);
    throw e;
  }
  const written = opts.out !== undefined ? writeOutputs(opts.out, built.spec, run) : [];
  const last = run.steps[run.steps.length - 1]!;
  // The E asked for: tolerance + relativeTolerance × ‖u‖ (the run's target, from its last step).
  const asked = built.spec.tolerance > 0 || built.spec.relativeTolerance > 0;
  const tolerance = asked ? run.target : 0;
  const toleranceText = built.spec.relativeTolerance > 0
    ? `${built.spec.tolerance > 0 ? `${built.spec.tolerance} + ` : ''}${(100 * built.spec.relativeTolerance).toPrecision(2)} % of ‖u‖ (= ${tolerance.toExponential(3)})`
    : `${tolerance}`;
  // E at the rounding level counts as reached: nothing lowers it further, and the solution is exact
  // to working precision (the summary says so).
  const toleranceReached = asked ? last.estimate <= tolerance || run.stopReason === 'rounding' : null;
  // A run stopped by the deepest trustworthy temporal level cannot go on with more budget.
  const atDepth = run.stopReason === 'resolution';
  const forecast = toleranceReached === false && !atDepth ? toleranceForecast(run.steps.map((s) => ({ unknowns: s.dofs, estimate: s.estimate, seconds: s.seconds })), tolerance) : null;
  if (toleranceReached === false) {
    progress(
      `warning: tolerance ${toleranceText} not reached: the estimator is ${last.estimate.toExponential(3)} at ${last.dofs} unknowns, ` +
        `where the run stopped by ${run.stopReason}; ` +
        (atDepth
          ? resolutionAdvice('--out writes end-state.json; start the next file from it with "initial": {"state": FILE}')
          : 'raise maxDofs / maxSeconds / maxSteps or loosen the tolerance') +
        ` (exit status ${TOLERANCE_NOT_REACHED})`,
    );
    if (!atDepth) progress(forecast === null
      ? 'forecast: none — over the recent steps (since N was an eighth of its last value) the estimator has not fallen steadily, or N grew less than twofold'
      : `forecast: at the rate of the recent steps (${forecast.rate.toFixed(2)}, since N was an eighth of its last value), E would reach ${toleranceText} at about ` +
        `${roundedCount(forecast.unknowns)} unknowns, a whole run of roughly ${roundedDuration(forecast.seconds)} on this machine ` +
        (built.spec.strategy === 'adaptive'
          ? '(an extrapolation: rates on rough data usually still rise, so early in a run this over-estimates)'
          : `(an extrapolation: ${built.spec.strategy} grids keep a low rate on rough data; the adaptive strategy usually needs far fewer unknowns)`) +
        // #Λ̲ ≥ #Λ, so this is a lower bound of the step's memory (src/adapt/step-memory.ts)
        (adaptiveStepBytes(forecast.unknowns, forecast.unknowns, built.problem.domain.dim) > memoryBudget() ? '; that many unknowns exceed this machine\'s memory budget' : ''));
  }
  const check = run.exactErrors?.splitCheck;
  if (check && !check.agrees) {
    progress(
      `warning: the true error depends on the quadrature: ${run.exactErrors!.energyL2.toExponential(3)} in the energy norm with the standard rule, ` +
        `${check.energyL2.toExponential(3)} with every element split ${check.elementSplits} × ${check.elementSplits}: the exact solution is not smooth inside elements ` +
        '(a kink or jump, e.g. along a curve source off the mesh lines); the split figure is nearer the truth, and the per-step ratios to E are unreliable (spaceTimeErrors option elementSplits)',
    );
  }
  const held = run.heldDataError;
  if (held > 0 && held >= 0.5 * last.estimate) {
    progress(
      `warning: the held boundary values are interpolated linearly between initial-mesh vertices, which leaves an error of about ${held.toExponential(2)} ` +
        `in the energy norm that refinement does not reduce and the estimator (${last.estimate.toExponential(3)}) does not include; ` +
        'give the initial mesh more cells along the held parts where their values are not affine',
    );
  }
  if (opts.json) {
    log(JSON.stringify({ steps: run.steps, probes: run.probes, rate: run.rate, stopReason: run.stopReason, tolerance, toleranceReached, forecast, heldDataError: held, exactErrors: run.exactErrors, sensors: run.sensors }));
  } else {
    log(`${built.spec.title ?? file}: ${run.steps.length} steps (${built.spec.strategy}), stopped by ${run.stopReason}`);
    log(`last step: ${last.dofs} unknowns, estimator ${last.estimate.toExponential(3)}${relativeText(last.relativeEstimate)}; observed rate ${rateText(run.rate, 'E')}`);
    if (run.stopReason === 'rounding') {
      log(`the estimator is at the rounding level of double precision (E ≤ 1e-10 × ‖u‖): the discrete solution solves the problem to working precision, as when the exact solution lies in the discrete space; refining further would only resolve rounding errors`);
    }
    if (held > 0) log(`held-value data error (not in the estimator, not reduced by refinement): about ${held.toExponential(2)}`);
    const ex = run.exactErrors;
    if (ex) {
      const sameNorm = Math.abs(ex.energyL2 - ex.gradientL2) <= 1e-12 * ex.gradientL2; // κ = 1, c = 0
      log(`true error against the file's exact solution: ${ex.energyL2.toExponential(3)} in the energy norm (∫∫ κ|∇e|² + c e² + ∫∫ h e² on convection parts)^1/2, the norm of the estimator` +
        `${sameNorm ? ' (here the L2(0,T;H1) norm)' : `; ${ex.gradientL2.toExponential(3)} in L2(0,T;H1)`}, ${ex.valueL2.toExponential(3)} in L2(0,T;L2); ` +
        (run.stopReason === 'rounding'
          ? 'both at the rounding level, where their ratio means nothing; '
          : `${ex.ratioToEstimate.toFixed(2)} × the estimator (${ex.ratioRange[0].toFixed(2)}–${ex.ratioRange[1].toFixed(2)} over the steps); `) +
        `observed rate of the true error ${rateText(ex.rate, 'the true error')}`);
    }
    for (const p of run.probes) log(`u(t = ${p.t}, x = ${p.x}${p.y === null ? '' : `, y = ${p.y}`}) = ${p.value.toPrecision(6)}${probeChange(p)}`);
    if (run.sensors !== null) {
      const { times, points, values } = run.sensors;
      log(`sensor histories: ${points.length} sensor${points.length === 1 ? '' : 's'} at ${times.length} times (sensors.csv with --out); at t = ${times[times.length - 1]}: ` +
        points.map((p, i) => `u(${p.join(', ')}) = ${values[times.length - 1]![i]!.toPrecision(6)}`).join(', '));
    }
    if (written.length > 0) {
      log(`wrote ${written.length} files into ${opts.out}`);
      const state = written.find((w) => w.endsWith('end-state.json'));
      // an absolute path works from any problem file (a relative one is read against the file's folder)
      if (state) log(`to continue from the end state: "start": ${built.spec.horizon}, "initial": {"state": ${JSON.stringify(resolve(state))}}`);
    }
  }
  return { run, written, toleranceReached };
}

/** The `solve` subcommand; returns the exit status. */
export function solveCommand(argv: string[]): number {
  const { values, positionals } = parseCommandArgs('solve', argv, {
    json: { type: 'boolean' }, out: { type: 'string' }, quiet: { type: 'boolean' }, debug: { type: 'boolean' }, help: { type: 'boolean', short: 'h' },
    checkpoint: { type: 'string' }, resume: { type: 'string' },
  });
  if (values.help) {
    console.log(SOLVE_HELP);
    return 0;
  }
  if (positionals.length !== 1) throw new CliError(`solve: expected one problem file, found ${positionals.length} (see \`chronomesh solve --help\`)`);
  const { toleranceReached } = solveFile(positionals[0]!, {
    json: values.json === true,
    quiet: values.quiet === true,
    ...(typeof values.out === 'string' ? { out: values.out } : {}),
    ...(typeof values.checkpoint === 'string' ? { checkpoint: values.checkpoint } : {}),
    ...(typeof values.resume === 'string' ? { resume: values.resume } : {}),
  });
  return toleranceReached === false ? TOLERANCE_NOT_REACHED : 0;
}

/** A count to two significant digits: 18000, 1.3e8. */
function roundedCount(n: number): string {
  return n < 1e5 ? String(Number(n.toPrecision(2))) : n.toExponential(1).replace('e+', 'e');
}

/** Seconds to two significant digits in the largest fitting unit: 44 s, 7.3 min, 42 h, 3.1e3 days. */
/**
 * How much a probe moved in the last step: E bounds a global norm, not point values, so the change
 * under the last refinement is the practical check of a probe's accuracy (an indication, not a bound).
 */
function probeChange(p: { value: number; previous: number | null }): string {
  if (p.previous === null) return '';
  const d = Math.abs(p.value - p.previous);
  const rel = Math.abs(p.value) > 0 ? ` (${(100 * d / Math.abs(p.value)).toPrecision(2)} %)` : '';
  return `; changed by ${d.toExponential(1)}${rel} in the last step`;
}

function roundedDuration(s: number): string {
  if (s < 60) return `${Number(s.toPrecision(2))} s`;
  if (s < 3600) return `${Number((s / 60).toPrecision(2))} min`;
  if (s < 86400 * 2) return `${Number((s / 3600).toPrecision(2))} h`;
  return `${roundedCount(s / 86400)} days`;
}

/**
 * An observed rate for the summary; none when the run's second half did not grow N twofold
 * (src/adapt/forecast.ts), and a negative one said to be a rise of `what`, not a rate. @internal
 */
export function rateText(rate: number | null, what: string): string {
  if (rate === null) return 'n/a (N grew less than twofold over the second half of the steps)';
  return rate < 0 ? `${rate.toFixed(2)} (${what} rose over the second half of the steps)` : rate.toFixed(2);
}

/** " (9.2 % of ‖u‖)": E relative to the solution's norm (RunStep.relativeEstimate), or nothing. */
function relativeText(rel: number | null): string {
  if (rel === null) return '';
  return rel >= 1e-4 ? ` (${(100 * rel).toPrecision(2)} % of ‖u‖)` : ` (${rel.toExponential(1)} × ‖u‖)`;
}

/**
 * Edges no part selects hold u = 0 by default. A file that sets up `insulated` or boundary parts
 * and leaves some edges out may not mean that: a note with how many, and where one of them lies.
 */
function defaultEdges(built: ReturnType<typeof buildProblem>): string | null {
  if (built.spec.boundary.length === 0 && built.spec.insulated === null) return null;
  const tables = built.domain.forest.boundary;
  const dim = built.domain.dim;
  const c = built.domain.forest.vCoord;
  let count = 0;
  let first = -1;
  for (let b = 0; b < tables.edgeCount; b++) {
    if (tables.edgeKind[b] !== EdgeKind.ZeroValue) continue;
    if (first < 0) first = b;
    count++;
  }
  if (count === 0) return null;
  const i = tables.edgeVertices[2 * first]!, j = tables.edgeVertices[2 * first + 1]!;
  const r = (v: number): number => Number(v.toPrecision(6));
  const at = dim === 1 ? `the end point x = ${r(c[i]!)}` : `the edge with midpoint (${r(0.5 * (c[2 * i]! + c[2 * j]!))}, ${r(0.5 * (c[2 * i + 1]! + c[2 * j + 1]!))})`;
  return `note: ${count} of ${tables.edgeCount} initial boundary ${dim === 1 ? 'end points' : 'edges'} have no part and hold u = 0 (the default), e.g. ${at}; ` +
    'select them with "insulated" or a boundary part if they should be otherwise';
}
