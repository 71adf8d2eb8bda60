/**
 * Script (not a unit test): condition numbers of V·(A + αM) up to ~1e6 vertices on
 * real domains, Lanczos estimates from 30 PCG steps with the test-side nodal operator.
 * Run: node --import tsx tests/space/multigrid/condition-table.ts [--quick]
 * Prints a markdown table (one row per mesh, one column per α).
 */
import { intervalDomain, rectangleDomain, type SpatialDomain } from '../../../src/space/index';
import type { LeafMesh } from '../../../src/space/leaf-mesh';
import { MultilevelPreconditioner } from '../../../src/space/multigrid/index';
import { makeOperator, pcg, randomVector } from './reference';
import { uniformGenerationProblem } from '../../../bench/space-problems';

const ALPHAS = [0, 1, 1e2, 1e4, 1e6, 1e8];
const quick = process.argv.includes('--quick');


function uniform2d(G: number): LeafMesh {
  const p = uniformGenerationProblem(G);
  return p.dom.leafMesh(p.set);
}

function graded2d(size: number): LeafMesh {
  let H = 0.5;
  let dom: SpatialDomain = rectangleDomain(0, 1, 0, 1, 2, 2);
  let set = dom.adaptedSet((x, y) => H * Math.hypot(x, y), 40);
  for (let it = 0; it < 4 && Math.abs(set.length / size - 1) > 0.1; it++) {
    H *= Math.sqrt(set.length / size);
    dom = rectangleDomain(0, 1, 0, 1, 2, 2);
    set = dom.adaptedSet((x, y) => H * Math.hypot(x, y), 40);
  }
  return dom.leafMesh(set);
}

function edge2d(generations: number): LeafMesh {
  const dom = rectangleDomain(0, 1, 0, 1, 1, 1);
  return dom.leafMesh(dom.refineTowards(dom.uniformSet(1), [0, 0, 1, 0], generations));
}

function uniform1d(level: number): LeafMesh {
  const dom = intervalDomain(0, 1, 2);
  return dom.leafMesh(dom.uniformSet(level));
}

function graded1d(level: number, generations: number): LeafMesh {
  const dom = intervalDomain(0, 1, 2, { insulated: [[2]] });
  return dom.leafMesh(dom.refineTowards(dom.uniformSet(level), [1 / 3], generations));
}

const rows: [string, () => LeafMesh][] = quick
  ? [['2d uniform G=10', () => uniform2d(10)], ['2d corner-graded 1e4', () => graded2d(1e4)]]
  : [
      ['1d uniform L=10', () => uniform1d(10)],
      ['1d uniform L=19', () => uniform1d(19)],
      ['1d graded to x=1/3, L=4 then +40 gen', () => graded1d(4, 40)],
      ['1d graded to x=1/3, L=19 then +20 gen', () => graded1d(19, 20)],
      ['2d uniform G=10', () => uniform2d(10)],
      ['2d uniform G=14', () => uniform2d(14)],
      ['2d uniform G=18', () => uniform2d(18)],
      ['2d corner-graded (40 gen) 1e4', () => graded2d(1e4)],
      ['2d corner-graded (40 gen) 1e5', () => graded2d(1e5)],
      ['2d corner-graded (40 gen) 1e6', () => graded2d(1e6)],
      ['2d edge-graded 24 gen', () => edge2d(24)],
      ['2d edge-graded 30 gen', () => edge2d(30)],
      ['2d edge-graded 36 gen', () => edge2d(36)],
    ];

console.log(`| mesh | vertices | levels | ${ALPHAS.map((a) => `α=${a === 0 ? 0 : a.toExponential(0)}`).join(' | ')} |`);
console.log(`|---|---:|---:|${ALPHAS.map(() => '---:').join('|')}|`);
for (const [name, mk] of rows) {
  const mesh = mk();
  const pre = new MultilevelPreconditioner(mesh);
  const op = makeOperator(mesh);
  const b = randomVector(mesh, 1);
  const conds = ALPHAS.map((alpha) => {
    const r = pcg((x, y) => op(alpha, x, y), (rr, z) => pre.applyNodal(rr, z, alpha), b, { maxIter: 30, relTol: 1e-14 });
    return (r.lambdaMax / r.lambdaMin).toFixed(2);
  });
  console.log(`| ${name} | ${mesh.vertexCount} | ${pre.levels} | ${conds.join(' | ')} |`);
}
