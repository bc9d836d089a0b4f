/**
 * One invented harbour mesh written by the test encoder in every encoding the reader takes
 * (ASCII / big-endian binary, 4.x counted cells / 5.x offsets, float / double / int points,
 * with and without the newline after binary blocks, grid and polydata), read back and
 * compared value by value with what the encoder was given.
 */
import { describe, expect, it } from 'vitest';
import { readVtkLegacy } from '../../../src/mesh/legacy/index.js';
import { findArray, QUAD, TRIANGLE, type Mesh } from '../../../src/mesh/model.js';
import { bigEndian, encodeLegacy, type AttributeBlock, type LegacySpec } from './encode.js';

const NX = 4;
const NY = 3;

function coords(type: string): number[] {
  // double points sit at projected-map magnitudes; float and int points are exact in their type
  const x0 = type === 'double' ? 431000.1 : type === 'int' ? 10 : -0.75;
  const y0 = type === 'double' ? 5123000.37 : 0;
  const dx = type === 'int' ? 2 : 0.5;
  const xyz: number[] = [];
  for (let j = 0; j < NY; j++) for (let i = 0; i < NX; i++) xyz.push(x0 + i * dx, y0 + j * (type === 'int' ? 3 : 0.25), 0);
  return xyz;
}

/** Point ids: row j, column i is j * 4 + i. */
const GRID_CELLS = [[0, 1, 5, 4], [1, 2], [1, 2, 6], [1, 6, 5], [3], [4, 5, 8, 9], [2, 3, 7], [6, 7, 11, 2, 3, 10]];
/**
 * quad, line, triangle, triangle, vertex, pixel (nodes in grid order), polygon, quadratic triangle:
 * ids and node orders from Kitware, "VTK File Formats" (The VTK User's Guide), cell type figures.
 */
const GRID_TYPES = [9, 3, 5, 5, 1, 8, 7, 22];
const GRID_KEPT = [0, 2, 3, 5, 6, 7];
/** Kept cells as the reader must give them: the pixel's nodes in quad order, the quadratic triangle's corners. */
const GRID_NODES = [[0, 1, 5, 4], [1, 2, 6], [1, 6, 5], [4, 5, 9, 8], [2, 3, 7], [6, 7, 11]];
const GRID_KINDS = [QUAD, TRIANGLE, TRIANGLE, QUAD, TRIANGLE, TRIANGLE];

const POLYS = [[0, 1, 5, 4], [1, 2, 6], [1, 6, 5], [4, 5, 9, 8], [2, 3, 7]];
const POLY_KINDS = [QUAD, TRIANGLE, TRIANGLE, QUAD, TRIANGLE];

/** A float whose big-endian bytes are 20 0A 0A 20: spaces and newlines inside a binary block. */
const TRAP_FLOAT = (() => {
  const dv = new DataView(new ArrayBuffer(4));
  dv.setUint32(0, 0x200a0a20);
  return dv.getFloat32(0);
})();
/** Ints whose bytes read "POIN" and four newlines. */
const TRAP_INTS = [0x504f494e, 0x0a0a0a0a, -1, 0, 7, -2147483648, 2147483647, 13, 14, 15, 16, 17];

const range = (n: number, f: (i: number) => number) => Array.from({ length: n }, (_, i) => f(i));

