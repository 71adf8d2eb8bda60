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

/**
 * Stated outputs. An example states what a line prints with `// → expected` after the
 * `console.log(…)`, in the form `node` prints it (util.format); numbers are compared to the
 * digits stated (0.3679 matches 0.36787944), everything else token by token, ignoring spaces.
 * Text after ` — ` is commentary.
 */
export function statedOutputs(code) {
  const out = [];
  code.split('\n').forEach((l, i) => {
    const m = /console\.log\(.*\/\/ → (.*)$/.exec(l);
    if (m) out.push({ line: i + 1, expected: m[1].split(' — ')[0].trim() });
  });
  return out;
}

/** console.log lines whose comment starts like a value (number, bracket, true/false, NaN, a typed array) but has no →. A comment starting with a word or a quote is prose. */
export function unmarkedClaims(code) {
  const out = [];
  code.split('\n').forEach((l, i) => {
    if (/console\.log\(.*\/\/ (?!→)(-?\d|\[|true\b|false\b|NaN\b|[A-Z]\w*Array\b)/.test(l)) out.push(i + 1);
  });
  return out;
}

const TOKEN = /-?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?|NaN|-?Infinity|'[^']*'|"[^"]*"|[A-Za-z_$][\w$]*|[^\s\w]/g;
const NUM = /^-?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?$/;

export function outputMatches(actual, expected) {
  const a = actual.match(TOKEN) ?? [];
  const e = expected.match(TOKEN) ?? [];
  if (a.length !== e.length) return false;
  return e.every((t, i) => {
    if (!NUM.test(t)) return t === a[i];
    if (!NUM.test(a[i])) return false;
    const [mant, exp] = t.toLowerCase().split('e');
    const decimals = (mant.split('.')[1] ?? '').length;
    const tol = 0.5 * 10 ** (-decimals) * 10 ** Number(exp ?? 0);
    return Math.abs(Number(a[i]) - Number(t)) <= tol * (1 + 1e-12);
  });
}
