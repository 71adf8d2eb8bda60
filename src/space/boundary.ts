/**
 * Boundary parts of a spatial domain: prescribed value, flux and convection (Robin) conditions.
 *
 * Problem class (n the outward unit normal, κ the diffusion coefficient):
 *   value       u = g(t, x)                         on Γ_V (Dirichlet; zero on the default part Γ_0),
 *   flux        κ ∂u/∂n = q(t, x)                   on Γ_F (q = 0: insulated),
 *   convection  κ ∂u/∂n = h(x) (u_∞(t, x) − u)      on Γ_C (Newton cooling, h ≥ 0).
 * q is the heat flux INTO the body (q > 0 heats), h the heat-transfer coefficient and u_∞ the
 * ambient value. Integrating ∫ ∇·(κ∇u) v by parts over Ω with v = 0 on Γ_0 ∪ Γ_V gives the
 * spatial form and the boundary load
 *   a(u, v) = ∫_Ω κ ∇u·∇v + c u v dx + ∫_{Γ_C} h u v ds,
 *   ℓ_Γ(t; v) = ∫_{Γ_F} q(t) v ds + ∫_{Γ_C} h u_∞(t) v ds.
 * The convection term keeps a symmetric, time-independent and (with h ≥ 0) non-negative, so the
 * tensor structure of the space-time operators and the block preconditioners stay as they are;
 * a is coercive on H¹_{Γ_0∪Γ_V} as soon as the value part is non-empty, or c > 0 on some element,
 * or h > 0 on some boundary edge (a Friedrichs-type inequality ‖v‖² ≤ C(‖∇v‖² + ∫_Γ' v²) for any
 * boundary piece Γ' of positive measure — common practice).
 *
 * This file turns the user's list of parts into per-edge tables of the initial mesh. A boundary
 * edge of the initial mesh carries one kind; its bisection halves inherit it (the forest copies the
 * edge code, see ./forest). Edge codes: −1 Dirichlet (zero or prescribed value), −2 insulated with no
 * data, −3 − b natural edge (flux or convection) with initial boundary-edge index b.
 */
import { InvalidMeshError, describeValue } from '../errors';

/**
 * Boundary data: a constant, or a function of time and position (y = 0 in 1D).
 *
 * @example
 * ```ts
 * import type { BoundaryData } from 'chronomesh';
 * const steady: BoundaryData = 20;
 * const ramp: BoundaryData = (t) => 20 + 60 * Math.min(t / 600, 1); // °C, heats up over 10 min
 * console.log(typeof steady, typeof ramp);
 * ```
 */
export type BoundaryData = number | ((t: number, x: number, y: number) => number);

/**
 * Which boundary edges a part covers: a predicate on the midpoint of each boundary edge of the
 * initial mesh (in 1D on the endpoint, with y = 0), or a list of boundary edges `[i, j]` by initial
 * vertex index (in 1D: `[i]` with i = 0 or `cells`).
 *
 * @example
 * ```ts
 * import type { BoundarySelector } from 'chronomesh';
 * const leftFace: BoundarySelector = (mx) => mx < 1e-9;
 * const twoEdges: BoundarySelector = [[0, 1], [1, 2]]; // boundary edges by initial vertex pairs
 * console.log(typeof leftFace, twoEdges.length);
 * ```
 */
export type BoundarySelector = ((mx: number, my: number) => boolean) | number[][];

/**
 * Prescribed value (Dirichlet) u = value(t, x) on the selected edges: a temperature, a
 * concentration. It may change in time and need not agree with the initial state at t = 0.
 *
 * The value is interpolated linearly between the vertices of the initial mesh along the part
 * (exact for values that are affine along each initial edge, e.g. a face held at a temperature
 * history T(t)); give a finer initial mesh along the part if the value varies along it.
 * At a vertex shared with another held part, the part listed later wins.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * // rod at 0, its end x = 0 raised linearly to 1 over t ∈ (0, 1); the end x = 1 stays at 0
 * const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'value', where: [[0]], value: (t) => t }] });
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 5)).solve();
 * // prints the held end (exactly 1) and the middle (about 0.4)
 * console.log(solution.evaluate(1, [0, 0.5]));
 * ```
 */
export interface ValuePart {
  kind: 'value';
  where: BoundarySelector;
  /** u on the part (default 0). */
  value?: BoundaryData;
}

