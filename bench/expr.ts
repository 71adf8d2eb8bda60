/**
 * Benchmark cases of problem-file expressions (`expr.` rows): ns per evaluation of compiled
 * expressions typical of source terms and coefficients, evaluated at varying points.
 */
import type { BenchCase } from './harness';
import { compileExpression } from '../src/problem-file/index';

const EXPRESSIONS: [string, string][] = [
  ['expr.source-gaussian', '40*exp(-((x+0.5)^2+(y-0.5)^2)/0.02)*(t >= 0.25)'],
  ['expr.source-moving', '100*exp(-((x - 0.2 - 0.6*t)^2 + (y - 0.5)^2)/0.005)'],
  ['expr.coefficient-layers', 'x < 0.5 ? 1 : 0.05'],
];

/** Evaluations per timed run. */
const EVALS = 4096;

export function exprCases(quick: boolean): BenchCase[] {
  return EXPRESSIONS.map(([component, source]) => ({
    component,
    sizes: [quick ? 512 : EVALS],
    setup(size: number) {
      const f = compileExpression(source, 'source', ['t', 'x', 'y']).fn;
      const pts = new Float64Array(3 * size);
      for (let i = 0; i < size; i++) {
        pts[3 * i] = (i % 97) / 97;
        pts[3 * i + 1] = ((i * 31) % 101) / 50.5 - 1;
        pts[3 * i + 2] = ((i * 17) % 103) / 51.5 - 1;
      }
      let sink = 0;
      return {
        units: size,
        run: () => {
          let s = 0;
          for (let i = 0; i < size; i++) s += f(pts[3 * i]!, pts[3 * i + 1]!, pts[3 * i + 2]!);
          sink += s;
        },
        extra: { expression: source },
      };
    },
  }));
}
