/**
 * Benchmark cases of solution files (`output.solution-file.` rows, docs/solution-files.md):
 * encode to bytes, decode (rebuilding the domain and replaying the forest's bisections), and the
 * atomic file write (temp file, fsync, rename). Sizes: a sparse-grid level on the unit square
 * (≤ 20), or an unknown budget for an adaptive run on the L-shape with u0 ≡ 1.
 * Extra fields: `bytes` (file size), `bytesPerUnknown`, `forestVertices` (replayed on decode).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DoubleTree } from '../src/spacetime/double-tree';
import { lShapeDomain, rectangleDomain } from '../src/space/index';
import { SpaceTimeSolution } from '../src/spacetime/space-time-solution';
import { HeatProblem } from '../src/system/heat-problem';
import { solveAdaptive } from '../src/adapt/index';
import { decodeSolution, encodeSolution } from '../src/output/solution-file';
import { writeSolutionFile } from '../src/files/index';
import type { BenchCase, BenchInstance } from './harness';

function solution2d(size: number): SpaceTimeSolution {
  if (size <= 20) {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    const set = DoubleTree.sparseGrid(domain, size);
    return new SpaceTimeSolution(domain, set, new Float64Array(set.size).map((_, i) => Math.sin(0.37 * i + 0.1)), 1);
  }
  return solveAdaptive(new HeatProblem({ domain: lShapeDomain(1), T: 1, initial: () => 1 }), { maxUnknowns: size }).solution;
}

function solutionFile(size: number, op: 'encode' | 'decode' | 'write'): BenchInstance {
  const solution = solution2d(size);
  const bytes = encodeSolution(solution);
  const dir = op === 'write' ? mkdtempSync(join(tmpdir(), 'chronomesh-bench-')) : '';
  const run = op === 'encode' ? () => { encodeSolution(solution); }
    : op === 'decode' ? () => { decodeSolution(bytes); }
    : () => { writeSolutionFile(join(dir, 'u.cmsol'), solution); };
  if (op === 'write') process.once('exit', () => rmSync(dir, { recursive: true, force: true }));
  return {
    units: solution.trialSet.size,
    run,
    extra: { bytes: bytes.length, bytesPerUnknown: +(bytes.length / solution.trialSet.size).toFixed(2), forestVertices: solution.domain.vertexCount },
  };
}

export function solutionFileCases(quick: boolean): BenchCase[] {
  return (['encode', 'decode', 'write'] as const).map((op) => ({
    component: `output.solution-file.${op}.d2`,
    sizes: quick ? [3, 500] : [7, 100000],
    setup: (n: number) => solutionFile(n, op),
  }));
}
