/**
 * Benchmark entry point: `npm run -s bench -- [--json] [--quick] [--out FILE] [prefix ...]`.
 *
 * Positional arguments are component-name prefixes (`time.`, `space.stiffness`, …)
 * selecting which rows run. `--json` prints one JSON document
 * `{"rows":[{"component","size","nsPerUnit",...}]}` as the last line of stdout
 * (npm's own banner precedes it unless npm runs with `-s`); otherwise a table.
 * `--out FILE` also writes the JSON document to FILE.
 * `--quick` uses smaller sizes (for smoke testing the harness).
 */
import { writeFileSync } from 'node:fs';
import { runCases, type BenchCase, type BenchRow } from './harness';
import { suites } from './suites';
import { adaptiveRuns } from './adaptive';

const args = process.argv.slice(2);
const json = args.includes('--json');
const quick = args.includes('--quick');
const outAt = args.indexOf('--out');
const outFile = outAt >= 0 ? args[outAt + 1] : undefined;
if (outAt >= 0 && !outFile) {
  console.error('bench: --out needs a file name');
  process.exit(2);
}
const prefixes = args.filter((a, i) => !a.startsWith('--') && (outAt < 0 || i !== outAt + 1));

const cases: BenchCase[] = suites.flatMap((s) => s(quick));
const rows: BenchRow[] = [];
const opts = quick ? { minReps: 3, budgetMs: 20 } : { minReps: 7, budgetMs: 400 };
if (!json) console.log(`${'component'.padEnd(44)} ${'size'.padStart(10)} ${'ns/unit'.padStart(10)}  extra`);
const onRow = (r: BenchRow): void => {
  rows.push(r);
  if (!json) {
    const { component, size, nsPerUnit, ...extra } = r;
    const ex = Object.entries(extra).map(([k, v]) => `${k}=${typeof v === 'number' && !Number.isInteger(v) ? v.toPrecision(4) : v}`).join(' ');
    console.log(`${component.padEnd(44)} ${String(size).padStart(10)} ${nsPerUnit.toFixed(1).padStart(10)}  ${ex}`);
  }
};
runCases(cases, prefixes, opts, onRow);
// Whole-run suites (the adaptive loop), each run in a child process for its own peak memory.
const selected = (component: string): boolean => prefixes.length === 0 || prefixes.some((p) => component.startsWith(p));
adaptiveRuns.run(quick, selected, onRow);
if (json) console.log(JSON.stringify({ rows }));
if (outFile) writeFileSync(outFile, JSON.stringify({ rows }, null, 1) + '\n');
