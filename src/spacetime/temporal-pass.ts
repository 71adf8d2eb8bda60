/**
 * The time-direction pass (C_t ⊗ I) between two double trees (docs/method.md §5.2).
 *
 * For every spatial vertex ν the pass applies the one-dimensional tree
 * operator from the temporal fibre Λ_in(·, ν) to Λ_out(·, ν). Vertices whose
 * pair of temporal fibres has the same shape form one group and are processed
 * together as one batched 1D apply: the plan stores, per group, the 1D plans
 * and the gather/scatter offsets into the flat coefficient vectors, so that
 * an application is a sequence of passes over typed arrays.
 */
import { TreeOperatorPlan, type LevelPart, type TemporalForm } from '../time/index';
import type { DoubleTree } from './double-tree';
import { sameInts } from './fibre-pool';

/**
 * Per-vertex temporal fibres of a double tree, for the vertices lo ≤ v < hi: node positions and
 * coefficient offsets (slot 0; for a test set slot 1 follows at offset + the fibre's length).
 * @internal
 */
export interface VertexFibres {
  lo: number;
  hi: number;
  start: Int32Array; // by vertex id − lo, length hi − lo + 2
  node: Int32Array;
  offset: Int32Array; // offset of (node, vertex) for slot 0
}

/** @internal */
export function vertexFibres(dt: DoubleTree, vertexBound: number, lo = 0, hi = vertexBound): VertexFibres {
  const { tree } = dt;
  const fpn = dt.kind === 'test' ? 2 : 1;
  const whole = lo === 0 && hi >= vertexBound;
  const start = new Int32Array(hi - lo + 2);
  let total = 0;
  for (let i = 0; i < tree.size; i++) {
    const f = dt.fibre(i);
    // Fibres are sorted: the vertices in [lo, hi) are one run of each.
    const a = whole ? 0 : lowerBound(f, lo);
    const b = whole ? f.length : lowerBound(f, hi);
    total += b - a;
    for (let p = a; p < b; p++) start[f[p]! - lo + 2]!++;
  }
  for (let v = 2; v < start.length; v++) start[v]! += start[v - 1]!;
  const node = new Int32Array(total);
  const offset = new Int32Array(total);
  for (let i = 0; i < tree.size; i++) {
    const f = dt.fibre(i);
    const a = whole ? 0 : lowerBound(f, lo);
    const b = whole ? f.length : lowerBound(f, hi);
    const base = dt.functionOffset[fpn * i]!;
    for (let p = a; p < b; p++) {
      const slot = start[f[p]! - lo + 1]!++;
      node[slot] = i;
      offset[slot] = base + p;
    }
  }
  return { lo, hi, start, node, offset };
}

/** First position of sorted `f` whose value is ≥ v. */
function lowerBound(f: Int32Array, v: number): number {
  let a = 0;
  let b = f.length;
  while (a < b) {
    const m = (a + b) >>> 1;
    if (f[m]! < v) a = m + 1;
    else b = m;
  }
  return a;
}

function maxVertex(dt: DoubleTree): number {
  let m = -1;
  for (let i = 0; i < dt.tree.size; i++) {
    const f = dt.fibre(i);
    if (f.length > 0 && f[f.length - 1]! > m) m = f[f.length - 1]!;
  }
  return m;
}

/**
 * Entries of a batch buffer at most (unless a single vertex needs more, then one vertex per batch):
 * 2¹⁵ doubles, 256 KB, keep each buffer within a core's L2 cache.
 */
const BATCH_ENTRIES = 1 << 15;

interface Group {
  batch: number;
  plans: TreeOperatorPlan[]; // one per form
  inFunctions: number;
  outFunctions: number;
  gatherStart: number; // into gather (inFunctions * batch entries)
  scatterStart: number; // into scatter (outFunctions * batch entries)
}

