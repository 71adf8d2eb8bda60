/**
 * A short fingerprint of a {@link HeatProblem}, stored in solution files and checkpoints so that a
 * run resumed with another problem is refused (docs/solution-files.md §4). Functions cannot be
 * compared, so their values are: the fingerprint is the CRC-32 of T, the initial mesh (points,
 * elements, κ, c, boundary kinds and h) and of the data sampled at fixed points — u0 and f at up to
 * 16 initial-element centroids, f and the boundary data at two times, and the points, time profiles
 * and densities of concentrated sources. Equal problems give equal
 * fingerprints; different ones almost always differ (unless they agree at every sample).
 */
import { crc32, hex32 } from '../numerics/crc32';
import { checkInstance } from '../validation/index';
import { HeatProblem } from './heat-problem';

/**
 * Fingerprint (8 hex digits) of a problem: equal for problems with the same domain, T and data
 * at the sample points.
 *
 * @example
 * ```ts
 * import { HeatProblem, intervalDomain, problemFingerprint } from 'chronomesh';
 * const a = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 1 });
 * const b = new HeatProblem({ domain: intervalDomain(0, 1, 2), T: 1, initial: () => 2 });
 * console.log(problemFingerprint(a) === problemFingerprint(a), problemFingerprint(a) === problemFingerprint(b)); // → true false
 * ```
 */
export function problemFingerprint(problem: HeatProblem): string {
  checkInstance(problem, HeatProblem, 'problem', 'a HeatProblem');
  const f = problem.domain.forest;
  const m = f.initialMesh;
  const d = m.dim;
  const values: number[] = [problem.T, d];
  const ne = m.elements.length / (d + 1);
  const step = Math.max(1, Math.floor(ne / 16));
  const times = [0.3 * problem.T, 0.7 * problem.T];
  for (let e = 0; e < ne; e += step) {
    let x = 0, y = 0;
    for (let k = 0; k <= d; k++) {
      const v = m.elements[e * (d + 1) + k]!;
      x += m.coords[v * d]! / (d + 1);
      if (d === 2) y += m.coords[v * d + 1]! / (d + 1);
    }
    values.push(x, y, problem.initial ? problem.initial(x, y) : 0);
    for (const t of times) {
      if (problem.source) values.push(problem.source(t, x, y));
      if (problem.separableSource) for (const s of problem.separableSource) values.push(s.time(t) * s.space(x, y));
    }
  }
  const b = m.boundary;
  for (let e = 0; e < b.edgeCount; e++) {
    const p = b.edgePart[e]!;
    const data = p >= 0 ? b.parts[p]!.data : null;
    if (!data) continue;
    const i = b.edgeVertices[2 * e]!, j = b.edgeVertices[2 * e + 1]!;
    const x = 0.5 * (m.coords[i * d]! + m.coords[j * d]!), y = d === 2 ? 0.5 * (m.coords[i * d + 1]! + m.coords[j * d + 1]!) : 0;
    for (const t of times) values.push(e, data(t, x, y));
  }
  // Concentrated sources (nothing is added without them, so other fingerprints are unchanged):
  // the points, the time profile at the two times and the density at the points.
  for (const c of problem.curveSources ?? []) {
    const P = c.curve.points, dd = c.curve.dim;
    values.push(P.length, ...P);
    for (const t of times) values.push(c.time(t));
    for (let k = 0; k < P.length / dd; k++) values.push(c.curve.density ? c.curve.density(P[dd * k]!, dd === 2 ? P[dd * k + 1]! : 0) : 1);
  }
  const parts: Uint8Array[] = [
    new Uint8Array(Float64Array.from(values).buffer),
    new Uint8Array(m.coords.buffer, m.coords.byteOffset, m.coords.byteLength),
    new Uint8Array(m.elements.buffer, m.elements.byteOffset, m.elements.byteLength),
    new Uint8Array(m.kappa.buffer, m.kappa.byteOffset, m.kappa.byteLength),
    ...(m.kappaTensor !== null ? [new Uint8Array(m.kappaTensor.buffer, m.kappaTensor.byteOffset, m.kappaTensor.byteLength)] : []),
    new Uint8Array(m.reaction.buffer, m.reaction.byteOffset, m.reaction.byteLength),
    b.edgeKind,
    new Uint8Array(b.transfer.buffer, b.transfer.byteOffset, b.transfer.byteLength),
  ];
  let n = 0;
  for (const p of parts) n += p.length;
  const all = new Uint8Array(n);
  n = 0;
  for (const p of parts) {
    all.set(p, n);
    n += p.length;
  }
  return hex32(crc32(all));
}
