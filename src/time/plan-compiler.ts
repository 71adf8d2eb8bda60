/**
 * Compiles the level-wise single-scale algorithms of docs/method.md §3.3 (upper part bottom-up, lower
 * part top-down) for one (form, input tree, output tree) into steps of a {@link ProgramBuilder}.
 *
 * Exactness rests on nested supports: a child's support lies in its parent's, so a level-l
 * single-scale vector only has to be kept on the indices whose support meets a level-l node of
 * the tree that drives the recursion (inputs for the upper part, outputs for the lower part);
 * every other entry is either zero (upper) or never read by a finer output (lower). All kept
 * sets are sorted index arrays of size O(#nodes on the level), so the program has
 * O(#in + #out) entries.
 */
import { functionsPerNode, type TemporalBasisKind } from './levels';
import { supportOf } from './nodes';
import {
  derivOrders,
  elementFunctionComp,
  elementFunctionIdx,
  elementScale,
  localCount,
  prolongStencil,
  referenceElementMass,
  representationSpace,
  ssElements,
  ssRangeMeeting,
  functionsPerSingleScaleIndex,
  type SingleScaleSpace,
  type TemporalForm,
} from './single-scale';
import { derivativeStencil, waveletStencil } from './wavelets';
import type { TemporalTree } from './tree';
import { RangeUnion, SortedCursor } from './index-sets';
import { DST_WORK, DST_Y, SRC_WORK, SRC_X, type ProgramBuilder } from './sparse-program';

/** A sparse single-scale vector of one level: sorted indices, `width` scratch slots each from `base`. */
interface Region {
  vals: Float64Array;
  base: number;
  width: 1 | 2;
}

// Small scratch arrays for stencils during plan building (module level: building is synchronous).
const stIdx = new Float64Array(8);
const stComp = new Int32Array(8);
const stW = new Float64Array(8);
const fnIdx = new Float64Array(8);
const fnComp = new Int32Array(8);
const fnW = new Float64Array(8);
const elem = new Float64Array(2);
const loc = new Int32Array(2);
const sup = new Float64Array(2);
const rng = new Float64Array(2);

type StencilFn = typeof waveletStencil;

/** One side of an operator: a tree and how its functions (or their derivatives) are represented. */
class Side {
  readonly kind: TemporalBasisKind;
  readonly space: SingleScaleSpace;
  readonly fpn: 1 | 2;
  readonly stencil: StencilFn;
  constructor(readonly tree: TemporalTree, d: 0 | 1) {
    this.kind = tree.kind;
    this.space = representationSpace(tree.kind, d);
    this.fpn = functionsPerNode(tree.kind);
    this.stencil = d === 0 ? waveletStencil : derivativeStencil;
  }

  /** Indices of `space` meeting the supports of this side's level-l nodes. */
  meetingSet(space: SingleScaleSpace, l: number): Float64Array {
    const t = this.tree;
    const u = new RangeUnion();
    for (let p = t.levelStart[l]!; p < t.levelStart[l + 1]!; p++) {
      supportOf(this.kind, l, t.index[p]!, sup);
      ssRangeMeeting(space, l, sup[0]!, sup[1]!, rng);
      u.push(rng[0]!, rng[1]!);
    }
    return u.values();
  }
}

function region(b: ProgramBuilder, vals: Float64Array, width: 1 | 2): Region {
  return { vals, base: b.alloc(vals.length * width), width };
}

function regionEnd(r: Region): number {
  return r.base + r.vals.length * r.width;
}

export class PlanCompiler {
  private readonly E: Float64Array;
  private readonly inp: Side;
  private readonly out: Side;
  private readonly nd: number;
  private readonly acc = new SlotAccumulator();
  constructor(
    private readonly b: ProgramBuilder,
    form: TemporalForm,
    inTree: TemporalTree,
    outTree: TemporalTree,
    private readonly T: number,
  ) {
    const [dq, dp] = derivOrders(form);
    this.nd = dq + dp;
    this.inp = new Side(inTree, dp);
    this.out = new Side(outTree, dq);
    this.E = referenceElementMass(this.out.space, this.inp.space);
  }

