/**
 * From a validated problem file to the library's objects: the spatial domain (with κ, c and the
 * insulated boundary), the heat problem, and checks of every expression at sample points before
 * any solving. Expressions are wrapped so that a NaN or infinite value met later, anywhere,
 * stops the run with an error that names the field and the point.
 */
import {
  HeatProblem, InvalidArgumentError, InvalidMeshError, evaluateAt, intervalDomain, lShapeDomain, rectangleDomain,
  triangulatedDomain, type BoundaryPart, type DiffusionTensor, type DomainOptions, type SpatialDomain,
} from './core';
import type { CompiledExpression } from './expression';
import { positiveDefinite } from '../space/diffusion-tensor';
import { checkExactSolution } from './exact-solution';
import { coefficientSpread, transferSpread, type CoefficientSpread } from './coefficient-spread';
import type { BoundaryPartSpec, ProblemSpec } from './schema';

/** The domain and problem built from a {@link ProblemSpec}. */
export interface BuiltProblem {
  spec: ProblemSpec;
  domain: SpatialDomain;
  problem: HeatProblem;
  /**
   * Where κ and c vary most inside an initial element (they are taken at its centroid), and h along
   * an initial convection edge (taken at its midpoint): one entry per coefficient that varies there;
   * empty when all are constant per initial element and edge (./coefficient-spread.ts).
   */
  coefficientSpread: CoefficientSpread[];
}

function fmt(v: number): string {
  return Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(6)));
}

function at(dim: number, t: number | null, x: number, y: number): string {
  const parts = t === null ? [] : [`t = ${fmt(t)}`];
  parts.push(`x = ${fmt(x)}`);
  if (dim === 2) parts.push(`y = ${fmt(y)}`);
  return parts.join(', ');
}

function pointError(e: CompiledExpression, field: string, dim: number, t: number | null, x: number, y: number, v: number, want: string): never {
  throw new InvalidArgumentError(`${field}: ${JSON.stringify(e.source)} evaluates to ${fmt(v)} at ${at(dim, t, x, y)} (expected ${want})`, {
    field, expected: want, received: v,
  });
}

/** A space-only expression as (x, y) ⇒ value, checked against `ok` at every call. */
function spatial(e: CompiledExpression, field: string, dim: number, ok: (v: number) => boolean, want: string) {
  const f = e.fn;
  return (x: number, y: number): number => {
    const v = f(0, x, y);
    if (!ok(v)) pointError(e, field, dim, null, x, y, v, want);
    return v;
  };
}

const finite = (v: number) => Number.isFinite(v);

/**
 * The tensor of `"diffusion": {"xx", "xy", "yy"}` as the domain takes it (sampled at the initial
 * elements' centroids); a tensor that is not positive definite is refused naming the field and point.
 */
function tensorField(K: NonNullable<ProblemSpec['diffusionTensor']>, dim: number): (x: number, y: number) => DiffusionTensor {
  const xx = spatial(K.xx, 'diffusion.xx', dim, (v) => v > 0 && Number.isFinite(v), 'a finite number > 0');
  const xy = spatial(K.xy, 'diffusion.xy', dim, finite, 'a finite number');
  const yy = spatial(K.yy, 'diffusion.yy', dim, (v) => v > 0 && Number.isFinite(v), 'a finite number > 0');
  return (x, y) => {
    const t = { xx: xx(x, y), xy: xy(x, y), yy: yy(x, y) };
    if (!positiveDefinite(t.xx, t.xy, t.yy)) {
      throw new InvalidArgumentError(
        `diffusion: the tensor (xx, xy, yy) = (${t.xx}, ${t.xy}, ${t.yy}) at (x, y) = (${x}, ${y}) is not positive definite (it needs xx·yy − xy² > 0)`,
        { field: 'diffusion.xy', expected: 'xx·yy − xy² > 0', received: `${t.xx}, ${t.xy}, ${t.yy}` },
      );
    }
    return t;
  };
}