/** Reusable plan for y_f = (C_f ⊗ I) x with C_f one of several temporal forms. */
export class TemporalPassPlan {
  readonly forms: readonly TemporalForm[];
  private readonly groups: Group[] = [];
  private readonly gather: Int32Array;
  private readonly scatter: Int32Array;
  private readonly bufIn: Float64Array;
  private readonly bufOut: Float64Array;
  private readonly bufAcc: Float64Array;
  // One scratch for all groups' 1D programs (a scratch per program would add up to several times
  // the size of the coefficient vectors; the groups run one after the other).
  private readonly work: Float64Array;
  readonly inSize: number;
  readonly outSize: number;
  private readonly partial: boolean;

  /**
   * @param opts.vertices only the vertices lo ≤ v < hi (a part of a pass applied once in parts, to
   *   bound its memory); such a plan writes only its vertices' outputs and never zeroes the rest
   * @param opts.compiled 1D plans compiled by earlier parts of the same pass, reused by shape
   * @param opts.batchEntries bound on the entries of a batch buffer (tests lower it to force many batches)
   */
  constructor(
    forms: readonly TemporalForm[], input: DoubleTree, output: DoubleTree, part: LevelPart, T: number,
    opts: { vertices?: readonly [number, number]; compiled?: CompiledShapes; batchEntries?: number } = {},
  ) {
    this.forms = forms;
    this.inSize = input.size;
    this.outSize = output.size;
    this.partial = opts.vertices !== undefined;
    const batchEntries = opts.batchEntries ?? BATCH_ENTRIES;
    const vb = Math.max(maxVertex(input), maxVertex(output)) + 1;
    const lo = Math.max(0, opts.vertices?.[0] ?? 0);
    const hi = Math.max(lo, Math.min(opts.vertices?.[1] ?? vb, vb));
    const vin = vertexFibres(input, vb, lo, hi);
    const vout = vertexFibres(output, vb, lo, hi);
    const byShape = groupByFibreShape(vin, vout);
    const compiled = opts.compiled ?? new CompiledShapes();
    let nGather = 0;
    let nScatter = 0;
    let maxIn = 0;
    let maxOut = 0;
    let maxWork = 0;
    const specs: { vertices: number[]; group: Group }[] = [];
    for (const shape of byShape) {
      const v0 = shape[0]! - lo;
      const inNodes = vin.node.subarray(vin.start[v0]!, vin.start[v0 + 1]!);
      const outNodes = vout.node.subarray(vout.start[v0]!, vout.start[v0 + 1]!);
      const plans = compiled.get(shapeHash(vin, vout, shape[0]!), inNodes, outNodes, () => {
        // a vertex's temporal fibres are trees (docs/method.md §5.1)
        const inTree = input.tree.subTreeAt(inNodes);
        const outTree = output.tree.subTreeAt(outNodes);
        return forms.map((f) => new TreeOperatorPlan(f, inTree, outTree, part, T));
      });
      const inFunctions = plans[0]!.inTree.functionCount;
      const outFunctions = plans[0]!.outTree.functionCount;
      // Vertices of one shape run in batches of bounded size, so that the batch buffers stay small
      // (one shape often holds most vertices; sized to it, the buffers took ≈ 0.2 KB per unknown).
      let widest = Math.max(inFunctions, outFunctions);
      for (const p of plans) widest = Math.max(widest, p.workSize);
      const chunk = Math.max(1, Math.floor(batchEntries / widest));
      for (let c0 = 0; c0 < shape.length; c0 += chunk) {
        const vertices = shape.slice(c0, c0 + chunk);
        const batch = vertices.length;
        const group: Group = { batch, plans, inFunctions, outFunctions, gatherStart: nGather, scatterStart: nScatter };
        nGather += inFunctions * batch;
        nScatter += outFunctions * batch;
        maxIn = Math.max(maxIn, inFunctions * batch);
        maxOut = Math.max(maxOut, outFunctions * batch);
        for (const p of plans) maxWork = Math.max(maxWork, p.workSize * batch);
        specs.push({ vertices, group });
        this.groups.push(group);
      }
    }
    this.gather = new Int32Array(nGather);
    this.scatter = new Int32Array(nScatter);
    for (const { vertices, group } of specs) {
      fillOffsets(this.gather, group.gatherStart, vertices, vin, input);
      fillOffsets(this.scatter, group.scatterStart, vertices, vout, output);
    }
    this.bufIn = new Float64Array(maxIn);
    this.bufOut = new Float64Array(maxOut);
    this.bufAcc = new Float64Array(maxOut);
    this.work = new Float64Array(maxWork);
  }

