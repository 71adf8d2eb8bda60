/**
 * Validation and labelling of the initial mesh (docs/method.md §4.1).
 *
 * Produces the flat arrays the bisection forest starts from: counter-clockwise triangles whose
 * first two vertices span the refinement edge (longest edge, ties broken by the smaller sorted
 * vertex pair), neighbours across each edge, boundary kinds, free flags and coefficients.
 */
import { InvalidArgumentError, InvalidMeshError, describeValue } from '../errors';
import type { Coefficient, DomainOptions } from './domain-options';
import { sampleDiffusionTensor } from './diffusion-tensor';
import { checkNoHangingNodes } from './hanging-nodes';
import { checkNoOverlap } from './mesh-overlap';
import { EdgeKind, buildBoundaryTables, isValueKind, naturalEdgeCode, noEdgeSelected, type BoundaryTables } from './boundary';

/** Neighbour code of a Dirichlet boundary edge. */
export const DIRICHLET_EDGE = -1;
/** Neighbour code of an insulated boundary edge. */
export const INSULATED_EDGE = -2;

export interface InitialMesh {
  readonly dim: 1 | 2;
  /** `dim` coordinates per vertex. */
  readonly coords: Float64Array;
  /** `dim + 1` vertices per element; in 2D counter-clockwise with refinement edge (v0, v1). */
  readonly elements: Int32Array;
  /** 2D: 3 per element, entry k = element across the edge opposite vertex k, or a boundary code. */
  readonly neighbors: Int32Array;
  readonly vertexFree: Uint8Array;
  /**
   * κ per element; for an anisotropic element the largest eigenvalue of its tensor (the scale of
   * diffusion times and other bounds, docs/method.md §4.4).
   */
  readonly kappa: Float64Array;
  /** Diffusion tensors (xx, xy, yy per element) when the domain was given `diffusionTensor`, else null. */
  readonly kappaTensor: Float64Array | null;
  readonly reaction: Float64Array;
  /** Boundary parts per initial boundary edge (see ./boundary). */
  readonly boundary: BoundaryTables;
  /** Number of clockwise input triangles that were reoriented. */
  readonly reoriented: number;
}

/** An entry of a user array must be a number: numeric strings, null or booleans are refused, not converted. */
function numberEntry(v: unknown, field: string): number {
  if (typeof v !== 'number') {
    throw new InvalidMeshError(`${field} must be a number, received ${describeValue(v)}`, { field, expected: 'a number', received: describeValue(v) });
  }
  return v;
}

