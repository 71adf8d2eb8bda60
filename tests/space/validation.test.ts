/** Every bad input of the validation list raises its documented typed error naming the offending item. */
import { describe, expect, it } from 'vitest';
import { InvalidArgumentError, InvalidIndexSetError, InvalidMeshError } from '../../src/errors';
import { SpatialOperatorPlan, evaluateAt, intervalDomain, lShapeDomain, loadVector, rectangleDomain, triangulatedDomain } from '../../src/space/index';

const P = [0, 0, 1, 0, 0, 1];

function expectError(fn: () => unknown, cls: Function, message: RegExp, field?: string): void {
  let err: unknown;
  try {
    fn();
  } catch (e) {
    err = e;
  }
  expect(err).toBeInstanceOf(cls);
  expect((err as Error).message).toMatch(message);
  if (field !== undefined) expect((err as { field?: string }).field).toBe(field);
}

describe('mesh validation', () => {
  it('non-finite coordinates', () => {
    expectError(() => triangulatedDomain([0, 0, 1, NaN, 0, 1], [0, 1, 2]), InvalidMeshError, /points\[1\] has a non-finite coordinate NaN/, 'points[1]');
    expectError(() => triangulatedDomain([[0, 0], [1, Infinity], [0, 1]], [[0, 1, 2]]), InvalidMeshError, /points\[1\] has a non-finite coordinate Infinity/);
  });
  it('a domain too large or too small for squared lengths in double precision (it failed as "zero area")', () => {
    expectError(() => rectangleDomain(0, 1e200, 0, 1e200, 2, 2), InvalidMeshError, /the mesh spans 1\.00e\+200, outside the range 1e-100 … 1e100 .* express lengths in other units/, 'points');
    expectError(() => triangulatedDomain([0, 0, 1e-200, 0, 0, 1e-200], [0, 1, 2]), InvalidMeshError, /the mesh spans 1\.00e-200/, 'points');
    expectError(() => intervalDomain(0, 1e-150, 2), InvalidArgumentError, /the interval spans 1\.00e-150/, 'a, b');
    // the ends of the range are accepted: micrometres to light years are far inside it
    expect(() => rectangleDomain(0, 1e-90, 0, 1e-90, 1, 1)).not.toThrow();
    expect(() => intervalDomain(0, 1e90, 1)).not.toThrow();
  });
  it('point lists of odd length name the layout and the count', () => {
    const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
    expectError(() => evaluateAt(domain, domain.uniformSet(1), new Float64Array(domain.uniformSet(1).length), [0.1, 0.2, 0.3]), InvalidArgumentError, /points must be a flat array of x, y values \(x0, y0, x1, y1, …\); found 3 numbers, an odd count/, 'points');
  });
  it('malformed arrays', () => {
    expectError(() => triangulatedDomain([0, 0, 1, 0, 0], [0, 1, 2]), InvalidMeshError, /points has length 5, which is not a multiple of 2/);
    expectError(() => triangulatedDomain([[0, 0], [1, 0, 3], [0, 1]], [[0, 1, 2]]), InvalidMeshError, /points\[1\] must have exactly 2 entries/);
  });
  it('indices out of range', () => {
    expectError(() => triangulatedDomain(P, [0, 1, 5]), InvalidMeshError, /triangles\[0\] refers to vertex 5, outside the valid range 0…2/, 'triangles[0]');
    expectError(() => triangulatedDomain(P, [0, 1, 1.5]), InvalidMeshError, /triangles\[0\] refers to vertex 1.5/);
  });
  it('repeated vertices in a triangle', () => {
    expectError(() => triangulatedDomain(P, [0, 1, 1]), InvalidMeshError, /triangles\[0\] repeats a vertex: \[0, 1, 1\]/);
  });
  it('zero area', () => {
    expectError(() => triangulatedDomain([0, 0, 1, 1, 2, 2, 0, 1], [0, 1, 3, 0, 2, 1]), InvalidMeshError, /triangles\[1\] = \[0, 2, 1\] has zero area/, 'triangles[1]');
  });
  it('clockwise triangles are reoriented, not rejected', () => {
    const dom = triangulatedDomain([0, 0, 1, 0, 1, 1, 0, 1], [0, 2, 1, 0, 2, 3], { reaction: 1, insulated: () => true });
    expect(dom.reorientedTriangles).toBe(1);
  });
  it('an edge in more than two triangles', () => {
    const pts = [0, 0, 1, 0, 0.5, 1, 0.5, -1, 0.5, 2];
    expectError(() => triangulatedDomain(pts, [0, 1, 2, 1, 0, 3, 0, 1, 4]), InvalidMeshError, /edge \[0, 1\] belongs to more than two triangles \(triangles\[2\] is the third\)/);
    expectError(() => triangulatedDomain([0, 0, 1, 0, 0.5, 1, 0.5, 2], [0, 1, 2, 0, 1, 3]), InvalidMeshError, /triangles\[1\] and triangles\[0\] overlap along edge \[0, 1\]/);
  });
  it('hanging node', () => {
    const pts = [0, 0, 2, 0, 1, 2, 1, 0, 1, -1];
    expectError(() => triangulatedDomain(pts, [0, 1, 2, 0, 4, 3, 3, 4, 1]), InvalidMeshError, /not conforming: vertex 3 lies inside edge \[0, 1\] of triangles\[0\] \(hanging node\)/);
  });
  it('disconnected mesh, unused points', () => {
    const pts = [0, 0, 1, 0, 0, 1, 5, 5, 6, 5, 5, 6];
    expectError(() => triangulatedDomain(pts, [0, 1, 2, 3, 4, 5]), InvalidMeshError, /disconnected: triangles\[1\] cannot be reached from triangles\[0\]/, 'triangles[1]');
    expectError(() => triangulatedDomain([...P, 3, 3], [0, 1, 2]), InvalidMeshError, /points\[3\] is not a vertex of any triangle/);
  });
});

