/**
 * The problem-file format (JSON): field names, types, defaults and the checks made before any
 * work. Every error is an {@link InvalidArgumentError} whose message starts with the field path
 * (`domain.cells`, `probes[2]`) and says what was expected; unknown fields get the nearest valid
 * name as a suggestion.
 */
import { InvalidArgumentError } from '../errors';
import { compileExpression, type CompiledExpression } from './expression';
import { nearestName } from './nearest-name';
import { bad, checkKeys, typeName } from './field-errors';
import { compileExact, type ExactSolutionSpec } from './exact-solution';
import { parseState } from './state-file';
import type { NodalField } from './core';

/** Spatial domain of a problem file. */
export type DomainSpec =
  | { shape: 'interval'; from: number; to: number; cells: number }
  | { shape: 'rectangle'; from: [number, number]; to: [number, number]; cells: [number, number] }
  | { shape: 'lshape'; cells: number }
  | { shape: 'mesh'; points: number[][]; triangles: number[][] };

/**
 * One boundary part of a problem file: `where` selects initial boundary edges by their midpoint
 * (nonzero = selected); `value` (u = g(t, x, y)), `flux` (κ∂u/∂n = q(t, x, y)) or
 * `transferCoefficient` h(x, y) ≥ 0 with `ambient` u∞(t, x, y) (κ∂u/∂n = h(u∞ − u)).
 */
export interface BoundaryPartSpec {
  kind: 'value' | 'flux' | 'convection';
  where: CompiledExpression;
  /** g, q or u∞ (default 0). */
  data: CompiledExpression;
  /** h (convection only). */
  transferCoefficient: CompiledExpression | null;
}

const BOUNDARY_FIELDS: Record<BoundaryPartSpec['kind'], string[]> = {
  value: ['kind', 'where', 'value'],
  flux: ['kind', 'where', 'flux'],
  convection: ['kind', 'where', 'transferCoefficient', 'ambient'],
};

/** A validated problem file with its expressions compiled. */
export interface ProblemSpec {
  title: string | null;
  description: string | null;
  domain: DomainSpec;
  /**
   * The time the run starts at (default 0): probes, slices and every expression in t use the
   * absolute time t ∈ [start, horizon], and the solver's clock runs over the duration horizon −
   * start (the expressions are shifted here, so later code evaluates them at the solver's time).
   */
  start: number;
  horizon: number;
  /** horizon − start: the length of the solver's clock (its T). */
  duration: number;
  /** κ(x, y); the default "1" when `diffusionTensor` is given (the file's `diffusion` is then an object). */
  diffusion: CompiledExpression;
  /** The entries of an anisotropic diffusion tensor (`"diffusion": {"xx": …, "xy": …, "yy": …}`, 2D), else null. */
  diffusionTensor: { xx: CompiledExpression; xy: CompiledExpression; yy: CompiledExpression } | null;
  reaction: CompiledExpression;
  source: CompiledExpression;
  /** u0(x, y): the expression, or for a state (`"initial": {"state": …}`) its interpolation. */
  initial: CompiledExpression;
  /** The state the run starts from when `initial` names one (./state-file.ts), else null. */
  initialState: NodalField | null;
  insulated: CompiledExpression | null;
  /** Boundary parts (value, flux, convection), applied in order after `insulated`. */
  boundary: BoundaryPartSpec[];
  strategy: 'adaptive' | 'sparse' | 'full';
  tolerance: number;
  /** Adds relativeTolerance × the solution's norm to `tolerance` (the stop test is E ≤ the sum). */
  relativeTolerance: number;
  maxDofs: number;
  maxSeconds: number;
  maxSteps: number;
  /** Dörfler θ, or null for the library's default (0.5 in 1D, 0.7 in 2D). */
  bulk: number | null;
  /** Whether the adaptive strategy runs on initial elements too flat for its estimator (AdaptiveOptions.acceptFlatElements). */
  acceptFlatElements: boolean;
  /** Probe points as [t, x] or [t, x, y]. */
  probes: number[][];
  /**
   * Sources concentrated at a point (1D) or on a polyline (2D): the points, the time profile g(t)
   * (default "1") and the density ρ(x, y) along the curve (default "1"); the load is ∫∫_Γ g ρ v.
   */
  curveSources: { curve: number[][]; time: CompiledExpression; density: CompiledExpression }[];
  /** Sensor histories: fixed points ([x] or [x, y]) read at the given absolute times; null if none. */
  sensors: { points: number[][]; times: number[] } | null;
  slices: number[];
  /** A known solution u(t, x[, y]) for verification, with its derivatives (./exact-solution.ts); null if none. */
  exact: ExactSolutionSpec | null;
}

