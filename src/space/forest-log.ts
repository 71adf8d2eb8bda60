/**
 * The bisection log of a forest: which element was bisected to create each vertex, so that a
 * fresh forest grown from the same initial mesh can be brought to the same state by bisecting the
 * same elements in the same order (docs/solution-files.md §3).
 *
 * Vertex and element ids of the forest are assigned in creation order, and every bisection creates
 * exactly one vertex (in 2D: one call of the split that bisects an element together with its
 * compatible neighbour). Replaying the splits in vertex order therefore reproduces every id: when
 * vertex m is replayed, all vertices < m (including those a recursive completion created first)
 * already exist, so the element that created m is bisected without any further completion. The
 * element recorded for m is the one whose children come first (the one the split was called on).
 * Each replayed vertex is checked against the recorded interpolation parents.
 */
import { CorruptFileError, InvalidArgumentError } from '../errors';
import type { BisectionForest } from './forest';

/** Element bisected to create each vertex id in [initialVertexCount, count), and the vertex's parents. */
export interface BisectionLog {
  /** One element id per created vertex. */
  readonly elements: Int32Array;
  /** Interpolation parents (a, b) per created vertex. */
  readonly parents: Int32Array;
}

/** The log of the first `count` vertices of `forest` (default: all). */
export function bisectionLog(forest: BisectionForest, count = forest.vertexCount): BisectionLog {
  const n0 = forest.initialVertexCount;
  const n = Math.max(0, count - n0);
  const elements = new Int32Array(n).fill(-1);
  for (let e = 0; e < forest.elementCount; e++) {
    const m = forest.eMid[e]!;
    if (m < n0 || m >= count) continue;
    const k = m - n0;
    const prev = elements[k]!;
    if (prev < 0 || forest.eChild[e]! < forest.eChild[prev]!) elements[k] = e;
  }
  const parents = new Int32Array(2 * n);
  for (let k = 0; k < n; k++) {
    parents[2 * k] = forest.vParentA[n0 + k]!;
    parents[2 * k + 1] = forest.vParentB[n0 + k]!;
  }
  return { elements, parents };
}

function sameEdge(a: number, b: number, p: number, q: number): boolean {
  return (a === p && b === q) || (a === q && b === p);
}

/**
 * Brings `forest` to the state recorded in `log`. A forest that already has some of the vertices
 * must agree with the log on them (same interpolation parents); the rest are created by bisecting
 * the recorded elements. Disagreement of a forest given by the caller is an InvalidArgumentError
 * naming `field`; a replay that does not reproduce the log is a CorruptFileError (`'mismatch'`).
 */
export function replayBisections(forest: BisectionForest, log: BisectionLog, field: string): void {
  const n0 = forest.initialVertexCount;
  const n = log.elements.length;
  const have = Math.min(n, forest.vertexCount - n0);
  for (let k = 0; k < have; k++) {
    const m = n0 + k;
    if (!sameEdge(forest.vParentA[m]!, forest.vParentB[m]!, log.parents[2 * k]!, log.parents[2 * k + 1]!)) {
      throw new InvalidArgumentError(
        `${field} was refined differently from the run that wrote the file: its vertex ${m} is the midpoint of (${forest.vParentA[m]}, ${forest.vParentB[m]}), the file's of (${log.parents[2 * k]}, ${log.parents[2 * k + 1]}); pass a freshly built domain`,
        { field, expected: `vertex ${m} = midpoint of (${log.parents[2 * k]}, ${log.parents[2 * k + 1]})`, received: `midpoint of (${forest.vParentA[m]}, ${forest.vParentB[m]})` },
      );
    }
  }
  const nv = forest.nv;
  for (let k = have; k < n; k++) {
    const m = n0 + k;
    const e = log.elements[k]!;
    const a = log.parents[2 * k]!, b = log.parents[2 * k + 1]!;
    const ok = e >= 0 && e < forest.elementCount && forest.eChild[e]! < 0 && sameEdge(forest.eVert[e * nv]!, forest.eVert[e * nv + 1]!, a, b);
    const got = ok ? forest.bisect(e) : -1;
    if (got !== m || !sameEdge(forest.vParentA[m]!, forest.vParentB[m]!, a, b)) {
      throw new CorruptFileError(
        `the bisection log does not replay: vertex ${m} should be the midpoint of (${a}, ${b}) made by bisecting element ${e}, but ${ok ? `the bisection created vertex ${got}` : 'that element is not an unrefined element with this refinement edge'}`,
        'mismatch',
        { field: `forest.elements[${k}]`, expected: `a bisection creating vertex ${m}`, received: ok ? `vertex ${got}` : `element ${e}` },
      );
    }
  }
}
