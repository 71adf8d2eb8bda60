/**
 * Solution files (docs/solution-files.md): a {@link SpaceTimeSolution} as bytes and back, in the
 * container of ./file-format/container.ts with format name `chronomesh-solution`, version 1.
 *
 * What is stored: the labelled initial mesh with κ, c and the boundary tables (enough to rebuild
 * the SpatialDomain), the bisection log of the forest up to the largest vertex id used (the
 * element bisected for each vertex, so that replaying it reproduces every vertex id, see
 * ../space/forest-log.ts), the trial double tree (temporal nodes, distinct fibres, fibre of each
 * node), the coefficients, T, a description and the problem's fingerprint. Everything is bytes
 * (Uint8Array), so a solution can also be posted to a worker thread; writing to disk is in the
 * node-only entry point `chronomesh/files`.
 */
import { ChronomeshError, CorruptFileError, InvalidArgumentError } from '../errors';
import { crc32, hex32 } from '../numerics/crc32';
import { SpatialDomain } from '../space/index';
import type { BoundaryPart } from '../space/boundary';
import type { InitialMesh } from '../space/initial-mesh';
import { bisectionLog, replayBisections } from '../space/forest-log';
import { DoubleTree } from '../spacetime/double-tree';
import { FibrePool } from '../spacetime/fibre-pool';
import { SpaceTimeSolution } from '../spacetime/space-time-solution';
import { TemporalTree } from '../time/index';
import { HeatProblem } from '../system/heat-problem';
import { problemFingerprint } from '../system/problem-fingerprint';
import { checkInstance, checkOptions, checkString } from '../validation/index';
import { readContainer, writeContainer, type Container, type SectionArray } from './file-format/container';

/** Format name in the header of every solution file and checkpoint. */
export const SOLUTION_FORMAT = 'chronomesh-solution';
/**
 * The one version of the solution-file format this build writes and reads (a file of another
 * version is refused with a `CorruptFileError` of problem `'version'`).
 *
 * @example
 * ```ts
 * import { SOLUTION_FORMAT, SOLUTION_FORMAT_VERSION } from 'chronomesh';
 * console.log(SOLUTION_FORMAT, SOLUTION_FORMAT_VERSION); // → chronomesh-solution 1
 * ```
 */
export const SOLUTION_FORMAT_VERSION = 1;

/** Options of {@link encodeSolution}. */
export interface EncodeSolutionOptions {
  /** Free text stored with the solution (e.g. what was solved, units). */
  description?: string;
  /** The problem that was solved: its T is checked and its fingerprint stored (see {@link problemFingerprint}). */
  problem?: HeatProblem;
}

/** Options of {@link decodeSolution}. */
export interface DecodeSolutionOptions {
  /**
   * Rebuild the solution on this domain instead of a new one: it must be built like the one that
   * was saved (same initial mesh, coefficients and boundary) and either unrefined or refined only as
   * far as the saved run had refined it. Needed when a boundary part's data is a function, which a
   * file cannot hold.
   */
  domain?: SpatialDomain;
}

/** What {@link decodeSolution} returns. */
export interface DecodedSolution {
  solution: SpaceTimeSolution;
  /** The stored description ('' if none). */
  description: string;
  /** Fingerprint of the problem the solution was saved with, or null. */
  problemFingerprint: string | null;
  /** What the file holds: a solution, or an adaptive run's checkpoint. */
  content: 'solution' | 'adaptive-checkpoint';
  /** For a checkpoint: the completed step it holds (0-based); null for a solution. */
  step: number | null;
}

interface PartInfo {
  kind: 'value' | 'flux' | 'convection';
  /** Constant data, null for none (zero), 'function' for data that the file cannot hold. */
  data: number | null | 'function';
}

/** @internal Domain description as header info and sections. */
export interface DomainInfo {
  dim: 1 | 2;
  initialVertices: number;
  initialElements: number;
  boundaryEdges: number;
  reoriented: number;
  parts: PartInfo[];
  hash: string;
}