/** A problem-file boundary part as the core's {@link BoundaryPart}, with every value checked where it is used. */
/** `start` (the problem's start time) only turns the solver's t into the file's t in messages. */
function boundaryPart(b: BoundaryPartSpec, field: string, dim: number, start: number): BoundaryPart {
  const whereFn = spatial(b.where, `${field}.where`, dim, finite, 'a finite number (nonzero = selected)');
  const where = (mx: number, my: number): boolean => whereFn(mx, my) !== 0;
  const g = b.data.fn;
  const dataField = `${field}.${b.kind === 'value' ? 'value' : b.kind === 'flux' ? 'flux' : 'ambient'}`;
  const data = (t: number, x: number, y: number): number => {
    const v = g(t, x, y);
    if (!Number.isFinite(v)) pointError(b.data, dataField, dim, t + start, x, y, v, 'a finite number');
    return v;
  };
  if (b.kind === 'value') return { kind: 'value', where, value: data };
  if (b.kind === 'flux') return { kind: 'flux', where, flux: data };
  const h = spatial(b.transferCoefficient!, `${field}.transferCoefficient`, dim, (v) => v >= 0 && Number.isFinite(v), 'a finite number ≥ 0');
  return { kind: 'convection', where, transferCoefficient: h, ambient: data };
}

/**
 * Builds the domain and problem of a validated spec and evaluates every expression at the initial
 * mesh's vertices and element centroids (the source also at t = 0, T/2, T) before any work; a
 * known solution (`exact`) is checked against the equation, the initial state and the boundary
 * conditions (./exact-solution.ts).
 *
 * @example
 * ```ts
 * import { buildProblem, parseProblem } from 'chronomesh/problem-file';
 * const built = buildProblem(parseProblem({ domain: { shape: 'lshape' }, horizon: 1, initial: '1' }));
 * console.log(built.domain.dim, built.problem.T); // → 2 1
 * ```
 */