function attributes(nCells: number): AttributeBlock[] {
  const nPts = NX * NY;
  return [
    {
      section: 'CELL_DATA', count: nCells, items: [
        { kind: 'SCALARS', name: 'depth', type: 'double', lookupTable: 'default', values: range(nCells, (c) => c * 1.5 - 2.1) },
        { kind: 'METADATA', lines: ['INFORMATION 0'] },
        {
          kind: 'FIELD', name: 'FieldData', arrays: [
            { name: 'id64', type: 'vtktypeint64', values: range(nCells, (c) => (c % 2 ? -3 * c : 2 ** 40 + c)) },
            { name: 'flag', type: 'unsigned_char', values: range(nCells, (c) => 250 + (c % 6)) },
            { name: 'wide', type: 'long', components: 2, values: range(2 * nCells, (c) => 3 - c) },
          ],
        },
      ],
    },
    {
      section: 'POINT_DATA', count: nPts, items: [
        // no LOOKUP_TABLE line, and the binary block starts with bytes that look like blank space
        { kind: 'SCALARS', name: 'eta', type: 'float', values: range(nPts, (i) => (i === 0 ? TRAP_FLOAT : i * 0.125)) },
        { kind: 'SCALARS', name: 'pair', type: 'short', components: 2, lookupTable: 'default', values: range(2 * nPts, (i) => i - 12) },
        { kind: 'VECTORS', name: 'velocity', type: 'float', values: range(3 * nPts, (i) => (i % 3 === 2 ? 0 : i / 4)) },
        { kind: 'TENSORS', name: 'stress', type: 'double', values: range(9 * nPts, (i) => i) },
        { kind: 'TEXTURE_COORDINATES', name: 'uv', dim: 2, type: 'float', values: range(2 * nPts, (i) => i / 2) },
        { kind: 'COLOR_SCALARS', name: 'rgb', nValues: 3, values: range(3 * nPts, (i) => i % 2) },
        { kind: 'LOOKUP_TABLE', name: 'lut', values: [0, 0, 0, 1, 1, 1, 1, 1] },
        { kind: 'GLOBAL_IDS', name: 'gid', type: 'int', values: range(nPts, (i) => i) },
        { kind: 'NORMALS', name: 'up', type: 'double', values: range(3 * nPts, (i) => (i % 3 === 2 ? 1 : 0)) },
        { kind: 'FIELD', name: 'FieldData', arrays: [{ name: 'traps', type: 'int', values: TRAP_INTS }] },
        { kind: 'METADATA', lines: ['COMPONENT_NAMES', 'trap%20value', 'INFORMATION 0'] },
        { kind: 'SCALARS', name: 'last', type: 'unsigned_short', values: range(nPts, (i) => 65535 - i) },
      ],
    },
  ];
}

function spec(over: Partial<LegacySpec>, pointType: string, poly: boolean): LegacySpec {
  const nCells = poly ? 2 + POLYS.length : GRID_CELLS.length;
  return {
    points: { type: pointType, xyz: coords(pointType) },
    fieldData: [{ name: 'TimeValue', type: 'double', values: [3600.5] }, { name: 'CYCLE', type: 'int', values: [12] }],
    ...(poly
      ? { dataset: 'POLYDATA' as const, cells: POLYS, verts: [[3]], lines: [[1, 2]] }
      : { cells: GRID_CELLS, cellTypes: GRID_TYPES }),
    attributes: attributes(nCells),
    ...over,
  };
}

/** The values a typed array of `type` holds for `values`. */
function asStored(type: string, values: readonly number[]): number[] {
  return type === 'float' ? values.map((v) => Math.fround(v)) : [...values];
}

function check(m: Mesh, s: LegacySpec, poly: boolean): void {
  const xyz = asStored(s.points.type, s.points.xyz);
  expect(Array.from(m.points)).toEqual(xyz.filter((_, k) => k % 3 !== 2));
  const nodes = poly ? POLYS : GRID_NODES;
  expect(Array.from(m.cellNodes)).toEqual(nodes.flat());
  expect(Array.from(m.cellTypes)).toEqual(poly ? POLY_KINDS : GRID_KINDS);
  expect(m.time).toBe(3600.5);
  const kept = poly ? range(POLYS.length, (i) => i + 2) : GRID_KEPT;
  const blocks = s.attributes!;
  const expectArrays = (section: 'POINT_DATA' | 'CELL_DATA', keep: number[] | null) => {
    const got = section === 'POINT_DATA' ? m.pointData : m.cellData;
    const read = blocks.find((b) => b.section === section)!.items.flatMap((it) => {
      if (it.kind === 'FIELD') return it.arrays.map((a) => ({ name: a.name, type: a.type, comps: a.components ?? 1, values: a.values }));
      if (it.kind === 'SCALARS') return [{ name: it.name, type: it.type, comps: it.components ?? 1, values: it.values }];
      if (it.kind === 'VECTORS' || it.kind === 'NORMALS') return [{ name: it.name, type: it.type, comps: 3, values: it.values }];
      return [];
    });
    expect(got.map((a) => a.name)).toEqual(read.map((a) => a.name));
    for (const r of read) {
      const a = findArray(got, r.name)!;
      expect(a.components).toBe(r.comps);
      expect(a.values instanceof Float32Array).toBe(r.type === 'float');
      const all = asStored(r.type, r.values);
      const want = keep ? keep.flatMap((c) => all.slice(c * r.comps, (c + 1) * r.comps)) : all;
      expect(Array.from(a.values)).toEqual(want);
    }
  };
  expectArrays('POINT_DATA', null);
  expectArrays('CELL_DATA', kept);
}

const WARN_QUADRATIC = '1 higher-order cells reduced to their corner nodes';