/** Top-level fields of a problem file (the contract of the command line; additions only). */
export const PROBLEM_FIELDS = [
  'title', 'description', 'domain', 'start', 'horizon', 'diffusion', 'reaction', 'source', 'initial', 'insulated',
  'boundary', 'strategy', 'tolerance', 'relativeTolerance', 'maxDofs', 'maxSeconds', 'maxSteps', 'bulk', 'acceptFlatElements', 'probes', 'slices', 'exact',
  'sensors', 'curveSources',
] as const;

const DOMAIN_FIELDS: Record<DomainSpec['shape'], string[]> = {
  interval: ['shape', 'from', 'to', 'cells'],
  rectangle: ['shape', 'from', 'to', 'cells'],
  lshape: ['shape', 'cells'],
  mesh: ['shape', 'points', 'triangles'],
};

/** Defaults of the optional fields. */
export const PROBLEM_DEFAULTS = {
  diffusion: '1', reaction: '0', source: '0', initial: '0', strategy: 'adaptive',
  tolerance: 0, relativeTolerance: 0, maxDofs: 20000, maxSeconds: 60, maxSteps: 200, bulk: null, acceptFlatElements: false,
} as const;


function num(v: unknown, field: string, range: string, ok: (x: number) => boolean): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) bad(field, `must be a number ${range}, found ${typeName(v)}`, v);
  if (!ok(v)) bad(field, `must be ${range}, found ${v}`, v);
  return v;
}

function flag(v: unknown, field: string): boolean {
  if (typeof v !== 'boolean') bad(field, `must be true or false, found ${typeName(v)}`, v);
  return v;
}

function int(v: unknown, field: string, lo: number, hi: number): number {
  return num(v, field, `(an integer in [${lo}, ${hi}])`, (x) => Number.isInteger(x) && x >= lo && x <= hi);
}

function pair(v: unknown, field: string): [number, number] {
  if (!Array.isArray(v) || v.length !== 2) bad(field, `must be a pair [x, y], found ${typeName(v)}`, v);
  return [num(v[0], `${field}[0]`, '(finite)', () => true), num(v[1], `${field}[1]`, '(finite)', () => true)];
}

function expression(obj: Record<string, unknown>, key: string, fallback: string, vars: ('t' | 'x' | 'y')[], field = key): CompiledExpression {
  const v = obj[key] ?? fallback;
  if (typeof v !== 'string' && typeof v !== 'number') bad(field, `must be an expression string such as "1 + x*y" or a number, found ${typeName(v)}`, v);
  return compileExpression(String(v), field, vars);
}

/** `diffusion`: an expression (isotropic κ) or, in 2D, an object {"xx", "xy", "yy"} of expressions (a tensor). */
function diffusionFields(o: Record<string, unknown>, dim: 1 | 2, space: ('x' | 'y')[]): Pick<ProblemSpec, 'diffusion' | 'diffusionTensor'> {
  const v = o.diffusion;
  if (v === null || typeof v !== 'object') return { diffusion: expression(o, 'diffusion', PROBLEM_DEFAULTS.diffusion, space), diffusionTensor: null };
  if (dim !== 2) bad('diffusion', 'may be a tensor {"xx", "xy", "yy"} only on a 2D domain; on an interval give one expression', v);
  if (Array.isArray(v)) bad('diffusion', 'must be an expression or an object {"xx": …, "xy": …, "yy": …} (a diffusion tensor), found a list', v);
  const t = v as Record<string, unknown>;
  checkKeys(t, ['xx', 'xy', 'yy'], 'diffusion');
  for (const k of ['xx', 'yy'] as const) if (t[k] === undefined) bad(`diffusion.${k}`, 'is required for a diffusion tensor (xy defaults to 0)', undefined);
  return {
    diffusion: compileExpression(PROBLEM_DEFAULTS.diffusion, 'diffusion', space),
    diffusionTensor: { xx: expression(t, 'xx', '1', space, 'diffusion.xx'), xy: expression(t, 'xy', '0', space, 'diffusion.xy'), yy: expression(t, 'yy', '1', space, 'diffusion.yy') },
  };
}

