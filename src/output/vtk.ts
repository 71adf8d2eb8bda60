/**
 * VTK XML export of time slices (the open VTK file formats: an
 * UnstructuredGrid `.vtu` file per slice and a `.pvd` collection indexing
 * them by time), written as ASCII strings so that any environment can save
 * them. 1D meshes become VTK lines, 2D meshes triangles.
 */
import type { TimeSlice } from '../spacetime/space-time-solution';
import { checkSlice } from './slice-checks';
import { checkNumber, checkObject, checkString } from '../validation/index';

const VTK_LINE = 3;
const VTK_TRIANGLE = 5;

/**
 * One slice as a VTK XML UnstructuredGrid document with the point field `name`.
 *
 * @example
 * ```ts
 * import { DoubleTree, HeatProblem, SpaceTimeSystem, intervalDomain, sliceToVtu } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const { solution } = new SpaceTimeSystem(new HeatProblem({ domain, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(domain, 4)).solve();
 * const xml = sliceToVtu(solution.slice(0.1)); // save as rod-0001.vtu
 * ```
 */
export function sliceToVtu(slice: TimeSlice, name = 'u'): string {
  checkSlice(slice);
  checkString(name, 'name', 200);
  const { mesh, values } = slice;
  const n = mesh.vertexCount;
  const m = mesh.elementCount;
  const k = mesh.dim + 1;
  const pts: string[] = [];
  for (let i = 0; i < n; i++) {
    const x = mesh.coords[mesh.dim * i]!;
    const y = mesh.dim === 2 ? mesh.coords[2 * i + 1]! : 0;
    pts.push(`${x} ${y} 0`);
  }
  const conn: string[] = [];
  const offs: string[] = [];
  for (let e = 0; e < m; e++) {
    const row: number[] = [];
    for (let j = 0; j < k; j++) row.push(mesh.elements[k * e + j]!);
    conn.push(row.join(' '));
    offs.push(String(k * (e + 1)));
  }
  const type = String(mesh.dim === 1 ? VTK_LINE : VTK_TRIANGLE);
  return [
    '<?xml version="1.0"?>',
    '<VTKFile type="UnstructuredGrid" version="1.0" byte_order="LittleEndian">',
    '  <UnstructuredGrid>',
    `    <FieldData><DataArray type="Float64" Name="TimeValue" NumberOfTuples="1" format="ascii">${slice.t}</DataArray></FieldData>`,
    `    <Piece NumberOfPoints="${n}" NumberOfCells="${m}">`,
    `      <PointData Scalars="${escapeXml(name)}">`,
    `        <DataArray type="Float64" Name="${escapeXml(name)}" format="ascii">${Array.from(values).join(' ')}</DataArray>`,
    '      </PointData>',
    '      <Points>',
    `        <DataArray type="Float64" NumberOfComponents="3" format="ascii">${pts.join(' ')}</DataArray>`,
    '      </Points>',
    '      <Cells>',
    `        <DataArray type="Int32" Name="connectivity" format="ascii">${conn.join(' ')}</DataArray>`,
    `        <DataArray type="Int32" Name="offsets" format="ascii">${offs.join(' ')}</DataArray>`,
    `        <DataArray type="UInt8" Name="types" format="ascii">${new Array(m).fill(type).join(' ')}</DataArray>`,
    '      </Cells>',
    '    </Piece>',
    '  </UnstructuredGrid>',
    '</VTKFile>',
    '',
  ].join('\n');
}

/**
 * A `.pvd` collection listing slice files by time, for time-series viewers.
 *
 * @example
 * ```ts
 * import { vtkCollection } from 'chronomesh';
 * const pvd = vtkCollection([{ t: 0, file: 'rod-0000.vtu' }, { t: 0.5, file: 'rod-0001.vtu' }]);
 * ```
 */
export function vtkCollection(entries: { t: number; file: string }[]): string {
  if (!Array.isArray(entries)) checkObject(entries, 'entries', 'an array of { t, file }');
  entries.forEach((e, i) => {
    checkObject(e, `entries[${i}]`, 'an entry { t, file }');
    checkNumber(e.t, `entries[${i}].t`);
    checkString(e.file, `entries[${i}].file`, 4096);
  });
  const rows = entries.map((e) => `    <DataSet timestep="${e.t}" group="" part="0" file="${escapeXml(e.file)}"/>`);
  return ['<?xml version="1.0"?>', '<VTKFile type="Collection" version="1.0" byte_order="LittleEndian">', '  <Collection>', ...rows, '  </Collection>', '</VTKFile>', ''].join('\n');
}

function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}
