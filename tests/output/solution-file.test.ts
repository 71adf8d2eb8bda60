/**
 * Solution files (docs/solution-files.md): round trips in 1D and 2D (uniform and adaptive sets on a
 * refined user triangulation), the layout read back by an independent reader written from the
 * format description with Node's zlib CRC-32, and every kind of damaged or foreign input giving a
 * CorruptFileError that names what is wrong.
 */
import { crc32 as zlibCrc32 } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import {
  CorruptFileError, HeatProblem, InvalidArgumentError, SpaceTimeSolution, decodeSolution, encodeSolution, intervalDomain,
  problemFingerprint, solve, solveAdaptive, triangulatedDomain, type BoundaryPart, type SpatialDomain,
} from '../../src/index';
import { crc32 } from '../../src/numerics/crc32';
import { rng } from '../helpers/random';

/** Largest |u − v| over random points of the space-time cylinder (points outside a non-convex Ω skipped). */
function maxDifference(a: SpaceTimeSolution, b: SpaceTimeSolution, inside: (x: number, y: number) => boolean, seed: number): { diff: number; checked: number } {
  const r = rng(seed);
  let diff = 0, checked = 0;
  for (let k = 0; k < 400; k++) {
    const t = r() * a.T, x = r(), y = r();
    if (!inside(x, y)) continue;
    const p = a.domain.dim === 1 ? [x] : [x, y];
    const u = a.evaluate(t, p)[0]!, v = b.evaluate(t, p)[0]!;
    diff = Math.max(diff, Math.abs(u - v));
    checked++;
  }
  return { diff, checked };
}

/** A 1D rod: held at 2 on the left, cooling by convection (h = 3, ambient 0.5) on the right. */
function rodProblem(): HeatProblem {
  const boundary: BoundaryPart[] = [
    { kind: 'value', where: [[0]], value: 2 },
    { kind: 'convection', where: [[4]], transferCoefficient: 3, ambient: 0.5 },
  ];
  return new HeatProblem({ domain: intervalDomain(0, 1, 4, { kappa: (x) => (x < 0.5 ? 1 : 0.25), boundary }), T: 0.5, initial: (x) => Math.sin(3 * x) });
}

/**
 * A user triangulation of the unit square minus its upper-right quarter (an L), 6 triangles, with
 * a held face, an insulated face and a flux face.
 */
function lTriangulation(): SpatialDomain {
  const points = [0, 0, 0.5, 0, 1, 0, 0, 0.5, 0.5, 0.5, 1, 0.5, 0, 1, 0.5, 1];
  const triangles = [0, 1, 4, 0, 4, 3, 1, 2, 5, 1, 5, 4, 3, 4, 7, 3, 7, 6];
  const boundary: BoundaryPart[] = [
    { kind: 'value', where: (_mx, my) => my < 1e-9, value: 1 },
    { kind: 'flux', where: (mx) => mx < 1e-9, flux: 0.5 },
  ];
  return triangulatedDomain(points, triangles, { kappa: (x, y) => 1 + x + y, reaction: 0.1, boundary });
}
const insideL = (x: number, y: number): boolean => !(x > 0.5 && y > 0.5);

/** Reads the file as docs/solution-files.md §1 describes, independently of src/: header and named f64 section. */
function independentRead(bytes: Uint8Array): { header: Record<string, unknown>; f64: (name: string) => Float64Array; crcOk: boolean } {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const H = dv.getUint32(8, true);
  const headBytes = bytes.subarray(16, 16 + H);
  const header = JSON.parse(Buffer.from(headBytes).toString('utf8')) as Record<string, unknown>;
  const start = Math.ceil((16 + H) / 8) * 8;
  const sections = header.sections as { name: string; type: string; length: number; offset: number; crc32: string }[];
  let crcOk = zlibCrc32(headBytes) === dv.getUint32(12, true);
  const size = { f64: 8, i32: 4, u8: 1 } as Record<string, number>;
  for (const s of sections) {
    const b = bytes.subarray(start + s.offset, start + s.offset + s.length * size[s.type]!);
    crcOk &&= zlibCrc32(b).toString(16).padStart(8, '0') === s.crc32;
  }
  const f64 = (name: string): Float64Array => {
    const s = sections.find((e) => e.name === name)!;
    return Float64Array.from({ length: s.length }, (_, i) => dv.getFloat64(start + s.offset + 8 * i, true));
  };
  return { header, f64, crcOk };
}

