/**
 * The `exact` field of a problem file: a known solution u(t, x[, y]) for verification (for instance
 * a manufactured solution with the source computed from it; common practice in code verification).
 * With it, a run also reports the true error of its answer in L2(0, T; H¹) and L2(0, T; L2)
 * and its ratio to the estimator.
 *
 * A known solution that does not solve the stated problem would make those numbers meaningless, so
 * before any work it is checked, with exact derivatives (./derivative.ts), at sample points of the
 * initial mesh and times in (0, T], for the problem the library solves — κ and c taken at the
 * centroid of each initial element:
 *   - the heat equation ∂t u − ∇·(K∇u) + c u = f in every element (K = κI unless `diffusion` is a tensor),
 *   - continuity of the flux κ ∂u/∂n (n·K∇u with a diffusion tensor) across the edges where κ (K) jumps,
 *   - the initial state u(0, ·) = u0,
 *   - the boundary condition of every initial boundary edge at its midpoint (in 1D at the end
 *     point): the value g (0 on the default part), the flux κ ∂u/∂n = q (0 where insulated) or the
 *     convection condition κ ∂u/∂n = h (u∞ − u), with the parts selected as the library selects them
 *     (in order, a later part overriding an earlier one).
 */
import { InvalidArgumentError, type KnownSolution, type SpatialDomain } from './core';
import { compileWithDerivatives } from './derivative';
import { largestEigenvalue } from '../space/diffusion-tensor';
import type { CompiledExpression } from './expression';
import type { BoundaryPartSpec, ProblemSpec } from './schema';

/** A compiled known solution with the derivatives the checks and the error norms need. */
export interface ExactSolutionSpec {
  value: CompiledExpression;
  dt: CompiledExpression;
  dx: CompiledExpression;
  dxx: CompiledExpression;
  /** null in 1D. */
  dy: CompiledExpression | null;
  dyy: CompiledExpression | null;
  /** ∂x∂y u (2D, for a diffusion tensor's cross term); null in 1D. */
  dxy: CompiledExpression | null;
}

/** Compiles the `exact` field (an expression in t, x[, y]) with its derivatives. @internal */
export function compileExact(source: string, dim: 1 | 2): ExactSolutionSpec {
  const vars = dim === 1 ? (['t', 'x'] as const) : (['t', 'x', 'y'] as const);
  const wrt = dim === 1 ? [['t'], ['x'], ['x', 'x']] as const : [['t'], ['x'], ['x', 'x'], ['y'], ['y', 'y'], ['x', 'y']] as const;
  const [value, dt, dx, dxx, dy, dyy, dxy] = compileWithDerivatives(source, 'exact', vars, wrt);
  return { value: value!, dt: dt!, dx: dx!, dxx: dxx!, dy: dy ?? null, dyy: dyy ?? null, dxy: dxy ?? null };
}

/** The known solution as the error norms take it (value and spatial gradient). @internal */
export function knownSolution(exact: ExactSolutionSpec): KnownSolution {
  const u = exact.value.fn, ux = exact.dx.fn, uy = exact.dy?.fn;
  return {
    value: (t, x, y) => u(t, x, y),
    gradient: (t, x, y, g) => {
      g[0] = ux(t, x, y);
      if (uy) g[1] = uy(t, x, y);
    },
  };
}

/** Relative tolerance of the checks: far above rounding, far below any real mismatch. */
const RELATIVE = 1e-7;

function fmt(v: number): string {
  return String(Number(v.toPrecision(6)));
}

function mismatch(what: string, t: number, x: number, y: number, dim: number, lhs: number, rhs: number, source: string): never {
  const where = `t = ${fmt(t)}, x = ${fmt(x)}${dim === 2 ? `, y = ${fmt(y)}` : ''}`;
  throw new InvalidArgumentError(
    `exact: ${JSON.stringify(source)} does not satisfy ${what} at ${where}: ${fmt(lhs)} against ${fmt(rhs)}; ` +
      'the true errors would be meaningless (check the exact solution and the problem data)',
    { field: 'exact', expected: `≈ ${rhs}`, received: lhs },
  );
}

/**
 * The initial mesh: coordinates, elements, and the diffusion tensor (xx, xy, yy; κ, 0, κ when
 * isotropic) and c per element as the library takes them (at the centroid).
 */
interface InitialMesh {
  dim: number;
  coords: Float64Array;
  elements: Int32Array;
  elementCount: number;
  vertexCount: number;
  centroid: Float64Array;
  kappa: Float64Array;
  tensor: Float64Array;
  reaction: Float64Array;
}

