/** Files written by `chronomesh solve --out DIR`. */
import { accessSync, constants, mkdirSync, unlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { convergencePlotSvg, indexSetToSvg, sliceToSvg, sliceToVtu, vtkCollection } from '../index';
import { stateToJson, type ProblemSpec, type RunResult } from '../problem-file/index';
import { CliError } from './cli-error';

/** Creates DIR if needed and proves it writable by writing and removing a file, before any work. */
export function checkWritable(dir: string): void {
  try {
    mkdirSync(dir, { recursive: true });
    accessSync(dir, constants.W_OK);
    const probe = join(dir, `.chronomesh-write-check-${process.pid}`);
    writeFileSync(probe, '');
    unlinkSync(probe);
  } catch (e) {
    const code = (e as { code?: string }).code ?? 'error';
    throw new CliError(`--out ${dir}: folder cannot be created or written (${code})`);
  }
}

function csvLine(values: (string | number | null)[]): string {
  return values.map((v) => (v === null ? '' : String(v))).join(',');
}

/** Default slice times when the file gives none: 0, T/4, T/2, 3T/4, T. */
export function sliceTimes(spec: ProblemSpec): number[] {
  return spec.slices.length > 0 ? spec.slices : [0, 0.25, 0.5, 0.75, 1].map((f) => spec.start + f * spec.duration);
}

/** Writes all outputs of a run into `dir`; returns the paths written. */
export function writeOutputs(dir: string, spec: ProblemSpec, run: RunResult): string[] {
  const written: string[] = [];
  const save = (name: string, text: string) => {
    writeFileSync(join(dir, name), text);
    written.push(join(dir, name));
  };
  save('history.json', JSON.stringify({ steps: run.steps, rate: run.rate, stopReason: run.stopReason, exactErrors: run.exactErrors }, null, 1) + '\n');
  // With a known solution (`exact`) the history has the true error of every step as a last column.
  const truth = run.exactErrors !== null;
  save('history.csv', [
    // relativeEstimate last, so that the earlier columns keep their places
    csvLine(['step', 'dofs', 'estimate', 'iterations', 'riseChecks', 'seconds', ...(truth ? ['trueError'] : []), 'relativeEstimate']),
    ...run.steps.map((s, i) => csvLine([i, s.dofs, s.estimate, s.iterations, s.riseChecks, s.seconds, ...(truth ? [s.trueError ?? ''] : []), s.relativeEstimate ?? ''])),
  ].join('\n') + '\n');
  save('probes.csv', [csvLine(['t', 'x', 'y', 'value', 'previousStep']), ...run.probes.map((p) => csvLine([p.t, p.x, p.y, p.value, p.previous ?? '']))].join('\n') + '\n');
  if (run.sensors !== null) {
    // one row per reading time, one column per sensor, named by its position
    const { times, points, values } = run.sensors;
    save('sensors.csv', [csvLine(['t', ...points.map((p) => `u(${p.join(' ')})`)]), ...times.map((t, k) => csvLine([t, ...values[k]!]))].join('\n') + '\n');
  }
  const times = sliceTimes(spec);
  const name = spec.title ?? 'u';
  const lines = spec.curveSources.map((c) => c.curve); // drawn over the slice pictures
  const entries = times.map((t, i) => {
    const file = `slice-${String(i).padStart(4, '0')}.vtu`;
    // slice times are absolute, the solution's clock starts at 0 (problem field `start`)
    const slice = { ...run.solution.slice(t - spec.start), t };
    save(file, sliceToVtu(slice, 'u'));
    save(`slice-${String(i).padStart(4, '0')}.svg`, sliceToSvg(slice, { title: `${name}, t = ${t}`, quantity: 'u', ...(lines.length > 0 ? { lines } : {}) }));
    return { t, file };
  });
  save('slices.pvd', vtkCollection(entries));
  // The state at the horizon, for a run that continues this one ("initial": {"state": …}).
  save('end-state.json', stateToJson(run.solution.state(spec.duration), spec.horizon, `${name} at t = ${spec.horizon}`) + '\n');
  const pts = run.steps.filter((s) => s.estimate > 0).map((s) => [s.dofs, s.estimate] as [number, number]);
  const truePts = run.steps.filter((s) => typeof s.trueError === 'number' && s.trueError > 0).map((s) => [s.dofs, s.trueError!] as [number, number]);
  if (pts.length > 0) {
    const series = [{ label: truePts.length > 0 ? `${spec.strategy}: estimator E` : spec.strategy, points: pts }];
    if (truePts.length > 0) series.push({ label: 'true error', points: truePts });
    save('history.svg', convergencePlotSvg(series, truePts.length > 0
      ? { title: `${name}: estimator and true error (energy norm)`, yLabel: 'E, true error' }
      : { title: `${name}: residual estimator`, yLabel: 'estimator E' }));
  }
  const dim = run.solution.domain.dim;
  const meshTimes = times.map((t) => t - spec.start).filter((t) => t > 0).slice(0, 3);
  save('index-set.svg', indexSetToSvg(run.solution.domain, run.set, spec.duration, {
    title: `${name}: space-time index set (${run.set.size} unknowns)`,
    ...(spec.start > 0 ? { start: spec.start } : {}),
    ...(dim === 1 ? { logTime: true } : meshTimes.length > 0 ? { times: meshTimes } : {}),
  }));
  return written;
}
