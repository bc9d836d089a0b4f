// Hand-written VTK XML files (test/fixtures/vtkxml; the binary ones come from make-fixtures.mjs,
// which encodes with Node's Buffer and zlib, not with our writer). Expected values are the ones
// written into the fixtures.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { MeshInputError } from '../../../src/mesh/errors.js';
import { findArray, QUAD, TRIANGLE, type Mesh } from '../../../src/mesh/model.js';
import { readVtkXml } from '../../../src/mesh/vtkxml/index.js';

function fixture(name: string): Uint8Array {
  return new Uint8Array(readFileSync(fileURLToPath(new URL(`../../fixtures/vtkxml/${name}`, import.meta.url))));
}

function read(name: string): Mesh {
  return readVtkXml(fixture(name), name);
}

function values(m: Mesh, where: 'pointData' | 'cellData', name: string): number[] {
  const a = findArray(m[where], name);
  expect(a, `${where} ${name}`).toBeDefined();
  return Array.from(a!.values);
}

describe('VTK XML fixtures', () => {
  it('ascii, two pieces, an InformationKey before the data, FieldData time', () => {
    const m = read('two-pieces.vtu');
    expect(m.format).toBe('vtu/ascii');
    expect(m.nPoints).toBe(8);
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 1, 1, 0, 1, 1, 0, 2, 0, 2, 1, 1, 1]);
    // second piece's local indices 0..3 become 4..7
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 0, 2, 3, 4, 5, 6, 7]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 3, 6, 10]);
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE, TRIANGLE, QUAD]);
    expect(values(m, 'pointData', 'depth')).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(values(m, 'cellData', 'id')).toEqual([10, 11, 12]);
    expect(m.time).toBe(3.5);
    expect(m.warnings).toEqual([]);
  });

  it('inline base64 with UInt64 headers, header and data in one stream', () => {
    const m = read('inline-uint64.vtu');
    expect(m.format).toBe('vtu/binary');
    expect(Array.from(m.points)).toEqual([0, 0, 2, 0, 2, 1, 0, 1]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 0, 2, 3]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 3, 6]);
    const u = findArray(m.pointData, 'u')!;
    expect(u.components).toBe(2);
    expect(u.values).toBeInstanceOf(Float32Array);
    expect(Array.from(u.values)).toEqual([0.5, -1, 1.25, 0, 3, 2, -0.75, 4]);
    const level = findArray(m.cellData, 'level')!;
    expect(level.values).toBeInstanceOf(Float64Array);
    expect(Array.from(level.values)).toEqual([7, -3]);
  });

  it('appended raw with Float32 points, an offset with spaces, an unaligned Float64 array', () => {
    const m = read('appended-raw-f32.vtu');
    expect(m.format).toBe('vtu/appended-raw');
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 1, 1, 0, 1, 2, 0.5]);
    expect(Array.from(m.cellTypes)).toEqual([QUAD, TRIANGLE]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 3, 1, 4, 2]);
    expect(values(m, 'cellData', 'h')).toEqual([0.1, 1e-300]);
    // the last point's z (0.1 as float32) differs from the others: projected, with a note
    expect(m.warnings.some((w) => w.includes('z varies'))).toBe(true);
  });

  it('PolyData: polygons kept, verts and lines skipped, cell data cut to the polygons', () => {
    const m = read('polys.vtp');
    expect(m.format).toBe('vtp/ascii');
    expect(m.nCells).toBe(2);
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE, QUAD]);
    expect(Array.from(m.cellNodes)).toEqual([0, 4, 3, 0, 1, 2, 3]);
    expect(values(m, 'cellData', 'code')).toEqual([300, 400]);
    expect(values(m, 'pointData', 'depth')).toEqual([4, 3, 2, 1, 0.5]);
  });

  it('zlib inline binary, big-endian, block table encoded apart from the blocks', () => {
    const m = read('zlib-separate-header.vtu');
    expect(m.format).toBe('vtu/binary-zlib');
    expect(Array.from(m.points)).toEqual([0, 0, 3, 0, 3, 2, 0, 2]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 3, 1, 2, 3]);
    expect(values(m, 'cellData', 'v')).toEqual([-2.5, 6.0221e23]);
  });

  it('an unknown compressor is named in the error', () => {
    expect(() => read('lz4.vtu')).toThrow(/vtkLZ4DataCompressor/);
    expect(() => read('lz4.vtu')).toThrow(MeshInputError);
  });

  it('a tetrahedron is refused as 3-D', () => {
    expect(() => read('tetra.vtu')).toThrow('2-D meshes only: found 1 tetrahedra');
  });

  it('quadratic triangles are reduced to their corners with a warning', () => {
    const m = read('quadratic.vtu');
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2]);
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE]);
    expect(m.warnings).toEqual(['1 higher-order cells reduced to their corner nodes']);
  });

  it('vertices and lines are skipped silently and cell data follows the kept cells', () => {
    const m = read('mixed-lines.vtu');
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE, QUAD]);
    expect(Array.from(m.cellNodes)).toEqual([1, 4, 2, 0, 1, 2, 3]);
    const id = findArray(m.cellData, 'id')!;
    expect(id.values).toBeInstanceOf(Float32Array);
    expect(Array.from(id.values)).toEqual([2, 4]);
    expect(m.warnings).toEqual([]);
  });
});