/**
 * Prescribed heat flux κ ∂u/∂n = flux(t, x) into the body (n the outward normal, so flux > 0
 * heats the body; 0 is insulated).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * // heat flux 1 into the end x = 1, end x = 0 held at 0: steady state u = x
 * const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'flux', where: (x) => x > 0.5, flux: 1 }] });
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 4 }), DoubleTree.sparseGrid(domain, 6)).solve();
 * // prints about 1
 * console.log(solution.evaluate(4, [1])[0]);
 * ```
 */
export interface FluxPart {
  kind: 'flux';
  where: BoundarySelector;
  /** Inward flux q (default 0, i.e. insulated). */
  flux?: BoundaryData;
}

/**
 * Convection (Newton cooling, Robin condition) κ ∂u/∂n = h (ambient(t, x) − u) to surroundings at
 * the ambient value, with heat-transfer coefficient h ≥ 0 (constant on each initial boundary edge;
 * a function is sampled at the edge midpoint). With h > 0 somewhere the problem is well posed even
 * without any held part and with zero reaction.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain } from 'chronomesh';
 * // slab at 1 cooled on both faces by surroundings at 0 (Biot number hL/κ = 1 with L = 1/2)
 * const domain = intervalDomain(0, 1, 2, { boundary: [{ kind: 'convection', where: () => true, transferCoefficient: 2, ambient: 0 }] });
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 6)).solve();
 * // the surface is cooler than the centre
 * console.log(solution.evaluate(0.5, [0, 0.5]));
 * ```
 */
export interface ConvectionPart {
  kind: 'convection';
  where: BoundarySelector;
  /** Heat-transfer coefficient h ≥ 0 (same units as κ per length). */
  transferCoefficient: number | ((mx: number, my: number) => number);
  /** Ambient value u_∞ (default 0). */
  ambient?: BoundaryData;
}

/**
 * One part of the boundary ∂Ω. Parts are applied in order (a later part overrides an earlier one
 * on the edges both select); edges no part selects keep the defaults (value 0, or insulated where
 * the `insulated` option says so).
 *
 * @example
 * ```ts
 * import { rectangleDomain, type BoundaryPart } from 'chronomesh';
 * const parts: BoundaryPart[] = [
 *   { kind: 'value', where: (mx) => mx < 1e-9, value: (t) => 20 + 5 * t },            // held face x = 0
 *   { kind: 'convection', where: (mx) => mx > 1 - 1e-9, transferCoefficient: 10, ambient: 0 }, // air side
 *   { kind: 'flux', where: (_mx, my) => my < 1e-9 || my > 1 - 1e-9 },                  // insulated
 * ];
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2, { boundary: parts });
 * console.log(domain.boundaryParts.length); // → 3
 * ```
 */
export type BoundaryPart = ValuePart | FluxPart | ConvectionPart;

/** Kind of each initial boundary edge. */
export const EdgeKind = { ZeroValue: 0, Insulated: 1, Value: 2, Flux: 3, Convection: 4 } as const;

/** Per-edge tables of the initial boundary (see the file comment). */
export interface BoundaryTables {
  /** Number of initial boundary edges (1D: the two endpoints). */
  readonly edgeCount: number;
  /** Initial vertices of each edge, 2 per edge (1D: the endpoint twice). */
  readonly edgeVertices: Int32Array;
  readonly edgeKind: Uint8Array;
  /** Index into `parts` of the part that owns the edge, −1 for the defaults. */
  readonly edgePart: Int32Array;
  /** Heat-transfer coefficient h per edge (0 unless convective). */
  readonly transfer: Float64Array;
  /** Per initial vertex: the value part whose data holds there, −1 if none (free or zero value). */
  readonly vertexValuePart: Int32Array;
  /** The validated parts, data normalised to functions. */
  readonly parts: readonly NormalisedPart[];
  /** True when some edge is flux or convection with data, or some vertex carries a value part. */
  readonly hasData: boolean;
  /** True when some edge has h > 0. */
  readonly hasConvection: boolean;
}

export interface NormalisedPart {
  readonly kind: 'value' | 'flux' | 'convection';
  /** value g, flux q, or ambient u_∞; null when identically zero by default. */
  readonly data: ((t: number, x: number, y: number) => number) | null;
  readonly spec: BoundaryPart;
}

/**
 * The factor of initial boundary edge b's data in the boundary load: h on a convection edge, 1 on a
 * flux edge, 0 where the edge carries no flux or ambient data (or h = 0).
 */