function initialMesh(spec: ProblemSpec, domain: SpatialDomain): InitialMesh {
  const mesh = domain.leafMesh(domain.initialFreeVertices());
  const dim = domain.dim;
  const nv = dim + 1;
  const ne = mesh.elementCount;
  const centroid = new Float64Array(2 * ne);
  const kappa = new Float64Array(ne);
  const tensor = new Float64Array(3 * ne);
  const reaction = new Float64Array(ne);
  const K = spec.diffusionTensor;
  for (let e = 0; e < ne; e++) {
    let cx = 0, cy = 0;
    for (let j = 0; j < nv; j++) {
      const v = mesh.elements[nv * e + j]!;
      cx += mesh.coords[dim * v]! / nv;
      if (dim === 2) cy += mesh.coords[dim * v + 1]! / nv;
    }
    centroid[2 * e] = cx;
    centroid[2 * e + 1] = cy;
    if (K === null) {
      kappa[e] = spec.diffusion.fn(0, cx, cy);
      tensor[3 * e] = tensor[3 * e + 2] = kappa[e]!;
    } else {
      const xx = K.xx.fn(0, cx, cy), xy = K.xy.fn(0, cx, cy), yy = K.yy.fn(0, cx, cy);
      tensor.set([xx, xy, yy], 3 * e);
      kappa[e] = largestEigenvalue(xx, xy, yy); // for scales, as the library takes κ (docs/method.md §4.4)
    }
    reaction[e] = spec.reaction.fn(0, cx, cy);
  }
  return { dim, coords: mesh.coords, elements: mesh.elements, elementCount: ne, vertexCount: mesh.vertexCount, centroid, kappa, tensor, reaction };
}

/**
 * The facets of the initial mesh (edges in 2D, vertices in 1D) with their midpoint, the unit normal
 * pointing out of their first element, and their one (boundary) or two (interior) elements.
 */
function facets(m: InitialMesh): { mx: number; my: number; nx: number; ny: number; e1: number; e2: number }[] {
  const c = m.coords;
  const out: { mx: number; my: number; nx: number; ny: number; e1: number; e2: number }[] = [];
  if (m.dim === 1) {
    const at = new Map<number, number[]>();
    for (let e = 0; e < m.elementCount; e++) {
      for (let j = 0; j < 2; j++) {
        const v = m.elements[2 * e + j]!;
        const list = at.get(v);
        if (list) list.push(e);
        else at.set(v, [e]);
      }
    }
    for (const [v, es] of at) {
      const e1 = es[0]!;
      out.push({ mx: c[v]!, my: 0, nx: c[v]! > m.centroid[2 * e1]! ? 1 : -1, ny: 0, e1, e2: es[1] ?? -1 });
    }
    return out;
  }
  const n = m.vertexCount;
  const seen = new Map<number, { a: number; b: number; opposite: number; e1: number; e2: number }>();
  for (let e = 0; e < m.elementCount; e++) {
    for (let j = 0; j < 3; j++) {
      const a = m.elements[3 * e + j]!, b = m.elements[3 * e + ((j + 1) % 3)]!, o = m.elements[3 * e + ((j + 2) % 3)]!;
      const key = Math.min(a, b) * n + Math.max(a, b);
      const f = seen.get(key);
      if (f) f.e2 = e;
      else seen.set(key, { a, b, opposite: o, e1: e, e2: -1 });
    }
  }
  for (const { a, b, opposite, e1, e2 } of seen.values()) {
    const ax = c[2 * a]!, ay = c[2 * a + 1]!, bx = c[2 * b]!, by = c[2 * b + 1]!;
    let nx = by - ay, ny = -(bx - ax);
    const len = Math.hypot(nx, ny);
    nx /= len;
    ny /= len;
    const mx = (ax + bx) / 2, my = (ay + by) / 2;
    // out of e1: away from its vertex opposite the edge
    if ((c[2 * opposite]! - mx) * nx + (c[2 * opposite + 1]! - my) * ny > 0) {
      nx = -nx;
      ny = -ny;
    }
    out.push({ mx, my, nx, ny, e1, e2 });
  }
  return out;
}

