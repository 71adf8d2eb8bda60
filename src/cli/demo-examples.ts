/** The demo's last part: every problem file of examples/ through `chronomesh solve`. */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { solveFile } from './solve-command';

/** The shipped examples/ folder: next to src/ (sources) or to dist/ (package). */
export function examplesDir(): string | null {
  const here = typeof __dirname === 'string' ? __dirname : dirname(fileURLToPath(import.meta.url));
  for (const up of ['../..', '..']) {
    const d = resolve(here, up, 'examples');
    if (existsSync(d)) return d;
  }
  return null;
}

/** Runs each example (with small budgets when `quick`) writing into `out/NAME/`. */
export function runShippedExamples(quick: boolean, out: string, onWritten: (f: string) => void): void {
  const dir = examplesDir();
  if (!dir) {
    console.log('examples/ not found next to the program; skipped');
    return;
  }
  for (const f of readdirSync(dir).filter((f) => f.endsWith('.json')).sort()) {
    const file = join(dir, f);
    const spec = JSON.parse(readFileSync(file, 'utf8')) as { description?: string; maxDofs?: number; maxSeconds?: number };
    const name = f.replace(/\.json$/, '');
    console.log(`\n-- ${name}: ${spec.description ?? ''}`);
    console.log(`   chronomesh solve examples/${f} --out ${join(out, name)}${quick ? '   (demo --quick: maxDofs ≤ 1500)' : ''}`);
    const { written } = solveFile(file, {
      out: join(out, name), quiet: true,
      log: (l) => console.log(`   ${l}`),
      ...(quick ? { budget: { maxDofs: 1500, maxSeconds: 10 } } : {}),
    });
    written.forEach(onWritten);
  }
}