describe('legacy VTK in every encoding', () => {
  const cases: { name: string; over: Partial<LegacySpec> }[] = [
    { name: '4.2 ascii', over: { version: '4.2' } },
    { name: '4.2 binary', over: { version: '4.2', binary: true } },
    { name: '4.2 binary, no newline after blocks', over: { version: '4.2', binary: true, newlineAfterBinary: false } },
    { name: '5.1 ascii', over: { version: '5.1' } },
    { name: '5.1 binary', over: { version: '5.1', binary: true } },
    { name: '5.1 binary, no newline after blocks', over: { version: '5.1', binary: true, newlineAfterBinary: false } },
    { name: '5.1 binary, int32 offsets', over: { version: '5.1', binary: true, offsetsType: 'vtktypeint32' } },
    { name: '5.1 ascii, one value a line', over: { version: '5.1', perLine: 1 } },
  ];
  for (const c of cases) {
    for (const pointType of ['float', 'double', 'int']) {
      for (const poly of [false, true]) {
        it(`${c.name}, ${pointType} points, ${poly ? 'POLYDATA' : 'UNSTRUCTURED_GRID'}`, () => {
          const s = spec(c.over, pointType, poly);
          const m = readVtkLegacy(encodeLegacy(s), 'harbour.vtk');
          check(m, s, poly);
          expect(m.format).toBe(`vtk-legacy/${c.over.version}-${c.over.binary ? 'binary' : 'ascii'}`);
          expect(m.warnings).toEqual(poly ? [] : [WARN_QUADRATIC]);
        });
      }
    }
  }

  it('gives the same mesh from ASCII and binary', () => {
    const a = readVtkLegacy(encodeLegacy(spec({ version: '5.1' }, 'double', false)), 'a.vtk');
    const b = readVtkLegacy(encodeLegacy(spec({ version: '4.2', binary: true, newlineAfterBinary: false }, 'double', false)), 'b.vtk');
    expect({ ...b, format: '' }).toEqual({ ...a, format: '' });
  });

  it('reads every binary value type big-endian', () => {
    const types = ['char', 'unsigned_char', 'short', 'unsigned_short', 'int', 'unsigned_int', 'long',
      'unsigned_long', 'vtktypeint64', 'vtktypeuint64', 'float', 'double'];
    const vals: Record<string, number[]> = {
      char: [-128, 127, 0, -1], unsigned_char: [0, 255, 10, 32], short: [-32768, 32767, 10, -2],
      unsigned_short: [65535, 0, 2560, 1], int: [-2147483648, 2147483647, 168430090, -5],
      unsigned_int: [4294967295, 0, 1, 2 ** 31], long: [-(2 ** 53) + 1, 2 ** 53 - 1, -1, 0],
      unsigned_long: [2 ** 53 - 1, 0, 2 ** 32, 1], vtktypeint64: [-(2 ** 40), 2 ** 40, -1, 5],
      vtktypeuint64: [2 ** 52 + 3, 0, 2 ** 32 + 1, 9], float: [TRAP_FLOAT, -0.5, 3.25, 1e-30],
      double: [Math.PI, -1e300, 5e-324, 0.1],
    };
    for (const binary of [false, true]) {
      const s: LegacySpec = {
        binary, points: { type: 'float', xyz: [0, 0, 0, 1, 0, 0, 0, 1, 0, 1, 1, 0] },
        cells: [[0, 1, 3, 2]], cellTypes: [9],
        attributes: [{ section: 'POINT_DATA', count: 4, items: [{ kind: 'FIELD', name: 'FieldData', arrays: types.map((t) => ({ name: t, type: t, values: vals[t]! })) }] }],
      };
      const m = readVtkLegacy(encodeLegacy(s), 'types.vtk');
      for (const t of types) expect(Array.from(findArray(m.pointData, t)!.values)).toEqual(asStored(t, vals[t]!));
    }
  });

  it('reads a POLYDATA file of vertices and lines only as zero cells', () => {
    const s = spec({ binary: true, cells: [], attributes: [] }, 'float', true);
    const m = readVtkLegacy(encodeLegacy(s), 'lines.vtk');
    expect(m.nCells).toBe(0);
    expect(Array.from(m.cellOffsets)).toEqual([0]);
  });

  it('keeps the encoder honest: binary blocks are big-endian', () => {
    expect(Array.from(bigEndian('int', [1]))).toEqual([0, 0, 0, 1]);
    expect(Array.from(bigEndian('double', [1]))).toEqual([0x3f, 0xf0, 0, 0, 0, 0, 0, 0]);
  });
});
