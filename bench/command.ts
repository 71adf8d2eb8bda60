/**
 * The benchmark runner behind `npm run bench` and `chronomesh bench`: runs the selected suites
 * and prints a table, or one JSON document `{"rows":[{"component","size","nsPerUnit",...}]}`.
 */
import { writeFileSync } from 'node:fs';
import { runCases, type BenchCase, type BenchRow } from './harness';
import { suites } from './suites';
import { adaptiveRuns, adaptiveRunsAvailable } from './adaptive';

/** Options of {@link runBench}. */
export interface BenchOptions {
  json: boolean;
  quick: boolean;
  out?: string;
  /** Component-name prefixes (`time.`, `space.stiffness`, …); empty runs all. */
  prefixes: string[];
}

/** Runs the benchmark suites and returns the rows. */
export function runBench(o: BenchOptions, print: (line: string) => void = console.log): BenchRow[] {
  const cases: BenchCase[] = suites.flatMap((s) => s(o.quick));
  const rows: BenchRow[] = [];
  const opts = o.quick ? { minReps: 3, budgetMs: 20 } : { minReps: 7, budgetMs: 400 };
  if (!o.json) print(`${'component'.padEnd(44)} ${'size'.padStart(10)} ${'ns/unit'.padStart(10)}  extra`);
  const onRow = (r: BenchRow): void => {
    rows.push(r);
    if (!o.json) {
      const { component, size, nsPerUnit, ...extra } = r;
      const ex = Object.entries(extra).map(([k, v]) => `${k}=${typeof v === 'number' && !Number.isInteger(v) ? v.toPrecision(4) : v}`).join(' ');
      print(`${component.padEnd(44)} ${String(size).padStart(10)} ${nsPerUnit.toFixed(1).padStart(10)}  ${ex}`);
    }
  };
  runCases(cases, o.prefixes, opts, onRow);
  // Whole-run suites (the adaptive loop), each run in a child process for its own peak memory.
  const selected = (component: string): boolean => o.prefixes.length === 0 || o.prefixes.some((p) => component.startsWith(p));
  // They need the child's file (bench/adaptive-run.ts, or its bundle out/bench/adaptive-run.js): from a repository checkout only.
  if (adaptiveRunsAvailable()) adaptiveRuns.run(o.quick, selected, onRow);
  else if (o.prefixes.some((p) => p.startsWith('adaptive'))) process.stderr.write('bench: adaptive.* rows need a repository checkout (npm run bench); skipped\n');
  if (o.json) print(JSON.stringify({ rows }));
  if (o.out) writeFileSync(o.out, JSON.stringify({ rows }, null, 1) + '\n');
  return rows;
}
