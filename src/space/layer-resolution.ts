/**
 * The first adaptive set next to boundary parts where the initial state differs from the boundary
 * data, for horizons shorter than the diffusion time of the elements there (docs/adaptivity.md
 * §2.4).
 *
 * An initial state that jumps against a held value starts a layer of width about √(κt), which
 * stays thinner than √(κT) over the whole run. Where that is much thinner than the elements, the
 * hats of the first set and the candidates one h-halving finer cannot represent it, and the
 * estimator sees only a small part of the error. Measured before this rule: u0 ≡ 1 on the unit
 * square of 2 × 2 cells held at 0, E at the first step was 1/10 of the true error for κT = 10⁻⁶ and
 * 1/30 for κT = 10⁻⁸, and 1/17 on (0, 1) in two cells for κT = 10⁻⁶. A run asked for 1 % of the
 * solution stopped at once with an error of 6 %. So the elements with a vertex on such an edge are
 * bisected, from the initial mesh down, while their diameter exceeds RESOLUTION · √(κT) (in 2D not
 * below diam(Ω)/512, which bounds the first set to a few thousand vertices per unit of held
 * boundary). Initial states that match the held values, and horizons of a diffusion time or more,
 * add nothing.
 *
 * Convection and flux edges start the same kind of layer where the flux their data ask for differs
 * from the flux n·K∇u0 the initial state carries across them (./surface-flux-mismatch). A mismatch m
 * moves the surface value by about |m|·√(t/κ), and under convection by at most |m|/h, where the
 * heat transfer balances it: min(1, H√(κt))·|u0 − u_∞| for a uniform u0 and ambient u_∞, H = h/κ
 * (the semi-infinite solid with surface heat transfer and with a constant flux, Carslaw & Jaeger
 * §2.7 and §2.9). Unresolved, E fell step after step while the error stayed: to a fifth of it on
 * (0, 1) with h = 1000, κT = 10⁻⁶, to a third with q = 1 (docs/adaptivity.md §2.4). So those edges
 * are refined alike where that surface change exceeds MISMATCH; data in balance with u0 (a steady
 * state, a manufactured solution) add nothing. All data are compared at the times T·k/8, since data
 * that leave the initial value or balance later start a layer too.
 *
 * A reaction term c makes a layer of its own. After a time of about 1/c the solution settles, away
 * from the boundary, to the reduced state f/c where reaction balances the source; where that differs
 * from a held value, a layer of width √(κ/c) stays at the edge for the rest of the run, however long
 * (−κu'' + cu = f near a held edge, whose solution leaves the edge like e^{−x√(c/κ)}; common practice).
 * Unresolved on (0, 1) in two cells with c = 10⁴, f = 1, u0 = 0, u = 0 at both ends, T = 0.5, E fell
 * to about a fifth of the true error (err/E up to 4.8, against the sine series) before it rose
 * 2.3-fold in one step.
 * So held edges also count where |f/c − g| exceeds MISMATCH (c of the edge's element, f sampled at
 * the same places and times). Convection and flux edges count where the flux their data ask for
 * from f/c (h(u∞ − f/c), or q) differs from the flux f/c carries, times the layer's depth 1/√(κc)
 * (for convection at most 1/h): unresolved, with h = 1000 and the same data, err/E rose to 3.76 over
 * 25 steps while the error stalled. Every layer is resolved to its width at the end of the run,
 * √(κ·min(T, 1/c)): the layer of an initial jump stops growing once reaction has taken it down.
 */
import { EdgeKind } from './boundary';
import { bisectWhere, domainDiameter } from './data-resolution';
import { elementDiameter } from './diffusion-time';
import { pointSegmentDistance } from './geometry';
import { boundaryEdgeFrames, conormalFlux, normalDiffusivity } from './surface-flux-mismatch';
import type { VertexClosure } from './vertex-closure';

/** Largest diameter of an element next to the layer, in units of the layer width √(κT). */
const RESOLUTION = 4;
/** Relative mismatch of the initial state and the held value (against the larger of their sizes) that counts as a jump. */
const MISMATCH = 1e-3;
/** Sample points inside each held edge (edge coordinate), away from its end points. */
const EDGE_SAMPLES = [0.25, 0.5, 0.75];
/** Times T·k/8, k = 0 … 8, at which the boundary data are compared with the initial state. */
const TIME_SAMPLES = 9;

/**
 * The closed vertex set that resolves the layers at boundary edges whose data start one against
 * `initial` (held values, ambients and fluxes; see the file comment), and the shortest diffusion
 * time h²/κ of the elements it creates. @internal
 */