/** The file with its JSON header replaced by `mutate(header)` (CRC recomputed, data kept). */
function rewriteHeader(bytes: Uint8Array, mutate: (h: Record<string, unknown>) => void): Uint8Array {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const H = dv.getUint32(8, true);
  const header = JSON.parse(Buffer.from(bytes.subarray(16, 16 + H)).toString('utf8')) as Record<string, unknown>;
  const data = bytes.subarray(Math.ceil((16 + H) / 8) * 8);
  mutate(header);
  const head = new TextEncoder().encode(JSON.stringify(header));
  const start = Math.ceil((16 + head.length) / 8) * 8;
  const out = new Uint8Array(start + data.length);
  out.set(bytes.subarray(0, 8));
  const ov = new DataView(out.buffer);
  ov.setUint32(8, head.length, true);
  ov.setUint32(12, zlibCrc32(head), true);
  out.set(head, 16);
  out.set(data, start);
  return out;
}

function corruptError(f: () => unknown): CorruptFileError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(CorruptFileError);
    return e as CorruptFileError;
  }
  throw new Error('expected a CorruptFileError, but the call succeeded');
}

describe('CRC-32', () => {
  it('has the standard check value', () => {
    // CRC-32/ISO-HDLC check value of "123456789" = 0xCBF43926 (the catalogue of parametrised CRC
    // algorithms, R. Williams' "A painless guide to CRC error detection algorithms"; from memory).
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
    // and agrees with Node's zlib (an independent implementation) on random data
    const r = rng(7);
    const data = Uint8Array.from({ length: 10_000 }, () => Math.floor(256 * r()));
    expect(crc32(data)).toBe(zlibCrc32(data));
  });
});

