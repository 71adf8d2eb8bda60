/**
 * Every input error of `chronomesh solve` through the real command line: exit status 2, exactly
 * one line on stderr that names the problem, no stack trace (unless --debug).
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './spawn';

const dir = mkdtempSync(join(tmpdir(), 'chronomesh-cli-'));
const rod = { domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 1, initial: '1', maxDofs: 200 };
function file(name: string, content: unknown): string {
  const p = join(dir, name);
  writeFileSync(p, typeof content === 'string' ? content : JSON.stringify(content));
  return p;
}

const CASES: [string, string[], RegExp][] = [
  ['unknown field in a boundary part', ['solve', file('bnd-field.json', { ...rod, boundary: [{ kind: 'flux', where: 'x > 0.5', flx: '1' }] })], /boundary\[0\]\.flx: unknown field; did you mean 'flux'\?/],
  ['unknown boundary kind', ['solve', file('bnd-kind.json', { ...rod, boundary: [{ kind: 'convektion', where: '1' }] })], /boundary\[0\]\.kind: must be "value", "flux" or "convection".*did you mean "convection"\?/],
  ['negative transfer coefficient', ['solve', file('bnd-h.json', { ...rod, boundary: [{ kind: 'convection', where: 'x > 0.5', transferCoefficient: '-2' }] })], /boundary\[0\]\.transferCoefficient/],
  ['unreadable file', ['solve', join(dir, 'missing.json')], /missing\.json: cannot read the problem file \(ENOENT\)/],
  ['invalid JSON', ['solve', file('bad.json', '{"horizon": 1,,}')], /bad\.json: invalid JSON/],
  ['unknown field with suggestion', ['solve', file('unknown.json', { ...rod, horizn: 1 })], /horizn: unknown field; did you mean 'horizon'\?/],
  ['unknown domain field', ['solve', file('celss.json', { ...rod, domain: { shape: 'interval', from: 0, to: 1, celss: 2 } })], /domain\.celss: unknown field; did you mean 'cells'\?/],
  ['shape under another key', ['solve', file('kind.json', { ...rod, domain: { kind: 'interval', from: 0, to: 1 } })], /domain\.shape: is missing; found "kind": "interval" — did you mean "shape": "interval"\?/],
  ['boundary part without its kind', ['solve', file('nokind.json', { ...rod, boundary: [{ where: 'x < 0.5', flux: '1' }] })], /boundary\[0\]\.kind: is missing; the part has the fields of a "flux" part — did you mean "kind": "flux"\?/],
  ['missing field named as missing', ['solve', file('noshape.json', { ...rod, domain: { from: 0, to: 1 } })], /domain\.shape: must be one of .*found nothing \(the field is missing\)/],
  ['probe given as a point without its time', ['solve', file('probept.json', { ...rod, probes: [[0.5]] })], /probes\[0\]: must be \[t, x\] \(2 numbers\), found a list of 1; .*"sensors"/],
  ['boundary part that selects no edge', ['solve', file('noedge.json', { ...rod, boundary: [{ kind: 'flux', where: 'x == 0.3', flux: '1' }] })], /boundary\[0\]\.where selects no boundary edge: it is false at both end points \(x = 0 and x = 1\); a part must select at least one edge/],
  ['insulated that selects no edge', ['solve', file('noins.json', { ...rod, insulated: 'x > 2' })], /insulated selects no boundary edge: it is false at both end points \(x = 0 and x = 1\)/],
  ['unknown shape', ['solve', file('shape.json', { ...rod, domain: { shape: 'rectangel', from: [0, 0], to: [1, 1] } })], /domain\.shape: must be one of .*did you mean "rectangle"\?/],
  ['wrong type', ['solve', file('type.json', { ...rod, horizon: '1' })], /horizon: must be a number > 0 \(the final time T\), found the string "1"/],
  ['missing field', ['solve', file('nohorizon.json', { domain: rod.domain })], /horizon: is required/],
  ['out of range', ['solve', file('bulk.json', { ...rod, bulk: 1.5 })], /bulk: must be in \(0, 1\)/],
  ['expression does not parse', ['solve', file('parse.json', { ...rod, initial: 'sin(x' })], /initial: does not parse: .*column/],
  ['unknown function', ['solve', file('fn.json', { ...rod, source: 'exq(-t)' })], /source: unknown function 'exq'; did you mean 'exp'\?/],
  ['variable not allowed', ['solve', file('var.json', { ...rod, initial: 't*x' })], /initial: unknown name 't' \(initial may depend on x only\)/],
  ['expression NaN at a point', ['solve', file('nan.json', { ...rod, initial: 'sqrt(x - 0.5)' })], /initial: "sqrt\(x - 0.5\)" evaluates to NaN at x = 0(\.\d+)? \(expected a finite number\)/],
  ['source infinite at a point', ['solve', file('inf.json', { ...rod, source: '1/(t - 0.5)' })], /source: "1\/\(t - 0.5\)" evaluates to Infinity at t = 0.5, x = \S+ \(expected a finite number\)/],
  ['diffusion not positive', ['solve', file('kappa.json', { ...rod, diffusion: 'x - 0.5' })], /diffusion: "x - 0.5" evaluates to -0.25 at x = 0.25 \(expected a finite number > 0\)/],
  ['invalid mesh', ['solve', file('mesh.json', { ...rod, domain: { shape: 'mesh', points: [[0, 0], [1, 0], [2, 0]], triangles: [[0, 1, 2]] } })], /domain: .*(area|degenerate)/i],
  ['triangle index out of range', ['solve', file('index.json', { ...rod, domain: { shape: 'mesh', points: [[0, 0], [1, 0], [0, 1]], triangles: [[0, 1, 3]] } })], /domain\.triangles\[0\]\[2\]: must be \(an integer in \[0, 2\]\), found 3/],
  ['probe outside the domain', ['solve', file('probe.json', { ...rod, probes: [[0.5, 2]] })], /probes\[0\]: the point \(2\) lies outside the domain/],
  ['probe time beyond horizon', ['solve', file('probet.json', { ...rod, probes: [[3, 0.5]] })], /probes\[0\]\[0\] \(t\): must be in \[0, horizon = 1\], found 3/],
  ['unwritable --out', ['solve', file('ok.json', rod), '--out', join(file('plain.txt', 'x'), 'sub')], /--out .*plain\.txt\/sub: folder cannot be created or written \(ENOTDIR\)/],
  ['unknown option with suggestion', ['solve', file('ok2.json', rod), '--jsn'], /solve: unknown option --jsn; did you mean --json\?/],
  ['no problem file', ['solve'], /solve: expected one problem file, found 0/],
  ['unknown command', ['slove', 'x.json'], /unknown command 'slove'; did you mean 'solve'\?/],
];

describe('chronomesh solve: input errors exit 2 with one clear line', () => {
  // Spawned concurrently: each child needs about a second to start.
  const runs = Promise.all(CASES.map(([, args]) => runCli(args)));
  CASES.forEach(([name, , pattern], i) => {
    it(name, async () => {
      const r = (await runs)[i]!;
      expect(r.status).toBe(2);
      const lines = r.stderr.trimEnd().split('\n');
      expect(lines.length, r.stderr).toBe(1);
      expect(lines[0]).toMatch(/^chronomesh: /);
      expect(lines[0]).toMatch(pattern);
      expect(r.stderr).not.toMatch(/\n\s+at /);
      expect(r.stdout).toBe('');
    }, 180000);
  });

  it('--debug adds the stack trace', async () => {
    const r = await runCli(['solve', file('dbg.json', { ...rod, horizn: 1 }), '--debug']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/\n\s+at /);
  }, 180000);
});
