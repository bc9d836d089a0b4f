// Partitioned VTK XML (.pvtu): hand-written ASCII pieces and index files; expected values are
// the ones written into them.
import { describe, expect, it } from 'vitest';
import { findArray, QUAD, TRIANGLE, type Mesh } from '../../../src/mesh/model.js';
import { readMesh } from '../../../src/mesh/read.js';
import { PIECE_ARRAY, PIECE_ARRAY_ALT, pieceOfCell } from '../../../src/mesh/vtkxml/pvtu.js';
import { inputError } from '../../helpers/errors.js';

const enc = new TextEncoder();

/** An ASCII .vtu piece: points (x y 0), cells, a point "depth" and optional cell arrays. */
function piece(points: number[][], cells: number[][], depth: number[], cellArrays: Record<string, number[]> = {}): string {
  let offsets = 0;
  const cellData = Object.entries(cellArrays)
    .map(([name, v]) => `<DataArray type="Float64" Name="${name}" format="ascii">${v.join(' ')}</DataArray>`).join('');
  return `<?xml version="1.0"?>
<VTKFile type="UnstructuredGrid" version="1.0" byte_order="LittleEndian">
 <UnstructuredGrid><Piece NumberOfPoints="${points.length}" NumberOfCells="${cells.length}">
  <PointData><DataArray type="Float64" Name="depth" format="ascii">${depth.join(' ')}</DataArray></PointData>
  <CellData>${cellData}</CellData>
  <Points><DataArray type="Float64" NumberOfComponents="3" format="ascii">${points.map((p) => `${p[0]} ${p[1]} 0`).join(' ')}</DataArray></Points>
  <Cells>
   <DataArray type="Int32" Name="connectivity" format="ascii">${cells.flat().join(' ')}</DataArray>
   <DataArray type="Int32" Name="offsets" format="ascii">${cells.map((c) => (offsets += c.length)).join(' ')}</DataArray>
   <DataArray type="UInt8" Name="types" format="ascii">${cells.map((c) => (c.length === 4 ? 9 : 5)).join(' ')}</DataArray>
  </Cells>
 </Piece></UnstructuredGrid>
</VTKFile>
`;
}

function index(sources: string[], type = 'PUnstructuredGrid'): string {
  return `<?xml version="1.0"?>
<VTKFile type="${type}" version="1.0" byte_order="LittleEndian">
 <${type} GhostLevel="0">
  <PPointData><PDataArray type="Float64" Name="depth"/></PPointData>
  <PPoints><PDataArray type="Float64" NumberOfComponents="3"/></PPoints>
${sources.map((s) => `  <Piece Source="${s}"/>`).join('\n')}
 </${type}>
</VTKFile>
`;
}

// a 2 × 1 strip cut at x = 1: two triangles on the left, one quad on the right (x = 1 duplicated)
const LEFT = piece([[0, 0], [1, 0], [1, 1], [0, 1]], [[0, 1, 2], [0, 2, 3]], [1, 2, 3, 4], { id: [10, 11] });
const RIGHT = piece([[1, 0], [2, 0], [2, 1], [1, 1]], [[0, 1, 2, 3]], [2, 5, 6, 3], { id: [12] });

function files(entries: Record<string, string>): (name: string) => Uint8Array | null {
  return (name) => (name in entries ? enc.encode(entries[name]!) : null);
}

function read(name: string, entries: Record<string, string>): Mesh {
  return readMesh(enc.encode(entries[name]!), name, { loadSibling: files(entries) });
}

const failure = inputError;

