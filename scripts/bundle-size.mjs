#!/usr/bin/env node
/**
 * Bundle sizes a user's bundler would produce from the built package (dist/index.js):
 * for each import below, esbuild bundles `import { … } from 'chronomesh'` minified for the
 * browser-neutral platform (tree shaking on, `sideEffects: false` honoured) and the script prints
 * minified and gzip sizes. Fails when a one-function import exceeds the budget.
 *
 * esbuild is not a declared dependency: it comes with tsup and vite (devDependencies).
 *
 * Usage: node scripts/bundle-size.mjs [--json]   (after `npm run build`)
 */
import { build } from 'esbuild';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const BUDGET_KB = 40; // one-function imports, minified
const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));

/** [label, import list, subpath, is a one-function import (budgeted)] */
const cases = [
  ['ChronomeshError', 'ChronomeshError', '.', true],
  ['intervalDomain', 'intervalDomain', '.', true],
  ['evaluateTemporal', 'evaluateTemporal', '.', true],
  ['HeatProblem', 'HeatProblem', '.', true],
  ['solve', 'solve', '.', false],
  ['SpaceTimeSystem + DoubleTree + HeatProblem', 'SpaceTimeSystem, DoubleTree, HeatProblem', '.', false],
  ['everything (import *)', '*', '.', false],
];

function entryFile(sub) {
  const e = pkg.exports?.[sub];
  const target = typeof e === 'string' ? e : e?.import?.default ?? e?.import ?? e?.default;
  if (!target) throw new Error(`package.json has no ESM export for ${sub}`);
  return join(root, target);
}

const rows = [];
let failed = false;
for (const [label, names, sub, budgeted] of cases) {
  const file = entryFile(sub);
  if (!existsSync(file)) throw new Error(`${file} is missing: run npm run build first`);
  const spec = JSON.stringify(file);
  const contents = names === '*'
    ? `import * as m from ${spec}; globalThis.__keep = m;`
    : `import { ${names} } from ${spec}; globalThis.__keep = [${names}];`;
  const r = await build({
    stdin: { contents, resolveDir: root, loader: 'js' },
    bundle: true, minify: true, write: false, format: 'esm', platform: 'neutral',
    mainFields: ['module', 'main'], target: 'es2022', logLevel: 'silent',
  });
  const code = r.outputFiles[0].contents;
  const kb = code.length / 1024;
  const gz = gzipSync(code).length / 1024;
  const over = budgeted && kb > BUDGET_KB;
  if (over) failed = true;
  rows.push({ import: label, minifiedKB: +kb.toFixed(1), gzipKB: +gz.toFixed(1), budgetKB: budgeted ? BUDGET_KB : null, over });
}

if (process.argv.includes('--json')) console.log(JSON.stringify(rows, null, 2));
else {
  console.log('bundle size (esbuild --bundle --minify, from dist/index.js)');
  for (const r of rows) {
    console.log(`  ${r.import.padEnd(44)} ${String(r.minifiedKB).padStart(7)} KB min ${String(r.gzipKB).padStart(6)} KB gzip${r.budgetKB ? `  (budget ${r.budgetKB} KB${r.over ? ': OVER' : ''})` : ''}`);
  }
}
if (failed) {
  console.error(`bundle size: a one-function import exceeds ${BUDGET_KB} KB minified`);
  process.exit(1);
}
