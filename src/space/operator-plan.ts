/**
 * Spatial mass / stiffness operators between two closed vertex sets in hierarchical coordinates
 * (docs/method.md §4.2): scatter the input into the leaf mesh of the union, T (hierarchical → nodal),
 * matrix-free element loop, Tᵀ, read off the output set. Linear in the size of the union.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { SpatialDomain } from './domain';
import { checkInstance } from '../validation/index';
import { applyElementsNodal, applyElementsNodalSplit, applyElementsNodalSum, elementTables, type ElementTables } from './element-matrices';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from './hierarchical';
import type { LeafMesh } from './leaf-mesh';

/** Sorted union of two sorted Int32Arrays. */
export function unionOfTwoSorted(a: Int32Array, b: Int32Array): Int32Array {
  if (a === b) return a;
  const out = new Int32Array(a.length + b.length);
  let i = 0, j = 0, n = 0;
  while (i < a.length && j < b.length) {
    const x = a[i]!, y = b[j]!;
    if (x < y) { out[n++] = x; i++; }
    else if (y < x) { out[n++] = y; j++; }
    else { out[n++] = x; i++; j++; }
  }
  while (i < a.length) out[n++] = a[i++]!;
  while (j < b.length) out[n++] = b[j++]!;
  return n === a.length ? a : out.slice(0, n);
}

/** Local leaf-mesh index of every member of `set` (all must be vertices of `mesh`); linear time. */
export function localIndices(domain: SpatialDomain, mesh: LeafMesh, set: Int32Array): Int32Array {
  const local = domain.beginMeshQuery(mesh);
  const out = new Int32Array(set.length);
  for (let i = 0; i < set.length; i++) out[i] = local[set[i]!]!;
  domain.endMeshQuery(mesh);
  return out;
}

/**
 * Local indices of the members of `sub` ⊆ `set` (both sorted), given those of `set`: one merge,
 * sequential in both arrays.
 */
function subsetLocal(set: Int32Array, setLocal: Int32Array, sub: Int32Array): Int32Array {
  const out = new Int32Array(sub.length);
  let j = 0;
  for (let i = 0; i < sub.length; i++) {
    const v = sub[i]!;
    while (j < set.length && set[j]! < v) j++;
    if (set[j] !== v) {
      throw new InvalidArgumentError(`vertex ${v} (entry ${i}) is not in the set the leaf mesh was built for`, { field: `set[${i}]`, expected: 'a subset of the mesh set', received: v });
    }
    out[i] = setLocal[j]!;
  }
  return out;
}

/**
 * Plan for y = (wm·M + wa·A) x between closed free vertex sets in hierarchical coordinates, where
 * M is the mass matrix and A the stiffness with κ plus the reaction term c·M. Built once (leaf
 * mesh of the union, index maps, element records), applied many times without allocation.
 *
 * @example
 * ```ts
 * import { rectangleDomain, SpatialOperatorPlan } from 'chronomesh';
 * const dom = rectangleDomain(0, 1, 0, 1, 2, 2);
 * const set = dom.uniformSet(1);
 * const plan = new SpatialOperatorPlan(dom, set, set);
 * const x = new Float64Array(set.length).fill(1), y = new Float64Array(set.length);
 * plan.apply(x, 0, y, 0, 0, 1); // y = A x
 * ```
 */
/**
 * A leaf mesh with its element tables and nodal scratch, shared by several
 * {@link SpatialOperatorPlan}s. Plans run one at a time, so plans on one mesh share its scratch:
 * `u` (nodal input), `r` (nodal output) and `w`, the second input of applySum or the second output
 * of applySplit (never both at once). @internal
 */
export interface SharedLeafMesh {
  /** The closed vertex set the mesh resolves (sorted). */
  readonly union: Int32Array;
  readonly mesh: LeafMesh & { readonly memberLocal: Int32Array; readonly forestElement: Int32Array };
  readonly tables: ElementTables;
  readonly u: Float64Array;
  readonly r: Float64Array;
  readonly w: Float64Array;
}

/** The leaf mesh, element tables and scratch of a closed vertex set, for {@link SpatialOperatorPlan}'s `shared`. @internal */
export function sharedLeafMesh(domain: SpatialDomain, union: Int32Array): SharedLeafMesh {
  const mesh = domain.leafMesh(union);
  const n = mesh.vertexCount;
  return { union, mesh, tables: elementTables(domain.forest, mesh), u: new Float64Array(n), r: new Float64Array(n), w: new Float64Array(n) };
}

export class SpatialOperatorPlan {
  readonly domain: SpatialDomain;
  readonly inSet: Int32Array;
  readonly outSet: Int32Array;
  /** Leaf mesh of the union of both sets. */
  readonly mesh: LeafMesh;
  /** Local mesh index of each input / output vertex. */
  readonly inLocal: Int32Array;
  readonly outLocal: Int32Array;
  /** The mesh, tables and scratch this plan works on (possibly shared with other plans). @internal */
  readonly shared: SharedLeafMesh;
  private readonly rec: ElementTables;
  private readonly u: Float64Array;
  private readonly u2: Float64Array;
  private readonly r: Float64Array;
  private readonly r2: Float64Array;

