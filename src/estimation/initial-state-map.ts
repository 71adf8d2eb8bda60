/**
 * The initial state as nodal values on a uniformly refined initial mesh, mapped to the
 * right-hand side term g ⊗ ℓ_0 with ℓ_0[ν] = ∫ u0 φ_ν over the trace fibre (docs/method.md §6).
 *
 * u0 is P1 on the parameter mesh P (leaf mesh of `domain.uniformSet(level)`), the hats φ_ν are P1
 * on the leaf mesh of the trace fibre F. Both are NVB refinements of the initial mesh, so the leaf
 * mesh U of the union P ∪ F refines both and ℓ_0 is exact there:
 *   ℓ_0 = restrict_F · Tᵀ_U · M_U · I_{U←P} · m,
 * with I_{U←P} the P1 interpolation (a vertex of U not in P is the midpoint of an edge inside
 * one element of P, so its value is the mean of its interpolation parents), M_U the nodal P1
 * mass matrix (element formulas, e.g. Braess, Finite Elements, §II.8), and Tᵀ_U the transposed
 * hierarchical transform. The transpose runs the same steps backwards.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from '../space/hierarchical';
import type { LeafMesh } from '../space/leaf-mesh';
import { localIndices } from '../space/operator-plan';
import { positionsIn, unionSorted } from '../spacetime/fibre-pool';
import type { SpaceTimeSystem } from '../system/space-time-system';
import { traceVector } from '../time/index';
import type { ParameterMap } from './parameters';

/**
 * Parameter map of the initial state (see {@link initialState}).
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, initialState, rectangleDomain } from 'chronomesh';
 * const domain = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const system = new SpaceTimeSystem(new HeatProblem({ domain, T: 1 }), DoubleTree.sparseGrid(domain, 3));
 * const u0 = initialState(system, 1);
 * const m = new Float64Array(u0.size).fill(1); // u0 ≡ 1, boundary values included
 * const b = new Float64Array(system.size);
 * u0.addTo(m, b);
 * const { solution } = system.solve({ rightHandSide: b });
 * console.log(solution.evaluate(0.05, [0.5, 0.5])[0]);
 * ```
 */
export class InitialStateMap implements ParameterMap {
  readonly size: number;
  readonly systemSize: number;
  /** The parameter mesh: parameter j is u0 at its vertex j (`mesh.coords`). */
  readonly mesh: LeafMesh;
  readonly labels: readonly string[];
  private readonly union: LeafMesh;
  /** Local index in U of every vertex of P, and flag of U vertices that belong to P. */
  private readonly pInU: Int32Array;
  private readonly fromP: Uint8Array;
  /** Local index in U of every trace-fibre entry. */
  private readonly traceInU: Int32Array;
  /** Traced trial functions: coefficient offset, g value, positions of their fibre in the trace fibre. */
  private readonly tracedOffset: Int32Array;
  private readonly tracedG: Float64Array;
  private readonly tracedPos: Int32Array[];
  private readonly nodal: Float64Array;
  private readonly mass: Float64Array;
  private readonly ell: Float64Array;

  constructor(readonly system: SpaceTimeSystem, readonly level: number) {
    const { domain, T } = system.problem;
    if (!Number.isInteger(level) || level < 0 || level > 30) {
      throw new InvalidArgumentError(`level = ${describeValue(level)} must be an integer in [0, 30]`, { field: 'level', expected: 'integer in [0, 30]', received: level });
    }
    this.systemSize = system.size;
    const pSet = domain.uniformSet(level);
    this.mesh = domain.leafMesh(pSet);
    this.size = this.mesh.vertexCount;
    const d = this.mesh.dim;
    this.labels = Array.from({ length: this.size }, (_, j) =>
      `u0(${Array.from(this.mesh.coords.subarray(d * j, d * j + d)).map((v) => +v.toPrecision(6)).join(', ')})`);
    const F = system.G.traceFibre;
    const uSet = unionSorted([pSet, F]);
    this.union = domain.leafMesh(uSet);
    const U = this.union;
    // Match P's vertices (free and Dirichlet) into U by global id.
    const local = domain.beginMeshQuery(U);
    this.pInU = new Int32Array(this.size);
    this.fromP = new Uint8Array(U.vertexCount);
    try {
      for (let j = 0; j < this.size; j++) {
        const i = local[this.mesh.globalId[j]!]!;
        if (i < 0) throw new InvalidArgumentError(`internal: vertex ${this.mesh.globalId[j]} of the parameter mesh is missing from the common refinement`, { field: 'level' });
        this.pInU[j] = i;
        this.fromP[i] = 1;
      }
    } finally {
      domain.endMeshQuery(U);
    }
    this.traceInU = localIndices(domain, U, F);
    const trace = traceVector(system.trialSet.tree, 0, T);
    const off: number[] = [];
    const gs: number[] = [];
    const pos: Int32Array[] = [];
    for (let f = 0; f < trace.length; f++) {
      const fib = system.trialSet.fibre(f);
      if (trace[f] === 0 || fib.length === 0) continue;
      off.push(system.trialSet.functionOffset[f]!);
      gs.push(trace[f]!);
      pos.push(positionsIn(fib, F));
    }
    this.tracedOffset = Int32Array.from(off);
    this.tracedG = Float64Array.from(gs);
    this.tracedPos = pos;
    this.nodal = new Float64Array(U.vertexCount);
    this.mass = new Float64Array(U.vertexCount);
    this.ell = new Float64Array(F.length);
  }

