/** Boundary parts: selection, precedence, validation, coercivity (src/space/boundary.ts). */
import { describe, expect, it } from 'vitest';
import { InvalidMeshError, intervalDomain, rectangleDomain } from '../../src/index';

describe('boundary parts of a domain', () => {
  it('value parts make Dirichlet vertices; flux and convection keep them free; later parts override', () => {
    const d = rectangleDomain(0, 1, 0, 1, 1, 1, {
      boundary: [
        { kind: 'value', where: () => true, value: 1 },
        { kind: 'convection', where: (mx) => mx > 1 - 1e-9, transferCoefficient: 2 },
        { kind: 'flux', where: [[3, 2]] }, // top edge; vertices of rectangleDomain 1×1: (0,0), (1,0), (0,1), (1,1)
      ],
    });
    const free = Array.from({ length: 4 }, (_, v) => d.isFree(v));
    // the left and bottom edges stay held, so every corner touches a held edge except (1,1)
    expect([0, 1, 2, 3].map((v) => [d.coordinate(v, 0), d.coordinate(v, 1)])).toEqual([[0, 0], [1, 0], [0, 1], [1, 1]]);
    expect(free).toEqual([false, false, false, true]);
    expect(d.boundaryParts.map((p) => p.kind)).toEqual(['value', 'convection', 'flux']);
  });

  it('1D endpoints by list [i] or predicate on the endpoint', () => {
    const d = intervalDomain(0, 1, 4, { boundary: [{ kind: 'convection', where: [[4]], transferCoefficient: 1 }, { kind: 'flux', where: (x) => x < 0.5 }] });
    expect(d.isFree(0) && d.isFree(4)).toBe(true);
    const e = intervalDomain(0, 1, 4, { insulated: () => true, boundary: [{ kind: 'value', where: [[0]], value: 3 }] });
    expect([e.isFree(0), e.isFree(4)]).toEqual([false, true]);
  });

  it('convection with h > 0 makes an otherwise insulated problem with c = 0 well posed; h = 0 does not', () => {
    expect(() => rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: [{ kind: 'flux', where: () => true }, { kind: 'convection', where: (mx) => mx < 1e-9, transferCoefficient: 0.1 }] })).not.toThrow();
    expect(() => intervalDomain(0, 1, 2, { boundary: [{ kind: 'convection', where: () => true, transferCoefficient: 0 }] })).toThrow(/not coercive/);
  });

  it('rejects bad parts with the field named', () => {
    const bad: [unknown, RegExp][] = [
      [[{ kind: 'robin', where: () => true }], /boundary\[0\]\.kind must be 'value', 'flux' or 'convection'/],
      [[{ kind: 'convection', where: () => true, transferCoefficient: -1 }], /boundary\[0\]\.transferCoefficient must be a finite number ≥ 0/],
      [[{ kind: 'convection', where: () => true, transferCoefficient: (mx: number) => (mx > 0.5 ? NaN : 1) }], /boundary\[0\]\.transferCoefficient on boundary edge .* received NaN/],
      [[{ kind: 'value', where: [[0, 9]] }], /boundary\[0\]\.where\[0\] = \[0,9\] is not a boundary edge/],
      [[{ kind: 'flux', where: 'left' }], /boundary\[0\]\.where must be a predicate/],
      [[{ kind: 'flux', where: () => true, flux: Infinity }], /boundary\[0\]\.flux must be a finite number/],
      // a predicate true nowhere would leave the part without edges, silently
      [[{ kind: 'flux', where: (mx: number) => mx === 0.3, flux: 1 }], /boundary\[0\]\.where selects no boundary edge: it is false at all 4 initial boundary-edge midpoints, which span x ∈ \[0, 1\], y ∈ \[0, 1\]/],
      ['all', /boundary must be an array/],
    ];
    for (const [boundary, msg] of bad) {
      let err: unknown;
      try {
        rectangleDomain(0, 1, 0, 1, 1, 1, { boundary: boundary as never });
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InvalidMeshError);
      expect((err as Error).message).toMatch(msg);
    }
  });

  it('refuses an insulated predicate that selects no boundary edge, naming the field (1D and 2D)', () => {
    expect(() => rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: (_mx, my) => my > 2 })).toThrow(/^insulated selects no boundary edge: it is false at all 8 initial boundary-edge midpoints/);
    expect(() => intervalDomain(0, 1, 2, { insulated: (mx) => mx > 2 })).toThrow(/^insulated selects no boundary edge: it is false at both end points \(x = 0 and x = 1\)/);
    // a list that names nothing is accepted: an explicit choice
    expect(() => rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: [] })).not.toThrow();
  });
});
