/**
 * Validation of a time slice handed to an exporter: a consistent mesh (coordinates and
 * connectivity of the stated sizes, indices in range) and finite values, one per vertex, at a
 * finite time. Nothing non-finite or inconsistent is ever written to a file.
 */
import { InvalidArgumentError } from '../errors';
import { checkFloat64Array, checkInt32Array, checkInteger, checkNumber, checkObject, checkOneOf } from '../validation/index';
import type { TimeSlice } from '../spacetime/space-time-solution';

/** Checks a {@link TimeSlice} (e.g. from `solution.slice(t)`) before it is exported. */
export function checkSlice(slice: unknown, field = 'slice'): TimeSlice {
  const s = checkObject(slice, field, 'a time slice { t, mesh, values } (from solution.slice(t))');
  checkNumber(s.t, `${field}.t`);
  const mesh = checkObject(s.mesh, `${field}.mesh`, 'a leaf mesh');
  const dim = checkOneOf(mesh.dim, `${field}.mesh.dim`, [1, 2] as const);
  const nv = checkInteger(mesh.vertexCount, `${field}.mesh.vertexCount`, 1, 2 ** 31 - 1);
  const ne = checkInteger(mesh.elementCount, `${field}.mesh.elementCount`, 1, 2 ** 31 - 1);
  checkFloat64Array(mesh.coords, `${field}.mesh.coords`, { length: nv * dim, finite: true });
  const el = checkInt32Array(mesh.elements, `${field}.mesh.elements`, { length: ne * (dim + 1) });
  for (let i = 0; i < el.length; i++) {
    const v = el[i]!;
    if (v < 0 || v >= nv) {
      const e = Math.floor(i / (dim + 1));
      throw new InvalidArgumentError(`${field}.mesh.elements: element ${e} refers to vertex ${v}, outside 0…${nv - 1}`, {
        field: `${field}.mesh.elements[${i}]`,
        expected: `a vertex index in [0, ${nv - 1}]`,
        received: v,
      });
    }
  }
  checkFloat64Array(s.values, `${field}.values`, { length: nv, finite: true });
  return slice as TimeSlice;
}
