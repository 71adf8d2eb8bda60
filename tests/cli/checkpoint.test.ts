/** `chronomesh solve --checkpoint FILE` and `--resume FILE` through the real command line. */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './spawn';

const dir = mkdtempSync(join(tmpdir(), 'chronomesh-cli-checkpoint-'));
const rod = (maxSteps: number, strategy = 'adaptive'): string => {
  const f = join(dir, `rod-${maxSteps}-${strategy}.json`);
  writeFileSync(f, JSON.stringify({ domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 1, initial: 'x < 0.3 ? 1 : 0', maxSteps, maxDofs: 100000, tolerance: 0, strategy }));
  return f;
};
type Doc = { steps: { dofs: number; estimate: number }[] };

describe('chronomesh solve --checkpoint / --resume', () => {
  it('a run stopped after 4 steps and resumed with a budget of 8 gives the 8-step run', async () => {
    const cp = join(dir, 'run.cmsol');
    const full = await runCli(['solve', rod(8), '--json', '--quiet']);
    const first = await runCli(['solve', rod(4), '--json', '--quiet', '--checkpoint', cp]);
    const resumed = await runCli(['solve', rod(8), '--json', '--resume', cp]);
    for (const r of [full, first, resumed]) expect(r.status, r.stderr).toBe(0);
    const [a, b, c] = [full, first, resumed].map((r) => JSON.parse(r.stdout) as Doc);
    expect(b!.steps.length).toBe(4);
    expect(c!.steps.length).toBe(8);
    // progress lines are printed for the computed steps only: 4, 5, 6, 7
    expect(resumed.stderr.split('\n').filter((l) => /^step \d+:/.test(l)).map((l) => Number(/^step (\d+)/.exec(l)![1]))).toEqual([4, 5, 6, 7]);
    c!.steps.forEach((s, i) => {
      expect(s.dofs).toBe(a!.steps[i]!.dofs);
      expect(Math.abs(s.estimate - a!.steps[i]!.estimate)).toBeLessThanOrEqual(1e-10 * a!.steps[i]!.estimate);
    });
  }, 120_000);

  it('refuses a damaged checkpoint, a missing one, and checkpoints with a grid strategy (exit 2, one line)', async () => {
    const junk = join(dir, 'junk.cmsol');
    writeFileSync(junk, '{"not": "a checkpoint"}');
    const bad = await runCli(['solve', rod(8), '--resume', junk]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/junk\.cmsol: not a chronomesh-solution file/);
    const missing = await runCli(['solve', rod(8), '--resume', join(dir, 'nope.cmsol')]);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/cannot read --resume/);
    // a checkpoint of another domain: named as such, in the command line's words (not the API's opts.domain)
    const cp2 = join(dir, 'two-cells.cmsol');
    expect((await runCli(['solve', rod(2), '--checkpoint', cp2, '--quiet'])).status).toBe(0);
    const threeCells = join(dir, 'three-cells.json');
    writeFileSync(threeCells, JSON.stringify({ domain: { shape: 'interval', from: 0, to: 1, cells: 3 }, horizon: 1, initial: 'x < 0.3 ? 1 : 0', maxSteps: 4 }));
    const other = await runCli(['solve', threeCells, '--resume', cp2]);
    expect(other.status).toBe(2);
    expect(other.stderr).toMatch(/two-cells\.cmsol: the checkpoint was written for another problem: .*three-cells\.json's domain differs from the saved one/);
    expect(other.stderr).not.toMatch(/opts\./);
    const sparse = await runCli(['solve', rod(3, 'sparse'), '--checkpoint', join(dir, 'x.cmsol')]);
    expect(sparse.status).toBe(2);
    expect(sparse.stderr).toMatch(/need the adaptive strategy/);
  }, 120_000);
});
