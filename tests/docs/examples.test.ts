/**
 * Every `@example` code block in src/ must run against the public entry
 * point: imports from 'chronomesh' are redirected to src/index.ts and the
 * block is executed as a module.
 */
import { mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = join(__dirname, '..', '..');
const scratch = join(root, 'node_modules', '.cache', 'chronomesh-examples');

function sources(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sources(join(dir, e.name)) : e.name.endsWith('.ts') ? [join(dir, e.name)] : []);
}

interface Example { file: string; line: number; code: string }

function examples(): Example[] {
  const out: Example[] = [];
  for (const file of sources(join(root, 'src'))) {
    const text = readFileSync(file, 'utf8');
    const re = /@example\s*\n((?:\s*\*[^\n]*\n)*?)\s*\*\s*```ts\n((?:\s*\*[^\n]*\n)*?)\s*\*\s*```/g;
    let m: RegExpExecArray | null;
    while ((m = re.exec(text))) {
      const code = m[2]!.split('\n').map((l) => l.replace(/^\s*\* ?/, '')).join('\n');
      out.push({ file: relative(root, file), line: text.slice(0, m.index).split('\n').length, code });
    }
  }
  return out;
}

/** The ```ts blocks of the README, which users copy first. */
function readmeExamples(): Example[] {
  const text = readFileSync(join(root, 'README.md'), 'utf8');
  const out: Example[] = [];
  const re = /```ts\n([\s\S]*?)```/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text))) out.push({ file: 'README.md', line: text.slice(0, m.index).split('\n').length, code: m[1]! });
  return out;
}

const all = [...examples(), ...readmeExamples()];

describe('TSDoc examples', () => {
  it('there are examples to run', () => expect(all.length).toBeGreaterThan(30));
  it.each(all.map((e) => [`${e.file}:${e.line}`, e] as const))('%s runs', async (_name, ex) => {
    mkdirSync(scratch, { recursive: true });
    const index = pathToFileURL(join(root, 'src', 'index.ts')).href;
    const code = ex.code.replace(/from 'chronomesh'/g, `from '${index}'`);
    const path = join(scratch, `${ex.file.replace(/[\\/.]/g, '_')}_${ex.line}.ts`);
    writeFileSync(path, code.includes('import ') ? code : `${code}\nexport {};\n`);
    const log = console.log;
    console.log = () => {};
    try {
      await import(pathToFileURL(path).href);
    } finally {
      console.log = log;
    }
  });
});