function flatten(input: ArrayLike<number> | number[][], width: number, field: string): Float64Array {
  if (input === null || typeof input !== 'object' || typeof (input as ArrayLike<unknown>).length !== 'number') {
    throw new InvalidMeshError(`${field} must be an array of numbers or of ${width}-tuples, received ${describeValue(input)}`, {
      field,
      expected: `flat array or array of ${width}-tuples`,
      received: describeValue(input),
    });
  }
  const n = input.length;
  if (n > 0 && Array.isArray((input as unknown[])[0])) {
    const rows = input as number[][];
    const out = new Float64Array(n * width);
    for (let i = 0; i < n; i++) {
      const r = rows[i];
      if (!Array.isArray(r) || r.length !== width) {
        throw new InvalidMeshError(`${field}[${i}] must have exactly ${width} entries, received ${describeValue(r)}`, {
          field: `${field}[${i}]`,
          expected: `${width} numbers`,
          received: describeValue(r),
        });
      }
      for (let k = 0; k < width; k++) out[i * width + k] = numberEntry(r[k], `${field}[${i}][${k}]`);
    }
    return out;
  }
  if (n % width !== 0) {
    throw new InvalidMeshError(`${field} has length ${n}, which is not a multiple of ${width}`, {
      field,
      expected: `length divisible by ${width}`,
      received: n,
    });
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = numberEntry((input as ArrayLike<unknown>)[i], `${field}[${i}]`);
  return out;
}

/** Samples a coefficient per element (centroid for functions) and validates its sign. */
export function sampleCoefficient(
  value: Coefficient | undefined,
  fallback: number,
  centroids: Float64Array,
  field: 'kappa' | 'reaction',
): Float64Array {
  const ne = centroids.length / 2;
  const out = new Float64Array(ne);
  const strict = field === 'kappa';
  const expected = strict ? 'a finite number > 0' : 'a finite number ≥ 0';
  if (value === undefined) out.fill(fallback);
  else if (typeof value === 'number') out.fill(value);
  else if (typeof value !== 'function' && (value === null || typeof value !== 'object')) {
    throw new InvalidMeshError(`${field} must be a number, an array with one value per initial element, or a function (x, y) => number; received ${describeValue(value)}`, {
      field,
      expected: 'number | number[] | (x, y) => number',
      received: describeValue(value),
    });
  }
  else if (typeof value === 'function') {
    for (let e = 0; e < ne; e++) {
      const x = centroids[2 * e]!, y = centroids[2 * e + 1]!;
      const v: unknown = value(x, y);
      if (typeof v !== 'number' || !Number.isFinite(v) || (strict ? v <= 0 : v < 0)) {
        throw new InvalidMeshError(`${field}(${x}, ${y}) at the centroid of initial element ${e} returned ${describeValue(v)}; expected ${expected}`, {
          field: `${field}[${e}]`,
          expected,
          received: describeValue(v),
        });
      }
      out[e] = v;
    }
  } else {
    if (typeof value !== 'object' || value.length !== ne) {
      throw new InvalidMeshError(`${field} must have one value per initial element (${ne}), received ${describeValue(value)}`, {
        field,
        expected: `${ne} values`,
        received: describeValue(value),
      });
    }
    for (let e = 0; e < ne; e++) out[e] = numberEntry(value[e], `${field}[${e}]`);
  }
  for (let e = 0; e < ne; e++) {
    const v = out[e]!;
    if (typeof v !== 'number' || !Number.isFinite(v) || (strict ? v <= 0 : v < 0)) {
      throw new InvalidMeshError(`${field} on initial element ${e} must be ${expected}, received ${describeValue(v)}`, {
        field: `${field}[${e}]`,
        expected,
        received: v,
      });
    }
  }
  return out;
}

function requireSomeDirichletOrReaction(vertexFree: Uint8Array, reaction: Float64Array, boundary: BoundaryTables): void {
  let anyDirichlet = false;
  for (let i = 0; i < vertexFree.length; i++) if (vertexFree[i] === 0) anyDirichlet = true;
  if (anyDirichlet || boundary.hasConvection) return;
  for (let e = 0; e < reaction.length; e++) if (reaction[e]! > 0) return;
  throw new InvalidMeshError(
    'the whole boundary is insulated (or carries a prescribed flux, or convects with h = 0) and the reaction coefficient is zero everywhere: ' +
      'the spatial form is then not coercive (constants have zero energy), which this method needs (the heat equation itself is well posed); ' +
      'hold part of the boundary at a value, give a convective part h > 0, or give reaction > 0 somewhere. ' +
      'For a body insulated all round, solve for v = e^{-λt}·u instead: reaction λ (e.g. 1/T), source and flux multiplied by e^{-λt}, ' +
      'and multiply v by e^{λt} afterwards (docs/method.md §1.1)',
    { field: 'boundary', expected: 'some value part, some convection with h > 0, or reaction > 0 on some element', received: 'all boundary insulated or flux' },
  );
}

/** Builds the initial 1D mesh of [a, b] with `cells` equal cells. */
export function buildIntervalMesh(a: number, b: number, cells: number, opts: DomainOptions = {}): InitialMesh {
  if (!Number.isFinite(a) || !Number.isFinite(b) || !(a < b)) {
    throw new InvalidArgumentError(`interval endpoints must be finite with a < b, received a = ${describeValue(a)}, b = ${describeValue(b)}`, {
      field: 'a, b',
      expected: 'finite a < b',
      received: `${a}, ${b}`,
    });
  }
  checkLengthScale(b - a, 'a, b', 'the interval');
  if (!Number.isInteger(cells) || cells < 1 || cells > 1e7) {
    throw new InvalidArgumentError(`cells must be an integer in [1, 1e7], received ${describeValue(cells)}`, {
      field: 'cells',
      expected: 'integer in [1, 1e7]',
      received: cells,
    });
  }
  const coords = new Float64Array(cells + 1);
  for (let i = 0; i <= cells; i++) coords[i] = i === cells ? b : a + ((b - a) * i) / cells;
  const elements = new Int32Array(2 * cells);
  const centroids = new Float64Array(2 * cells);
  for (let e = 0; e < cells; e++) {
    elements[2 * e] = e;
    elements[2 * e + 1] = e + 1;
    centroids[2 * e] = 0.5 * (coords[e]! + coords[e + 1]!);
  }
  if (opts.diffusionTensor !== undefined) {
    throw new InvalidArgumentError('diffusionTensor is for 2D domains; on an interval give the scalar kappa', {
      field: 'diffusionTensor', expected: 'no diffusionTensor in 1D (use kappa)', received: 'a diffusion tensor',
    });
  }
  const kappa = sampleCoefficient(opts.kappa, 1, centroids, 'kappa');
  const reaction = sampleCoefficient(opts.reaction, 0, centroids, 'reaction');
  const vertexFree = new Uint8Array(cells + 1).fill(1);
  const ins = opts.insulated;
  let insA = false;
  let insB = false;
  if (typeof ins === 'function') {
    insA = !!ins(a, 0);
    insB = !!ins(b, 0);
    if (!insA && !insB) throw noEdgeSelected('insulated', 1, 2, (e) => (e === 0 ? a : b), INSULATED_ADVICE);
  } else if (ins !== undefined) {
    if (!Array.isArray(ins)) {
      throw new InvalidMeshError(`insulated must be a predicate or a list of endpoints, received ${describeValue(ins)}`, {
        field: 'insulated',
        expected: 'function or number[][]',
        received: describeValue(ins),
      });
    }
    ins.forEach((item, k) => {
      const i = Array.isArray(item) && item.length === 1 ? item[0] : NaN;
      if (i === 0) insA = true;
      else if (i === cells) insB = true;
      else {
        throw new InvalidMeshError(`insulated[${k}] must be [0] or [${cells}] (a boundary vertex of the interval), received ${describeValue(item)}`, {
          field: `insulated[${k}]`,
          expected: `[0] or [${cells}]`,
          received: describeValue(item),
        });
      }
    });
  }
  const edges = Int32Array.from([0, 0, cells, cells]);
  const boundary = buildBoundaryTables(1, coords, cells + 1, edges, Uint8Array.from([insA ? 1 : 0, insB ? 1 : 0]), opts.boundary, (item) => {
    const i = Array.isArray(item) && item.length === 1 ? item[0] : NaN;
    return i === 0 ? 0 : i === cells ? 1 : -1;
  });
  vertexFree[0] = isValueKind(boundary.edgeKind[0]!) ? 0 : 1;
  vertexFree[cells] = isValueKind(boundary.edgeKind[1]!) ? 0 : 1;
  requireSomeDirichletOrReaction(vertexFree, reaction, boundary);
  return { dim: 1, coords, elements, neighbors: new Int32Array(0), vertexFree, kappa, kappaTensor: null, reaction, boundary, reoriented: 0 };
}

/** Edge bookkeeping uses Maps, which hold at most 2^24 entries; ~1.5 edges per triangle. */
const MAX_INPUT_TRIANGLES = 10_000_000;

const edgeKey = (i: number, j: number, n: number): number => (i < j ? i * n + j : j * n + i);

/**
 * Validates a user triangulation and labels it for newest-vertex bisection, in named steps:
 * finite points, orientation and refinement edges, neighbours across edges, boundary edges and
 * conformity (no hanging nodes), connectedness, no overlap, boundary kinds, free vertices and
 * coefficients. Clockwise triangles are reoriented counter-clockwise (counted in `reoriented`).
 */
export function buildTriangulation(
  pointsIn: ArrayLike<number> | number[][],
  trianglesIn: ArrayLike<number> | number[][],
  opts: DomainOptions = {},
): InitialMesh {
  const coords = flatten(pointsIn, 2, 'points');
  const triF = flatten(trianglesIn, 3, 'triangles');
  const nv = coords.length / 2;
  const ne = triF.length / 3;
  if (nv < 3) throw new InvalidMeshError(`points must hold at least 3 points, received ${nv}`, { field: 'points', expected: '≥ 3 points', received: nv });
  if (ne < 1) throw new InvalidMeshError('triangles must hold at least one triangle', { field: 'triangles', expected: '≥ 1 triangle', received: 0 });
  if (ne > MAX_INPUT_TRIANGLES) {
    throw new InvalidMeshError(`triangles holds ${ne} triangles; an initial mesh may have at most ${MAX_INPUT_TRIANGLES} (refine adaptively instead)`, {
      field: 'triangles',
      expected: `at most ${MAX_INPUT_TRIANGLES} triangles`,
      received: ne,
    });
  }
  checkFinitePoints(coords);
  if (opts.diffusionTensor !== undefined && opts.kappa !== undefined) {
    throw new InvalidArgumentError('give either kappa or diffusionTensor, not both', {
      field: 'diffusionTensor', expected: 'kappa (isotropic) or diffusionTensor (anisotropic)', received: 'both',
    });
  }
  const { elements, reoriented } = orientAndLabel(coords, triF);
  const neighbors = linkNeighbours(elements, nv);
  const bEdges = boundaryEdges(elements, neighbors);
  checkNoHangingNodes(coords, bEdges);
  checkConnected(neighbors);
  checkNoOverlap(coords, elements, neighbors);
  labelBoundaryKinds(opts.insulated, coords, bEdges, neighbors);
  const boundary = applyBoundaryParts(opts, coords, bEdges, neighbors);
  const vertexFree = freeVertices(nv, bEdges, neighbors);
  const centroids = elementCentroids(coords, elements);
  const tensor = opts.diffusionTensor === undefined ? null : sampleDiffusionTensor(opts.diffusionTensor, centroids);
  const kappa = tensor === null ? sampleCoefficient(opts.kappa, 1, centroids, 'kappa') : tensor.scale;
  const reaction = sampleCoefficient(opts.reaction, 0, centroids, 'reaction');
  requireSomeDirichletOrReaction(vertexFree, reaction, boundary);
  return { dim: 2, coords, elements, neighbors, vertexFree, kappa, kappaTensor: tensor?.entries ?? null, reaction, boundary, reoriented };
}

/** Every coordinate is a finite number, and the mesh spans a representable length scale. */
function checkFinitePoints(coords: Float64Array): void {
  const nv = coords.length / 2;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let i = 0; i < nv; i++) {
    for (let k = 0; k < 2; k++) {
      const c = coords[2 * i + k]!;
      if (!Number.isFinite(c)) {
        throw new InvalidMeshError(`points[${i}] has a non-finite coordinate ${describeValue(c)}`, {
          field: `points[${i}]`,
          expected: 'finite coordinates',
          received: c,
        });
      }
    }
    x0 = Math.min(x0, coords[2 * i]!); x1 = Math.max(x1, coords[2 * i]!);
    y0 = Math.min(y0, coords[2 * i + 1]!); y1 = Math.max(y1, coords[2 * i + 1]!);
  }
  if (nv > 0) checkLengthScale(Math.max(x1 - x0, y1 - y0), 'points', 'the mesh');
}

