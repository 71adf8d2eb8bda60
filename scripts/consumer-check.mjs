#!/usr/bin/env node
/**
 * Installs the packed package the way a user does and uses it from fresh projects:
 *
 *   npm pack → one temporary directory with the tarball installed (its dependencies
 *   come from the npm cache/registry as for any user), and four consumer projects in it:
 *     ts-esm-node16   "type": "module",   module/moduleResolution node16, strict, skipLibCheck false
 *     ts-cjs-node16   "type": "commonjs", module/moduleResolution node16, strict, skipLibCheck false
 *     ts-bundler      module esnext, moduleResolution bundler, strict, skipLibCheck false
 *     js              plain .mjs (import) and .cjs (require) files
 *
 * Every ```ts block of the README is compiled in the three TypeScript projects (the
 * `@example` blocks of src/ are type-checked there too) and the README blocks are run
 * as ES modules (ts-esm-node16 output) and as CommonJS (ts-cjs-node16 output).
 *
 * Usage: node scripts/consumer-check.mjs [--keep] [--no-run]
 * Exit status 0 when every step passed; prints one line per step.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readmeBlocks, tsdocExamples } from './examples.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const keep = process.argv.includes('--keep');
const run = !process.argv.includes('--no-run');
const tsc = join(root, 'node_modules', 'typescript', 'bin', 'tsc');
const lock = JSON.parse(readFileSync(join(root, 'package-lock.json'), 'utf8'));
const typesNode = lock.packages['node_modules/@types/node']?.version;

const work = mkdtempSync(join(tmpdir(), 'chronomesh-consumers-'));
let failed = 0;
function step(name, fn) {
  const t0 = Date.now();
  try {
    const note = fn();
    console.log(`ok    ${name}${note ? ` — ${note}` : ''} (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
  } catch (e) {
    failed++;
    console.log(`FAIL  ${name} (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
    console.log(String(e.stdout ?? '') + String(e.stderr ?? '') || String(e.message ?? e));
  }
}
const sh = (cmd, args, cwd, extra = {}) =>
  execFileSync(cmd, args, { cwd, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'], ...extra });
const json = (path, obj) => writeFileSync(path, `${JSON.stringify(obj, null, 2)}\n`);

let tarball = '';
step('npm pack', () => {
  const out = JSON.parse(sh('npm', ['pack', '--json', '--pack-destination', work], root));
  tarball = join(work, out[0].filename);
  return `${out[0].filename}: ${(out[0].size / 1024).toFixed(1)} KB packed, ${(out[0].unpackedSize / 1024).toFixed(1)} KB unpacked, ${out[0].files.length} files`;
});

step('npm install <tarball> into a fresh project', () => {
  json(join(work, 'package.json'), { name: 'consumer-root', private: true });
  const deps = [tarball];
  if (typesNode) deps.push(`@types/node@${typesNode}`); // for console.log in the examples
  sh('npm', ['install', '--no-audit', '--no-fund', '--prefer-offline', ...deps], work);
  const installed = JSON.parse(readFileSync(join(work, 'node_modules', 'chronomesh', 'package.json'), 'utf8'));
  return `chronomesh ${installed.version} with ${Object.keys(installed.dependencies ?? {}).join(', ')}`;
});

const readme = readmeBlocks(root);
const tsdoc = tsdocExamples(root);
const withExport = (code) => (/^\s*(import|export)\s/m.test(code) ? code : `${code}\nexport {};\n`);

const strict = {
  strict: true,
  skipLibCheck: false,
  noUncheckedIndexedAccess: true,
  exactOptionalPropertyTypes: true,
  target: 'ES2022',
  lib: ['ES2022'],
  types: ['node'],
  outDir: 'out',
  rootDir: '.',
};

function tsProject(name, type, compilerOptions, files) {
  const dir = join(work, name);
  mkdirSync(dir, { recursive: true });
  json(join(dir, 'package.json'), { name, private: true, type });
  json(join(dir, 'tsconfig.json'), { compilerOptions: { ...strict, ...compilerOptions }, include: ['*.ts'] });
  for (const [file, code] of files) writeFileSync(join(dir, file), withExport(code));
  return dir;
}

const readmeFiles = readme.map((b, i) => [`readme-${i + 1}.ts`, b.code]);
const exampleFiles = tsdoc.map((b, i) => [`example-${i + 1}.ts`, b.code]);
const where = new Map([...readme.map((b, i) => [`readme-${i + 1}.ts`, `README.md:${b.line}`]),
  ...tsdoc.map((b, i) => [`example-${i + 1}.ts`, `${b.file}:${b.line}`])]);
const explain = (e) => {
  // Point tsc's messages at the README / source line the example came from.
  const text = String(e.stdout ?? '') + String(e.stderr ?? '');
  e.stdout = text.replace(/(readme|example)-\d+\.ts/g, (f) => `${f} [${where.get(f)}]`);
  return e;
};
const compile = (dir) => {
  try {
    sh(process.execPath, [tsc, '-p', dir], dir);
  } catch (e) {
    throw explain(e);
  }
};

// Top-level await exists only in ES modules: such @examples are left out of the CommonJS project.
const esmOnly = (code) => /^\S[^\n]*\bawait\b/m.test(code);
const projects = [
  ['ts-esm-node16', 'module', { module: 'node16', moduleResolution: 'node16' }, true],
  ['ts-cjs-node16', 'commonjs', { module: 'node16', moduleResolution: 'node16' }, false],
  ['ts-bundler', 'module', { module: 'esnext', moduleResolution: 'bundler', noEmit: true }, true],
];
const dirs = {};
for (const [name, type, opts, withTla] of projects) {
  const examples = withTla ? exampleFiles : exampleFiles.filter(([, code]) => !esmOnly(code));
  const skipped = exampleFiles.length - examples.length;
  step(`${name}: tsc (strict, skipLibCheck false) on ${readmeFiles.length} README blocks + ${examples.length} @examples${skipped ? ` (${skipped} with top-level await left out)` : ''}`, () => {
    dirs[name] = tsProject(name, type, opts, [...readmeFiles, ...examples]);
    compile(dirs[name]);
  });
}

step('js: import (ESM) and require (CommonJS) of the installed package', () => {
  const dir = join(work, 'js');
  mkdirSync(dir, { recursive: true });
  const body = `
const problem = new m.HeatProblem({ domain: m.intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
const r = m.solve(problem, 4);
if (!(r.solution.evaluate(0.1, [0.5])[0] > 0)) throw new Error('no positive value');
if (!(r.solution.sampleGrid([0.1], [0.5]).get(0, 0) > 0)) throw new Error('sampleGrid');`;
  writeFileSync(join(dir, 'esm.mjs'), `import * as m from 'chronomesh';${body}\n`);
  writeFileSync(join(dir, 'cjs.cjs'), `const m = require('chronomesh');${body}\n`);
  sh(process.execPath, ['esm.mjs'], dir);
  sh(process.execPath, ['cjs.cjs'], dir);
});

step('bin: every command of the package answers --help', () => {
  const installed = JSON.parse(readFileSync(join(work, 'node_modules', 'chronomesh', 'package.json'), 'utf8'));
  const bins = Object.keys(installed.bin ?? {});
  for (const b of bins) sh(join(work, 'node_modules', '.bin', b), ['--help'], work);
  return bins.join(', ');
});

if (run) {
  for (const [name, kind] of [['ts-esm-node16', 'ES modules'], ['ts-cjs-node16', 'CommonJS']]) {
    step(`run the README blocks as ${kind} (${name} output)`, () => {
      if (!dirs[name]) throw new Error('not compiled');
      for (const [file] of readmeFiles) {
        try {
          sh(process.execPath, [join('out', file.replace(/\.ts$/, '.js'))], dirs[name]);
        } catch (e) {
          e.stdout = `${where.get(file)} (${file}):\n${e.stdout ?? ''}`;
          throw e;
        }
      }
      return `${readmeFiles.length} blocks`;
    });
  }
}

if (keep || failed) console.log(`consumer projects kept in ${work}`);
else rmSync(work, { recursive: true, force: true });
console.log(failed ? `consumer check: ${failed} step(s) failed` : 'consumer check: all steps passed');
process.exit(failed ? 1 : 0);