export function layerResolvedSet(
  closure: VertexClosure, initial: ((x: number, y: number) => number) | null | undefined, T: number,
  source?: ((t: number, x: number, y: number) => number) | null,
): { set: Int32Array; tau: number } {
  const f = closure.forest;
  const created: number[] = [];
  const edges = layerEdges(closure, initial ?? (() => 0), T, source ?? null);
  if (edges.length === 0) return { set: closure.close(created), tau: Infinity };
  const d = f.dim;
  const eps = 1e-12 * domainDiameter(f);
  // per forest vertex: 1 if on an incompatible held edge, 0 if not, undefined until asked
  const onEdge: (0 | 1 | undefined)[] = [];
  const touches = (v: number): boolean => {
    let flag = onEdge[v];
    if (flag === undefined) {
      flag = 0;
      // every vertex is tested: those on convection edges are free, so freedom tells nothing here
      const xy = f.vCoord; // read afresh: the forest replaces its arrays when bisection grows it
      const px = xy[d * v]!, py = d === 2 ? xy[d * v + 1]! : 0;
      for (let k = 0; k < edges.length && flag === 0; k += 4) {
        if (pointSegmentDistance(px, py, edges[k]!, edges[k + 1]!, edges[k + 2]!, edges[k + 3]!) <= eps) flag = 1;
      }
      onEdge[v] = flag;
    }
    return flag === 1;
  };
  const nv = f.nv;
  const thick = thickerThanLayer(closure, T);
  const tau = bisectWhere(closure, created, (e) => {
    if (!thick(e)) return false;
    for (let k = 0; k < nv; k++) if (touches(f.eVert[nv * e + k]!)) return true;
    return false;
  });
  return { set: closure.close(created), tau };
}

/**
 * Whether forest element e is still to be bisected toward a layer of width √(κ·min(T, 1/c)): its
 * diameter exceeds RESOLUTION times that width (κ and c of its material; c = 0 gives √(κT)) and, in
 * 2D, diam(Ω)/512, which bounds a first set to a few thousand vertices per unit length of layer.
 * Shared with ./front-resolution. @internal
 */
export function thickerThanLayer(closure: VertexClosure, T: number): (e: number) => boolean {
  const f = closure.forest;
  const floor = f.dim === 2 ? domainDiameter(f) / 512 : 0;
  return (e) => {
    const h = elementDiameter(f, e);
    const m = f.eMat[e]!;
    const c = f.reaction[m]!;
    return h > floor && h > RESOLUTION * Math.sqrt(f.kappa[m]! * (c > 0 ? Math.min(T, 1 / c) : T));
  };
}

/**
 * End points (x0, y0, x1, y1; y = 0 in 1D) of the initial boundary edges where a layer starts: the
 * surface change their data would cause at the times T·k/8 exceeds MISMATCH of the largest size of
 * the initial state, the data and those changes. The change is |g − u0| at a held edge; at a flux
 * or convection edge it is the mismatch m of the flux asked for (q, or h(u∞ − u0)) against the flux
 * u0 carries (n·K∇u0), times √(T/κ) with κ = n·K·n of the owning element, and for convection at
 * most |m|/h (file comment). Sampled inside each edge in 2D, at the end point in 1D.
 */
