/**
 * Boundary data in the space-time loads (src/space/boundary.ts, src/space/boundary-lifting.ts).
 *
 * With u = w + G (G the lifting of the prescribed values) the system is solved for w, whose loads are
 *   ℓ_f[(μ,ν)] += ∫_I ℓ_Γ(t; φ_ν) ψ_μ dt                                (flux and convection data)
 *               − Σ_d [ (∫_I g_d' ψ_μ dt) M(φ⁰_d, φ_ν) + (∫_I g_d ψ_μ dt) A(φ⁰_d, φ_ν) ]   (lifting)
 *   ℓ_0[ν]     −= ∫_Ω G(0) φ_ν.
 * ψ_μ is linear on each half of its interval, so ∫ g' ψ over a half [lo, hi] is
 *   g(hi) ψ(hi⁻) − g(lo) ψ(lo⁺) − ψ' ∫ g dt
 * (integration by parts: no derivative of g is needed, g only has to be continuous in t), and the
 * same holds on every piece of a half. Time integrals use the same Gauss points and the same pieces
 * (between the breakpoints of ./load-time-rule.ts) as the source load. Per test node one pass over the
 * boundary segments per time point and one element pass on its fibre's leaf mesh: linear cost.
 */
import { evaluateTemporal } from '../time/index';
import type { SpatialDomain } from '../space/index';
import { addNodalBoundaryLoad } from '../space/boundary-load';
import { liftingOf } from '../space/boundary-lifting';
import { hierarchicalToNodal, hierarchicalToNodalTransposed } from '../space/hierarchical';
import type { DoubleTree } from '../spacetime/double-tree';
import type { HeatProblem } from './heat-problem';
import { initialLoad, sourceLoad } from './right-hand-side';
import type { SpatialPlanCache } from '../spacetime/spatial-plan-cache';
import { gaussLegendre01 } from '../numerics/gauss-legendre';
import { LOAD_TIME_POINTS, halfPieces, loadTimeBreakpoints } from './load-time-rule';

/** True when the domain has boundary data that enters the loads. */
export function hasBoundaryData(domain: SpatialDomain): boolean {
  return domain.forest.boundary.hasData;
}

