/** Constructors of spatial domains: interval, user triangulation and mesh generators. */
import { InvalidArgumentError, describeValue } from '../errors';
import type { DomainOptions } from './domain-options';
import { SpatialDomain } from './domain';
import { buildIntervalMesh, buildTriangulation } from './initial-mesh';
import { BYTES_PER_INPUT_CELL, BYTES_PER_INPUT_TRIANGLE, checkMemory, checkOptions } from '../validation/index';

/** Keys of {@link DomainOptions}; the Record type makes a new option a compile error until listed here. */
const DOMAIN_KEYS: Record<keyof Required<DomainOptions>, true> = { kappa: true, diffusionTensor: true, reaction: true, insulated: true, boundary: true };

/** Unknown keys are refused with the nearest valid name; undefined gives the defaults. */
function domainOptions(opts: unknown): DomainOptions {
  return checkOptions<DomainOptions>(opts, 'opts', DOMAIN_KEYS);
}

/** Refuses a generated mesh of `triangles` triangles whose construction would exceed the memory budget. */
function checkTriangles(triangles: number, what: string, field: string): void {
  checkMemory(triangles * BYTES_PER_INPUT_TRIANGLE, `${what} (${triangles} triangles)`, field, 'use fewer initial cells and refine adaptively instead');
}

/**
 * The interval [a, b] split into `cells` equal initial cells (d = 1).
 *
 * @example
 * ```ts
 * import { intervalDomain } from 'chronomesh';
 * const dom = intervalDomain(0, 1, 4, { kappa: 2 });
 * console.log(dom.initialFreeVertices()); // → Int32Array(3) [ 1, 2, 3 ]
 * ```
 */
export function intervalDomain(a: number, b: number, cells: number, opts?: DomainOptions): SpatialDomain {
  const o = domainOptions(opts);
  if (typeof cells === 'number' && cells > 0) checkMemory(cells * BYTES_PER_INPUT_CELL, `the interval mesh of ${cells} cells`, 'cells', 'use fewer initial cells and refine adaptively instead');
  return new SpatialDomain(buildIntervalMesh(a, b, cells, o));
}

/**
 * A polygonal domain given by a conforming triangulation (d = 2).
 *
 * `points` is flat `[x0, y0, x1, y1, …]` or `[[x0, y0], …]`; `triangles` flat or `[[i, j, k], …]`.
 * The input is validated (finite coordinates, indices in range, distinct vertices, positive area,
 * every edge in at most two triangles, no hanging nodes, connected) and errors name the offending
 * triangle or point. Clockwise triangles are reoriented counter-clockwise automatically (their
 * number is reported in `reorientedTriangles`). Each triangle's refinement edge is its longest edge,
 * ties broken by the smaller sorted vertex pair.
 *
 * @example
 * ```ts
 * import { triangulatedDomain } from 'chronomesh';
 * const dom = triangulatedDomain([0, 0, 1, 0, 1, 1, 0, 1], [0, 1, 2, 0, 2, 3], { reaction: 1, insulated: () => true });
 * console.log(dom.initialFreeVertices().length); // → 4
 * ```
 */
export function triangulatedDomain(
  points: ArrayLike<number> | number[][],
  triangles: ArrayLike<number> | number[][],
  opts?: DomainOptions,
): SpatialDomain {
  const o = domainOptions(opts);
  const n = triangles !== null && typeof triangles === 'object' && typeof triangles.length === 'number' ? triangles.length : 0;
  checkTriangles(Array.isArray((triangles as unknown[])[0]) ? n : n / 3, 'the triangulation', 'triangles');
  return new SpatialDomain(buildTriangulation(points, triangles, o));
}

function checkCount(v: number, field: string): void {
  if (!Number.isInteger(v) || v < 1 || v > 1e4) {
    throw new InvalidArgumentError(`${field} must be an integer in [1, 10000], received ${describeValue(v)}`, {
      field,
      expected: 'integer in [1, 10000]',
      received: v,
    });
  }
}

