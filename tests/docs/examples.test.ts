/**
 * Every `@example` code block in src/ and every ```ts block of the README must run
 * against the public entry point: imports from 'chronomesh' are redirected to
 * src/index.ts and the block is executed as a module. A line that states its
 * output (`console.log(…); // → expected`) must print exactly that (numbers to
 * the digits stated), and a comment that looks like an output claim without the
 * `→` marker is refused, so no stated output goes unchecked.
 * (Type checking of the same blocks: scripts/check-examples.mjs.)
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { format } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import { outputMatches, readmeBlocks, statedOutputs, tsdocExamples, unmarkedClaims } from '../../scripts/examples.mjs';

const root = join(__dirname, '..', '..');
const scratch = join(root, 'node_modules', '.cache', 'chronomesh-examples');
const all = [...tsdocExamples(root), ...readmeBlocks(root)];

type Printed = Map<number, string>;
declare global {
  // eslint-disable-next-line no-var
  var __chronomeshExampleOut: ((key: string, line: number, ...args: unknown[]) => void) | undefined;
}
const printed = new Map<string, Printed>();
globalThis.__chronomeshExampleOut = (key, line, ...args) => {
  const m = printed.get(key) ?? new Map<number, string>();
  if (!m.has(line)) m.set(line, format(...args));
  printed.set(key, m);
};

// Examples print nothing during the test run. Some start asynchronous work that finishes after
// their module has loaded (`solveAdaptiveAsync(…).then(…)` with an AbortSignal.timeout of at most
// 3 s); console.log stays silenced until that work has settled, so no output arrives while the
// worker shuts down.
const realLog = console.log;
console.log = () => {};
afterAll(async () => {
  await new Promise((resolve) => setTimeout(resolve, 4000));
  console.log = realLog;
}, 20_000);

describe('TSDoc and README examples', () => {
  it('there are examples to run', () => expect(all.length).toBeGreaterThan(30));
  it('stated outputs are recognised', () => {
    expect(outputMatches('Float64Array(3) [ 5, 0, 7 ]', 'Float64Array(3) [5, 0, 7]')).toBe(true);
    expect(outputMatches('0.36787944117144233', '0.3679')).toBe(true);
    expect(outputMatches('0.3681', '0.3679')).toBe(false);
    expect(outputMatches('49 112', '49 113')).toBe(false);
    expect(outputMatches('true', 'false')).toBe(false);
    expect(unmarkedClaims('console.log(x); // 5\nconsole.log(y); // → 5\nconsole.log(z); // heat left')).toEqual([1]);
  });
  it.each(all.map((e) => [`${e.file}:${e.line}`, e] as const))('%s runs and prints what it states', async (name, ex) => {
    expect(unmarkedClaims(ex.code), `${name}: mark stated outputs with "// → "`).toEqual([]);
    const stated = statedOutputs(ex.code);
    mkdirSync(scratch, { recursive: true });
    const index = pathToFileURL(join(root, 'src', 'index.ts')).href;
    const problemFile = pathToFileURL(join(root, 'src', 'problem-file', 'index.ts')).href;
    const files = pathToFileURL(join(root, 'src', 'files', 'index.ts')).href;
    const lines = ex.code.replace(/from 'chronomesh\/problem-file'/g, `from '${problemFile}'`).replace(/from 'chronomesh\/files'/g, `from '${files}'`).replace(/from 'chronomesh'/g, `from '${index}'`).split('\n');
    for (const { line } of stated) {
      lines[line - 1] = lines[line - 1]!.replace('console.log(', `globalThis.__chronomeshExampleOut!(${JSON.stringify(name)}, ${line}, `);
    }
    const code = lines.join('\n');
    const path = join(scratch, `${ex.file.replace(/[\\/.]/g, '_')}_${ex.line}.ts`);
    writeFileSync(path, code.includes('import ') ? code : `${code}\nexport {};\n`);
    await import(pathToFileURL(path).href);
    for (const { line, expected } of stated) {
      const actual = printed.get(name)?.get(line);
      expect(actual, `${name} line ${line} never printed`).toBeDefined();
      expect(outputMatches(actual!, expected), `${name} line ${line}: printed "${actual}", the example states "${expected}"`).toBe(true);
    }
  }, 30_000); // a few examples run a small adaptive solve (the README's laminate: about 2.5 s alone)
});