/** The condition on a boundary edge with midpoint (mx, my), selected as the library selects it. */
function conditionAt(spec: ProblemSpec, mx: number, my: number): { part: BoundaryPartSpec | null; index: number; insulated: boolean } {
  let chosen: { part: BoundaryPartSpec | null; index: number; insulated: boolean } = {
    part: null, index: -1, insulated: spec.insulated !== null && spec.insulated.fn(0, mx, my) !== 0,
  };
  spec.boundary.forEach((b, i) => {
    if (b.where.fn(0, mx, my) !== 0) chosen = { part: b, index: i, insulated: false };
  });
  return chosen;
}

/**
 * Checks that the spec's known solution solves its problem on `domain` (module comment); throws
 * an InvalidArgumentError on field `exact` naming the condition, the point and both sides.
 * @internal
 */
export function checkExactSolution(spec: ProblemSpec, exact: ExactSolutionSpec, domain: SpatialDomain): void {
  const m = initialMesh(spec, domain);
  const dim = m.dim;
  const T = spec.duration; // the solver's clock (the expressions are shifted to it)
  const src = exact.value.source;
  const u = exact.value.fn, ut = exact.dt.fn, ux = exact.dx.fn, uxx = exact.dxx.fn;
  const uy = exact.dy?.fn, uyy = exact.dyy?.fn, uxy = exact.dxy?.fn;
  const f = spec.source.fn, u0 = spec.initial.fn;
  const times = [T * 0.137, T * 0.5, T * 0.911, T];
  const tn = m.tensor;
  // the conormal flux n·K∇u with element e's tensor (κ ∂u/∂n when isotropic)
  const normalFlux = (e: number, t: number, x: number, y: number, nx: number, ny: number): number => {
    const gx = ux(t, x, y), gy = uy ? uy(t, x, y) : 0;
    return nx * (tn[3 * e]! * gx + tn[3 * e + 1]! * gy) + ny * (tn[3 * e + 1]! * gx + tn[3 * e + 2]! * gy);
  };
  const sameTensor = (a: number, b: number): boolean => tn[3 * a] === tn[3 * b] && tn[3 * a + 1] === tn[3 * b + 1] && tn[3 * a + 2] === tn[3 * b + 2];
  const fluxName = spec.diffusionTensor === null ? 'κ ∂u/∂n' : 'n·K∇u';
  const tensorText = (e: number): string => (spec.diffusionTensor === null ? fmt(m.kappa[e]!) : `(xx, xy, yy) = (${fmt(tn[3 * e]!)}, ${fmt(tn[3 * e + 1]!)}, ${fmt(tn[3 * e + 2]!)})`);
  // Sample points per element: its centroid and the points halfway to each vertex (so that a
  // solution right only at a few special points, as on a two-triangle mesh, is still caught).
  const inElement: { x: number; y: number; e: number }[] = [];
  for (let e = 0; e < m.elementCount; e++) {
    const cx = m.centroid[2 * e]!, cy = m.centroid[2 * e + 1]!;
    inElement.push({ x: cx, y: cy, e });
    for (let j = 0; j <= dim; j++) {
      const v = m.elements[(dim + 1) * e + j]!;
      inElement.push({ x: (cx + m.coords[dim * v]!) / 2, y: dim === 2 ? (cy + m.coords[dim * v + 1]!) / 2 : 0, e });
    }
  }
  // Scales for the absolute floors: the largest |u| and |κ∇u| met at the sample points.
  let uScale = 0, fluxScale = 0;
  for (const { x, y, e } of inElement) {
    for (const t of [0, ...times]) {
      uScale = Math.max(uScale, Math.abs(u(t, x, y)));
      fluxScale = Math.max(fluxScale, m.kappa[e]! * Math.hypot(ux(t, x, y), uy ? uy(t, x, y) : 0));
    }
  }
  // Said with a failure in an element where the expressions of κ or c are not constant: the likely cause.
  const centroidNote = (e: number): string => {
    let varies = false;
    for (let j = 0; j <= dim; j++) {
      const v = m.elements[(dim + 1) * e + j]!;
      const x = m.coords[dim * v]!, y = dim === 2 ? m.coords[dim * v + 1]! : 0;
      const K = spec.diffusionTensor;
      const diffusionVaries = K === null
        ? spec.diffusion.fn(0, x, y) !== m.kappa[e]
        : K.xx.fn(0, x, y) !== tn[3 * e] || K.xy.fn(0, x, y) !== tn[3 * e + 1] || K.yy.fn(0, x, y) !== tn[3 * e + 2];
      if (diffusionVaries || spec.reaction.fn(0, x, y) !== m.reaction[e]) varies = true;
    }
    if (!varies) return '';
    return ` (diffusion and reaction are taken at initial-element centroids, here ${spec.diffusionTensor === null ? 'κ' : 'K'} = ${tensorText(e)}, c = ${fmt(m.reaction[e]!)}: ` +
      'a known solution must solve the problem with these constants per initial element)';
  };
  for (const { x, y, e } of inElement) {
    const a = u(0, x, y), b = u0(0, x, y);
    if (!(Math.abs(a - b) <= RELATIVE * (Math.abs(a) + Math.abs(b) + uScale))) mismatch(`the initial state (u(${fmt(spec.start)}, ·) = initial)`, spec.start, x, y, dim, a, b, src);
    const kxx = tn[3 * e]!, kxy = tn[3 * e + 1]!, kyy = tn[3 * e + 2]!, c = m.reaction[e]!;
    for (const t of times) {
      // ∂t u − ∇·(K∇u) + c u = f with K (κI when isotropic) and c constant on the element:
      // ∇·(K∇u) = Kxx uxx + 2 Kxy uxy + Kyy uyy; every term kept for the scale
      const div = kxx * uxx(t, x, y) + (uyy ? kyy * uyy(t, x, y) : 0) + (uxy && kxy !== 0 ? 2 * kxy * uxy(t, x, y) : 0);
      const terms = [ut(t, x, y), -div, c * u(t, x, y)];
      const lhs = terms[0]! + terms[1]! + terms[2]!;
      const rhs = f(t, x, y);
      const scale = terms.reduce((s, v) => s + Math.abs(v), Math.abs(rhs));
      if (!(Math.abs(lhs - rhs) <= RELATIVE * scale)) mismatch(`the heat equation (∂t u − ∇·(κ∇u) + c u = source)${centroidNote(e)}`, t + spec.start, x, y, dim, lhs, rhs, src);
    }
  }
  for (const { mx, my, nx, ny, e1, e2 } of facets(m)) {
    if (e2 >= 0) {
      // Interior facet: where κ jumps, the flux κ ∂u/∂n must still be continuous (a weak solution),
      // each side's derivative taken just inside its element.
      if (sameTensor(e1, e2)) continue;
      for (const t of times) {
        const side = (e: number): number => {
          const px = mx + 1e-9 * (m.centroid[2 * e]! - mx), py = my + 1e-9 * (m.centroid[2 * e + 1]! - my);
          return normalFlux(e, t, px, py, nx, ny);
        };
        const q1 = side(e1), q2 = side(e2);
        if (!(Math.abs(q1 - q2) <= RELATIVE * (Math.abs(q1) + Math.abs(q2) + fluxScale))) {
          mismatch(`continuity of the flux ${fluxName} across the interface where the diffusion jumps from ${tensorText(e1)} to ${tensorText(e2)}`, t + spec.start, mx, my, dim, q1, q2, src);
        }
      }
      continue;
    }
    const { part, index, insulated } = conditionAt(spec, mx, my);
    const name = part === null ? (insulated ? `the insulated boundary (${fluxName} = 0)` : 'the default boundary value 0') : `boundary[${index}] (${part.kind})`;
    for (const t of times) {
      const value = u(t, mx, my);
      const flux = normalFlux(e1, t, mx, my, nx, ny);
      if (part === null && !insulated) {
        if (!(Math.abs(value) <= RELATIVE * uScale)) mismatch(name, t + spec.start, mx, my, dim, value, 0, src);
      } else if (part === null || part.kind === 'flux') {
        const q = part === null ? 0 : part.data.fn(t, mx, my);
        if (!(Math.abs(flux - q) <= RELATIVE * (Math.abs(flux) + Math.abs(q) + fluxScale))) mismatch(`${name}, ${fluxName}`, t + spec.start, mx, my, dim, flux, q, src);
      } else if (part.kind === 'value') {
        const g = part.data.fn(t, mx, my);
        if (!(Math.abs(value - g) <= RELATIVE * (Math.abs(value) + Math.abs(g) + uScale))) mismatch(name, t + spec.start, mx, my, dim, value, g, src);
      } else {
        const h = part.transferCoefficient!.fn(0, mx, my);
        const want = h * (part.data.fn(t, mx, my) - value);
        if (!(Math.abs(flux - want) <= RELATIVE * (Math.abs(flux) + Math.abs(want) + fluxScale))) mismatch(`${name}, ${fluxName} = h (ambient − u)`, t + spec.start, mx, my, dim, flux, want, src);
      }
    }
  }
}