function domainSections(domain: SpatialDomain): { info: DomainInfo; sections: Record<string, SectionArray> } {
  const m = domain.forest.initialMesh;
  const b = m.boundary;
  const sections: Record<string, SectionArray> = {
    'domain.coords': m.coords,
    'domain.elements': m.elements,
    'domain.neighbors': m.neighbors,
    'domain.vertexFree': m.vertexFree,
    'domain.kappa': m.kappa,
    'domain.reaction': m.reaction,
    'boundary.edgeVertices': b.edgeVertices,
    'boundary.edgeKind': b.edgeKind,
    'boundary.edgePart': b.edgePart,
    'boundary.transfer': b.transfer,
    'boundary.vertexValuePart': b.vertexValuePart,
  };
  // Only anisotropic domains have this section, so isotropic files and their hashes are unchanged.
  if (m.kappaTensor !== null) sections['domain.kappaTensor'] = m.kappaTensor;
  const parts: PartInfo[] = b.parts.map((p) => {
    const spec = p.spec as { value?: unknown; flux?: unknown; ambient?: unknown };
    const raw = p.kind === 'value' ? spec.value : p.kind === 'flux' ? spec.flux : spec.ambient;
    return { kind: p.kind, data: p.data === null ? null : typeof raw === 'number' ? raw : 'function' };
  });
  return {
    info: { dim: m.dim, initialVertices: m.coords.length / m.dim, initialElements: m.elements.length / (m.dim + 1), boundaryEdges: b.edgeCount, reoriented: m.reoriented, parts, hash: hashSections(sections) },
    sections,
  };
}

function hashSections(sections: Record<string, SectionArray>): string {
  let c = '';
  for (const a of Object.values(sections)) c += hex32(crc32(new Uint8Array(a.buffer, a.byteOffset, a.byteLength)));
  return hex32(crc32(new TextEncoder().encode(c)));
}

/** @internal Sections of a trial double tree under `prefix` (fibres renumbered to the distinct ones used). */
export function setSections(set: DoubleTree, prefix: string): { info: { nodes: number; fibres: number; unknowns: number }; sections: Record<string, SectionArray>; maxVertex: number } {
  const local = new Map<number, number>();
  const nodeFibre = new Int32Array(set.tree.size);
  const fibres: Int32Array[] = [];
  let total = 0;
  let maxVertex = -1;
  for (let i = 0; i < set.tree.size; i++) {
    const id = set.nodeFibre[i]!;
    let k = local.get(id);
    if (k === undefined) {
      k = fibres.length;
      local.set(id, k);
      const f = set.pool.get(id);
      fibres.push(f);
      total += f.length;
      if (f.length > 0 && f[f.length - 1]! > maxVertex) maxVertex = f[f.length - 1]!;
    }
    nodeFibre[i] = k;
  }
  const lengths = Int32Array.from(fibres, (f) => f.length);
  const vertices = new Int32Array(total);
  let o = 0;
  for (const f of fibres) {
    vertices.set(f, o);
    o += f.length;
  }
  return {
    info: { nodes: set.tree.size, fibres: fibres.length, unknowns: set.size },
    sections: {
      [`${prefix}.levels`]: Uint8Array.from(set.tree.level),
      [`${prefix}.indices`]: set.tree.index,
      [`${prefix}.nodeFibre`]: nodeFibre,
      [`${prefix}.fibreLengths`]: lengths,
      [`${prefix}.fibreVertices`]: vertices,
    },
    maxVertex,
  };
}

function malformed(field: string, message: string): CorruptFileError {
  return new CorruptFileError(message, 'malformed', { field, expected: 'a consistent solution file', received: message });
}

function headerObject(h: Record<string, unknown>, key: string): Record<string, unknown> {
  const v = h[key];
  if (v === null || typeof v !== 'object' || Array.isArray(v)) throw malformed(key, `the header field '${key}' must be an object`);
  return v as Record<string, unknown>;
}

function headerInt(h: Record<string, unknown>, key: string, field: string, min = 0): number {
  const v = h[key];
  if (typeof v !== 'number' || !Number.isInteger(v) || v < min) throw malformed(field, `the header field '${field}' must be an integer ≥ ${min}, found ${JSON.stringify(v)}`);
  return v;
}