/**
 * Lengths enter squared and to higher powers (areas, element matrices, squared distances), so a
 * domain spanning less than 1e-100 or more than 1e100 would under- or overflow them and fail later
 * with a misleading message ("zero area"). Refused with the reason.
 */
function checkLengthScale(span: number, field: string, what: string): void {
  if (span >= 1e-100 && span <= 1e100) return;
  const Err = field === 'points' ? InvalidMeshError : InvalidArgumentError;
  throw new Err(`${what} spans ${span.toExponential(2)}, outside the range 1e-100 … 1e100 where its squared lengths and areas are representable in double precision; express lengths in other units`, {
    field,
    expected: 'a domain size in [1e-100, 1e100]',
    received: span,
  });
}

/**
 * Checks the vertex indices and areas of the triangles, orients them counter-clockwise and puts
 * the refinement edge (longest edge) first; every point must be used.
 */
function orientAndLabel(coords: Float64Array, triF: Float64Array): { elements: Int32Array; reoriented: number } {
  const nv = coords.length / 2;
  const ne = triF.length / 3;
  const elements = new Int32Array(3 * ne);
  let reoriented = 0;
  const used = new Uint8Array(nv);
  for (let e = 0; e < ne; e++) {
    const t = [triF[3 * e]!, triF[3 * e + 1]!, triF[3 * e + 2]!];
    for (const v of t) {
      if (!Number.isInteger(v) || v < 0 || v >= nv) {
        throw new InvalidMeshError(`triangles[${e}] refers to vertex ${describeValue(v)}, outside the valid range 0…${nv - 1}`, {
          field: `triangles[${e}]`,
          expected: `integer vertex indices in [0, ${nv - 1}]`,
          received: v,
        });
      }
    }
    if (t[0] === t[1] || t[1] === t[2] || t[0] === t[2]) {
      throw new InvalidMeshError(`triangles[${e}] repeats a vertex: [${t.join(', ')}]`, {
        field: `triangles[${e}]`,
        expected: 'three distinct vertices',
        received: `[${t.join(', ')}]`,
      });
    }
    const [p, q, r] = t as [number, number, number];
    const ax = coords[2 * p]!, ay = coords[2 * p + 1]!;
    const bx = coords[2 * q]! - ax, by = coords[2 * q + 1]! - ay;
    const cx = coords[2 * r]! - ax, cy = coords[2 * r + 1]! - ay;
    const twice = bx * cy - by * cx;
    const scale = Math.max(bx * bx + by * by, cx * cx + cy * cy, (bx - cx) ** 2 + (by - cy) ** 2);
    if (!(Math.abs(twice) > 1e-12 * scale)) {
      throw new InvalidMeshError(`triangles[${e}] = [${t.join(', ')}] has zero area (its vertices are collinear or coincide)`, {
        field: `triangles[${e}]`,
        expected: 'a triangle of positive area',
        received: twice / 2,
      });
    }
    if (twice < 0) {
      reoriented++;
      t[1] = r;
      t[2] = q;
    }
    // Longest edge as refinement edge; ties (relative 1e-12) broken by the smaller sorted vertex pair.
    const lens = [0, 0, 0];
    for (let k = 0; k < 3; k++) {
      const i = t[k]!, j = t[(k + 1) % 3]!;
      lens[k] = (coords[2 * i]! - coords[2 * j]!) ** 2 + (coords[2 * i + 1]! - coords[2 * j + 1]!) ** 2;
    }
    const maxLen = Math.max(lens[0]!, lens[1]!, lens[2]!);
    let best = -1;
    let bestKey = Infinity;
    for (let k = 0; k < 3; k++) {
      const key = edgeKey(t[k]!, t[(k + 1) % 3]!, nv);
      if (lens[k]! >= maxLen * (1 - 1e-12) && key < bestKey) {
        best = k;
        bestKey = key;
      }
    }
    elements[3 * e] = t[best]!;
    elements[3 * e + 1] = t[(best + 1) % 3]!;
    elements[3 * e + 2] = t[(best + 2) % 3]!;
    used[t[0]!] = used[t[1]!] = used[t[2]!] = 1;
  }
  for (let i = 0; i < nv; i++) {
    if (!used[i]) {
      throw new InvalidMeshError(`points[${i}] is not a vertex of any triangle`, {
        field: `points[${i}]`,
        expected: 'every point used by some triangle',
        received: 'unused point',
      });
    }
  }
  return { elements, reoriented };
}

