/**
 * Hand-written legacy VTK files under test/fixtures/legacy/. Every expected value below is
 * read off the fixture text by hand (the fixtures are our own invented meshes). Cell type ids
 * (3 line, 5 triangle, 9 quad) and the section layout follow Kitware, "VTK File Formats"
 * (The VTK User's Guide, legacy format section and its cell type figures).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readVtkLegacy } from '../../../src/mesh/legacy/index.js';
import { findArray, QUAD, TRIANGLE, type Mesh } from '../../../src/mesh/model.js';

const dir = new URL('../../fixtures/legacy/', import.meta.url);

function load(name: string): Mesh {
  return readVtkLegacy(new Uint8Array(readFileSync(new URL(name, dir))), name);
}

function values(m: Mesh, where: 'point' | 'cell', name: string): { components: number; values: number[]; f32: boolean } {
  const a = findArray(where === 'point' ? m.pointData : m.cellData, name);
  if (!a) throw new Error(`no ${where} array ${name}`);
  return { components: a.components, values: Array.from(a.values), f32: a.values instanceof Float32Array };
}

describe('ASCII 4.2 unstructured grid (harbour-grid-4.2.vtk)', () => {
  const m = load('harbour-grid-4.2.vtk');

  it('reads the points, wrapped across lines, as x,y', () => {
    expect(m.nPoints).toBe(6);
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 2, 0, 0, 1, 1, 1, 2, 1]);
    expect(m.warnings).toEqual([]);
  });

  it('keeps the quad and the two triangles in file order and drops the line', () => {
    expect(m.nCells).toBe(3);
    expect(Array.from(m.cellTypes)).toEqual([QUAD, TRIANGLE, TRIANGLE]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 4, 7, 10]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 4, 3, 1, 2, 5, 1, 5, 4]);
  });

  it('reads CELL_DATA given before POINT_DATA, subset to the kept cells', () => {
    expect(values(m, 'cell', 'depth')).toEqual({ components: 1, values: [1.5, 2.25, 3], f32: false });
    // FIELD array after a SCALARS section, name %-encoded, followed by a METADATA block
    expect(values(m, 'cell', 'flux x')).toEqual({ components: 2, values: [0.5, 0.25, 9, 9, 4, 8], f32: true });
  });

  it('reads SCALARS with and without a component count, VECTORS and NORMALS; skips TENSORS and texture coordinates', () => {
    expect(values(m, 'point', 'eta')).toEqual({ components: 1, values: [0, 0.125, 0.25, 0.375, 0.5, 0.625], f32: true });
    expect(values(m, 'point', 'velocity')).toEqual({
      components: 3, values: [1, 0, 0, 2, 0, 0, 3, 0, 0, 4, 0, 0, 5, 0, 0, 6, 0, 0], f32: false,
    });
    expect(values(m, 'point', 'pair')).toEqual({ components: 2, values: [-1, 1, -2, 2, -3, 3, -4, 4, -5, 5, -6, 6], f32: false });
    expect(values(m, 'point', 'up').values).toEqual([0, 0, 1, 0, 0, 1, 0, 0, 1, 0, 0, 1, 0, 0, 1, 0, 0, 1]);
    expect(m.pointData.map((a) => a.name)).toEqual(['eta', 'velocity', 'pair', 'up']);
  });

  it('takes the time from the TimeValue array of the dataset FIELD block', () => {
    expect(m.time).toBe(12.5);
    expect(m.format).toBe('vtk-legacy/4.2-ascii');
  });
});

describe('ASCII POLYDATA (basin-poly-4.2.vtk)', () => {
  const m = load('basin-poly-4.2.vtk');

  it('turns POLYGONS into a quad and a triangle, skipping VERTICES and LINES', () => {
    expect(Array.from(m.points)).toEqual([0, 0, 2, 0, 2, 1, 0, 1, 1, 2]);
    expect(Array.from(m.cellTypes)).toEqual([QUAD, TRIANGLE]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 3, 3, 2, 4]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 4, 7]);
  });

  it('lines CELL_DATA up with VTK numbering (vertices, lines, then polygons)', () => {
    expect(values(m, 'cell', 'id').values).toEqual([9, 10]);
  });

  it('skips COLOR_SCALARS and a LOOKUP_TABLE with data, and reads the scalars between them', () => {
    expect(m.pointData.map((a) => a.name)).toEqual(['h']);
    expect(values(m, 'point', 'h').values).toEqual([10, 20, 30, 40, 50]);
    expect(m.time).toBeUndefined();
    expect(m.format).toBe('vtk-legacy/3.0-ascii');
  });
});

describe('ASCII 5.1 layout (channel-5.1.vtk)', () => {
  const m = load('channel-5.1.vtk');

  it('reads OFFSETS and CONNECTIVITY', () => {
    expect(Array.from(m.cellTypes)).toEqual([QUAD, TRIANGLE]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 4, 7]);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 3, 1, 4, 2]);
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 1, 1, 0, 1, 2, 0.5]);
  });

  it('reads FIELD arrays of POINT_DATA and scalars of CELL_DATA', () => {
    expect(values(m, 'point', 'u').values).toEqual([1, 2, 3, 4, 5]);
    expect(values(m, 'point', 'v').values).toEqual([-1, -2, -3, -4, -5]);
    expect(values(m, 'cell', 'manning').values).toEqual([0.025, 0.03]);
    expect(m.format).toBe('vtk-legacy/5.1-ascii');
  });
});