  /** x (level-l inputs) → region R in single scale; entries outside R are dropped. */
  private expandInputs(l: number, R: Region): void {
    const { b, inp } = this;
    const t = inp.tree;
    if (l > t.maxLevel) return;
    const cur = new SortedCursor(R.vals);
    b.beginStep(SRC_X, DST_WORK, R.base, regionEnd(R));
    for (let p = t.levelStart[l]!; p < t.levelStart[l + 1]!; p++) {
      for (let s = 0; s < inp.fpn; s++) {
        const n = inp.stencil(inp.kind, l, t.index[p]!, s, stIdx, stComp, stW);
        for (let e = 0; e < n; e++) {
          const q = cur.find(stIdx[e]!);
          if (q >= 0) b.add(p * inp.fpn + s, R.base + q * R.width + stComp[e]!, stW[e]!);
        }
      }
    }
    b.endStep();
  }

  /** Region E (output space, level l) += B_l S_l x: the level-l inputs through the element form, fused. */
  private inputsThroughForm(l: number, R: Region): void {
    const { b, inp, E, acc } = this;
    const t = inp.tree;
    if (l > t.maxLevel) return;
    const si = inp.space;
    const so = this.out.space;
    const nlo = localCount(so);
    const scale = elementScale(so, si, this.nd, l, this.T);
    const cur = new SortedCursor(R.vals);
    b.beginStep(SRC_X, DST_WORK, R.base, regionEnd(R));
    for (let p = t.levelStart[l]!; p < t.levelStart[l + 1]!; p++) {
      for (let s = 0; s < inp.fpn; s++) {
        const n = inp.stencil(inp.kind, l, t.index[p]!, s, stIdx, stComp, stW);
        acc.clear();
        for (let e = 0; e < n; e++) {
          const ne = ssElements(si, l, stIdx[e]!, stComp[e]!, elem, loc);
          for (let a = 0; a < ne; a++) {
            for (let fo = 0; fo < nlo; fo++) {
              const w = E[2 * fo + loc[a]!]!;
              if (w === 0) continue;
              const q = cur.find(elementFunctionIdx(so, elem[a]!, fo));
              if (q >= 0) acc.add(R.base + q * R.width + elementFunctionComp(so, fo), stW[e]! * w * scale);
            }
          }
        }
        for (let e = 0; e < acc.n; e++) b.add(p * inp.fpn + s, acc.slot[e]!, acc.w[e]!);
      }
    }
    b.endStep();
  }

  /** y (level-l outputs) += C_l B_l d: the element form read off by the output expansions, fused. */
  private outputsThroughForm(l: number, R: Region): void {
    const { b, out, E, acc } = this;
    const t = out.tree;
    const p0 = t.levelStart[l]!;
    const p1 = t.levelStart[l + 1]!;
    if (p0 === p1) return;
    const si = this.inp.space;
    const so = out.space;
    const nli = localCount(si);
    const scale = elementScale(so, si, this.nd, l, this.T);
    const cur = new SortedCursor(R.vals);
    b.beginStep(SRC_WORK, DST_Y, p0 * out.fpn, p1 * out.fpn);
    for (let p = p0; p < p1; p++) {
      for (let s = 0; s < out.fpn; s++) {
        const n = out.stencil(out.kind, l, t.index[p]!, s, stIdx, stComp, stW);
        acc.clear();
        for (let e = 0; e < n; e++) {
          const ne = ssElements(so, l, stIdx[e]!, stComp[e]!, elem, loc);
          for (let a = 0; a < ne; a++) {
            for (let fi = 0; fi < nli; fi++) {
              const w = E[2 * loc[a]! + fi]!;
              if (w === 0) continue;
              const q = cur.find(elementFunctionIdx(si, elem[a]!, fi));
              if (q >= 0) acc.add(R.base + q * R.width + elementFunctionComp(si, fi), stW[e]! * w * scale);
            }
          }
        }
        for (let e = 0; e < acc.n; e++) b.add(acc.slot[e]!, p * out.fpn + s, acc.w[e]!);
      }
    }
    b.endStep();
  }