  /** Number of vertex batches (vertices of one temporal fibre shape, in batches of bounded size). */
  get groupCount(): number {
    return this.groups.length;
  }

  /** ys[f] = (C_f ⊗ I) x for every form f (overwrites each ys[f]; a plan of some vertices only overwrites theirs). */
  applyEach(x: Float64Array, ys: Float64Array[]): void {
    if (!this.partial) for (const y of ys) y.fill(0, 0, this.outSize);
    const { gather, scatter, bufIn, bufOut, work } = this;
    for (const g of this.groups) {
      const nIn = g.inFunctions * g.batch;
      const nOut = g.outFunctions * g.batch;
      for (let k = 0, o = g.gatherStart; k < nIn; k++, o++) bufIn[k] = x[gather[o]!]!;
      for (let f = 0; f < g.plans.length; f++) {
        g.plans[f]!.applyWithWork(bufIn, bufOut, g.batch, work);
        const y = ys[f]!;
        for (let k = 0, o = g.scatterStart; k < nOut; k++, o++) y[scatter[o]!] = bufOut[k]!;
      }
    }
  }

  /** y (+)= Σ_f (C_f ⊗ I) xs[f]; overwrites y unless `accumulate`. */
  applySummed(xs: Float64Array[], y: Float64Array, accumulate: boolean): void {
    if (!accumulate && !this.partial) y.fill(0, 0, this.outSize);
    const { gather, scatter, bufIn, bufOut, bufAcc, work } = this;
    for (const g of this.groups) {
      const nIn = g.inFunctions * g.batch;
      const nOut = g.outFunctions * g.batch;
      for (let f = 0; f < g.plans.length; f++) {
        const x = xs[f]!;
        for (let k = 0, o = g.gatherStart; k < nIn; k++, o++) bufIn[k] = x[gather[o]!]!;
        g.plans[f]!.applyWithWork(bufIn, f === 0 ? bufAcc : bufOut, g.batch, work);
        if (f > 0) for (let k = 0; k < nOut; k++) bufAcc[k]! += bufOut[k]!;
      }
      for (let k = 0, o = g.scatterStart; k < nOut; k++, o++) y[scatter[o]!]! += bufAcc[k]!;
    }
  }
}

/**
 * 1D plans by the shape of a pair of temporal fibres (node positions in the input and output
 * trees), so that the parts of a pass applied in parts compile each shape once. @internal
 */
export class CompiledShapes {
  private readonly byHash = new Map<number, { inNodes: Int32Array; outNodes: Int32Array; plans: TreeOperatorPlan[] }[]>();

  private count = 0;

  /** Number of distinct shapes compiled. */
  get size(): number {
    return this.count;
  }

  /** The plans of the shape (inNodes, outNodes) whose hash is `h` (shapeHash of a vertex with it), made on first use. */
  get(h: number, inNodes: Int32Array, outNodes: Int32Array, make: () => TreeOperatorPlan[]): TreeOperatorPlan[] {
    let bucket = this.byHash.get(h);
    if (bucket === undefined) this.byHash.set(h, (bucket = []));
    for (const e of bucket) if (sameInts(e.inNodes, inNodes) && sameInts(e.outNodes, outNodes)) return e.plans;
    const plans = make();
    // copies: the node arrays given are views into a part's temporary arrays
    bucket.push({ inNodes: inNodes.slice(), outNodes: outNodes.slice(), plans });
    this.count++;
    return plans;
  }
}