/** Structured grid triangulation over cells kept by `keep(i, j)`; unused grid points are dropped. */
function gridTriangulation(
  x0: number, x1: number, y0: number, y1: number, nx: number, ny: number,
  keep: (i: number, j: number) => boolean,
): { points: Float64Array; triangles: Int32Array } {
  // Points are numbered row by row (x fastest) among the used ones.
  const id = new Int32Array((nx + 1) * (ny + 1)).fill(-1);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      if (!keep(i, j)) continue;
      for (const g of [j * (nx + 1) + i, j * (nx + 1) + i + 1, (j + 1) * (nx + 1) + i, (j + 1) * (nx + 1) + i + 1]) id[g] = 0;
    }
  }
  const pts: number[] = [];
  for (let j = 0; j <= ny; j++) {
    for (let i = 0; i <= nx; i++) {
      const g = j * (nx + 1) + i;
      if (id[g]! < 0) continue;
      id[g] = pts.length / 2;
      pts.push(i === nx ? x1 : x0 + ((x1 - x0) * i) / nx, j === ny ? y1 : y0 + ((y1 - y0) * j) / ny);
    }
  }
  const vid = (i: number, j: number): number => id[j * (nx + 1) + i]!;
  const tris: number[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      if (!keep(i, j)) continue;
      const a = vid(i, j), b = vid(i + 1, j), c = vid(i + 1, j + 1), d = vid(i, j + 1);
      tris.push(a, b, c, a, c, d); // diagonal from (i, j) to (i + 1, j + 1)
    }
  }
  return { points: Float64Array.from(pts), triangles: Int32Array.from(tris) };
}

/**
 * The rectangle (x0, x1) × (y0, y1) on an nx × ny grid, two triangles per cell (all diagonals from
 * lower-left to upper-right: the structured right-triangle mesh). Vertex (i, j) has id j(nx + 1) + i.
 *
 * @example
 * ```ts
 * import { rectangleDomain } from 'chronomesh';
 * const dom = rectangleDomain(0, 2, 0, 1, 4, 2);
 * console.log(dom.vertexCount); // → 15
 * ```
 */
export function rectangleDomain(x0: number, x1: number, y0: number, y1: number, nx: number, ny: number, opts?: DomainOptions): SpatialDomain {
  for (const [v, name] of [[x0, 'x0'], [x1, 'x1'], [y0, 'y0'], [y1, 'y1']] as const) {
    if (!Number.isFinite(v)) throw new InvalidArgumentError(`${name} must be finite, received ${describeValue(v)}`, { field: name, expected: 'finite number', received: v });
  }
  if (!(x0 < x1) || !(y0 < y1)) {
    throw new InvalidArgumentError(`need x0 < x1 and y0 < y1, received (${x0}, ${x1}) × (${y0}, ${y1})`, {
      field: 'x0, x1, y0, y1',
      expected: 'x0 < x1 and y0 < y1',
      received: `${x0}, ${x1}, ${y0}, ${y1}`,
    });
  }
  checkCount(nx, 'nx');
  checkCount(ny, 'ny');
  domainOptions(opts);
  checkTriangles(2 * nx * ny, `the ${nx} × ${ny} rectangle grid`, nx >= ny ? 'nx' : 'ny');
  const g = gridTriangulation(x0, x1, y0, y1, nx, ny, () => true);
  return triangulatedDomain(g.points, g.triangles, opts);
}

/**
 * The L-shaped domain (−1, 1)² \ [0, 1] × [−1, 0] with its re-entrant corner at the origin, made of
 * 3n² squares of side 1/n, two triangles each.
 *
 * @example
 * ```ts
 * import { lShapeDomain } from 'chronomesh';
 * console.log(lShapeDomain(2).initialFreeVertices().length); // → 5 — the re-entrant corner lies on the boundary
 * ```
 */
export function lShapeDomain(n = 1, opts?: DomainOptions): SpatialDomain {
  checkCount(n, 'n');
  domainOptions(opts);
  checkTriangles(6 * n * n, `the L-shape of ${3 * n * n} squares`, 'n');
  const g = gridTriangulation(-1, 1, -1, 1, 2 * n, 2 * n, (i, j) => !(i >= n && j < n));
  return triangulatedDomain(g.points, g.triangles, opts);
}

/**
 * The square (−1, 1)² with the square hole [−1/3, 1/3]² removed (a non-convex domain with a hole
 * and four re-entrant corners), made of 8·n² squares of side 2/(3n), two triangles each.
 *
 * @example
 * ```ts
 * import { squareWithHoleDomain } from 'chronomesh';
 * console.log(squareWithHoleDomain(1).initialElementCount); // → 16
 * ```
 */
export function squareWithHoleDomain(n = 1, opts?: DomainOptions): SpatialDomain {
  checkCount(n, 'n');
  domainOptions(opts);
  checkTriangles(16 * n * n, `the square with a hole of ${8 * n * n} squares`, 'n');
  const m = 3 * n;
  const g = gridTriangulation(-1, 1, -1, 1, m, m, (i, j) => !(i >= n && i < 2 * n && j >= n && j < 2 * n));
  return triangulatedDomain(g.points, g.triangles, opts);
}