  /** ℓ_0[ν] = ∫ u0 φ_ν on the trace fibre for nodal values m (exact). */
  initialLoad(m: Float64Array): Float64Array {
    this.checkParams(m);
    const U = this.union;
    const v = this.nodal;
    v.fill(0);
    for (let j = 0; j < this.size; j++) v[this.pInU[j]!] = m[j]!;
    // I_{U←P}: parents precede children in the local order.
    for (let i = 0; i < U.vertexCount; i++) if (!this.fromP[i]) v[i] = 0.5 * (v[U.parentA[i]!]! + v[U.parentB[i]!]!);
    massApply(U, v, this.mass);
    hierarchicalToNodalTransposed(U, this.mass);
    const out = new Float64Array(this.traceInU.length);
    for (let p = 0; p < out.length; p++) out[p] = this.mass[this.traceInU[p]!]!;
    return out;
  }

  addTo(m: Float64Array, b: Float64Array): void {
    const ell = this.initialLoad(m);
    for (let t = 0; t < this.tracedOffset.length; t++) {
      const o = this.tracedOffset[t]!, g = this.tracedG[t]!, pos = this.tracedPos[t]!;
      for (let p = 0; p < pos.length; p++) b[o + p]! += g * ell[pos[p]!]!;
    }
  }

  transpose(v: Float64Array, g: Float64Array): void {
    const U = this.union;
    const ell = this.ell;
    ell.fill(0);
    for (let t = 0; t < this.tracedOffset.length; t++) {
      const o = this.tracedOffset[t]!, gt = this.tracedG[t]!, pos = this.tracedPos[t]!;
      for (let p = 0; p < pos.length; p++) ell[pos[p]!]! += gt * v[o + p]!;
    }
    const w = this.nodal;
    w.fill(0);
    for (let p = 0; p < ell.length; p++) w[this.traceInU[p]!] = ell[p]!;
    hierarchicalToNodal(U, w);
    massApply(U, w, this.mass);
    const r = this.mass;
    for (let i = U.vertexCount - 1; i >= 0; i--) {
      if (this.fromP[i]) continue;
      const h = 0.5 * r[i]!;
      r[U.parentA[i]!]! += h;
      r[U.parentB[i]!]! += h;
      r[i] = 0;
    }
    for (let j = 0; j < this.size; j++) g[j] = r[this.pInU[j]!]!;
  }

  private checkParams(m: Float64Array): void {
    if (!(m instanceof Float64Array) || m.length !== this.size) {
      throw new InvalidArgumentError(`initial-state parameters must be a Float64Array of length ${this.size}`, { field: 'm', expected: `Float64Array(${this.size})`, received: describeValue(m) });
    }
  }
}

/** y = M x with the nodal P1 mass matrix of the leaf mesh (element formulas). */
function massApply(mesh: LeafMesh, x: Float64Array, y: Float64Array): void {
  y.fill(0);
  const el = mesh.elements, c = mesh.coords;
  if (mesh.dim === 1) {
    for (let e = 0; e < mesh.elementCount; e++) {
      const i0 = el[2 * e]!, i1 = el[2 * e + 1]!;
      const h = Math.abs(c[i1]! - c[i0]!) / 6;
      y[i0]! += h * (2 * x[i0]! + x[i1]!);
      y[i1]! += h * (x[i0]! + 2 * x[i1]!);
    }
    return;
  }
  for (let e = 0; e < mesh.elementCount; e++) {
    const i0 = el[3 * e]!, i1 = el[3 * e + 1]!, i2 = el[3 * e + 2]!;
    const area = 0.5 * Math.abs((c[2 * i1]! - c[2 * i0]!) * (c[2 * i2 + 1]! - c[2 * i0 + 1]!) - (c[2 * i2]! - c[2 * i0]!) * (c[2 * i1 + 1]! - c[2 * i0 + 1]!));
    const s = (area / 12) * (x[i0]! + x[i1]! + x[i2]!);
    const a12 = area / 12;
    y[i0]! += s + a12 * x[i0]!;
    y[i1]! += s + a12 * x[i1]!;
    y[i2]! += s + a12 * x[i2]!;
  }
}