/** Adds the flux / convection loads and subtracts the lifting's loads, on the test index set. */
export function addBoundaryLoads(problem: HeatProblem, testSet: DoubleTree, plans: SpatialPlanCache, out: Float64Array): void {
  const { domain, T } = problem;
  const tables = domain.forest.boundary;
  if (!tables.hasData) return;
  const lifting = liftingOf(domain.forest);
  const nd = lifting.vertices.length;
  if (nd > 0) problem.heldDataError(); // refuses held values that jump in time (checked once per problem)
  const natural = tables.parts.some((p) => p.kind !== 'value' && p.data !== null);
  const { nodes, weights } = gaussLegendre01(LOAD_TIME_POINTS);
  const breaks = loadTimeBreakpoints(problem).times;
  const pieces: number[] = [];
  const { tree } = testSet;
  const gq = new Float64Array(nd);
  const gEnd = new Float64Array(nd);
  const cM = [new Float64Array(nd), new Float64Array(nd)];
  const cA = [new Float64Array(nd), new Float64Array(nd)];
  for (let i = 0; i < tree.size; i++) {
    const fibreId = testSet.nodeFibre[i]!;
    const n = testSet.pool.get(fibreId).length;
    if (n === 0) continue;
    const plan = plans.get(fibreId, fibreId);
    const mesh = plan.mesh;
    const nv = mesh.vertexCount;
    const l = tree.level[i]!, k = tree.index[i]!;
    const offs = [testSet.functionOffset[2 * i]!, testSet.functionOffset[2 * i + 1]!];
    const h = l === 0 ? T : T * 2 ** -(l - 1);
    const a = l === 0 ? 0 : k * h;
    const b = a + h;
    const R = [new Float64Array(nv), new Float64Array(nv)];
    for (let j = 0; j < 2; j++) {
      cM[j]!.fill(0);
      cA[j]!.fill(0);
    }
    // Each half [a, mid], [mid, b] piece by piece between the breakpoints of the loads' time rule
    // (./load-time-rule.ts): ψ is linear on every piece.
    halfPieces(a, b, breaks, pieces);
    for (let piece = 0; piece < pieces.length; piece += 2) {
      const lo = pieces[piece]!, hi = pieces[piece + 1]!;
      const len = hi - lo;
      let slope0 = 0, slope1 = 0, v0 = 0, v1 = 0, t0 = 0;
      for (let q = 0; q < nodes.length; q++) {
        const t = lo + len * nodes[q]!;
        const w = len * weights[q]!;
        const e0 = evaluateTemporal('test', l, k, 0, t, T);
        const e1 = evaluateTemporal('test', l, k, 1, t, T);
        if (q === 0) {
          slope0 = e0.derivative;
          slope1 = e1.derivative;
          v0 = e0.value;
          v1 = e1.value;
          t0 = t;
        }
        if (natural) {
          addNodalBoundaryLoad(mesh, tables, t, w * e0.value, R[0]!);
          addNodalBoundaryLoad(mesh, tables, t, w * e1.value, R[1]!);
        }
        if (nd > 0) {
          lifting.values(t, gq);
          for (let d = 0; d < nd; d++) {
            const gw = w * gq[d]!;
            cA[0]![d]! += gw * e0.value;
            cA[1]![d]! += gw * e1.value;
            cM[0]![d]! -= gw * slope0;
            cM[1]![d]! -= gw * slope1;
          }
        }
      }
      if (nd > 0) {
        // boundary terms g(hi) ψ(hi⁻) − g(lo) ψ(lo⁺), ψ linear on the half
        lifting.values(hi, gEnd);
        const ph0 = v0 + slope0 * (hi - t0), ph1 = v1 + slope1 * (hi - t0);
        for (let d = 0; d < nd; d++) {
          cM[0]![d]! += gEnd[d]! * ph0;
          cM[1]![d]! += gEnd[d]! * ph1;
        }
        lifting.values(lo, gEnd);
        const pl0 = v0 + slope0 * (lo - t0), pl1 = v1 + slope1 * (lo - t0);
        for (let d = 0; d < nd; d++) {
          cM[0]![d]! -= gEnd[d]! * pl0;
          cM[1]![d]! -= gEnd[d]! * pl1;
        }
      }
    }
    for (let j = 0; j < 2; j++) {
      const r = R[j]!;
      if (nd > 0) {
        const zM = new Float64Array(nv), zA = new Float64Array(nv);
        for (let d = 0; d < nd; d++) {
          zM[lifting.vertices[d]!] = cM[j]![d]!;
          zA[lifting.vertices[d]!] = cA[j]![d]!;
        }
        hierarchicalToNodal(mesh, zM);
        hierarchicalToNodal(mesh, zA);
        const s = new Float64Array(nv);
        plan.addNodalSum(zM, zA, s);
        for (let p = 0; p < nv; p++) r[p] = r[p]! - s[p]!;
      }
      hierarchicalToNodalTransposed(mesh, r);
      const loc = plan.outLocal;
      const o = offs[j]!;
      for (let p = 0; p < n; p++) out[o + p]! += r[loc[p]!]!;
    }
  }
}

/** ℓ_0 −= ∫_Ω G(0) φ_ν on the fibre `fibreId` (no-op without a lifting). */
export function subtractInitialLifting(domain: SpatialDomain, plans: SpatialPlanCache, fibreId: number, l0: Float64Array): void {
  const lifting = liftingOf(domain.forest);
  const n = plans.pool.get(fibreId).length;
  if (lifting.isZero || n === 0) return;
  const plan = plans.get(fibreId, fibreId);
  const mesh = plan.mesh;
  const nv = mesh.vertexCount;
  const z = new Float64Array(nv);
  lifting.addNodal(mesh, 0, z);
  const r = new Float64Array(nv);
  plan.addNodalSum(z, new Float64Array(nv), r);
  hierarchicalToNodalTransposed(mesh, r);
  const loc = plan.outLocal;
  for (let p = 0; p < n; p++) l0[p] = l0[p]! - r[loc[p]!]!;
}

/** ℓ_f plus the boundary data on a test index set (source, flux, convection, lifting). */
export function sourceLoadWithBoundary(problem: HeatProblem, testSet: DoubleTree, plans: SpatialPlanCache): Float64Array {
  const lf = sourceLoad(problem, testSet);
  addBoundaryLoads(problem, testSet, plans, lf);
  return lf;
}

/** ℓ_0 − ∫ G(0) φ on a trace fibre (interned in the plans' pool). */
export function initialLoadWithLifting(problem: HeatProblem, traceFibre: Int32Array, plans: SpatialPlanCache): Float64Array {
  const l0 = initialLoad(problem, traceFibre);
  if (l0.length > 0) subtractInitialLifting(problem.domain, plans, plans.pool.intern(traceFibre), l0);
  return l0;
}