function parseBoundaryPart(v: unknown, field: string, space: ('x' | 'y')[]): BoundaryPartSpec {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) bad(field, `must be an object with a "kind", found ${typeName(v)}`, v);
  const o = v as Record<string, unknown>;
  const kinds = Object.keys(BOUNDARY_FIELDS);
  if (typeof o.kind !== 'string' || !kinds.includes(o.kind)) {
    const hint = typeof o.kind === 'string' ? nearestName(o.kind, kinds) : null;
    if (o.kind === undefined) {
      // the data field names the kind ("value", "flux", "ambient"/"transferCoefficient")
      const implied = 'value' in o ? 'value' : 'flux' in o ? 'flux' : 'ambient' in o || 'transferCoefficient' in o ? 'convection' : null;
      if (implied !== null) bad(`${field}.kind`, `is missing; the part has the fields of a "${implied}" part — did you mean "kind": "${implied}"?`, o.kind);
    }
    bad(`${field}.kind`, `must be "value", "flux" or "convection", found ${typeName(o.kind)}${hint ? `; did you mean "${hint}"?` : ''}`, o.kind);
  }
  const kind = o.kind as BoundaryPartSpec['kind'];
  checkKeys(o, BOUNDARY_FIELDS[kind], field);
  if (o.where === undefined) bad(`${field}.where`, 'is required: an expression in x, y, nonzero on the edges to select (e.g. "x < 0.01")');
  if (kind === 'convection' && o.transferCoefficient === undefined) bad(`${field}.transferCoefficient`, 'is required for a convection part (h ≥ 0)');
  const sub = (name: string, fallback: string, vars: ('t' | 'x' | 'y')[]) => {
    const w = o[name] ?? fallback;
    if (typeof w !== 'string' && typeof w !== 'number') bad(`${field}.${name}`, `must be an expression string or a number, found ${typeName(w)}`, w);
    return compileExpression(String(w), `${field}.${name}`, vars);
  };
  const dataName = kind === 'value' ? 'value' : kind === 'flux' ? 'flux' : 'ambient';
  return {
    kind,
    where: sub('where', '0', space),
    data: sub(dataName, '0', ['t', ...space]),
    transferCoefficient: kind === 'convection' ? sub('transferCoefficient', '0', space) : null,
  };
}

/**
 * One of `curveSources`: {"curve": [[x]] (1D) or [[x, y], …] (2D polyline), "time": expression in
 * t, "density": expression in x, y}. The points are checked here for shape and finiteness; whether
 * the curve lies inside the domain is checked when the problem is built (with the domain).
 */
function parseCurveSource(v: unknown, field: string, dim: 1 | 2, space: ('x' | 'y')[]): ProblemSpec['curveSources'][number] {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) bad(field, `must be an object {"curve": […], "time": …, "density": …}, found ${typeName(v)}`, v);
  const o = v as Record<string, unknown>;
  checkKeys(o, ['curve', 'time', 'density'], field);
  const shape = dim === 1 ? '[[x]] (one point)' : '[[x, y], …] (a polyline of at least two points)';
  if (!Array.isArray(o.curve) || o.curve.length === 0) bad(`${field}.curve`, `is required: ${shape}, found ${typeName(o.curve)}`, o.curve);
  const curve = (o.curve as unknown[]).map((p, k) => {
    const f = `${field}.curve[${k}]`;
    if (!Array.isArray(p) || p.length !== dim) bad(f, `must be ${dim === 1 ? '[x]' : '[x, y]'}, found ${typeName(p)}`, p);
    return (p as unknown[]).map((c, j) => num(c, `${f}[${j}]`, '(finite)', () => true));
  });
  return {
    curve,
    time: expression(o, 'time', '1', ['t'], `${field}.time`),
    density: expression(o, 'density', '1', space, `${field}.density`),
  };
}

