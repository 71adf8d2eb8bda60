/**
 * `chronomesh/files`: solution files and checkpoints on disk (Node.js only). A separate entry
 * point, so that the core library (which encodes and decodes bytes, see `encodeSolution`) stays
 * free of `node:fs` and runs in browsers and workers. Writes are atomic: a reader, or a run
 * resumed after a crash, never sees a half-written file (docs/solution-files.md §5).
 * @packageDocumentation
 */
import { readFileSync } from 'node:fs';
import {
  InvalidArgumentError,
  decodeSolution,
  encodeSolution,
  type AdaptiveCheckpointInfo,
  type DecodeSolutionOptions,
  type DecodedSolution,
  type EncodeSolutionOptions,
  type SpaceTimeSolution,
} from '../index';
import { writeFileAtomic as atomicWrite } from './atomic-write';

/**
 * Writes `solution` to `path` atomically, in the format of `encodeSolution`. Returns the number of bytes written.
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain, solve } from 'chronomesh';
 * import { readSolutionFile, writeSolutionFile } from 'chronomesh/files';
 * import { mkdtempSync } from 'node:fs';
 * import { tmpdir } from 'node:os';
 * import { join } from 'node:path';
 * const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * const { solution } = solve(problem, 5);
 * const file = join(mkdtempSync(join(tmpdir(), 'cm-')), 'rod.cmsol');
 * writeSolutionFile(file, solution, { description: 'rod' });
 * const back = readSolutionFile(file).solution;
 * console.log(back.evaluate(0.2, [0.5])[0] === solution.evaluate(0.2, [0.5])[0]); // → true
 * ```
 */
export function writeSolutionFile(path: string, solution: SpaceTimeSolution, opts: EncodeSolutionOptions = {}): number {
  const bytes = encodeSolution(solution, opts);
  atomicWrite(path, bytes);
  return bytes.length;
}

/**
 * Reads a file's bytes (e.g. a checkpoint for `solveAdaptive`'s `resume`); a missing or
 * unreadable file is an InvalidArgumentError naming `field`.
 *
 * @example
 * ```ts
 * import { InvalidArgumentError } from 'chronomesh';
 * import { readFileBytes } from 'chronomesh/files';
 * try { readFileBytes('/no/such/run.cmsol', '--resume'); }
 * catch (e) { if (e instanceof InvalidArgumentError) console.log(e.field); } // → --resume
 * ```
 */
export function readFileBytes(path: string, field = 'path'): Uint8Array {
  if (typeof path !== 'string' || path.length === 0) throw new InvalidArgumentError(`${field} must be a non-empty file path`, { field, expected: 'a file path', received: typeof path });
  try {
    const b = readFileSync(path);
    return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  } catch (e) {
    throw new InvalidArgumentError(`cannot read ${field} ${JSON.stringify(path)}: ${(e as Error).message}`, { field, expected: 'a readable file', received: path });
  }
}

/**
 * Reads a solution file (or an adaptive checkpoint: its last completed step) written by
 * {@link writeSolutionFile}; errors as `decodeSolution` (a `CorruptFileError` for a damaged or
 * foreign file).
 *
 * @example
 * ```ts
 * import { CorruptFileError } from 'chronomesh';
 * import { readSolutionFile } from 'chronomesh/files';
 * import { mkdtempSync, writeFileSync } from 'node:fs';
 * import { tmpdir } from 'node:os';
 * import { join } from 'node:path';
 * const file = join(mkdtempSync(join(tmpdir(), 'cm-')), 'notes.json');
 * writeFileSync(file, '{"T": 1}');
 * try { readSolutionFile(file); } catch (e) { if (e instanceof CorruptFileError) console.log(e.problem); } // → foreign
 * ```
 */
export function readSolutionFile(path: string, opts: DecodeSolutionOptions = {}): DecodedSolution {
  return decodeSolution(readFileBytes(path), opts);
}

/**
 * A `checkpoint` callback for `solveAdaptive` that writes each checkpoint to `path` atomically
 * (the file always holds the last completed step; resume with `resume: readFileBytes(path)`).
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain, solveAdaptive } from 'chronomesh';
 * import { checkpointToFile, readFileBytes } from 'chronomesh/files';
 * import { mkdtempSync } from 'node:fs';
 * import { tmpdir } from 'node:os';
 * import { join } from 'node:path';
 * const file = join(mkdtempSync(join(tmpdir(), 'cm-')), 'run.cmsol');
 * const problem = () => new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * const first = solveAdaptive(problem(), { maxSteps: 3, checkpoint: checkpointToFile(file) });
 * const more = solveAdaptive(problem(), { maxSteps: 5, resume: readFileBytes(file) });
 * console.log(first.history.length, more.history.length); // → 3 5
 * ```
 */
export function checkpointToFile(path: string): (bytes: Uint8Array, info: AdaptiveCheckpointInfo) => void {
  if (typeof path !== 'string' || path.length === 0) throw new InvalidArgumentError('path must be a non-empty file path', { field: 'path', expected: 'a file path', received: typeof path });
  return (bytes) => atomicWrite(path, bytes, 'checkpoint path');
}

/**
 * Writes bytes to a file atomically: temporary file in the same directory, fsync, rename over the
 * target, fsync of the directory; a reader sees the old or the new file, never a partial one.
 *
 * @example
 * ```ts
 * import { writeFileAtomic } from 'chronomesh/files';
 * import { mkdtempSync, readFileSync } from 'node:fs';
 * import { tmpdir } from 'node:os';
 * import { join } from 'node:path';
 * const file = join(mkdtempSync(join(tmpdir(), 'cm-')), 'data.bin');
 * writeFileAtomic(file, Uint8Array.of(1, 2, 3));
 * console.log(readFileSync(file).length); // → 3
 * ```
 */
export const writeFileAtomic: (path: string, bytes: Uint8Array, field?: string) => void = atomicWrite;