/** Neighbour across the edge opposite vertex k of element e, in neighbors[3e + k] (DIRICHLET_EDGE on the boundary). */
function linkNeighbours(elements: Int32Array, nv: number): Int32Array {
  const ne = elements.length / 3;
  const neighbors = new Int32Array(3 * ne).fill(DIRICHLET_EDGE);
  const firstOwner = new Map<number, number>();
  const count = new Map<number, number>();
  for (let e = 0; e < ne; e++) {
    for (let k = 0; k < 3; k++) {
      const i = elements[3 * e + ((k + 1) % 3)]!, j = elements[3 * e + ((k + 2) % 3)]!;
      const key = edgeKey(i, j, nv);
      const c = (count.get(key) ?? 0) + 1;
      count.set(key, c);
      if (c === 1) firstOwner.set(key, 3 * e + k);
      else if (c === 2) {
        const slot = firstOwner.get(key)!;
        const other = (slot / 3) | 0;
        // Consistent orientation: the shared edge is traversed in opposite directions.
        const oi = elements[3 * other + (((slot % 3) + 1) % 3)]!;
        if (oi === i) {
          throw new InvalidMeshError(
            `triangles[${e}] and triangles[${other}] overlap along edge [${i}, ${j}] (they lie on the same side of it)`,
            { field: `triangles[${e}]`, expected: 'triangles meeting edge-to-edge from opposite sides', received: `edge [${i}, ${j}]` },
          );
        }
        neighbors[slot] = e;
        neighbors[3 * e + k] = other;
      } else {
        throw new InvalidMeshError(`edge [${i}, ${j}] belongs to more than two triangles (triangles[${e}] is the third)`, {
          field: `triangles[${e}]`,
          expected: 'every edge in one or two triangles',
          received: `edge [${i}, ${j}] in ${c} triangles`,
        });
      }
    }
  }
  return neighbors;
}