function parseDomain(v: unknown): DomainSpec {
  if (v === undefined) bad('domain', 'is required, e.g. {"shape": "interval", "from": 0, "to": 1, "cells": 2}');
  if (v === null || typeof v !== 'object' || Array.isArray(v)) bad('domain', `must be an object with a "shape", found ${typeName(v)}`, v);
  const d = v as Record<string, unknown>;
  const shapes = Object.keys(DOMAIN_FIELDS);
  if (typeof d.shape !== 'string' || !shapes.includes(d.shape)) {
    const hint = typeof d.shape === 'string' ? nearestName(d.shape, shapes) : null;
    if (d.shape === undefined) {
      // a shape name under another key ("kind", "type", …): name the key to rename
      const misplaced = Object.keys(d).find((k) => typeof d[k] === 'string' && shapes.includes(d[k] as string));
      if (misplaced !== undefined) bad('domain.shape', `is missing; found "${misplaced}": "${d[misplaced] as string}" — did you mean "shape": "${d[misplaced] as string}"?`, d[misplaced]);
    }
    bad('domain.shape', `must be one of ${shapes.map((s) => `"${s}"`).join(', ')}, found ${typeName(d.shape)}${hint ? `; did you mean "${hint}"?` : ''}`, d.shape);
  }
  const shape = d.shape as DomainSpec['shape'];
  checkKeys(d, DOMAIN_FIELDS[shape], 'domain');
  switch (shape) {
    case 'interval': {
      const from = num(d.from, 'domain.from', '(finite)', () => true);
      const to = num(d.to, 'domain.to', `(greater than domain.from = ${from})`, (x) => x > from);
      const cells = d.cells === undefined ? 2 : int(d.cells, 'domain.cells', 1, 10000);
      return { shape, from, to, cells };
    }
    case 'rectangle': {
      const from = pair(d.from, 'domain.from');
      const to = pair(d.to, 'domain.to');
      if (!(to[0] > from[0] && to[1] > from[1])) bad('domain.to', `must exceed domain.from in both coordinates, found from ${JSON.stringify(from)} to ${JSON.stringify(to)}`);
      let cells: [number, number];
      if (d.cells === undefined) {
        const w = to[0] - from[0], h = to[1] - from[1];
        cells = [Math.max(1, Math.round(w / h)), Math.max(1, Math.round(h / w))];
      } else {
        if (!Array.isArray(d.cells) || d.cells.length !== 2) bad('domain.cells', `must be a pair [nx, ny], found ${typeName(d.cells)}`, d.cells);
        cells = [int(d.cells[0], 'domain.cells[0]', 1, 10000), int(d.cells[1], 'domain.cells[1]', 1, 10000)];
      }
      return { shape, from, to, cells };
    }
    case 'lshape':
      return { shape, cells: d.cells === undefined ? 1 : int(d.cells, 'domain.cells', 1, 1000) };
    case 'mesh': {
      if (!Array.isArray(d.points) || d.points.length < 3) bad('domain.points', `must be a list of at least 3 points [x, y], found ${typeName(d.points)}`, d.points);
      if (!Array.isArray(d.triangles) || d.triangles.length < 1) bad('domain.triangles', `must be a list of triangles [i, j, k], found ${typeName(d.triangles)}`, d.triangles);
      const points = (d.points as unknown[]).map((p, i) => pair(p, `domain.points[${i}]`));
      const n = points.length;
      const triangles = (d.triangles as unknown[]).map((tri, i) => {
        if (!Array.isArray(tri) || tri.length !== 3) bad(`domain.triangles[${i}]`, `must be three point indices [i, j, k], found ${typeName(tri)}`, tri);
        return tri.map((k, j) => int(k, `domain.triangles[${i}][${j}]`, 0, n - 1));
      });
      return { shape, points, triangles };
    }
  }
}