  /** Region `fine` (level l+1) += P · region `coarse` (level l), or with transpose: coarse += Pᵀ fine. */
  private prolong(space: SingleScaleSpace, l: number, coarse: Region, fine: Region, transpose: boolean): void {
    const { b } = this;
    const cur = new SortedCursor(fine.vals);
    if (transpose) b.beginStep(SRC_WORK, DST_WORK, coarse.base, regionEnd(coarse));
    else b.beginStep(SRC_WORK, DST_WORK, fine.base, regionEnd(fine));
    for (let q = 0; q < coarse.vals.length; q++) {
      for (let c = 0; c < coarse.width; c++) {
        const n = prolongStencil(space, l, coarse.vals[q]!, c, fnIdx, fnComp, fnW);
        const cs = coarse.base + q * coarse.width + c;
        for (let e = 0; e < n; e++) {
          const t = cur.find(fnIdx[e]!);
          if (t < 0) continue;
          const fs = fine.base + t * fine.width + fnComp[e]!;
          if (transpose) b.add(fs, cs, fnW[e]!);
          else b.add(cs, fs, fnW[e]!);
        }
      }
    }
    b.endStep();
  }

  /** y (level-l outputs) += c_μ · region R. */
  private collectOutputs(l: number, R: Region): void {
    const { b, out } = this;
    const t = out.tree;
    if (l > t.maxLevel) return;
    const p0 = t.levelStart[l]!;
    const p1 = t.levelStart[l + 1]!;
    if (p0 === p1) return;
    const cur = new SortedCursor(R.vals);
    b.beginStep(SRC_WORK, DST_Y, p0 * out.fpn, p1 * out.fpn);
    for (let p = p0; p < p1; p++) {
      for (let s = 0; s < out.fpn; s++) {
        const n = out.stencil(out.kind, l, t.index[p]!, s, stIdx, stComp, stW);
        for (let e = 0; e < n; e++) {
          const q = cur.find(stIdx[e]!);
          if (q >= 0) b.add(R.base + q * R.width + stComp[e]!, p * out.fpn + s, stW[e]!);
        }
      }
    }
    b.endStep();
  }

  /**
   * Upper part, bottom-up: e_l = Pᵀ_out e_{l+1} + B_l ss_l(x), kept on the output single-scale
   * indices meeting a level-l input (by nestedness all nonzeros are there), then y_μ = c_μ · e_l.
   */
  upper(): void {
    const { b, inp, out } = this;
    let next: Region | null = null;
    for (let l = inp.tree.maxLevel; l >= 0; l--) {
      const e = region(b, inp.meetingSet(out.space, l), functionsPerSingleScaleIndex(out.space));
      this.inputsThroughForm(l, e);
      if (next) this.prolong(out.space, l, e, next, true);
      this.collectOutputs(l, e);
      next = e;
    }
  }

  /**
   * Lower part, top-down: d_l = P_in d_{l−1} (+ level-l inputs after the level-l outputs have
   * been evaluated as c_μ · B_l d_l), kept on the input single-scale indices meeting a level-l
   * output (by nestedness those are all that finer outputs need).
   */
  lower(): void {
    const { b, inp, out } = this;
    let prev: Region | null = null;
    for (let l = 0; l <= out.tree.maxLevel; l++) {
      const d = region(b, out.meetingSet(inp.space, l), functionsPerSingleScaleIndex(inp.space));
      if (prev) {
        this.prolong(inp.space, l - 1, prev, d, false);
        this.outputsThroughForm(l, d);
      }
      if (l < out.tree.maxLevel) this.expandInputs(l, d);
      prev = d;
    }
  }
}

/** Merges (slot, weight) contributions of one function before they go into the program. */
class SlotAccumulator {
  readonly slot = new Int32Array(32);
  readonly w = new Float64Array(32);
  n = 0;
  clear(): void {
    this.n = 0;
  }
  add(slot: number, w: number): void {
    for (let e = 0; e < this.n; e++) {
      if (this.slot[e] === slot) {
        this.w[e] += w;
        return;
      }
    }
    this.slot[this.n] = slot;
    this.w[this.n++] = w;
  }
}