  constructor(domain: SpatialDomain, inSet: Int32Array, outSet: Int32Array);
  /**
   * @param shared the leaf mesh and element tables of a closed superset of both sets, built once for
   *   several plans (one-shot passes group their plans by fibre union); the plan then works on that
   *   mesh, which is exact because hierarchical M and A do not depend on the mesh they are assembled
   *   on as long as it resolves every basis function involved. @internal
   */
  constructor(domain: SpatialDomain, inSet: Int32Array, outSet: Int32Array, shared: SharedLeafMesh);
  constructor(domain: SpatialDomain, inSet: Int32Array, outSet: Int32Array, shared?: SharedLeafMesh) {
    checkInstance(domain, SpatialDomain, 'domain', 'a SpatialDomain');
    this.domain = domain;
    this.inSet = inSet;
    this.outSet = outSet;
    if (!shared) {
      domain.checkSet(inSet, 'inSet');
      if (outSet !== inSet) domain.checkSet(outSet, 'outSet');
      shared = sharedLeafMesh(domain, unionOfTwoSorted(inSet, outSet)); // validates: both closed ⇒ union closed
    }
    const { union, mesh } = shared;
    this.shared = shared;
    this.rec = shared.tables;
    this.mesh = mesh;
    this.inLocal = inSet === union ? mesh.memberLocal : subsetLocal(union, mesh.memberLocal, inSet);
    this.outLocal = outSet === inSet ? this.inLocal : outSet === union ? mesh.memberLocal : subsetLocal(union, mesh.memberLocal, outSet);
    // u2 (applySum's second input) and r2 (applySplit's second output) are never alive together.
    this.u = shared.u;
    this.r = shared.r;
    this.u2 = shared.w;
    this.r2 = shared.w;
  }

  private check(a: Float64Array, off: number, len: number, field: string): void {
    if (!(a instanceof Float64Array) || !Number.isInteger(off) || off < 0 || off + len > a.length) {
      throw new InvalidArgumentError(`${field} must be a Float64Array holding ${len} values from offset ${off}, received ${describeValue(a)}`, {
        field,
        expected: `Float64Array with length ≥ ${off} + ${len}`,
        received: describeValue(a),
      });
    }
  }

  private scatterForward(x: Float64Array, xOff: number, u: Float64Array): void {
    u.fill(0);
    const il = this.inLocal;
    for (let i = 0; i < il.length; i++) u[il[i]!] = x[xOff + i]!;
    hierarchicalToNodal(this.mesh, u);
  }

  private gatherBack(r: Float64Array, y: Float64Array, yOff: number, accumulate = false): void {
    hierarchicalToNodalTransposed(this.mesh, r);
    const ol = this.outLocal;
    if (accumulate) for (let i = 0; i < ol.length; i++) y[yOff + i]! += r[ol[i]!]!;
    else for (let i = 0; i < ol.length; i++) y[yOff + i] = r[ol[i]!]!;
  }

  /** y[yOff …] = (wm·M + wa·A) x[xOff …] (overwrites). */
  apply(x: Float64Array, xOff: number, y: Float64Array, yOff: number, massWeight: number, stiffWeight: number): void {
    this.check(x, xOff, this.inSet.length, 'x');
    this.check(y, yOff, this.outSet.length, 'y');
    this.scatterForward(x, xOff, this.u);
    this.r.fill(0);
    applyElementsNodal(this.rec, this.u, this.r, massWeight, stiffWeight);
    this.gatherBack(this.r, y, yOff);
  }

  /** yM = M x and yA = A x with one forward transform. */
  applySplit(x: Float64Array, xOff: number, yM: Float64Array, yMOff: number, yA: Float64Array, yAOff: number): void {
    this.check(x, xOff, this.inSet.length, 'x');
    this.check(yM, yMOff, this.outSet.length, 'yM');
    this.check(yA, yAOff, this.outSet.length, 'yA');
    this.scatterForward(x, xOff, this.u);
    this.r.fill(0);
    this.r2.fill(0);
    applyElementsNodalSplit(this.rec, this.u, this.r, this.r2);
    this.gatherBack(this.r, yM, yMOff);
    this.gatherBack(this.r2, yA, yAOff);
  }

  /**
   * r += M uM + A uA for NODAL vectors of length `mesh.vertexCount` (no transforms, no gathers);
   * used for boundary-value liftings whose nodal values sit on Dirichlet vertices.
   */
  addNodalSum(uM: Float64Array, uA: Float64Array, r: Float64Array): void {
    const n = this.mesh.vertexCount;
    this.check(uM, 0, n, 'uM');
    this.check(uA, 0, n, 'uA');
    this.check(r, 0, n, 'r');
    applyElementsNodalSum(this.rec, uM, uA, r);
  }

  /** y = M xM + A xA with one transposed transform (y += … with `accumulate`). */
  applySum(xM: Float64Array, xMOff: number, xA: Float64Array, xAOff: number, y: Float64Array, yOff: number, accumulate = false): void {
    this.check(xM, xMOff, this.inSet.length, 'xM');
    this.check(xA, xAOff, this.inSet.length, 'xA');
    this.check(y, yOff, this.outSet.length, 'y');
    this.scatterForward(xM, xMOff, this.u);
    this.scatterForward(xA, xAOff, this.u2);
    this.r.fill(0);
    applyElementsNodalSum(this.rec, this.u, this.u2, this.r);
    this.gatherBack(this.r, y, yOff, accumulate);
  }
}