/**
 * Validates a parsed problem file and compiles its expressions. Probes and slices are checked
 * against the horizon here; probe points outside the domain are checked when the domain is built.
 *
 * @example
 * ```ts
 * import { parseProblem } from 'chronomesh/problem-file';
 * const spec = parseProblem({ domain: { shape: 'interval', from: 0, to: 1, cells: 2 }, horizon: 1, initial: '1' });
 * console.log(spec.strategy, spec.maxDofs); // → adaptive 20000
 * ```
 */
export function parseProblem(json: unknown, opts: ParseProblemOptions = {}): ProblemSpec {
  if (json === null || typeof json !== 'object' || Array.isArray(json)) bad('(top level)', `must be a JSON object, found ${typeName(json)}`);
  const o = json as Record<string, unknown>;
  checkKeys(o, PROBLEM_FIELDS, '');
  const domain = parseDomain(o.domain);
  if (o.horizon === undefined) bad('horizon', 'is required (the final time T > 0)');
  const start = o.start === undefined ? 0 : num(o.start, 'start', '≥ 0 (the time the run starts at)', (x) => x >= 0);
  const horizon = num(o.horizon, 'horizon', start > 0 ? `> start = ${start} (the final time T)` : '> 0 (the final time T)', (x) => x > start);
  const dim = domain.shape === 'interval' ? 1 : 2;
  const space: ('x' | 'y')[] = dim === 1 ? ['x'] : ['x', 'y'];
  const strategies = ['adaptive', 'sparse', 'full'];
  const strategy = o.strategy ?? PROBLEM_DEFAULTS.strategy;
  if (typeof strategy !== 'string' || !strategies.includes(strategy)) {
    const hint = typeof strategy === 'string' ? nearestName(strategy, strategies) : null;
    bad('strategy', `must be "adaptive", "sparse" or "full", found ${typeName(strategy)}${hint ? `; did you mean "${hint}"?` : ''}`, strategy);
  }
  const text = (f: 'title' | 'description'): string | null => {
    const v = o[f];
    if (v === undefined) return null;
    if (typeof v !== 'string') bad(f, `must be a string, found ${typeName(v)}`, v);
    return v;
  };
  const list = (f: string): unknown[] => {
    const v = o[f];
    if (v === undefined) return [];
    if (!Array.isArray(v)) bad(f, `must be a list, found ${typeName(v)}`, v);
    return v;
  };
  const time = (v: unknown, field: string) => num(v, field, `in [${start > 0 ? `start = ${start}` : '0'}, horizon = ${horizon}]`, (t) => t >= start && t <= horizon);
  const probes = list('probes').map((p, i) => {
    const f = `probes[${i}]`;
    if (!Array.isArray(p)) bad(f, `must be ${dim === 1 ? '[t, x]' : '[t, x, y]'}, found ${typeName(p)}`, p);
    if (p.length !== dim + 1) {
      // a point without its time is the commonest slip: say so, and where histories go
      const pointOnly = p.length === dim ? `; a probe is one value at one time — for u over time at a point use "sensors": {"points": [${dim === 1 ? '[x]' : '[x, y]'}, …]}` : '';
      bad(f, `must be ${dim === 1 ? '[t, x]' : '[t, x, y]'} (${dim + 1} numbers), found a list of ${p.length}${pointOnly}`, p);
    }
    return [time(p[0], `${f}[0] (t)`), ...p.slice(1).map((c, j) => num(c, `${f}[${j + 1}]`, '(finite)', () => true))];
  });
  const slices = list('slices').map((t, i) => time(t, `slices[${i}]`));
  const sensors = o.sensors === undefined ? null : parseSensors(o.sensors, dim, start, horizon, time);
  const spec: ProblemSpec = {
    title: text('title'),
    description: text('description'),
    domain,
    start,
    horizon,
    duration: horizon - start,
    ...diffusionFields(o, dim, space),
    reaction: expression(o, 'reaction', PROBLEM_DEFAULTS.reaction, space),
    source: expression(o, 'source', PROBLEM_DEFAULTS.source, ['t', ...space]),
    curveSources: list('curveSources').map((c, i) => parseCurveSource(c, `curveSources[${i}]`, dim, space)),
    ...initialState(o, space, opts),
    insulated: o.insulated === undefined ? null : expression(o, 'insulated', '0', space),
    boundary: list('boundary').map((p, i) => parseBoundaryPart(p, `boundary[${i}]`, space)),
    strategy: strategy as ProblemSpec['strategy'],
    tolerance: o.tolerance === undefined ? PROBLEM_DEFAULTS.tolerance : num(o.tolerance, 'tolerance', '≥ 0', (x) => x >= 0),
    relativeTolerance: o.relativeTolerance === undefined ? PROBLEM_DEFAULTS.relativeTolerance : num(o.relativeTolerance, 'relativeTolerance', 'in [0, 1)', (x) => x >= 0 && x < 1),
    maxDofs: o.maxDofs === undefined ? PROBLEM_DEFAULTS.maxDofs : int(o.maxDofs, 'maxDofs', 1, 1e8),
    maxSeconds: o.maxSeconds === undefined ? PROBLEM_DEFAULTS.maxSeconds : num(o.maxSeconds, 'maxSeconds', '> 0', (x) => x > 0),
    maxSteps: o.maxSteps === undefined ? PROBLEM_DEFAULTS.maxSteps : int(o.maxSteps, 'maxSteps', 1, 10000),
    bulk: o.bulk === undefined ? PROBLEM_DEFAULTS.bulk : num(o.bulk, 'bulk', 'in (0, 1) (the Dörfler parameter θ)', (x) => x > 0 && x < 1),
    acceptFlatElements: o.acceptFlatElements === undefined ? PROBLEM_DEFAULTS.acceptFlatElements : flag(o.acceptFlatElements, 'acceptFlatElements'),
    probes,
    sensors,
    slices,
    exact: o.exact === undefined ? null : compileExact(exactSource(o.exact), dim),
  };
  return start > 0 ? shiftedToStart(spec) : spec;
}

