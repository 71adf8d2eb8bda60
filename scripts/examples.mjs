/**
 * Extraction of the code examples users read: the ```ts blocks of README.md and
 * the ```ts blocks under `@example` in the TSDoc of src/. Shared by
 * scripts/consumer-check.mjs, scripts/check-examples.mjs and tests/docs/examples.test.ts.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join, relative } from 'node:path';

function sources(dir) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sources(join(dir, e.name)) : e.name.endsWith('.ts') ? [join(dir, e.name)] : []);
}

/** `@example` blocks of src/: `{ file, line, code }` with the leading ` * ` removed. */
export function tsdocExamples(root) {
  const out = [];
  for (const file of sources(join(root, 'src')).sort()) {
    const text = readFileSync(file, 'utf8');
    const re = /@example\s*\n((?:\s*\*[^\n]*\n)*?)\s*\*\s*```ts\n((?:\s*\*[^\n]*\n)*?)\s*\*\s*```/g;
    let m;
    while ((m = re.exec(text))) {
      const code = m[2].split('\n').map((l) => l.replace(/^\s*\* ?/, '')).join('\n');
      out.push({ file: relative(root, file), line: text.slice(0, m.index).split('\n').length, code });
    }
  }
  return out;
}

/** The ```ts blocks of README.md: `{ file, line, code }`. */
export function readmeBlocks(root) {
  const text = readFileSync(join(root, 'README.md'), 'utf8');
  const out = [];
  const re = /```ts\n([\s\S]*?)```/g;
  let m;
  while ((m = re.exec(text))) out.push({ file: 'README.md', line: text.slice(0, m.index).split('\n').length, code: m[1] });
  return out;
}
