/**
 * The `adaptive.` suite: whole adaptive runs on the reference problems (u0 ≡ 1, u = 0 on the
 * boundary, T = 0.5; d1 = (0, 1), d2 = the unit square), each in a child process so that its peak
 * resident memory is its own (`process.resourceUsage().maxRSS`). One row per step
 * (`adaptive.d2.step`: size = #Λ, nsPerUnit = step wall time per unknown, the time shares of
 * setup / solve / estimate / refine, rssBytesPerUnknown = peak RSS so far / #Λ) and one summary
 * row per run (`adaptive.d2.run`: total seconds, steps, final E, the least-squares rate of E over
 * the second half of the steps, peak RSS, the range of (setup + estimate + refine) / solve over the
 * steps at ≥ 10⁵ unknowns and the largest E_k / E_{k−1} after step 10). d1 runs to 3·10⁵ unknowns: its rate over the second half
 * of the steps is 0.886 for a run to 10⁵ and 0.91 to 3·10⁵ (still rising with N).
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { BenchRow } from './harness';

/** A suite of whole runs (not repeated applications): rows come from the run itself. */
export interface RunSuite {
  prefix: string;
  run(quick: boolean, selected: (component: string) => boolean, onRow: (row: BenchRow) => void): void;
}

/**
 * The child runs the same code as this file: the bundle of `npm run bench` (out/bench/*.js, plain
 * node, as the published library runs) or the TypeScript sources under tsx (`npm run bench:ts`),
 * where the same loop takes about 25 % longer (docs/measurement-log.md, 2026-12-05).
 */
const bundled = import.meta.url.endsWith('.js');
const child = fileURLToPath(new URL(bundled ? './adaptive-run.js' : './adaptive-run.ts', import.meta.url));

/** True where the child's file exists (a repository checkout; not the published CLI). */
export function adaptiveRunsAvailable(): boolean {
  return existsSync(child);
}

export const adaptiveRuns: RunSuite = {
  prefix: 'adaptive.',
  run(quick, selected, onRow) {
    const runs: [string, number, number][] = quick
      ? [['d1', 1500, 30], ['d2', 1500, 30]]
      : [['d1', 3e5, 600], ['d2', 1.5e6, 600]];
    for (const [which, maxUnknowns, maxSeconds] of runs) {
      if (!selected(`adaptive.${which}.run`) && !selected(`adaptive.${which}.step`)) continue;
      const p = spawnSync(process.execPath, [...(bundled ? [] : ['--import', 'tsx']), child, which, String(maxUnknowns), String(maxSeconds)], {
        encoding: 'utf8',
        maxBuffer: 64 * 1024 * 1024,
      });
      if (p.status !== 0) throw new Error(`adaptive bench run ${which} failed (exit ${p.status}): ${p.stderr.slice(-2000)}`);
      for (const line of p.stdout.split('\n')) {
        if (!line.startsWith('{')) continue;
        const row = JSON.parse(line) as BenchRow;
        if (selected(row.component)) onRow(row);
      }
    }
  },
};