/** `e` evaluated at t + start: the expression as the solver sees it, whose clock starts at 0. */
function shifted(e: CompiledExpression, start: number): CompiledExpression {
  const f = e.fn;
  return { source: e.source, constant: e.constant, fn: (t, x, y) => f(t + start, x, y) };
}

/** Every expression in t of `spec` shifted to the solver's clock (see ProblemSpec.start). */
function shiftedToStart(spec: ProblemSpec): ProblemSpec {
  const s = spec.start;
  const x = spec.exact;
  return {
    ...spec,
    source: shifted(spec.source, s),
    curveSources: spec.curveSources.map((c) => ({ ...c, time: shifted(c.time, s) })),
    boundary: spec.boundary.map((b) => ({ ...b, data: shifted(b.data, s) })),
    exact: x === null ? null : {
      value: shifted(x.value, s), dt: shifted(x.dt, s), dx: shifted(x.dx, s), dxx: shifted(x.dxx, s),
      dy: x.dy === null ? null : shifted(x.dy, s), dyy: x.dyy === null ? null : shifted(x.dyy, s),
      dxy: x.dxy === null ? null : shifted(x.dxy, s),
    },
  };
}

/** Options of {@link parseProblem}. */
export interface ParseProblemOptions {
  /**
   * Reads a file named in the problem (`"initial": {"state": "PATH"}`) as text; the command line
   * resolves PATH against the problem file's folder. Without it such a path is refused (a state can
   * also be given inline).
   */
  readText?: (path: string) => string;
}