describe('.pvtu', () => {
  it('joins the pieces in order: points duplicated on the cut, cells in piece then file order', () => {
    const m = read('run/strip.pvtu', { 'run/strip.pvtu': index(['strip_0.vtu', 'parts/strip_1.vtu']), 'run/strip_0.vtu': LEFT, 'run/parts/strip_1.vtu': RIGHT });
    expect(m.nPoints).toBe(8);
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 1, 1, 0, 1, 1, 0, 2, 0, 2, 1, 1, 1]);
    expect(m.nCells).toBe(3);
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE, TRIANGLE, QUAD]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 3, 6, 10]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 0, 2, 3, 4, 5, 6, 7]);
    expect(Array.from(findArray(m.pointData, 'depth')!.values)).toEqual([1, 2, 3, 4, 2, 5, 6, 3]);
    expect(Array.from(findArray(m.cellData, 'id')!.values)).toEqual([10, 11, 12]);
    expect(Array.from(findArray(m.cellData, PIECE_ARRAY)!.values)).toEqual([0, 0, 1]);
    expect(pieceOfCell(m, 2)).toBe(1);
    expect(pieceOfCell(m, 3)).toBeNull();
    expect(m.format).toBe('pvtu/ascii');
    expect(m.warnings).toEqual([]);
  });

  it('the sum of the cell areas is the area of the strip (common practice: a partition covers the domain once)', () => {
    const m = read('strip.pvtu', { 'strip.pvtu': index(['a.vtu', 'b.vtu']), 'a.vtu': LEFT, 'b.vtu': RIGHT });
    let area = 0;
    for (let i = 0; i < m.nCells; i++) {
      const s = m.cellOffsets[i]!, e = m.cellOffsets[i + 1]!;
      for (let k = s; k < e; k++) {
        const a = m.cellNodes[k]!, b = m.cellNodes[k + 1 < e ? k + 1 : s]!;
        area += 0.5 * (m.points[2 * a]! * m.points[2 * b + 1]! - m.points[2 * b]! * m.points[2 * a + 1]!);
      }
    }
    expect(area).toBeCloseTo(2, 12);
  });

  it('names a missing piece, with the index file and the Piece element', () => {
    const text = index(['a.vtu', 'gone.vtu']);
    const e = failure(() => read('strip.pvtu', { 'strip.pvtu': text, 'a.vtu': LEFT }));
    expect(e.detail).toMatch(/piece "gone\.vtu" was not found/);
    expect(e.location.file).toBe('strip.pvtu');
    expect(e.location.byteOffset).toBe(text.indexOf('<Piece Source="gone.vtu"'));
  });

  it('refuses a piece that is not an UnstructuredGrid, and a Piece without Source', () => {
    const poly = `<VTKFile type="PolyData"><PolyData><Piece NumberOfPoints="0"/></PolyData></VTKFile>`;
    expect(failure(() => read('s.pvtu', { 's.pvtu': index(['a.vtu', 'p.vtp']), 'a.vtu': LEFT, 'p.vtp': poly })).detail)
      .toMatch(/piece "p\.vtp" is vtp\/ascii, not a VTK XML UnstructuredGrid/);
    const noSource = index(['a.vtu']).replace('Source="a.vtu"', 'Name="a"');
    expect(failure(() => read('s.pvtu', { 's.pvtu': noSource, 'a.vtu': LEFT })).detail).toMatch(/no Source/);
  });

  it('errors inside a piece name the piece file', () => {
    const broken = LEFT.replace('0 1 2 0 2 3', '0 1 2 0 2 9');
    const e = failure(() => read('s.pvtu', { 's.pvtu': index(['a.vtu']), 'a.vtu': broken }));
    expect(e.location.file).toBe('a.vtu');
    expect(e.detail).toMatch(/node 9/);
  });

  it('without a loader (the browser) says the pieces need files', () => {
    const e = failure(() => readMesh(enc.encode(index(['a.vtu'])), 'x.pvtu'));
    expect(e.detail).toMatch(/its 1 pieces can only be read from files/);
  });

  it('drops an array that only some pieces carry, with a warning, and keeps the piece array apart from a "piece" array of the file', () => {
    const right = piece([[1, 0], [2, 0], [2, 1], [1, 1]], [[0, 1, 2, 3]], [2, 5, 6, 3], { piece: [7] });
    const left = piece([[0, 0], [1, 0], [1, 1], [0, 1]], [[0, 1, 2], [0, 2, 3]], [1, 2, 3, 4], { piece: [5, 6], id: [1, 2] });
    const m = read('s.pvtu', { 's.pvtu': index(['a.vtu', 'b.vtu']), 'a.vtu': left, 'b.vtu': right });
    expect(findArray(m.cellData, 'id')).toBeUndefined();
    expect(m.warnings.some((w) => /"id" is missing/.test(w))).toBe(true);
    expect(Array.from(findArray(m.cellData, PIECE_ARRAY)!.values)).toEqual([5, 6, 7]);
    expect(Array.from(findArray(m.cellData, PIECE_ARRAY_ALT)!.values)).toEqual([0, 0, 1]);
    expect(pieceOfCell(m, 0)).toBe(0);
  });

  it('reads .pvtp (partitioned PolyData) the same way', () => {
    const vtp = `<VTKFile type="PolyData"><PolyData><Piece NumberOfPoints="3" NumberOfPolys="1">
      <Points><DataArray type="Float32" NumberOfComponents="3" format="ascii">0 0 0 1 0 0 0 1 0</DataArray></Points>
      <Polys><DataArray type="Int32" Name="connectivity" format="ascii">0 1 2</DataArray>
      <DataArray type="Int32" Name="offsets" format="ascii">3</DataArray></Polys></Piece></PolyData></VTKFile>`;
    const m = read('s.pvtp', { 's.pvtp': index(['a.vtp', 'b.vtp'], 'PPolyData'), 'a.vtp': vtp, 'b.vtp': vtp });
    expect(m.nCells).toBe(2);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(m.format).toBe('pvtp/ascii');
  });
});
