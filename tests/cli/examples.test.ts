/** Every shipped problem file runs with small budgets and documents itself. */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { solveFile } from '../../src/cli/solve-command';
import { ROOT } from './spawn';

const dir = join(ROOT, 'examples');
const files = readdirSync(dir).filter((f) => f.endsWith('.json')).sort();

describe('examples/', () => {
  it('has at least three problem files, each with a title and a paragraph of description', () => {
    expect(files.length).toBeGreaterThanOrEqual(3);
    for (const f of files) {
      const spec = JSON.parse(readFileSync(join(dir, f), 'utf8')) as { title?: string; description?: string };
      expect(spec.title, f).toBeTruthy();
      expect((spec.description ?? '').split(/\s+/).length, f).toBeGreaterThan(40);
    }
  });

  for (const f of files) {
    it(`${f} runs with small budgets`, () => {
      const lines: string[] = [];
      const { run } = solveFile(join(dir, f), { quiet: true, log: (l) => lines.push(l), budget: { maxDofs: 600, maxSeconds: 20 } });
      expect(run.steps.length).toBeGreaterThan(0);
      expect(run.steps[run.steps.length - 1]!.dofs).toBeLessThanOrEqual(600);
      for (const p of run.probes) expect(Number.isFinite(p.value)).toBe(true);
      expect(lines.join('\n')).toMatch(/steps/);
    }, 120000);
  }
});