/** `initial` as an expression, or as `{"state": PATH or inline state}` (./state-file.ts). */
function initialState(o: Record<string, unknown>, space: ('x' | 'y')[], opts: ParseProblemOptions): { initial: CompiledExpression; initialState: NodalField | null } {
  const v = o.initial;
  if (v === null || typeof v !== 'object' || Array.isArray(v)) return { initial: expression(o, 'initial', PROBLEM_DEFAULTS.initial, space), initialState: null };
  const w = v as Record<string, unknown>;
  checkKeys(w, ['state'], 'initial');
  const src = w.state;
  let json: unknown = src;
  if (typeof src === 'string') {
    if (!opts.readText) bad('initial.state', `names the file "${src}", but no file reader was given (pass parseProblem(json, { readText }), or give the state inline)`, src);
    let text: string;
    try {
      text = opts.readText(src);
    } catch (e) {
      return bad('initial.state', `cannot read "${src}" (${(e as { code?: string }).code ?? (e as Error).message})`, src);
    }
    try {
      json = JSON.parse(text);
    } catch (e) {
      return bad('initial.state', `"${src}" is not valid JSON: ${(e as Error).message.split('\n')[0]}`, src);
    }
  } else if (src === undefined) {
    bad('initial.state', 'is required in an initial object: a state file path, or the state itself { points, cells, values }');
  }
  const field = parseState(json, 'initial.state', space.length as 1 | 2);
  const where = typeof src === 'string' ? `the state in "${src}"` : 'the inline state';
  return {
    initialState: field,
    initial: {
      source: where,
      constant: false,
      fn: (_t, x, y) => {
        try {
          return field.valueAt(x, y);
        } catch {
          const p = space.length === 1 ? `x = ${x}` : `(${x}, ${y})`;
          return bad('initial.state', `${where} does not cover the point ${p} of the domain: its mesh must cover the whole domain (a state saved from a run on this domain does)`, p);
        }
      },
    },
  };
}

function exactSource(v: unknown): string {
  if (typeof v !== 'string' && typeof v !== 'number') bad('exact', `must be an expression string in t and the space variables, such as "exp(-pi^2*t)*sin(pi*x)", found ${typeName(v)}`, v);
  return String(v);
}

/** Default number of evenly spaced sensor reading times (both ends included). */
export const SENSOR_TIMES_DEFAULT = 101;

/**
 * `sensors`: {"points": [[x, y], …], "times": n or [t, …]}, read at n evenly spaced times over
 * [start, horizon] (both ends; default 101) or at the listed absolute times.
 */
function parseSensors(
  v: unknown, dim: 1 | 2, start: number, horizon: number, time: (t: unknown, field: string) => number,
): { points: number[][]; times: number[] } {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) bad('sensors', `must be an object {"points": […], "times": n or […]}, found ${typeName(v)}`, v);
  const o = v as Record<string, unknown>;
  checkKeys(o, ['points', 'times'], 'sensors');
  if (!Array.isArray(o.points) || o.points.length === 0) bad('sensors.points', `must be a non-empty list of ${dim === 1 ? '[x]' : '[x, y]'}, found ${typeName(o.points)}`, o.points);
  const points = (o.points as unknown[]).map((p, i) => {
    const f = `sensors.points[${i}]`;
    if (!Array.isArray(p) || p.length !== dim) bad(f, `must be ${dim === 1 ? '[x]' : '[x, y]'}, found ${typeName(p)}`, p);
    return (p as unknown[]).map((c, j) => num(c, `${f}[${j}]`, '(finite)', () => true));
  });
  let times: number[];
  if (o.times === undefined || typeof o.times === 'number') {
    const n = o.times === undefined ? SENSOR_TIMES_DEFAULT : int(o.times, 'sensors.times', 2, 1e6);
    times = Array.from({ length: n }, (_, k) => (k === n - 1 ? horizon : start + ((horizon - start) * k) / (n - 1)));
  } else {
    if (!Array.isArray(o.times) || o.times.length === 0) bad('sensors.times', `must be a count of evenly spaced times (≥ 2) or a non-empty list of times, found ${typeName(o.times)}`, o.times);
    times = (o.times as unknown[]).map((t, k) => time(t, `sensors.times[${k}]`));
  }
  if (points.length * times.length > 1e7) bad('sensors.times', `asks for ${points.length} × ${times.length} readings, more than 10⁷; read fewer times`, times.length);
  return { points, times };
}
