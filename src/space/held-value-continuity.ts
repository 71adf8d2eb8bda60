/**
 * Held values must be continuous in time (docs/error-norms.md §8).
 *
 * The solver writes u = w + G with the lifting G(t) = Σ_d g_d(t) φ⁰_d (./boundary-lifting), and w's
 * loads contain ∂t G. A held value that jumps in time (a face quenched at once) has a Dirac
 * derivative there: w's data leave the space the method solves in, and the adaptive loop diverges
 * (a rod held at 1 until t = 0.3 and at 0 after: E grew fourfold per step to 2.7·10⁴ while the
 * true error grew from 0.29 to 12). The exact solution is fine, and reached by splitting the run
 * at the jump, since a jump against the initial state is allowed.
 *
 * Each held value is sampled at SAMPLES + 1 equal times on [0, T]. Every interval on which it
 * changes by more than JUMP of its largest magnitude is halved HALVINGS times, keeping the half
 * with the larger change; a change above JUMP that survives down to T·2^{−12−HALVINGS} (no temporal
 * level of the loop resolves that) is a jump. At most CANDIDATES intervals per held vertex are
 * followed, the largest changes first.
 */
import { InvalidArgumentError } from '../errors';
import { sameValues } from '../numerics/same-values';
import type { BisectionForest } from './forest';
import { heldValuesOf } from './held-values';

const SAMPLES = 4096;
const HALVINGS = 30;
const JUMP = 1e-3;
const CANDIDATES = 16;

/** Throws an InvalidArgumentError naming the part, the time and the remedy where a held value jumps in time. @internal */
export function checkHeldValueContinuity(forest: BisectionForest, T: number): void {
  const held = heldValuesOf(forest);
  const nd = held.vertices.length;
  if (nd === 0) return;
  let w = new Float64Array(SAMPLES + 1), previous = new Float64Array(SAMPLES + 1);
  for (let d = 0; d < nd; d++) {
    for (let j = 0; j <= SAMPLES; j++) w[j] = held.valueAt(d, (T * j) / SAMPLES);
    if (d > 0 && sameValues(w, previous)) continue; // the same history as the vertex checked before
    [w, previous] = [previous, w];
    check(d, previous);
  }

  /** Follows the large changes of the samples `w` of held vertex d down to T·2^{−12−HALVINGS}. */
  function check(d: number, w: Float64Array): void {
    let size = 0;
    for (let j = 0; j <= SAMPLES; j++) size = Math.max(size, Math.abs(w[j]!));
    const threshold = JUMP * size;
    const candidates: number[] = [];
    for (let j = 0; j < SAMPLES; j++) if (Math.abs(w[j + 1]! - w[j]!) > threshold) candidates.push(j);
    candidates.sort((a, b) => Math.abs(w[b + 1]! - w[b]!) - Math.abs(w[a + 1]! - w[a]!));
    for (const j of candidates.slice(0, CANDIDATES)) {
      let a = (T * j) / SAMPLES, b = (T * (j + 1)) / SAMPLES;
      let ga = w[j]!, gb = w[j + 1]!;
      for (let h = 0; h < HALVINGS; h++) {
        const m = 0.5 * (a + b);
        const gm = held.valueAt(d, m);
        if (Math.abs(gm - ga) >= Math.abs(gb - gm)) { b = m; gb = gm; } else { a = m; ga = gm; }
      }
      if (!(Math.abs(gb - ga) > threshold)) continue;
      const vertex = held.vertices[d]!;
      const dim = forest.dim;
      const x = forest.vCoord[vertex * dim]!, y = dim === 2 ? forest.vCoord[vertex * dim + 1]! : 0;
      const part = held.part[d]!;
      const t = 0.5 * (a + b);
      throw new InvalidArgumentError(
        `boundary[${part}].value jumps from ${ga} to ${gb} at t ≈ ${t < 1e-9 * T ? '0 (just after the start)' : Number(t.toPrecision(6))} (at ${dim === 1 ? `x = ${x}` : `(${x}, ${y})`}): held values must be continuous in time, ` +
          'because the method lifts them with their time derivative and a jump has none (an adaptive run diverges). ' +
          (t < 1e-9 * T
            ? 'Hold the value from t = 0 instead (it may differ from the initial state), or ramp it over a short time'
            : 'Ramp it over a short time (the loads resolve fast ramps), or split the run at the jump: solve up to that time, then start a new run from its end state (SpaceTimeSolution.state, or a problem file\'s "initial": {"state": …}) with the new value (a jump against the initial state is allowed)'),
        { field: `boundary[${part}].value`, expected: 'a held value continuous in time', received: `a jump of ${gb - ga} at t ≈ ${t}` },
      );
    }
  }
}