export function naturalDataFactor(tables: BoundaryTables, b: number): number {
  const p = tables.edgePart[b]!, kind = tables.edgeKind[b]!;
  if (p < 0 || tables.parts[p]!.data === null) return 0;
  if (kind === EdgeKind.Convection) return tables.transfer[b]!;
  return kind === EdgeKind.Flux ? 1 : 0;
}

/** Boundary-edge code of natural edge b (flux or convection) in the forest's neighbour table. */
export const naturalEdgeCode = (b: number): number => -3 - b;
/** Inverse of {@link naturalEdgeCode}: the initial boundary-edge index of a code ≤ −3, else −1. */
export const naturalEdgeIndex = (code: number): number => (code <= -3 ? -3 - code : -1);

function normaliseData(d: BoundaryData | undefined, field: string): ((t: number, x: number, y: number) => number) | null {
  if (d === undefined) return null;
  if (typeof d === 'number') {
    if (!Number.isFinite(d)) throw new InvalidMeshError(`${field} must be a finite number or a function (t, x, y) => number, received ${describeValue(d)}`, { field, expected: 'finite number or function', received: d });
    if (d === 0) return null;
    return () => d;
  }
  if (typeof d !== 'function') throw new InvalidMeshError(`${field} must be a finite number or a function (t, x, y) => number, received ${describeValue(d)}`, { field, expected: 'finite number or function', received: describeValue(d) });
  return d;
}

/**
 * Applies `parts` to the initial boundary edges. `edges` holds (i, j) per boundary edge (1D: (v, v));
 * `defaultInsulated[b]` is 1 where the `insulated` option holds. `edgeKey(i, j)` identifies an edge
 * given as `[i, j]` (1D: `[i]`), returning its index or −1.
 */
