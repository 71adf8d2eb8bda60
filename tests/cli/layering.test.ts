/** The core entry point must not load the problem-file layer or its expression parser. */
import { readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from './spawn';

/** All files reachable from `entry` through static relative imports, and the bare packages imported. */
function importGraph(entry: string): { files: Set<string>; packages: Set<string> } {
  const files = new Set<string>();
  const packages = new Set<string>();
  const stack = [entry];
  while (stack.length > 0) {
    const f = stack.pop()!;
    if (files.has(f)) continue;
    files.add(f);
    const src = readFileSync(f, 'utf8');
    for (const m of src.matchAll(/(?:^|\n)\s*(?:import|export)\s[^;]*?from\s+'([^']+)'/g)) {
      const spec = m[1]!;
      if (!spec.startsWith('.')) { packages.add(spec); continue; }
      const base = resolve(dirname(f), spec);
      const cand = [`${base}.ts`, join(base, 'index.ts')].find((c) => { try { readFileSync(c); return true; } catch { return false; } });
      if (cand) stack.push(cand);
    }
  }
  return { files, packages };
}

describe('layering', () => {
  it('src/index.ts reaches neither src/problem-file nor jsep', () => {
    const g = importGraph(join(ROOT, 'src/index.ts'));
    expect(g.files.size).toBeGreaterThan(30);
    expect([...g.files].filter((f) => f.includes('/problem-file/') || f.includes('/cli/'))).toEqual([]);
    expect(g.packages.has('jsep')).toBe(false);
  });
  it('src/index.ts reaches neither src/files nor any node: module (the core runs in browsers and workers)', () => {
    const g = importGraph(join(ROOT, 'src/index.ts'));
    expect([...g.files].filter((f) => f.includes('/src/files/'))).toEqual([]);
    expect([...g.packages].filter((p) => p.startsWith('node:') || ['fs', 'path', 'os'].includes(p))).toEqual([]);
    // the file layer does use node:fs (so the check above is meaningful)
    expect(importGraph(join(ROOT, 'src/files/index.ts')).packages.has('node:fs')).toBe(true);
  });
  it('the problem-file layer does use jsep (so the check above is meaningful)', () => {
    expect(importGraph(join(ROOT, 'src/problem-file/index.ts')).packages.has('jsep')).toBe(true);
  });
});