/** Boundary edges as triples (slot 3e + k, i, j). */
function boundaryEdges(elements: Int32Array, neighbors: Int32Array): number[] {
  const ne = elements.length / 3;
  const bEdges: number[] = [];
  for (let s = 0; s < 3 * ne; s++) {
    if (neighbors[s] === DIRICHLET_EDGE) {
      const e = (s / 3) | 0, k = s % 3;
      const i = elements[3 * e + ((k + 1) % 3)]!, j = elements[3 * e + ((k + 2) % 3)]!;
      bEdges.push(s, i, j);
    }
  }
  return bEdges;
}

/** Breadth-first search through shared edges from triangle 0 reaches every triangle. */
function checkConnected(neighbors: Int32Array): void {
  const ne = neighbors.length / 3;
  const seen = new Uint8Array(ne);
  const queue = new Int32Array(ne);
  let head = 0, tail = 0;
  queue[tail++] = 0;
  seen[0] = 1;
  while (head < tail) {
    const e = queue[head++]!;
    for (let k = 0; k < 3; k++) {
      const f = neighbors[3 * e + k]!;
      if (f >= 0 && !seen[f]) {
        seen[f] = 1;
        queue[tail++] = f;
      }
    }
  }
  if (tail < ne) {
    let e = 0;
    while (seen[e]) e++;
    throw new InvalidMeshError(`the mesh is disconnected: triangles[${e}] cannot be reached from triangles[0] through shared edges`, {
      field: `triangles[${e}]`,
      expected: 'a connected triangulation',
      received: `${ne - tail} unreachable triangles`,
    });
  }
}