describe('solution files: round trips', () => {
  it('1D with held, convective boundary and piecewise κ: same values, same set, same fingerprint', () => {
    const problem = rodProblem();
    const { solution } = solve(problem, 6);
    const bytes = encodeSolution(solution, { description: 'rod', problem });
    const back = decodeSolution(bytes);
    expect(back.description).toBe('rod');
    expect(back.content).toBe('solution');
    expect(back.problemFingerprint).toBe(problemFingerprint(problem));
    expect(back.solution.domain).not.toBe(solution.domain);
    expect(back.solution.domain.vertexCount).toBe(solution.domain.vertexCount);
    expect(Array.from(back.solution.coefficients)).toEqual(Array.from(solution.coefficients));
    const { diff, checked } = maxDifference(solution, back.solution, () => true, 1);
    expect(checked).toBeGreaterThan(300);
    expect(diff).toBeLessThanOrEqual(1e-14);
    // the held value of the rebuilt domain still holds: u(t, 0) = 2
    expect(back.solution.evaluate(0.3, [0])[0]).toBeCloseTo(2, 12);
    // the rebuilt domain's boundary parts are lists of edges with the constant data
    expect(back.solution.domain.boundaryParts.map((p) => p.kind)).toEqual(['value', 'convection']);
  });

  it('2D adaptive set on a refined user triangulation: identical values, vertex ids and coordinates', () => {
    const domain = lTriangulation();
    const problem = new HeatProblem({ domain, T: 0.3, initial: (x, y) => x * (1 - y) });
    const run = solveAdaptive(problem, { maxUnknowns: 4000, maxSteps: 12 });
    expect(run.history.length).toBeGreaterThan(3);
    expect(run.history.at(-1)!.maxSpaceGeneration).toBeGreaterThan(3);
    const bytes = encodeSolution(run.solution, { problem });
    const back = decodeSolution(bytes).solution;
    // fibres hold the same vertex ids, and those ids are the same points
    const s0 = run.solution.trialSet, s1 = back.trialSet;
    expect(s1.size).toBe(s0.size);
    for (let i = 0; i < s0.tree.size; i++) expect(Array.from(s1.fibre(i))).toEqual(Array.from(s0.fibre(i)));
    for (let v = 0; v < back.domain.vertexCount; v++) {
      expect(back.domain.coordinate(v, 0)).toBe(domain.coordinate(v, 0));
      expect(back.domain.coordinate(v, 1)).toBe(domain.coordinate(v, 1));
      expect(back.domain.isFree(v)).toBe(domain.isFree(v));
    }
    const { diff, checked } = maxDifference(run.solution, back, insideL, 2);
    expect(checked).toBeGreaterThan(200);
    expect(diff).toBeLessThanOrEqual(1e-14);
    // slices agree too (leaf meshes rebuilt from the replayed forest)
    const a = run.solution.slice(0.1), b = back.slice(0.1);
    expect(Array.from(b.mesh.coords)).toEqual(Array.from(a.mesh.coords));
    expect(Array.from(b.values)).toEqual(Array.from(a.values));
  });

  it('the layout is what docs/solution-files.md describes (independent reader, zlib CRC-32)', () => {
    const { solution } = solve(rodProblem(), 5);
    const bytes = encodeSolution(solution, { description: 'layout' });
    expect(Array.from(bytes.subarray(0, 8))).toEqual([0x89, 0x43, 0x48, 0x52, 0x4d, 0x0d, 0x0a, 0x1a]);
    const r = independentRead(bytes);
    expect(r.crcOk).toBe(true);
    expect(r.header.format).toBe('chronomesh-solution');
    expect(r.header.version).toBe(1);
    expect(r.header.T).toBe(0.5);
    expect(Array.from(r.f64('coefficients'))).toEqual(Array.from(solution.coefficients));
    expect(bytes.length).toBe(Math.ceil((16 + new DataView(bytes.buffer).getUint32(8, true)) / 8) * 8 + (r.header.dataBytes as number));
  });

  it('reading into the caller’s domain: same domain accepted, another refused, a differently refined one refused', () => {
    const mk = () => intervalDomain(0, 1, 4);
    const problem = new HeatProblem({ domain: mk(), T: 1, initial: () => 1 });
    const { solution } = solve(problem, 5);
    const bytes = encodeSolution(solution);
    const fresh = mk();
    const back = decodeSolution(bytes, { domain: fresh }).solution;
    expect(back.domain).toBe(fresh);
    expect(maxDifference(solution, back, () => true, 3).diff).toBeLessThanOrEqual(1e-14);
    // reading twice into the same (now refined exactly as saved) domain works
    expect(decodeSolution(bytes, { domain: fresh }).solution.coefficients.length).toBe(solution.coefficients.length);
    expect(() => decodeSolution(bytes, { domain: intervalDomain(0, 1, 5) })).toThrow(InvalidArgumentError);
    expect(() => decodeSolution(bytes, { domain: intervalDomain(0, 1, 4, { kappa: 2 }) })).toThrow(/not the saved domain/);
    const other = mk();
    other.refineTowards(other.uniformSet(0), [0.9], 3); // refined elsewhere first: ids differ
    expect(() => decodeSolution(bytes, { domain: other })).toThrow(/refined differently/);
  });

  it('boundary data given by a function: refused without the domain, read with it', () => {
    const make = () => intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t) => t }] });
    const domain = make();
    const { solution } = solve(new HeatProblem({ domain, T: 1 }), 5);
    const bytes = encodeSolution(solution);
    expect(() => decodeSolution(bytes)).toThrow(/data given by a function/);
    const back = decodeSolution(bytes, { domain: make() }).solution;
    expect(back.evaluate(0.7, [0])[0]).toBeCloseTo(0.7, 12);
    expect(maxDifference(solution, back, () => true, 4).diff).toBeLessThanOrEqual(1e-14);
  });

  it('refuses bad options before any work', () => {
    const { solution } = solve(new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 }), 3);
    expect(() => encodeSolution(solution, { descripton: 'x' } as never)).toThrow(/description/);
    expect(() => encodeSolution({} as never)).toThrow(InvalidArgumentError);
    const wrongT = new HeatProblem({ domain: solution.domain, T: 2 });
    expect(() => encodeSolution(solution, { problem: wrongT })).toThrow(/T = 2/);
    expect(() => decodeSolution(encodeSolution(solution), { domain: 'x' as never })).toThrow(InvalidArgumentError);
  });
});