/** @internal Reads a double tree stored under `prefix` (info from the header) into `pool`. */
export function readSet(c: Container, prefix: string, info: Record<string, unknown>, domain: SpatialDomain, pool: FibrePool): DoubleTree {
  const nodes = headerInt(info, 'nodes', `${prefix}.nodes`, 1);
  const nf = headerInt(info, 'fibres', `${prefix}.fibres`, 1);
  const unknowns = headerInt(info, 'unknowns', `${prefix}.unknowns`, 1);
  const levels = c.section(`${prefix}.levels`, 'u8', nodes);
  const indices = c.section(`${prefix}.indices`, 'f64', nodes);
  const nodeFibre = c.section(`${prefix}.nodeFibre`, 'i32', nodes);
  const lengths = c.section(`${prefix}.fibreLengths`, 'i32', nf);
  let total = 0;
  for (let k = 0; k < nf; k++) {
    if (lengths[k]! < 0) throw malformed(`${prefix}.fibreLengths`, `${prefix}.fibreLengths[${k}] = ${lengths[k]} is negative`);
    total += lengths[k]!;
  }
  const vertices = c.section(`${prefix}.fibreVertices`, 'i32', total);
  const fibres: Int32Array[] = [];
  let o = 0;
  for (let k = 0; k < nf; k++) {
    fibres.push(vertices.slice(o, o + lengths[k]!));
    o += lengths[k]!;
  }
  const byNode: Int32Array[] = [];
  for (let i = 0; i < nodes; i++) {
    const k = nodeFibre[i]!;
    if (!(k >= 0 && k < nf)) throw malformed(`${prefix}.nodeFibre`, `${prefix}.nodeFibre[${i}] = ${k} is not a fibre number in [0, ${nf})`);
    byNode.push(fibres[k]!);
  }
  let set: DoubleTree;
  try {
    const tree = TemporalTree.fromNodes('trial', levels, indices);
    for (let i = 0; i < nodes; i++) {
      if (tree.level[i] !== levels[i] || tree.index[i] !== indices[i]) throw malformed(`${prefix}.levels`, `the temporal nodes of '${prefix}' are not sorted by (level, index) at node ${i}`);
    }
    set = DoubleTree.fromNodeFibres('trial', tree, byNode, pool);
    if (set.size !== unknowns) throw malformed(`${prefix}.unknowns`, `'${prefix}' has ${set.size} unknowns, the header says ${unknowns}`);
    const n = domain.vertexCount;
    for (const f of fibres) {
      for (let p = 0; p < f.length; p++) {
        if (!(f[p]! >= 0 && f[p]! < n) || !domain.isFree(f[p]!)) throw malformed(`${prefix}.fibreVertices`, `'${prefix}' holds vertex ${f[p]}, which is not a free vertex of the rebuilt domain (${n} vertices)`);
      }
    }
  } catch (e) {
    if (e instanceof CorruptFileError || !(e instanceof ChronomeshError)) throw e;
    throw malformed(prefix, `the index set '${prefix}' is invalid: ${e.message}`);
  }
  return set;
}

/** @internal Everything but the coefficients: a writer for solution files and checkpoints. */
export function encodeSolutionFile(
  solution: SpaceTimeSolution,
  content: DecodedSolution['content'],
  opts: EncodeSolutionOptions,
  extra: { header?: Record<string, unknown>; sets?: Record<string, DoubleTree>; arrays?: Record<string, SectionArray>; wholeForest?: boolean } = {},
): Uint8Array {
  const domain = solution.domain;
  const { info: dInfo, sections: dSecs } = domainSections(domain);
  const main = setSections(solution.trialSet, 'set');
  let maxVertex = main.maxVertex;
  const setInfo: Record<string, unknown> = { set: main.info };
  const setSecs: Record<string, SectionArray> = { ...main.sections };
  for (const [name, s] of Object.entries(extra.sets ?? {})) {
    const r = setSections(s, name);
    setInfo[name] = r.info;
    Object.assign(setSecs, r.sections);
    if (r.maxVertex > maxVertex) maxVertex = r.maxVertex;
  }
  const log = bisectionLog(domain.forest, extra.wholeForest ? domain.forest.vertexCount : Math.max(domain.forest.initialVertexCount, maxVertex + 1));
  const header: Record<string, unknown> = {
    content,
    T: solution.T,
    description: opts.description ?? '',
    problemFingerprint: opts.problem ? problemFingerprint(opts.problem) : null,
    domain: dInfo,
    forest: { createdVertices: log.elements.length },
    ...setInfo,
    ...(extra.header ?? {}),
  };
  return writeContainer(SOLUTION_FORMAT, SOLUTION_FORMAT_VERSION, header, {
    ...dSecs,
    'forest.elements': log.elements,
    'forest.parents': log.parents,
    ...setSecs,
    coefficients: solution.coefficients,
    ...(extra.arrays ?? {}),
  });
}

