/**
 * Minimal benchmark harness shared by all bench suites.
 *
 * A suite exports `cases: BenchCase[]`. For every case and size the harness
 * builds the problem once (`setup`), warms up, then times repeated single
 * applications and reports the median time divided by the number of units.
 */

export interface BenchInstance {
  /** Number of units the cost is divided by (tree nodes, vertices, unknowns). */
  units: number;
  /** Performs exactly one application of the operator being measured. */
  run: () => void;
  /** Extra numeric fields copied into the output row (e.g. iteration counts). */
  extra?: Record<string, number | string>;
}

export interface BenchCase {
  /** Dotted component name; the first segment is the module (`time.`, `space.`, `spacetime.`). */
  component: string;
  /** Requested problem sizes (approximate unit counts). */
  sizes: number[];
  setup(size: number): BenchInstance;
}

export interface BenchRow {
  component: string;
  size: number;
  nsPerUnit: number;
  [extra: string]: number | string;
}

export interface TimingOptions {
  /** Minimum number of timed repetitions. */
  minReps: number;
  /** Stop repeating once this much time (ms) has been spent (after minReps). */
  budgetMs: number;
}

/** Median of the per-repetition times in nanoseconds. */
export function timeMedianNs(run: () => void, opts: TimingOptions): number {
  run(); // warm-up (JIT, caches)
  run();
  const samples: number[] = [];
  const start = process.hrtime.bigint();
  while (samples.length < opts.minReps || Number(process.hrtime.bigint() - start) / 1e6 < opts.budgetMs) {
    const t0 = process.hrtime.bigint();
    run();
    samples.push(Number(process.hrtime.bigint() - t0));
    if (samples.length >= 200) break;
  }
  samples.sort((a, b) => a - b);
  return samples[samples.length >> 1]!;
}

export function runCases(cases: BenchCase[], prefixes: string[], opts: TimingOptions, onRow: (r: BenchRow) => void): void {
  for (const c of cases) {
    if (prefixes.length > 0 && !prefixes.some((p) => c.component.startsWith(p))) continue;
    for (const size of c.sizes) {
      const inst = c.setup(size);
      const ns = timeMedianNs(inst.run, opts);
      onRow({ component: c.component, size: inst.units, nsPerUnit: ns / inst.units, ...(inst.extra ?? {}) });
    }
  }
}