describe('coefficient and boundary validation', () => {
  it('non-positive κ, negative c, non-finite values, wrong lengths', () => {
    expectError(() => rectangleDomain(0, 1, 0, 1, 1, 1, { kappa: [1, 0] }), InvalidMeshError, /kappa on initial element 1 must be a finite number > 0, received 0/, 'kappa[1]');
    expectError(() => rectangleDomain(0, 1, 0, 1, 1, 1, { kappa: -2 }), InvalidMeshError, /kappa on initial element 0 must be a finite number > 0, received -2/);
    expectError(() => rectangleDomain(0, 1, 0, 1, 1, 1, { reaction: (x) => x - 0.5 }), InvalidMeshError, /reaction\(0\.33+, 0\.66+\) at the centroid of initial element 1 returned -0\.16+.*; expected a finite number ≥ 0/);
    expectError(() => rectangleDomain(0, 1, 0, 1, 1, 1, { kappa: () => NaN }), InvalidMeshError, /kappa\([0-9.]+, [0-9.]+\) at the centroid of initial element 0 returned NaN; expected a finite number > 0/);
    expectError(() => intervalDomain(0, 1, 2, { reaction: [Infinity, 1] }), InvalidMeshError, /reaction on initial element 0 must be a finite number ≥ 0, received Infinity/);
    expectError(() => rectangleDomain(0, 1, 0, 1, 1, 1, { kappa: [1, 2, 3] }), InvalidMeshError, /kappa must have one value per initial element \(2\)/);
  });
  it('all-insulated boundary needs positive reaction somewhere', () => {
    expectError(() => rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: () => true }), InvalidMeshError, /whole boundary is insulated .*reaction coefficient is zero everywhere: .*not coercive/);
    expectError(() => intervalDomain(0, 1, 2, { insulated: [[0], [2]] }), InvalidMeshError, /not coercive/);
    expect(() => rectangleDomain(0, 1, 0, 1, 2, 2, { insulated: () => true, reaction: (x) => (x > 0.5 ? 1 : 0) })).not.toThrow();
  });
  it('insulated edge lists must name boundary edges', () => {
    expectError(() => rectangleDomain(0, 1, 0, 1, 1, 1, { insulated: [[0, 3]] }), InvalidMeshError, /insulated\[0\] = \[0,3\] is not a boundary edge/, 'insulated[0]');
    expectError(() => intervalDomain(0, 1, 2, { insulated: [[1]] }), InvalidMeshError, /insulated\[0\] must be \[0\] or \[2\]/);
    const dom = rectangleDomain(0, 1, 0, 1, 1, 1, { insulated: [[0, 1]] });
    expect(dom.isFree(0)).toBe(false); // corner 0 also lies on a Dirichlet edge
  });
  it('generator arguments', () => {
    expectError(() => intervalDomain(1, 1, 2), InvalidArgumentError, /a < b/);
    expectError(() => intervalDomain(0, 1, 2.5), InvalidArgumentError, /cells must be an integer/, 'cells');
    expectError(() => rectangleDomain(0, 1, 0, 1, 0, 1), InvalidArgumentError, /nx must be an integer in \[1, 10000\], received 0/, 'nx');
    expectError(() => lShapeDomain(-1), InvalidArgumentError, /n must be an integer/);
  });
});

describe('vertex-set and operator validation', () => {
  const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
  const set = dom.uniformSet(2);
  it('sets must be sorted, closed, free and in range', () => {
    expectError(() => dom.leafMesh(Int32Array.from([...set].reverse())), InvalidIndexSetError, /strictly increasing/);
    expectError(() => dom.leafMesh(set.subarray(0, set.length - 1).slice(1)), InvalidIndexSetError, /not closed: free vertex \d+ .* is missing/);
    expectError(() => dom.leafMesh(Int32Array.of(0)), InvalidIndexSetError, /set\[0\] = 0 is a Dirichlet vertex/);
    expectError(() => dom.close([1e9]), InvalidArgumentError, /ids\[0\] = 1000000000 is not a vertex id/, 'ids[0]');
    expectError(() => dom.leafMesh([4] as unknown as Int32Array), InvalidArgumentError, /set must be an Int32Array/);
  });
  it('operator arguments', () => {
    const plan = new SpatialOperatorPlan(dom, set, set);
    expectError(() => plan.apply(new Float64Array(3), 0, new Float64Array(set.length), 0, 1, 1), InvalidArgumentError, /x must be a Float64Array holding \d+ values from offset 0/, 'x');
    expectError(() => loadVector(dom, set, () => NaN), InvalidArgumentError, /f produced a non-finite value/);
    expectError(() => dom.refineTowards(set, [0], 3), InvalidArgumentError, /point must be 2 \(a point\) or 4 \(a segment\)/);
    expectError(() => dom.uniformSet(-1), InvalidArgumentError, /level must be an integer/);
  });
});
