/**
 * Resume after a crash: a child process runs an adaptive solve that checkpoints to a file after
 * every step (atomic writes); the test kills it with SIGKILL once a few checkpoints are on disk,
 * reads the file (it must be complete and valid), resumes in this process and compares with an
 * uninterrupted run of the same problem.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { HeatProblem, decodeSolution, lShapeDomain, solveAdaptive } from '../../src/index';
import { readFileBytes } from '../../src/files/index';

const ROOT = resolve(__dirname, '../..');
const dir = mkdtempSync(join(tmpdir(), 'chronomesh-resume-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const MAX_STEPS = 16;
const problem = () => new HeatProblem({ domain: lShapeDomain(1), T: 1, initial: () => 1 });

/** Starts the child and kills it (SIGKILL) right after it reports checkpoint `killAfter`. */
function runAndKill(file: string, killAfter: number): Promise<{ lastReported: number; signal: string | null; finished: boolean }> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'tests/adapt/fixtures/checkpointed-run.ts'), file, String(MAX_STEPS)], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    let lastReported = -1;
    let finished = false;
    let out = '', err = '';
    child.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      for (const m of out.matchAll(/checkpoint (\d+)/g)) lastReported = Math.max(lastReported, Number(m[1]));
      if (out.includes('done')) finished = true;
      if (lastReported >= killAfter && child.exitCode === null && !child.killed) child.kill('SIGKILL');
    });
    child.stderr.on('data', (d: Buffer) => { err += d.toString(); });
    child.on('error', fail);
    child.on('exit', (code, signal) => {
      if (code !== null && code !== 0) fail(new Error(`child failed (${code}): ${err}`));
      else done({ lastReported, signal, finished });
    });
  });
}

describe('resume after kill', () => {
  it('a SIGKILLed run loses nothing it saved and resumes to the uninterrupted answer', async () => {
    const file = join(dir, 'run.cmsol');
    const killed = await runAndKill(file, 3);
    expect(killed.signal).toBe('SIGKILL');
    expect(killed.finished).toBe(false);
    expect(existsSync(file)).toBe(true);
    // The file on disk is complete and valid (atomic replace): it decodes, and holds a step ≥ the
    // last one the child reported (it may have written one more before the signal arrived).
    const bytes = readFileBytes(file);
    const saved = decodeSolution(bytes);
    expect(saved.content).toBe('adaptive-checkpoint');
    const savedStep = saved.step!;
    expect(savedStep).toBeGreaterThanOrEqual(killed.lastReported);
    expect(savedStep).toBeLessThan(MAX_STEPS - 1);
    const seen: number[] = [];
    const resumed = solveAdaptive(problem(), { maxSteps: MAX_STEPS, resume: bytes, onStep: (h) => { seen.push(h.step); } });
    // the first step computed after resuming is the one after the saved step
    expect(seen[0]).toBe(savedStep + 1);
    expect(seen).toEqual(Array.from({ length: MAX_STEPS - savedStep - 1 }, (_, k) => savedStep + 1 + k));
    expect(resumed.history[savedStep]!.unknowns).toBe(saved.solution.trialSet.size);
    // Only leftovers of an interrupted write may remain beside the file (temporary names).
    for (const f of readdirSync(dir)) expect(f === 'run.cmsol' || /^\.run\.cmsol\..*\.tmp$/.test(f)).toBe(true);

    const full = solveAdaptive(problem(), { maxSteps: MAX_STEPS });
    expect(resumed.history.length).toBe(full.history.length);
    expect(resumed.stopReason).toBe(full.stopReason);
    // Steps continue where the checkpoint ended: the resumed history holds the saved steps, then
    // steps savedStep + 1, …, and every step matches the uninterrupted run (same sets; estimates
    // equal up to the PCG tolerance, here in fact to rounding).
    resumed.history.forEach((h, k) => {
      expect(h.step).toBe(k);
      expect(h.unknowns).toBe(full.history[k]!.unknowns);
      expect(Math.abs(h.estimate - full.history[k]!.estimate)).toBeLessThanOrEqual(1e-9 * full.history[k]!.estimate);
    });
    const tEnd = 0.2;
    const a = resumed.solution.evaluate(tEnd, [-0.5, 0.5, -0.25, -0.75]);
    const b = full.solution.evaluate(tEnd, [-0.5, 0.5, -0.25, -0.75]);
    for (let i = 0; i < a.length; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThanOrEqual(1e-9);
  }, 120_000);
});