/** What to do about an `insulated` predicate that selects no edge (see noEdgeSelected). */
const INSULATED_ADVICE = 'leave it out for none, or compare with a margin (e.g. y > 0.999 rather than y == 1)';

/** Marks the insulated boundary edges (a predicate on the edge midpoint or a list of edges). */
function labelBoundaryKinds(ins: DomainOptions['insulated'], coords: Float64Array, bEdges: number[], neighbors: Int32Array): void {
  const nv = coords.length / 2;
  if (typeof ins === 'function') {
    const mid = (b: number, k: number): number => 0.5 * (coords[2 * bEdges[3 * b + 1]! + k]! + coords[2 * bEdges[3 * b + 2]! + k]!);
    let any = false;
    for (let b = 0; 3 * b < bEdges.length; b++) {
      if (!ins(mid(b, 0), mid(b, 1))) continue;
      neighbors[bEdges[3 * b]!] = INSULATED_EDGE;
      any = true;
    }
    if (!any) throw noEdgeSelected('insulated', 2, bEdges.length / 3, mid, INSULATED_ADVICE);
  } else if (ins !== undefined) {
    if (!Array.isArray(ins)) {
      throw new InvalidMeshError(`insulated must be a predicate or a list of boundary edges, received ${describeValue(ins)}`, {
        field: 'insulated',
        expected: 'function or number[][]',
        received: describeValue(ins),
      });
    }
    const slotOf = new Map<number, number>();
    for (let q = 0; q < bEdges.length; q += 3) slotOf.set(edgeKey(bEdges[q + 1]!, bEdges[q + 2]!, nv), bEdges[q]!);
    ins.forEach((item, k) => {
      const ok = Array.isArray(item) && item.length === 2 && Number.isInteger(item[0]) && Number.isInteger(item[1]);
      const slot = ok ? slotOf.get(edgeKey(item[0]!, item[1]!, nv)) : undefined;
      if (slot === undefined) {
        throw new InvalidMeshError(`insulated[${k}] = ${JSON.stringify(item)} is not a boundary edge of the mesh`, {
          field: `insulated[${k}]`,
          expected: 'a pair [i, j] of vertex indices forming a boundary edge',
          received: JSON.stringify(item),
        });
      }
      neighbors[slot] = INSULATED_EDGE;
    });
  }
}