export function buildBoundaryTables(
  dim: 1 | 2,
  coords: Float64Array,
  vertexCount: number,
  edges: Int32Array,
  defaultInsulated: Uint8Array,
  parts: BoundaryPart[] | undefined,
  findEdge: (item: unknown) => number,
): BoundaryTables {
  const nb = edges.length / 2;
  const edgeKind = new Uint8Array(nb);
  const edgePart = new Int32Array(nb).fill(-1);
  const transfer = new Float64Array(nb);
  for (let b = 0; b < nb; b++) edgeKind[b] = defaultInsulated[b] ? EdgeKind.Insulated : EdgeKind.ZeroValue;
  const norm: NormalisedPart[] = [];
  if (parts !== undefined && !Array.isArray(parts)) {
    throw new InvalidMeshError(`boundary must be an array of boundary parts, received ${describeValue(parts)}`, { field: 'boundary', expected: 'array of { kind, where, … }', received: describeValue(parts) });
  }
  const mid = (b: number, k: number): number => {
    const i = edges[2 * b]!, j = edges[2 * b + 1]!;
    return dim === 1 ? (k === 0 ? coords[i]! : 0) : 0.5 * (coords[2 * i + k]! + coords[2 * j + k]!);
  };
  (parts ?? []).forEach((part, p) => {
    const field = `boundary[${p}]`;
    const any = part as unknown as { value?: BoundaryData; flux?: BoundaryData; ambient?: BoundaryData; transferCoefficient?: unknown };
    if (part === null || typeof part !== 'object') throw new InvalidMeshError(`${field} must be an object { kind, where, … }, received ${describeValue(part)}`, { field, expected: 'boundary part object', received: describeValue(part) });
    const kind = (part as { kind?: unknown }).kind;
    if (kind !== 'value' && kind !== 'flux' && kind !== 'convection') {
      throw new InvalidMeshError(`${field}.kind must be 'value', 'flux' or 'convection', received ${describeValue(kind)}`, { field: `${field}.kind`, expected: "'value' | 'flux' | 'convection'", received: describeValue(kind) });
    }
    const data = kind === 'value' ? normaliseData(any.value, `${field}.value`) : kind === 'flux' ? normaliseData(any.flux, `${field}.flux`) : normaliseData(any.ambient, `${field}.ambient`);
    norm.push({ kind, data, spec: part });
    let hOf: ((mx: number, my: number) => number) | null = null;
    let hConst = 0;
    if (kind === 'convection') {
      const h = any.transferCoefficient;
      if (typeof h === 'function') hOf = h as (mx: number, my: number) => number;
      else if (typeof h === 'number' && Number.isFinite(h) && h >= 0) hConst = h;
      else throw new InvalidMeshError(`${field}.transferCoefficient must be a finite number ≥ 0 or a function (mx, my) => h, received ${describeValue(h)}`, { field: `${field}.transferCoefficient`, expected: 'finite number ≥ 0', received: describeValue(h) });
    }
    const selected: number[] = [];
    const where = part.where;
    if (typeof where === 'function') {
      for (let b = 0; b < nb; b++) if (where(mid(b, 0), mid(b, 1))) selected.push(b);
      // A part that selects nothing leaves its edges at the defaults without a word: the heated face
      // stays cold. Usually an exact comparison ("x == 0.001") that no midpoint meets.
      if (selected.length === 0) throw noEdgeSelected(`${field}.where`, dim, nb, mid, 'a part must select at least one edge (compare with a margin, e.g. x < 1e-9 rather than x == 0)');
    } else if (Array.isArray(where)) {
      where.forEach((item, k) => {
        const b = findEdge(item);
        if (b < 0) {
          throw new InvalidMeshError(`${field}.where[${k}] = ${JSON.stringify(item)} is not a boundary edge of the initial mesh`, {
            field: `${field}.where[${k}]`,
            expected: dim === 1 ? '[i] with i a boundary vertex of the interval' : 'a pair [i, j] of vertex indices forming a boundary edge',
            received: JSON.stringify(item),
          });
        }
        selected.push(b);
      });
    } else {
      throw new InvalidMeshError(`${field}.where must be a predicate (mx, my) => boolean or a list of boundary edges, received ${describeValue(where)}`, { field: `${field}.where`, expected: 'function or number[][]', received: describeValue(where) });
    }
    for (const b of selected) {
      edgePart[b] = p;
      edgeKind[b] = kind === 'value' ? EdgeKind.Value : kind === 'flux' ? EdgeKind.Flux : EdgeKind.Convection;
      let h = 0;
      if (kind === 'convection') {
        h = hOf ? hOf(mid(b, 0), mid(b, 1)) : hConst;
        if (typeof h !== 'number' || !Number.isFinite(h) || h < 0) {
          throw new InvalidMeshError(`${field}.transferCoefficient on boundary edge [${edges[2 * b]}, ${edges[2 * b + 1]}] must be a finite number ≥ 0, received ${describeValue(h)}`, {
            field: `${field}.transferCoefficient`,
            expected: 'finite number ≥ 0',
            received: h,
          });
        }
      }
      transfer[b] = h;
    }
  });
  const vertexValuePart = new Int32Array(vertexCount).fill(-1);
  let hasData = false;
  let hasConvection = false;
  for (let b = 0; b < nb; b++) {
    const p = edgePart[b]!;
    if (transfer[b]! > 0) hasConvection = true;
    if (p >= 0 && norm[p]!.data !== null) hasData = true;
    if (edgeKind[b] === EdgeKind.Value && norm[p]!.data !== null) {
      // At a vertex shared by two value parts the later part wins.
      for (const v of [edges[2 * b]!, edges[2 * b + 1]!]) if (vertexValuePart[v]! < p) vertexValuePart[v] = p;
    }
  }
  return { edgeCount: nb, edgeVertices: edges, edgeKind, edgePart, transfer, vertexValuePart, parts: norm, hasData, hasConvection };
}

/**
 * A predicate (`boundary[i].where`, `insulated`) that is true at no boundary-edge midpoint: its edges
 * would silently keep the defaults, usually because of an exact comparison that no midpoint meets.
 * The error names where the predicate was asked (`mid(b, k)`: coordinate k of edge b's midpoint)
 * and `advice`. @internal
 */
export function noEdgeSelected(field: string, dim: 1 | 2, nb: number, mid: (b: number, k: number) => number, advice: string): InvalidMeshError {
  let where: string;
  if (dim === 1) where = `both end points (${Array.from({ length: nb }, (_, b) => `x = ${mid(b, 0)}`).join(' and ')})`;
  else {
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
    for (let b = 0; b < nb; b++) {
      x0 = Math.min(x0, mid(b, 0)); x1 = Math.max(x1, mid(b, 0));
      y0 = Math.min(y0, mid(b, 1)); y1 = Math.max(y1, mid(b, 1));
    }
    where = `all ${nb} initial boundary-edge midpoints, which span x ∈ [${x0}, ${x1}], y ∈ [${y0}, ${y1}]`;
  }
  return new InvalidMeshError(`${field} selects no boundary edge: it is false at ${where}; ${advice}`, { field, expected: 'a predicate true on at least one boundary-edge midpoint' });
}

/** True for edge kinds that hold the value (Dirichlet). */
export const isValueKind = (k: number): boolean => k === EdgeKind.ZeroValue || k === EdgeKind.Value;
