/**
 * Fits the estimator sequence of an adaptive run to the rate model of docs/adaptivity.md §7.2,
 *
 *   E ≈ C · N^(−q) · (ln N)^p,
 *
 * and prints what it predicts for the local slope −d ln E / d ln N = q − p / ln N.
 *
 *   node --import tsx bench/rate-model.ts d1|d2 FILE
 *
 * FILE is the output of `npm run -s bench -- adaptive. --json` (rows `adaptive.dX.step`) or of
 * `bench/rate-study.ts` (JSON lines with N and E). The model's values for the u0 ≡ 1 reference
 * problems are q = 1, p = 1 (d = 1) and q = 1/2, p = 3/2 (d = 2); §7.2 derives them. Three fits are
 * made by least squares in ln E over the second half of the steps (the window of the bench's
 * `rate`): a pure power law (the bench's rate), the model's q with p free, and both free.
 * Before fitting, the script checks the one integral the derivation rests on by quadrature.
 */
import { readFileSync } from 'node:fs';
import { Matrix, solve } from 'ml-matrix';

const [which, file] = process.argv.slice(2);
if ((which !== 'd1' && which !== 'd2') || !file) throw new Error('usage: rate-model.ts d1|d2 FILE');
const d = which === 'd1' ? 1 : 2;
const qModel = d === 1 ? 1 : 0.5;
const pModel = d === 1 ? 1 : 1.5;

// ∫₀^∞ |∂²u/∂x²|² dt = 1/(π x²) for the half-space profile u = erf(x / (2√t)) (§7.2), checked at
// x = 0.3 by composite Simpson in ln t.
{
  const x = 0.3;
  const f = (t: number): number => (x / (2 * Math.sqrt(Math.PI) * t ** 1.5)) ** 2 * Math.exp(-(x * x) / (2 * t));
  // over t in [1e-6, 1e6]: the integrand is negligible outside
  const a = Math.log(1e-6), b = Math.log(1e6), n = 20000, h = (b - a) / n;
  let s = 0;
  for (let i = 0; i <= n; i++) {
    const t = Math.exp(a + i * h);
    s += (i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2) * f(t) * t;
  }
  const integral = (s * h) / 3;
  const expected = 1 / (Math.PI * x * x);
  if (Math.abs(integral / expected - 1) > 1e-6) throw new Error(`model integral ${integral} ≠ 1/(πx²) = ${expected}`);
  console.log(`check: ∫|u_xx|² dt at x = ${x}: ${integral.toPrecision(8)} (1/(πx²) = ${expected.toPrecision(8)})`);
}

type Point = { N: number; E: number };
const text = readFileSync(file, 'utf8');
let points: Point[];
if (text.trimStart().startsWith('{"rows"')) {
  const rows = (JSON.parse(text) as { rows: { component: string; size: number; estimate: number }[] }).rows;
  points = rows.filter((r) => r.component === `adaptive.${which}.step`).map((r) => ({ N: r.size, E: r.estimate }));
} else {
  points = text.split('\n').filter((l) => l.startsWith('{')).map((l) => JSON.parse(l) as Point);
}
if (points.length < 6) throw new Error(`${file}: ${points.length} steps of ${which}; need at least 6`);
const half = points.slice(Math.floor(points.length / 2));

/** Least squares ln E − (known columns) = Σ c_k g_k(N) over the window; returns c. */
function fit(columns: ((n: number) => number)[], offset: (n: number) => number): number[] {
  const A = new Matrix(half.map((p) => columns.map((g) => g(p.N))));
  const y = Matrix.columnVector(half.map((p) => Math.log(p.E) - offset(p.N)));
  return solve(A.transpose().mmul(A), A.transpose().mmul(y)).to1DArray();
}
const rms = (pred: (n: number) => number): number => Math.sqrt(half.reduce((s, p) => s + (Math.log(p.E) - pred(p.N)) ** 2, 0) / half.length);
const one = (): number => 1;
const ln = Math.log;

const [c0, slope] = fit([one, (n) => -ln(n)], () => 0);
const [c1, p1] = fit([one, (n) => ln(ln(n))], (n) => -qModel * ln(n));
const [c2, q2, p2] = fit([one, (n) => -ln(n), (n) => ln(ln(n))], () => 0);
const N1 = half[0]!.N, N2 = half.at(-1)!.N;
// Mean slope of the model over [N1, N2]: q − p (ln ln N2 − ln ln N1) / (ln N2 − ln N1).
const meanSlope = (q: number, p: number): number => q - (p * (ln(ln(N2)) - ln(ln(N1)))) / (ln(N2) - ln(N1));
const target = d === 1 ? 0.9 : 0.45;

console.log(`${which}: ${points.length} steps; second half ${half.length} steps, N = ${N1} … ${N2}`);
console.log(`  power law            E ∝ N^-${slope!.toFixed(3)}                      rms(ln E) ${rms((n) => c0! - slope! * ln(n)).toFixed(4)}`);
console.log(`  model q, p free      E ∝ N^-${qModel} (ln N)^${p1!.toFixed(2)}   mean slope ${meanSlope(qModel, p1!).toFixed(3)}   rms ${rms((n) => c1! - qModel * ln(n) + p1! * ln(ln(n))).toFixed(4)}`);
console.log(`  q and p free         E ∝ N^-${q2!.toFixed(3)} (ln N)^${p2!.toFixed(2)}   mean slope ${meanSlope(q2!, p2!).toFixed(3)}   rms ${rms((n) => c2! - q2! * ln(n) + p2! * ln(ln(n))).toFixed(4)}`);
console.log(`  model (q, p) = (${qModel}, ${pModel}): mean slope over the window ${meanSlope(qModel, pModel).toFixed(3)}; local slope ${(qModel - pModel / ln(N2)).toFixed(3)} at N = ${N2}`);
for (const p of [pModel, p1!]) {
  // local slope q − p/ln N reaches the target at ln N = p / (q − target)
  const lnN = p / (qModel - target);
  console.log(`  local slope ${target} needs ln N ≥ ${lnN.toFixed(1)}, N ≈ ${Math.exp(lnN).toExponential(1)} (p = ${p.toFixed(2)})`);
}
