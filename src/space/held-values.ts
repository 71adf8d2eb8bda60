/**
 * The held values g_d(t) = g(t, x_d) at the initial vertices d of value parts with data: what the
 * lifting (./boundary-lifting) interpolates, kept apart from it so that checks of the data in time
 * need not load the lifting's mesh machinery.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import type { BisectionForest } from './forest';

export class HeldValues {
  /** Initial vertices carrying a prescribed value with data (sorted; Dirichlet vertices). */
  readonly vertices: Int32Array;
  /** The value part of each vertex (index into the domain's boundary parts). */
  readonly part: Int32Array;
  private readonly data: ((t: number, x: number, y: number) => number)[];
  private readonly forest: BisectionForest;

  constructor(forest: BisectionForest) {
    this.forest = forest;
    const vp = forest.boundary.vertexValuePart;
    const vs: number[] = [];
    for (let v = 0; v < vp.length; v++) if (vp[v]! >= 0 && forest.vFree[v] === 0) vs.push(v);
    this.vertices = Int32Array.from(vs);
    this.part = Int32Array.from(vs, (v) => vp[v]!);
    this.data = forest.boundary.parts.map((p) => p.data ?? (() => 0));
  }

  /** g_d(t) for every vertex, into `out` (length = vertices.length); checks finiteness. */
  values(t: number, out: Float64Array): Float64Array {
    for (let i = 0; i < this.vertices.length; i++) out[i] = this.valueAt(i, t);
    return out;
  }

  /** g_i(t) of vertex i (an index into `vertices`); checks finiteness. */
  valueAt(i: number, t: number): number {
    const f = this.forest, d = f.dim;
    const v = this.vertices[i]!;
    const x = f.vCoord[v * d]!, y = d === 2 ? f.vCoord[v * d + 1]! : 0;
    const p = this.part[i]!;
    const g = this.data[p]!(t, x, y);
    if (typeof g !== 'number' || !Number.isFinite(g)) {
      throw new InvalidArgumentError(`boundary[${p}].value(${t}, ${x}, ${y}) returned ${describeValue(g)}; expected a finite number`, {
        field: `boundary[${p}].value`,
        expected: 'finite number',
        received: String(g),
      });
    }
    return g;
  }
}

const cache = new WeakMap<BisectionForest, HeldValues>();

/** The held values of a domain's forest (built once). */
export function heldValuesOf(forest: BisectionForest): HeldValues {
  let h = cache.get(forest);
  if (h === undefined) {
    h = new HeldValues(forest);
    cache.set(forest, h);
  }
  return h;
}
