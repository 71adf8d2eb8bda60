/**
 * Checkpoints of adaptive runs (docs/solution-files.md §4): after each completed step the run can
 * be written as a solution file (content `adaptive-checkpoint`) holding the step's solution (Λ_k,
 * u_k), the refined set Λ_{k+1} the next step would solve on, the step history and the problem's
 * fingerprint. Resuming rebuilds the forest by replaying its bisections (so vertex ids are those
 * of the interrupted run), prolongs u_k to Λ_{k+1} exactly as the run would have, and continues
 * with step k + 1: the resumed run computes what the uninterrupted one would have.
 */
import { CorruptFileError, InvalidArgumentError } from '../errors';
import type { DoubleTree } from '../spacetime/double-tree';
import type { SpaceTimeSolution } from '../spacetime/space-time-solution';
import type { HeatProblem } from '../system/heat-problem';
import { problemFingerprint } from '../system/problem-fingerprint';
import { encodeSolutionFile, readSet, readSolutionFile } from '../output/solution-file';
import type { AdaptiveResult, AdaptiveStep } from './adaptive-options';

/** Passed with each checkpoint to {@link AdaptiveOptions.checkpoint}. */
export interface AdaptiveCheckpointInfo {
  /** The completed step the checkpoint holds (0-based). */
  step: number;
  /** #Λ of that step. */
  unknowns: number;
  /** Its estimator E. */
  estimate: number;
  /** Size of the checkpoint, bytes. */
  bytes: number;
}

/** @internal State of a run after a completed step. */
export interface CheckpointState {
  solution: SpaceTimeSolution;
  /** The set of the next step (null when the run cannot continue, e.g. E = 0). */
  next: DoubleTree | null;
  history: AdaptiveStep[];
  /** Stop reason of the run at that step, null while it continues. */
  stopReason: AdaptiveResult['stopReason'] | null;
}

/** @internal */
export function encodeCheckpoint(problem: HeatProblem, s: CheckpointState): Uint8Array {
  return encodeSolutionFile(s.solution, 'adaptive-checkpoint', { problem }, {
    header: { adaptive: { step: s.history.length - 1, history: s.history, stopReason: s.stopReason, hasNext: s.next !== null } },
    sets: s.next ? { next: s.next } : {},
    // The whole forest, not only the vertices the sets use: the resumed run then numbers every vertex
    // it creates as the uninterrupted run did (ids order fibres and break ties in the marking).
    wholeForest: true,
  });
}

const STEP_NUMBERS: (keyof AdaptiveStep)[] = ['step', 'unknowns', 'estimate', 'pcgIterations', 'algebraicError', 'maxTimeLevel', 'maxSpaceGeneration', 'spatialVertices', 'enlargedUnknowns', 'marked', 'seconds'];
const STOP_REASONS: AdaptiveResult['stopReason'][] = ['tolerance', 'unknowns', 'steps', 'time', 'callback', 'aborted', 'memory', 'resolution', 'rounding'];

function bad(field: string, what: string): CorruptFileError {
  return new CorruptFileError(`the checkpoint's ${field} is malformed: ${what}`, 'malformed', { field, expected: what });
}

/** @internal Reads a checkpoint for resuming `problem` (its domain receives the replayed bisections). */
export function decodeCheckpoint(bytes: Uint8Array, problem: HeatProblem, field: string): CheckpointState {
  const r = readSolutionFile(bytes, { domain: problem.domain });
  const h = r.header;
  if (h.content !== 'adaptive-checkpoint') {
    throw new InvalidArgumentError(`${field} holds a saved solution, not an adaptive checkpoint (write one with the 'checkpoint' option)`, { field, expected: 'an adaptive checkpoint', received: String(h.content) });
  }
  const fp = problemFingerprint(problem);
  if (h.problemFingerprint !== fp) {
    throw new InvalidArgumentError(
      `${field} was written for another problem (fingerprint ${String(h.problemFingerprint)}, this problem's is ${fp}): T, the domain or the data u0, f, boundary values differ`,
      { field: 'problem', expected: `fingerprint ${String(h.problemFingerprint)}`, received: fp },
    );
  }
  if (r.solution.T !== problem.T) throw bad('T', `T = ${problem.T}`);
  const a = h.adaptive as { step?: unknown; history?: unknown; stopReason?: unknown; hasNext?: unknown } | undefined;
  if (!a || typeof a !== 'object') throw bad('adaptive', 'an object with the run state');
  if (!Array.isArray(a.history) || a.history.length < 1) throw bad('adaptive.history', 'a non-empty array of steps');
  const history = a.history.map((raw: unknown, i: number) => {
    const s = raw as Record<string, unknown>;
    if (!s || typeof s !== 'object') throw bad(`adaptive.history[${i}]`, 'an object');
    for (const k of STEP_NUMBERS) if (typeof s[k] !== 'number' || !Number.isFinite(s[k] as number)) throw bad(`adaptive.history[${i}].${k}`, 'a finite number');
    const t = s.timings as Record<string, unknown> | undefined;
    if (!t || typeof t !== 'object' || !['setup', 'solve', 'estimate', 'refine'].every((k) => typeof t[k] === 'number')) throw bad(`adaptive.history[${i}].timings`, 'setup, solve, estimate, refine seconds');
    // Checkpoints written before the field existed have no rise checks recorded.
    if (s.riseChecks === undefined) s.riseChecks = 0;
    else if (typeof s.riseChecks !== 'number' || !Number.isInteger(s.riseChecks) || s.riseChecks < 0) throw bad(`adaptive.history[${i}].riseChecks`, 'a count ≥ 0');
    // Nor the solution's norm (null: not known for those steps).
    if (s.solutionNorm === undefined) s.solutionNorm = null;
    else if (s.solutionNorm !== null && (typeof s.solutionNorm !== 'number' || !Number.isFinite(s.solutionNorm) || s.solutionNorm < 0)) throw bad(`adaptive.history[${i}].solutionNorm`, 'null or a finite number ≥ 0');
    if (s.step !== i) throw bad(`adaptive.history[${i}].step`, `step number ${i}`);
    return s as unknown as AdaptiveStep;
  });
  if (a.step !== history.length - 1) throw bad('adaptive.step', `the last step of the history (${history.length - 1})`);
  if (history[history.length - 1]!.unknowns !== r.solution.trialSet.size) throw bad('adaptive.history', 'the last step’s unknowns equal to the stored set’s size');
  if (a.stopReason !== null && !STOP_REASONS.includes(a.stopReason as AdaptiveResult['stopReason'])) throw bad('adaptive.stopReason', `null or one of ${STOP_REASONS.join(', ')}`);
  if (typeof a.hasNext !== 'boolean') throw bad('adaptive.hasNext', 'a boolean');
  const next = a.hasNext ? readSet(r.container, 'next', (h.next ?? {}) as Record<string, unknown>, r.domain, r.pool) : null;
  return { solution: r.solution, next, history, stopReason: (a.stopReason ?? null) as CheckpointState['stopReason'] };
}
