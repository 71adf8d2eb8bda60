/**
 * Checks the parts of the LeafMesh contract (src/space/leaf-mesh.ts) that the
 * multilevel preconditioner relies on: array lengths, index ranges, local order
 * by generation with interpolation parents of lower generation, coefficients.
 */
import { InvalidMeshError } from '../../errors';
import type { LeafMesh } from '../leaf-mesh';

function fail(field: string, expected: string, received: unknown, what: string): never {
  throw new InvalidMeshError(`${what}: ${field} must be ${expected}`, { field: `mesh.${field}`, expected, received });
}

function checkLength(name: string, arr: { length: number } | undefined, want: number): void {
  if (!arr || arr.length !== want) fail(name, `an array of length ${want}`, arr ? arr.length : arr, 'leaf mesh');
}

export function validateLeafMesh(mesh: LeafMesh): void {
  if (mesh === null || typeof mesh !== 'object') {
    throw new InvalidMeshError('mesh must be a leaf mesh (from SpatialDomain.leafMesh)', { field: 'mesh', expected: 'a leaf mesh', received: typeof mesh });
  }
  if (mesh.dim !== 1 && mesh.dim !== 2) fail('dim', '1 or 2', mesh.dim, 'leaf mesh');
  const n = mesh.vertexCount;
  if (!Number.isInteger(n) || n < 1) fail('vertexCount', 'an integer ≥ 1', n, 'leaf mesh');
  const ne = mesh.elementCount;
  if (!Number.isInteger(ne) || ne < 1) fail('elementCount', 'an integer ≥ 1', ne, 'leaf mesh');
  const nv = mesh.dim + 1;
  checkLength('coords', mesh.coords, mesh.dim * n);
  checkLength('generation', mesh.generation, n);
  checkLength('parentA', mesh.parentA, n);
  checkLength('parentB', mesh.parentB, n);
  checkLength('isFree', mesh.isFree, n);
  checkLength('elements', mesh.elements, nv * ne);
  checkLength('elementMaterial', mesh.elementMaterial, ne);
  if (!mesh.kappa || typeof mesh.kappa.length !== 'number') fail('kappa', 'an array of per-material values', mesh.kappa, 'leaf mesh');
  const nm = mesh.kappa.length;
  checkLength('reaction', mesh.reaction, nm);
  for (let i = 0; i < mesh.dim * n; i++) {
    if (!Number.isFinite(mesh.coords[i]!)) fail(`coords[${i}]`, 'finite', mesh.coords[i], 'leaf mesh');
  }
  const gen = mesh.generation;
  const pa = mesh.parentA;
  const pb = mesh.parentB;
  let prev = 0;
  for (let m = 0; m < n; m++) {
    const g = gen[m]!;
    if (g < prev) fail(`generation[${m}]`, `≥ generation of the previous local vertex (${prev}); local vertices must be ordered by generation`, g, `vertex ${m}`);
    prev = g;
    const a = pa[m]!;
    const b = pb[m]!;
    if (g === 0) {
      if (a !== -1 || b !== -1) fail(`parentA[${m}]/parentB[${m}]`, '−1 for an initial vertex', [a, b].join(','), `vertex ${m}`);
      continue;
    }
    if (!(a >= 0 && a < m)) fail(`parentA[${m}]`, `a local index in [0, ${m}) (parents precede children)`, a, `vertex ${m}`);
    if (!(b >= 0 && b < m) || b === a) fail(`parentB[${m}]`, `a local index in [0, ${m}) different from parentA`, b, `vertex ${m}`);
    if (gen[a]! >= g || gen[b]! >= g) {
      fail(`generation[${m}]`, `greater than the generations of its parents (${gen[a]}, ${gen[b]})`, g, `vertex ${m}`);
    }
  }
  const el = mesh.elements;
  for (let i = 0; i < nv * ne; i++) {
    const v = el[i]!;
    if (!(v >= 0 && v < n)) fail(`elements[${i}]`, `a local vertex index in [0, ${n})`, v, `element ${Math.floor(i / nv)}`);
  }
  for (let e = 0; e < ne; e++) {
    const mat = mesh.elementMaterial[e]!;
    if (!(mat >= 0 && mat < nm)) fail(`elementMaterial[${e}]`, `an index in [0, ${nm})`, mat, `element ${e}`);
  }
  for (let k = 0; k < nm; k++) {
    const kap = mesh.kappa[k]!;
    if (!(kap > 0) || !Number.isFinite(kap)) fail(`kappa[${k}]`, 'a finite number > 0', kap, 'coefficients');
    const c = mesh.reaction[k]!;
    if (!(c >= 0) || !Number.isFinite(c)) fail(`reaction[${k}]`, 'a finite number ≥ 0', c, 'coefficients');
  }
  const t = mesh.kappaTensor;
  if (t === undefined) return;
  if (mesh.dim !== 2) fail('kappaTensor', 'absent in 1D (a scalar kappa)', 'a tensor', 'coefficients');
  checkLength('kappaTensor', t, 3 * nm);
  for (let k = 0; k < nm; k++) {
    const xx = t[3 * k]!, xy = t[3 * k + 1]!, yy = t[3 * k + 2]!;
    if (!(xx > 0 && xx * yy - xy * xy > 0 && Number.isFinite(xx + xy + yy))) {
      fail(`kappaTensor[${3 * k}…${3 * k + 2}]`, 'a symmetric positive definite tensor (xx > 0, xx·yy − xy² > 0)', `${xx}, ${xy}, ${yy}`, 'coefficients');
    }
  }
}