function checkEncodeOptions(solution: unknown, opts: unknown): EncodeSolutionOptions {
  checkInstance(solution, SpaceTimeSolution, 'solution', 'a SpaceTimeSolution');
  const o = checkOptions<EncodeSolutionOptions>(opts, 'opts', ['description', 'problem']);
  if (o.description !== undefined) checkString(o.description, 'opts.description');
  if (o.problem !== undefined) {
    checkInstance(o.problem, HeatProblem, 'opts.problem', 'a HeatProblem');
    const s = solution as SpaceTimeSolution;
    if (o.problem.domain !== s.domain) throw new InvalidArgumentError('opts.problem is posed on another domain than the solution', { field: 'opts.problem', expected: 'the problem that was solved' });
    if (o.problem.T !== s.T) throw new InvalidArgumentError(`opts.problem has T = ${o.problem.T}, the solution T = ${s.T}`, { field: 'opts.problem', expected: `T = ${s.T}`, received: o.problem.T });
  }
  return o;
}

/**
 * Writes a solution as bytes (format `chronomesh-solution`, version 1; see docs/solution-files.md):
 * domain, bisection log, index set, coefficients, T, description and problem fingerprint. The
 * bytes can be stored (`writeSolutionFile` of `chronomesh/files` writes them atomically) or posted
 * to a worker thread and read with {@link decodeSolution}.
 *
 * @example
 * ```ts
 * import { HeatProblem, decodeSolution, encodeSolution, intervalDomain, solve } from 'chronomesh';
 * const problem = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * const { solution } = solve(problem, 5);
 * const bytes = encodeSolution(solution, { description: 'rod, u0 = 1', problem });
 * const back = decodeSolution(bytes);
 * console.log(back.description, back.solution.evaluate(0.1, [0.3])[0] === solution.evaluate(0.1, [0.3])[0]); // → rod, u0 = 1 true
 * ```
 */
export function encodeSolution(solution: SpaceTimeSolution, opts: EncodeSolutionOptions = {}): Uint8Array {
  return encodeSolutionFile(solution, 'solution', checkEncodeOptions(solution, opts));
}

