/**
 * A {@link NodalField} as the initial state of a problem: checked before any work against the
 * domain (same dimension; the field's mesh covers every initial vertex and element centroid), and
 * wrapped so that a point it does not cover, met later, is an error naming `initial`.
 */
import { InvalidArgumentError } from '../errors';
import type { NodalField, SpatialDomain } from '../space/index';

function uncovered(x: number, y: number, dim: number): never {
  const p = dim === 1 ? `x = ${x}` : `(${x}, ${y})`;
  throw new InvalidArgumentError(
    `initial: the NodalField does not cover the point ${p} of the domain (its mesh must cover the whole domain; the state of a solution on this domain does)`,
    { field: 'initial', expected: 'a field whose mesh covers the domain', received: p },
  );
}

/**
 * Whether `v` is a NodalField, tested by its shape rather than with `instanceof`, so that
 * HeatProblem does not pull the field's class and its validation into every bundle that imports
 * it (a one-function import of HeatProblem must stay within its size budget). @internal
 */
export function isNodalField(v: unknown): v is NodalField {
  if (v === null || typeof v !== 'object') return false;
  const f = v as Partial<NodalField>;
  return typeof f.valueAt === 'function' && typeof f.contains === 'function' && (f.dim === 1 || f.dim === 2);
}

/** u0(x, y) from `field` on `domain`. @internal */
export function initialFromField(field: NodalField, domain: SpatialDomain): (x: number, y: number) => number {
  const d = domain.dim;
  if (field.dim !== d) {
    throw new InvalidArgumentError(`initial: a ${field.dim}D NodalField for a ${d}D domain`, { field: 'initial', expected: `a ${d}D field`, received: `${field.dim}D` });
  }
  const m = domain.forest.initialMesh;
  const nv = d + 1;
  for (let v = 0; v < m.coords.length / d; v++) {
    const x = m.coords[d * v]!, y = d === 2 ? m.coords[d * v + 1]! : 0;
    if (!field.contains(x, y)) uncovered(x, y, d);
  }
  for (let e = 0; e < m.elements.length / nv; e++) {
    let x = 0, y = 0;
    for (let k = 0; k < nv; k++) {
      const v = m.elements[nv * e + k]!;
      x += m.coords[d * v]! / nv;
      if (d === 2) y += m.coords[d * v + 1]! / nv;
    }
    if (!field.contains(x, y)) uncovered(x, y, d);
  }
  return (x, y) => {
    try {
      return field.valueAt(x, y);
    } catch {
      return uncovered(x, y, d);
    }
  };
}
