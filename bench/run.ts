/**
 * Benchmark entry point: `npm run bench -- [--json] [--quick] [prefix ...]`.
 *
 * Positional arguments are component-name prefixes (`time.`, `space.stiffness`, …)
 * selecting which rows run. `--json` prints one JSON document
 * `{"rows":[{"component","size","nsPerUnit",...}]}`; otherwise a table.
 * `--quick` uses smaller sizes (for smoke testing the harness).
 */
import { runCases, type BenchCase, type BenchRow } from './harness';
import { suites } from './suites';

const args = process.argv.slice(2);
const json = args.includes('--json');
const quick = args.includes('--quick');
const prefixes = args.filter((a) => !a.startsWith('--'));

const cases: BenchCase[] = suites.flatMap((s) => s(quick));
const rows: BenchRow[] = [];
const opts = quick ? { minReps: 3, budgetMs: 20 } : { minReps: 7, budgetMs: 400 };
if (!json) console.log(`${'component'.padEnd(44)} ${'size'.padStart(10)} ${'ns/unit'.padStart(10)}  extra`);
runCases(cases, prefixes, opts, (r) => {
  rows.push(r);
  if (!json) {
    const { component, size, nsPerUnit, ...extra } = r;
    const ex = Object.entries(extra).map(([k, v]) => `${k}=${v}`).join(' ');
    console.log(`${component.padEnd(44)} ${String(size).padStart(10)} ${nsPerUnit.toFixed(1).padStart(10)}  ${ex}`);
  }
});
if (json) console.log(JSON.stringify({ rows }));