export function buildProblem(spec: ProblemSpec): BuiltProblem {
  const d = spec.domain;
  const dim = d.shape === 'interval' ? 1 : 2;
  const K = spec.diffusionTensor;
  const opts: DomainOptions = {
    ...(K === null
      ? { kappa: spatial(spec.diffusion, 'diffusion', dim, (v) => v > 0 && Number.isFinite(v), 'a finite number > 0') }
      : { diffusionTensor: tensorField(K, dim) }),
    reaction: spatial(spec.reaction, 'reaction', dim, (v) => v >= 0 && Number.isFinite(v), 'a finite number ≥ 0'),
  };
  if (spec.insulated) {
    const ins = spatial(spec.insulated, 'insulated', dim, finite, 'a finite number (nonzero = insulated)');
    opts.insulated = (mx, my) => ins(mx, my) !== 0;
  }
  if (spec.boundary.length > 0) opts.boundary = spec.boundary.map((b, i) => boundaryPart(b, `boundary[${i}]`, dim, spec.start));
  let domain: SpatialDomain;
  try {
    switch (d.shape) {
      case 'interval': domain = intervalDomain(d.from, d.to, d.cells, opts); break;
      case 'rectangle': domain = rectangleDomain(d.from[0], d.to[0], d.from[1], d.to[1], d.cells[0], d.cells[1], opts); break;
      case 'lshape': domain = lShapeDomain(d.cells, opts); break;
      case 'mesh': domain = triangulatedDomain(d.points, d.triangles, opts); break;
    }
  } catch (e) {
    // Errors of the boundary parts and of insulated name their own field, which is top-level in a file.
    if (e instanceof InvalidMeshError && (e.field?.startsWith('boundary[') || e.field === 'insulated')) throw e;
    if (e instanceof InvalidMeshError) throw new InvalidMeshError(`domain: ${e.message}`, { field: `domain.${e.field ?? ''}`, received: e.received });
    throw e;
  }
  const initial = spatial(spec.initial, 'initial', dim, finite, 'a finite number');
  // The solver's clock runs from 0 over horizon − start (the expressions in t are shifted, ./schema.ts).
  const { duration } = spec;
  const src = spec.source.fn;
  const source = spec.source.constant && src(0, 0, 0) === 0 ? undefined : (t: number, x: number, y: number): number => {
    const v = src(t, x, y);
    if (!Number.isFinite(v)) pointError(spec.source, 'source', dim, t + spec.start, x, y, v, 'a finite number');
    return v;
  };
  // Sample points: initial vertices and element centroids.
  const mesh = domain.leafMesh(domain.initialFreeVertices());
  const pts: number[][] = [];
  for (let i = 0; i < mesh.vertexCount; i++) pts.push([mesh.coords[dim * i]!, dim === 2 ? mesh.coords[dim * i + 1]! : 0]);
  for (let e = 0; e < mesh.elementCount; e++) {
    let cx = 0, cy = 0;
    for (let j = 0; j <= dim; j++) {
      const v = mesh.elements[(dim + 1) * e + j]!;
      cx += mesh.coords[dim * v]! / (dim + 1);
      if (dim === 2) cy += mesh.coords[dim * v + 1]! / (dim + 1);
    }
    pts.push([cx, cy]);
  }
  for (const [x, y] of pts) {
    initial(x!, y!);
    if (source) for (const t of [0, duration / 2, duration]) source(t, x!, y!);
  }
  // Probes and sensors must lie in the closed domain.
  checkInside(domain, spec.probes.map((p) => p.slice(1)), 'probes');
  if (spec.sensors !== null) checkInside(domain, spec.sensors.points, 'sensors.points');
  // A known solution must solve this problem, or the true errors reported against it mean nothing.
  if (spec.exact) checkExactSolution(spec, spec.exact, domain);
  const spreads: CoefficientSpread[] = [];
  const coefficients: [CoefficientSpread['field'], CompiledExpression][] = K === null
    ? [['diffusion', spec.diffusion]]
    : [['diffusion.xx', K.xx], ['diffusion.xy', K.xy], ['diffusion.yy', K.yy]];
  coefficients.push(['reaction', spec.reaction]);
  for (const [field, e] of coefficients) {
    const s = e.constant ? null : coefficientSpread(mesh, field, (x, y) => e.fn(0, x, y));
    if (s) spreads.push(s);
  }
  spec.boundary.forEach((b, p) => {
    if (b.kind !== 'convection' || b.transferCoefficient!.constant) return;
    const h = b.transferCoefficient!.fn;
    const s = transferSpread(mesh, domain.forest.boundary.edgePart, p, (x, y) => h(0, x, y));
    if (s) spreads.push(s);
  });
  const curveSources = spec.curveSources.map((c, j) => {
    const f = `curveSources[${j}]`;
    const time = (t: number): number => {
      const v = c.time.fn(t, 0, 0);
      if (!Number.isFinite(v)) throw new InvalidArgumentError(`${f}.time: ${JSON.stringify(c.time.source)} evaluates to ${v} at t = ${t + spec.start} (expected a finite number)`, { field: `${f}.time`, expected: 'a finite number', received: v });
      return v;
    };
    const density = (x: number, y: number): number => {
      const v = c.density.fn(0, x, y);
      if (!Number.isFinite(v)) pointError(c.density, `${f}.density`, dim, spec.start, x, y, v, 'a finite number');
      return v;
    };
    for (const t of [0, duration / 2, duration]) time(t);
    for (const p of c.curve) density(p[0]!, p[1] ?? 0);
    const unit = c.density.constant && c.density.fn(0, 0, 0) === 1;
    return { curve: c.curve, time, ...(unit ? {} : { density }) };
  });
  const zeroInitial = spec.initial.constant && spec.initial.fn(0, 0, 0) === 0;
  const problem = new HeatProblem({
    domain, T: duration, ...(zeroInitial ? {} : { initial }), ...(source ? { source } : {}), ...(curveSources.length > 0 ? { curveSources } : {}),
  });
  return { spec, domain, problem, coefficientSpread: spreads };
}

/** Each point ([x] or [x, y]) must lie in the closed domain; the error names `${field}[i]`. */
function checkInside(domain: SpatialDomain, points: number[][], field: string): void {
  if (points.length === 0) return;
  const free = domain.initialFreeVertices();
  const inside = evaluateAt(domain, free, new Float64Array(free.length), points.flat(), undefined, { outside: NaN });
  inside.forEach((v, i) => {
    if (Number.isNaN(v)) throw new InvalidArgumentError(`${field}[${i}]: the point (${points[i]!.join(', ')}) lies outside the domain`, { field: `${field}[${i}]` });
  });
}
