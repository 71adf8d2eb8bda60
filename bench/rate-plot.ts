/**
 * Log–log plot (SVG) of estimator and true error against #Λ from `bench/rate-study.ts` output:
 *
 *   node --import tsx bench/rate-plot.ts OUT.svg TITLE SLOPE run.jsonl [extra-errors.json]
 *
 * SLOPE is the reference slope drawn dashed (e.g. -0.5). The optional JSON file adds true errors
 * measured elsewhere for steps of the same (deterministic) run: `[[N, err], …]`.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { convergencePlotSvg } from '../src/index';

const [out, title, slope, runFile, extraFile] = process.argv.slice(2);
if (!out || !title || !slope || !runFile) throw new Error('usage: rate-plot.ts OUT.svg TITLE SLOPE run.jsonl [extra-errors.json]');
const rows = readFileSync(runFile, 'utf8').split('\n').filter((l) => l.startsWith('{')).map((l) => JSON.parse(l) as { N: number; E: number; err: number | null });
const errors = rows.filter((r) => r.err !== null).map((r) => [r.N, r.err!] as [number, number]);
if (extraFile) errors.push(...(JSON.parse(readFileSync(extraFile, 'utf8')) as [number, number][]));
errors.sort((a, b) => a[0] - b[0]);
const svg = convergencePlotSvg(
  [
    { label: 'estimator E', points: rows.map((r) => [r.N, r.E]) },
    { label: 'true error', points: errors },
  ],
  { title, xLabel: 'unknowns #Λ', yLabel: 'L2(0,T;H¹₀) error / E', referenceSlopes: [Number(slope)] },
);
writeFileSync(out, svg);
console.log(`wrote ${out}: ${rows.length} steps, ${errors.length} true errors`);