/** Rebuilds the domain stored in `c` (no user domain given). */
function rebuildDomain(c: Container, info: Record<string, unknown>): SpatialDomain {
  const dim = info.dim;
  if (dim !== 1 && dim !== 2) throw malformed('domain.dim', `the domain dimension must be 1 or 2, found ${JSON.stringify(dim)}`);
  const nv = headerInt(info, 'initialVertices', 'domain.initialVertices', 2);
  const ne = headerInt(info, 'initialElements', 'domain.initialElements', 1);
  const nb = headerInt(info, 'boundaryEdges', 'domain.boundaryEdges', 0);
  const reoriented = headerInt(info, 'reoriented', 'domain.reoriented', 0);
  const partsRaw = info.parts;
  if (!Array.isArray(partsRaw)) throw malformed('domain.parts', 'the header field domain.parts must be an array');
  const coords = c.section('domain.coords', 'f64', nv * dim);
  const elements = c.section('domain.elements', 'i32', ne * (dim + 1));
  const neighbors = c.section('domain.neighbors', 'i32', dim === 2 ? 3 * ne : 0);
  const vertexFree = c.section('domain.vertexFree', 'u8', nv);
  const kappa = c.section('domain.kappa', 'f64', ne);
  const reaction = c.section('domain.reaction', 'f64', ne);
  const kappaTensor = c.has('domain.kappaTensor') ? c.section('domain.kappaTensor', 'f64', 3 * ne) : null;
  const edgeVertices = c.section('boundary.edgeVertices', 'i32', 2 * nb);
  const edgeKind = c.section('boundary.edgeKind', 'u8', nb);
  const edgePart = c.section('boundary.edgePart', 'i32', nb);
  const transfer = c.section('boundary.transfer', 'f64', nb);
  const vertexValuePart = c.section('boundary.vertexValuePart', 'i32', nv);
  for (let i = 0; i < coords.length; i++) if (!Number.isFinite(coords[i]!)) throw malformed('domain.coords', `domain.coords[${i}] is not finite`);
  for (let i = 0; i < elements.length; i++) if (!(elements[i]! >= 0 && elements[i]! < nv)) throw malformed('domain.elements', `domain.elements[${i}] = ${elements[i]} is not a vertex in [0, ${nv})`);
  for (let i = 0; i < neighbors.length; i++) if (!(neighbors[i]! >= -3 - nb && neighbors[i]! < ne)) throw malformed('domain.neighbors', `domain.neighbors[${i}] = ${neighbors[i]} is neither an element nor a boundary code`);
  for (let i = 0; i < ne; i++) if (!(kappa[i]! > 0 && Number.isFinite(kappa[i]!)) || !(reaction[i]! >= 0 && Number.isFinite(reaction[i]!))) throw malformed('domain.kappa', `κ or c of initial element ${i} is out of range`);
  if (kappaTensor !== null) {
    if (dim !== 2) throw malformed('domain.kappaTensor', 'a diffusion tensor section belongs to a 2D domain');
    for (let i = 0; i < ne; i++) {
      const xx = kappaTensor[3 * i]!, xy = kappaTensor[3 * i + 1]!, yy = kappaTensor[3 * i + 2]!;
      if (!(xx > 0 && xx * yy - xy * xy > 0 && Number.isFinite(xx + xy + yy))) throw malformed('domain.kappaTensor', `the diffusion tensor of initial element ${i} is not positive definite`);
    }
  }
  for (let i = 0; i < edgeVertices.length; i++) if (!(edgeVertices[i]! >= 0 && edgeVertices[i]! < nv)) throw malformed('boundary.edgeVertices', `boundary.edgeVertices[${i}] is not a vertex`);
  const parts = partsRaw.map((p: unknown, k: number) => {
    const q = p as Partial<PartInfo> | null;
    if (!q || (q.kind !== 'value' && q.kind !== 'flux' && q.kind !== 'convection') || !(q.data === null || q.data === 'function' || (typeof q.data === 'number' && Number.isFinite(q.data)))) {
      throw malformed(`domain.parts[${k}]`, `domain.parts[${k}] must be { kind: 'value' | 'flux' | 'convection', data: number | null | 'function' }`);
    }
    if (q.data === 'function') {
      throw new InvalidArgumentError(
        `boundary part ${k} (${q.kind}) of the saved domain has data given by a function, which a file cannot hold; pass opts.domain, the domain built as for the saved run`,
        { field: 'opts.domain', expected: 'the domain of the saved run', received: 'none' },
      );
    }
    return q as PartInfo;
  });
  for (let i = 0; i < nb; i++) if (!(edgePart[i]! >= -1 && edgePart[i]! < parts.length) || edgeKind[i]! > 4) throw malformed('boundary.edgePart', `boundary edge ${i} names part ${edgePart[i]} (kind ${edgeKind[i]}) of ${parts.length}`);
  const normalised = parts.map((p, k) => {
    const where: number[][] = [];
    for (let e = 0; e < nb; e++) if (edgePart[e] === k) where.push(dim === 1 ? [edgeVertices[2 * e]!] : [edgeVertices[2 * e]!, edgeVertices[2 * e + 1]!]);
    const value = p.data as number | null;
    const data = value === null ? null : () => value;
    let spec: BoundaryPart;
    if (p.kind === 'value') spec = { kind: 'value', where, ...(value !== null ? { value } : {}) };
    else if (p.kind === 'flux') spec = { kind: 'flux', where, ...(value !== null ? { flux: value } : {}) };
    else {
      const hs = [...new Set(Array.from({ length: nb }, (_, e) => e).filter((e) => edgePart[e] === k).map((e) => transfer[e]!))];
      spec = { kind: 'convection', where, transferCoefficient: hs.length === 1 ? hs[0]! : 0, ...(value !== null ? { ambient: value } : {}) };
    }
    return { kind: p.kind, data, spec };
  });
  let hasData = false, hasConvection = false;
  for (let e = 0; e < nb; e++) {
    if (transfer[e]! > 0) hasConvection = true;
    if (edgePart[e]! >= 0 && normalised[edgePart[e]!]!.data !== null) hasData = true;
  }
  const init: InitialMesh = {
    dim,
    coords,
    elements,
    neighbors,
    vertexFree,
    kappa,
    kappaTensor,
    reaction,
    boundary: { edgeCount: nb, edgeVertices, edgeKind, edgePart, transfer, vertexValuePart, parts: normalised, hasData, hasConvection },
    reoriented,
  };
  return new SpatialDomain(init);
}

/** @internal A read solution container with its domain (rebuilt or given, forest replayed) and sets' pool. */
export interface ReadSolutionFile {
  container: Container;
  header: Record<string, unknown>;
  domain: SpatialDomain;
  pool: FibrePool;
  solution: SpaceTimeSolution;
}

