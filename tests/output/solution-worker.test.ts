/**
 * A solution moved to a worker thread as bytes (the buffer transferred, not copied): the worker
 * rebuilds domain, forest and set from the bytes alone and evaluates exactly as the original.
 */
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { describe, expect, it } from 'vitest';
import { HeatProblem, encodeSolution, lShapeDomain, solveAdaptive } from '../../src/index';

describe('solution bytes across a worker thread', () => {
  it('the worker evaluates the transferred solution exactly as the original', async () => {
    const run = solveAdaptive(new HeatProblem({ domain: lShapeDomain(1), T: 1, initial: () => 1 }), { maxUnknowns: 3000 });
    const bytes = encodeSolution(run.solution);
    const points = [-0.5, 0.5, -0.25, -0.75, 0.6, 0.3, 0, 0.9];
    const expected = Array.from(run.solution.evaluate(0.05, points));
    // The worker loads the TypeScript sources through tsx's loader (registered inside the worker).
    const file = join(__dirname, 'fixtures/worker-decode.ts');
    const worker = new Worker(`require('tsx/cjs'); require(${JSON.stringify(file)});`, { eval: true });
    try {
      const reply = await new Promise<{ values: Float64Array; unknowns: number }>((resolve, reject) => {
        worker.once('message', resolve);
        worker.once('error', reject);
        worker.postMessage({ bytes, t: 0.05, points }, [bytes.buffer as ArrayBuffer]);
      });
      expect(bytes.byteLength).toBe(0); // transferred, not copied
      expect(reply.unknowns).toBe(run.solution.trialSet.size);
      expect(Array.from(reply.values)).toEqual(expected);
    } finally {
      await worker.terminate();
    }
  }, 60_000);
});