function layerEdges(closure: VertexClosure, initial: (x: number, y: number) => number, T: number, source: ((t: number, x: number, y: number) => number) | null): number[] {
  const f = closure.forest;
  const b = f.boundary;
  const d = f.dim;
  const xy = f.vCoord;
  const held = (v: number, t: number): number => {
    const p = b.vertexValuePart[v]!;
    const data = p >= 0 ? b.parts[p]!.data : null;
    return data === null ? 0 : data(t, xy[d * v]!, d === 2 ? xy[d * v + 1]! : 0);
  };
  const frames = boundaryEdgeFrames(f);
  const samples: { edge: number; gap: number }[] = [];
  // The size of the initial state over the domain (initial vertices and element centroids), so
  // that rounding on an edge where it vanishes (sin πx at x = 1) does not count as a jump.
  let scale = 0;
  const nv = f.nv;
  for (let v = 0; v < f.initialVertexCount; v++) scale = Math.max(scale, finiteSize(initial(xy[d * v]!, d === 2 ? xy[d * v + 1]! : 0)));
  for (let e = 0; e < f.initialElementCount; e++) {
    let x = 0, y = 0;
    for (let k = 0; k < nv; k++) {
      const v = f.eVert[nv * e + k]!;
      x += xy[d * v]! / nv;
      if (d === 2) y += xy[d * v + 1]! / nv;
    }
    scale = Math.max(scale, finiteSize(initial(x, y)));
  }
  const times = Array.from({ length: TIME_SAMPLES }, (_, k) => (T * k) / (TIME_SAMPLES - 1));
  for (let e = 0; e < b.edgeCount; e++) {
    const k = b.edgeKind[e]!;
    const p = b.edgePart[e]!;
    const data = p >= 0 ? b.parts[p]!.data : null;
    const convective = k === EdgeKind.Convection && b.transfer[e]! > 0;
    const flux = k === EdgeKind.Flux && data !== null;
    if (k !== EdgeKind.ZeroValue && k !== EdgeKind.Value && !convective && !flux) continue;
    const i = b.edgeVertices[2 * e]!, j = b.edgeVertices[2 * e + 1]!;
    // a flux mismatch m moves the surface by about |m|·√(T/κ), an ambient at most until h(u∞ − u) balances it
    const h = b.transfer[e]!;
    const kn = normalDiffusivity(f, frames, e);
    const reach = Math.sqrt(T / kn);
    const perFlux = convective ? Math.min(reach, 1 / h) : reach;
    // the reaction of the edge's element: its reduced state f/c meets the edge's data (file comment)
    const owner = frames.element[e]!;
    const c = owner >= 0 ? f.reaction[f.eMat[owner]!]! : 0;
    const reduced = c > 0 && c * T > 1 && source !== null;
    // under reaction a flux mismatch m moves the surface by |m|/√(κc), the layer's own depth
    const perReducedFlux = convective ? Math.min(1 / Math.sqrt(kn * c), 1 / h) : 1 / Math.sqrt(kn * c);
    // held values at both ends, once per time (the edge takes them linearly in between)
    const gi = convective || flux ? null : times.map((t) => held(i, t));
    const gj = convective || flux ? null : times.map((t) => held(j, t));
    let gap = 0;
    for (const s of d === 1 ? [0] : EDGE_SAMPLES) {
      const x = (1 - s) * xy[d * i]! + s * xy[d * j]!;
      const y = d === 2 ? (1 - s) * xy[d * i + 1]! + s * xy[d * j + 1]! : 0;
      const u = initial(x, y);
      if (!Number.isFinite(u)) continue; // the initial state's own check names it
      scale = Math.max(scale, Math.abs(u));
      // the flux u0 already carries across the edge (surface-flux-mismatch.ts)
      const carried = convective || flux ? conormalFlux(f, frames, e, initial, x, y) : 0;
      if (!Number.isFinite(carried)) continue;
      for (let q = 0; q < times.length; q++) {
        // held values as the solver takes them (linear along the edge); ambient and flux where sampled
        const g = gi === null || gj === null ? (data === null ? 0 : data(times[q]!, x, y)) : (1 - s) * gi[q]! + s * gj[q]!;
        if (!Number.isFinite(g)) continue; // the data's own checks name them
        const change = flux ? Math.abs(g - carried) * perFlux : convective ? Math.abs(h * (g - u) - carried) * perFlux : Math.abs(u - g);
        gap = Math.max(gap, change);
        scale = Math.max(scale, flux ? change : Math.abs(g));
        if (reduced && times[q]! * c >= 1) {
          // settled by then: the reduced state r = f/c against the held value, or the flux its data
          // ask for from r (q, or h(u∞ − r)) against the flux r carries
          const t = times[q]!;
          const r = source(t, x, y) / c;
          if (Number.isFinite(r)) {
            let change = Math.abs(r - g);
            if (convective || flux) {
              const rc = conormalFlux(f, frames, e, (px, py) => source(t, px, py) / c, x, y);
              change = Number.isFinite(rc) ? Math.abs((flux ? g : h * (g - r)) - rc) * perReducedFlux : 0;
            }
            gap = Math.max(gap, change);
            scale = Math.max(scale, Math.abs(r), change);
          }
        }
      }
    }
    samples.push({ edge: e, gap });
  }
  const out: number[] = [];
  if (!(scale > 0)) return out;
  for (const { edge, gap } of samples) {
    if (!(gap > MISMATCH * scale)) continue;
    const i = b.edgeVertices[2 * edge]!, j = b.edgeVertices[2 * edge + 1]!;
    out.push(xy[d * i]!, d === 2 ? xy[d * i + 1]! : 0, xy[d * j]!, d === 2 ? xy[d * j + 1]! : 0);
  }
  return out;
}

/** |u| for a finite u, 0 otherwise (the initial state's own check names values that are not finite). */
function finiteSize(u: number): number {
  return Number.isFinite(u) ? Math.abs(u) : 0;
}