describe('solution files: damaged and foreign input', () => {
  const { solution } = solve(rodProblem(), 5);
  const good = encodeSolution(solution, { description: 'x' });
  const headerLength = new DataView(good.buffer).getUint32(8, true);
  const dataStart = Math.ceil((16 + headerLength) / 8) * 8;

  it('one flipped bit anywhere is caught and located', () => {
    const r = rng(11);
    for (let k = 0; k < 60; k++) {
      const at = Math.floor(r() * good.length);
      const bad = good.slice();
      bad[at]! ^= 1 << Math.floor(8 * r());
      // a bit flipped in the padding between header and data changes nothing that is read
      if (at >= 16 + headerLength && at < dataStart) continue;
      const e = corruptError(() => decodeSolution(bad));
      if (at < 8) expect(e.problem).toBe('foreign');
      else if (at < 16) expect(['truncated', 'checksum', 'malformed']).toContain(e.problem);
      else if (at < 16 + headerLength) expect(e.problem).toBe('checksum');
      else {
        expect(e.problem).toBe('checksum');
        // the named section's bytes contain the flipped byte
        const { header } = independentRead(good);
        const s = (header.sections as { name: string; offset: number }[]).find((x) => x.name === e.field)!;
        expect(e.offset).toBe(dataStart + s.offset);
        expect(at).toBeGreaterThanOrEqual(e.offset!);
      }
    }
  });

  it('a flipped byte in the coefficients names the section, its offset and both checksums', () => {
    const bad = good.slice();
    bad[bad.length - 5]! ^= 0x40;
    const e = corruptError(() => decodeSolution(bad));
    expect(e.problem).toBe('checksum');
    expect(e.field).toBe('coefficients');
    expect(e.message).toMatch(/section 'coefficients'.*CRC-32 is [0-9a-f]{8}, the header records [0-9a-f]{8}/);
    expect(e.expected).not.toBe(e.received);
  });

  it('truncated files at any length', () => {
    for (const n of [0, 3, 8, 12, 16, 40, 16 + headerLength - 1, dataStart, dataStart + 17, good.length - 1]) {
      const e = corruptError(() => decodeSolution(good.subarray(0, n)));
      expect(e.problem, `cut at ${n}`).toBe('truncated');
      expect(e.offset).toBe(n);
      expect(e.message).toContain(String(n));
    }
  });

  it('trailing bytes are refused', () => {
    const longer = new Uint8Array(good.length + 8);
    longer.set(good);
    const e = corruptError(() => decodeSolution(longer));
    expect(e.problem).toBe('malformed');
    expect(e.offset).toBe(good.length);
  });

  it('another version of the format', () => {
    const v2 = rewriteHeader(good, (h) => { h.version = 2; });
    const e = corruptError(() => decodeSolution(v2));
    expect(e.problem).toBe('version');
    expect(e.field).toBe('version');
    expect(e.expected).toBe('1');
    expect(e.received).toBe('2');
    expect(e.message).toMatch(/newer/);
    // the unchanged header through the same rewriter still reads (the rewriter itself is sound)
    expect(decodeSolution(rewriteHeader(good, () => {})).solution.coefficients.length).toBe(solution.coefficients.length);
  });

  it('foreign files: JSON text, empty, another container format, random bytes', () => {
    const json = corruptError(() => decodeSolution(new TextEncoder().encode(JSON.stringify({ format: 'chronomesh-solution', version: 1 }))));
    expect(json.problem).toBe('foreign');
    expect(json.offset).toBe(0);
    expect(json.message).toMatch(/JSON/);
    expect(corruptError(() => decodeSolution(new Uint8Array(0))).problem).toBe('truncated');
    const other = corruptError(() => decodeSolution(rewriteHeader(good, (h) => { h.format = 'someone-else'; })));
    expect(other.problem).toBe('foreign');
    expect(other.field).toBe('format');
    const r = rng(5);
    expect(corruptError(() => decodeSolution(Uint8Array.from({ length: 300 }, () => Math.floor(256 * r()))))).toBeInstanceOf(CorruptFileError);
    expect(corruptError(() => decodeSolution('not bytes' as never)).problem).toBe('foreign');
  });

  it('consistent checksums but inconsistent content (a crafted header) is refused as malformed', () => {
    const cases: [string, (h: Record<string, unknown>) => void][] = [
      ['unknowns', (h) => { (h.set as Record<string, number>).unknowns += 1; }],
      ['T', (h) => { h.T = -1; }],
      ['content', (h) => { h.content = 'picture'; }],
      ['section length', (h) => { (h.sections as { name: string; length: number }[]).find((s) => s.name === 'coefficients')!.length -= 1; }],
      ['section offset', (h) => { (h.sections as { name: string; offset: number }[])[0]!.offset = 4; }],
      ['forest size', (h) => { (h.forest as Record<string, number>).createdVertices += 1; }],
      ['missing section', (h) => { h.sections = (h.sections as { name: string }[]).filter((s) => s.name !== 'set.levels'); }],
    ];
    for (const [name, mutate] of cases) {
      const e = corruptError(() => decodeSolution(rewriteHeader(good, mutate)));
      expect(['malformed', 'checksum', 'mismatch'], name).toContain(e.problem);
    }
  });
});
