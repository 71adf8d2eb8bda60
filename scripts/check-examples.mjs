#!/usr/bin/env node
/**
 * Type-checks every ```ts block of the README and every `@example` block of src/:
 * each is written to its own .ts file under node_modules/.cache/ with 'chronomesh'
 * mapped to src/index.ts, and tsc runs on them with the repository's strict options
 * (the consumer check adds noUncheckedIndexedAccess etc. against the packed
 * declarations). Errors point back to the README/source line.
 * tests/docs/examples.test.ts runs the same blocks and checks their stated outputs;
 * scripts/consumer-check.mjs type-checks them again against the packed declarations.
 *
 * Usage: node scripts/check-examples.mjs
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readmeBlocks, tsdocExamples } from './examples.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dir = join(root, 'node_modules', '.cache', 'chronomesh-examples-tsc');
rmSync(dir, { recursive: true, force: true });
mkdirSync(dir, { recursive: true });

const blocks = [...readmeBlocks(root), ...tsdocExamples(root)];
const where = new Map();
blocks.forEach((b, i) => {
  const name = `ex-${String(i + 1).padStart(3, '0')}.ts`;
  where.set(name, b);
  writeFileSync(join(dir, name), /^\s*(import|export)\s/m.test(b.code) ? b.code : `${b.code}\nexport {};\n`);
});
writeFileSync(join(dir, 'tsconfig.json'), JSON.stringify({
  compilerOptions: {
    target: 'ES2022', module: 'ESNext', moduleResolution: 'Bundler', lib: ['ES2022'],
    types: ['node'], typeRoots: [join(root, 'node_modules', '@types')],
    strict: true, isolatedModules: true, esModuleInterop: true,
    skipLibCheck: false, noEmit: true, baseUrl: root,
    // chronomesh/files maps to src/ too, so that its types are the same declarations as the core's
    // (chronomesh/problem-file resolves to dist/ through the package's exports).
    paths: { chronomesh: [join(root, 'src', 'index.ts')], 'chronomesh/files': [join(root, 'src', 'files', 'index.ts')] },
  },
  include: ['*.ts', join(root, 'src', 'types', '*.d.ts')],
}, null, 2));

try {
  execFileSync(process.execPath, [join(root, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', dir], { encoding: 'utf8', stdio: 'pipe' });
  console.log(`examples type-check: ${blocks.length} blocks (README + @example) ok`);
} catch (e) {
  const text = `${e.stdout ?? ''}${e.stderr ?? ''}`.replace(/(ex-\d+\.ts)\((\d+),(\d+)\)/g, (_m, f, l, c) => {
    const b = where.get(f);
    return b ? `${b.file}:${b.line + Number(l)} (${f}:${l}:${c})` : _m;
  });
  console.log(text);
  console.log('examples type-check: FAILED');
  process.exit(1);
}