/**
 * The vertices with non-empty input and output fibres, grouped by the shape of their pair of
 * temporal fibres (the node positions of both), in order of first occurrence. Shapes are hashed
 * (32-bit, over both position lists) and compared in full on a hash match, so equal hashes of
 * different shapes stay apart (`hash` is replaceable so that tests can force collisions). @internal
 */
export function groupByFibreShape(vin: VertexFibres, vout: VertexFibres, hash: (v: number) => number = (v) => shapeHash(vin, vout, v)): number[][] {
  const groups: number[][] = [];
  const firstOfHash = new Map<number, number>(); // hash → first group with it
  const nextSameHash: number[] = []; // group → next group with the same hash, or -1
  const sameShape = (v: number, w: number): boolean =>
    sameRun(vin, v, w) && sameRun(vout, v, w);
  for (let v = vin.lo; v < vin.hi; v++) {
    const a0 = vin.start[v - vin.lo]!, a1 = vin.start[v - vin.lo + 1]!;
    const b0 = vout.start[v - vout.lo]!, b1 = vout.start[v - vout.lo + 1]!;
    if (a0 === a1 || b0 === b1) continue;
    const h = hash(v);
    let g = firstOfHash.get(h);
    let last = -1;
    while (g !== undefined && g >= 0 && !sameShape(groups[g]![0]!, v)) {
      last = g;
      g = nextSameHash[g]!;
    }
    if (g === undefined || g < 0) {
      g = groups.length;
      groups.push([]);
      nextSameHash.push(-1);
      if (last < 0) firstOfHash.set(h, g);
      else nextSameHash[last] = g;
    }
    groups[g]!.push(v);
  }
  return groups;
}

/** 32-bit FNV-style hash of vertex v's pair of temporal fibres (lengths and node positions). */
function shapeHash(vin: VertexFibres, vout: VertexFibres, v: number): number {
  const a0 = vin.start[v - vin.lo]!, a1 = vin.start[v - vin.lo + 1]!;
  const b0 = vout.start[v - vout.lo]!, b1 = vout.start[v - vout.lo + 1]!;
  let h = 0x811c9dc5 ^ (a1 - a0);
  for (let s = a0; s < a1; s++) h = Math.imul(h ^ vin.node[s]!, 0x01000193);
  h = Math.imul(h ^ 0x5bd1e995 ^ (b1 - b0), 0x01000193);
  for (let s = b0; s < b1; s++) h = Math.imul(h ^ vout.node[s]!, 0x01000193);
  return h;
}

/** Whether vertices v and w have the same temporal fibre (node positions) in `vf`. */
function sameRun(vf: VertexFibres, v: number, w: number): boolean {
  const a0 = vf.start[v - vf.lo]!, n = vf.start[v - vf.lo + 1]! - a0;
  const b0 = vf.start[w - vf.lo]!;
  if (vf.start[w - vf.lo + 1]! - b0 !== n) return false;
  for (let k = 0; k < n; k++) if (vf.node[a0 + k] !== vf.node[b0 + k]) return false;
  return true;
}

/** Offsets of (temporal function j, vertex b) in batch layout j * batch + b. */
function fillOffsets(dst: Int32Array, start: number, vertices: number[], vf: VertexFibres, dt: DoubleTree): void {
  const batch = vertices.length;
  const fpn = dt.kind === 'test' ? 2 : 1;
  const fo = dt.functionOffset;
  for (let b = 0; b < batch; b++) {
    const v = vertices[b]!;
    const s0 = vf.start[v - vf.lo]!;
    const s1 = vf.start[v - vf.lo + 1]!;
    for (let s = s0; s < s1; s++) {
      const j = (s - s0) * fpn;
      dst[start + j * batch + b] = vf.offset[s]!;
      if (fpn === 2) {
        // slot 1 of a test node follows slot 0 after the fibre's length
        const i = vf.node[s]!;
        dst[start + (j + 1) * batch + b] = vf.offset[s]! + fo[2 * i + 1]! - fo[2 * i]!;
      }
    }
  }
}