/** Boundary parts (./boundary) override the insulated / zero-value defaults edge by edge. */
function applyBoundaryParts(opts: DomainOptions, coords: Float64Array, bEdges: number[], neighbors: Int32Array): BoundaryTables {
  const nv = coords.length / 2;
  const nbe = bEdges.length / 3;
  const edgeVerts = new Int32Array(2 * nbe);
  const insulatedDefault = new Uint8Array(nbe);
  const edgeIndex = new Map<number, number>();
  for (let b = 0; b < nbe; b++) {
    edgeVerts[2 * b] = bEdges[3 * b + 1]!;
    edgeVerts[2 * b + 1] = bEdges[3 * b + 2]!;
    insulatedDefault[b] = neighbors[bEdges[3 * b]!] === INSULATED_EDGE ? 1 : 0;
    edgeIndex.set(edgeKey(bEdges[3 * b + 1]!, bEdges[3 * b + 2]!, nv), b);
  }
  const boundary = buildBoundaryTables(2, coords, nv, edgeVerts, insulatedDefault, opts.boundary, (item) => {
    const ok = Array.isArray(item) && item.length === 2 && Number.isInteger(item[0]) && Number.isInteger(item[1]);
    return ok ? (edgeIndex.get(edgeKey(item[0] as number, item[1] as number, nv)) ?? -1) : -1;
  });
  for (let b = 0; b < nbe; b++) {
    const k = boundary.edgeKind[b]!;
    neighbors[bEdges[3 * b]!] = isValueKind(k) ? DIRICHLET_EDGE : k === EdgeKind.Insulated ? INSULATED_EDGE : naturalEdgeCode(b);
  }
  return boundary;
}

/** Free flags: every vertex of a Dirichlet edge carries no unknown. */
function freeVertices(nv: number, bEdges: number[], neighbors: Int32Array): Uint8Array {
  const vertexFree = new Uint8Array(nv).fill(1);
  for (let q = 0; q < bEdges.length; q += 3) {
    if (neighbors[bEdges[q]!] === DIRICHLET_EDGE) vertexFree[bEdges[q + 1]!] = vertexFree[bEdges[q + 2]!] = 0;
  }
  return vertexFree;
}

function elementCentroids(coords: Float64Array, elements: Int32Array): Float64Array {
  const ne = elements.length / 3;
  const centroids = new Float64Array(2 * ne);
  for (let e = 0; e < ne; e++) {
    for (let k = 0; k < 2; k++) {
      centroids[2 * e + k] = (coords[2 * elements[3 * e]! + k]! + coords[2 * elements[3 * e + 1]! + k]! + coords[2 * elements[3 * e + 2]! + k]!) / 3;
    }
  }
  return centroids;
}