/** @internal Reads a solution file or checkpoint. */
export function readSolutionFile(bytes: Uint8Array, opts: DecodeSolutionOptions = {}): ReadSolutionFile {
  const o = checkOptions<DecodeSolutionOptions>(opts, 'opts', ['domain']);
  if (o.domain !== undefined) checkInstance(o.domain, SpatialDomain, 'opts.domain', 'a SpatialDomain');
  const c = readContainer(bytes, SOLUTION_FORMAT, SOLUTION_FORMAT_VERSION);
  const h = c.header;
  if (h.content !== 'solution' && h.content !== 'adaptive-checkpoint') throw malformed('content', `the header field 'content' must be 'solution' or 'adaptive-checkpoint', found ${JSON.stringify(h.content)}`);
  const T = h.T;
  if (typeof T !== 'number' || !Number.isFinite(T) || T <= 0) throw malformed('T', `the header field 'T' must be a finite number > 0, found ${JSON.stringify(T)}`);
  const dInfo = headerObject(h, 'domain');
  let domain: SpatialDomain;
  if (o.domain) {
    domain = o.domain;
    const own = domainSections(domain).info;
    if (own.hash !== dInfo.hash) {
      throw new InvalidArgumentError(
        `opts.domain is not the saved domain: its description hash is ${own.hash}, the file's ${String(dInfo.hash)} (initial mesh, κ or diffusion tensor, c and boundary must be the same)`,
        { field: 'opts.domain', expected: `domain hash ${String(dInfo.hash)}`, received: own.hash },
      );
    }
  } else {
    domain = rebuildDomain(c, dInfo);
    if (domainSections(domain).info.hash !== dInfo.hash) throw malformed('domain.hash', 'the rebuilt domain does not match the stored domain hash');
  }
  const created = headerInt(headerObject(h, 'forest'), 'createdVertices', 'forest.createdVertices');
  const elements = c.section('forest.elements', 'i32', created);
  const parents = c.section('forest.parents', 'i32', 2 * created);
  replayBisections(domain.forest, { elements, parents }, 'opts.domain');
  const pool = new FibrePool();
  const set = readSet(c, 'set', headerObject(h, 'set'), domain, pool);
  const coefficients = c.section('coefficients', 'f64', set.size);
  for (let i = 0; i < coefficients.length; i++) if (!Number.isFinite(coefficients[i]!)) throw malformed('coefficients', `coefficients[${i}] is not finite`);
  return { container: c, header: h, domain, pool, solution: new SpaceTimeSolution(domain, set, coefficients, T) };
}

function checkpointStep(h: Record<string, unknown>): number {
  const a = h.adaptive as { step?: unknown } | undefined;
  const step = a && typeof a === 'object' ? a.step : undefined;
  if (typeof step !== 'number' || !Number.isInteger(step) || step < 0) throw malformed('adaptive.step', `a checkpoint's adaptive.step must be an integer ≥ 0, found ${JSON.stringify(step)}`);
  return step;
}

/**
 * Reads bytes written by {@link encodeSolution} (or an adaptive checkpoint, giving its last
 * completed step's solution). Everything is checked first: a file of another format, cut short,
 * altered, of another version or inconsistent gives a {@link CorruptFileError} naming the part,
 * the offset and what was expected. The domain is rebuilt (or `opts.domain` is used) and the
 * stored bisections replayed, so vertex ids are those of the saved run and the solution
 * evaluates exactly as the saved one.
 *
 * @example
 * ```ts
 * import { CorruptFileError, HeatProblem, decodeSolution, encodeSolution, rectangleDomain, solve } from 'chronomesh';
 * const { solution } = solve(new HeatProblem({ domain: rectangleDomain(0, 1, 0, 1, 2, 2), T: 1, initial: () => 1 }), 4);
 * const bytes = encodeSolution(solution);
 * bytes[bytes.length - 3]! ^= 1; // flip one bit in the coefficients
 * try { decodeSolution(bytes); } catch (e) { if (e instanceof CorruptFileError) console.log(e.problem, e.field); } // → checksum coefficients
 * ```
 */
export function decodeSolution(bytes: Uint8Array, opts: DecodeSolutionOptions = {}): DecodedSolution {
  const r = readSolutionFile(bytes, opts);
  const fp = r.header.problemFingerprint;
  return {
    solution: r.solution,
    description: typeof r.header.description === 'string' ? r.header.description : '',
    problemFingerprint: typeof fp === 'string' ? fp : null,
    content: r.header.content as DecodedSolution['content'],
    step: r.header.content === 'adaptive-checkpoint' ? checkpointStep(r.header) : null,
  };
}
