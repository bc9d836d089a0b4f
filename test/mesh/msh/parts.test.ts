/** The MSH reader's parts: element type table, tag map, data sections. */
import { describe, expect, it } from 'vitest';
import { findArray } from '../../../src/mesh/model.js';
import { MSH_DIM, MSH_VTK, mshNodeCount } from '../../../src/mesh/msh/elementTypes.js';
import { readMsh } from '../../../src/mesh/msh/index.js';
import { TagMap } from '../../../src/mesh/msh/tagmap.js';
import { encodeMsh, type MshDoc, type MshField } from './encode.js';
import { expectInputError } from './helpers.js';

describe('MSH element types', () => {
  it('knows the node counts of the Gmsh manual\'s element type list', () => {
    // Gmsh reference manual, "MSH file format", elm-type list: 1 2-node line, 2 3-node triangle,
    // 3 4-node quadrangle, 4 4-node tetrahedron, 5 8-node hexahedron, 6 6-node prism,
    // 7 5-node pyramid, 8 3-node line, 9 6-node triangle, 10 9-node quadrangle, 11 10-node
    // tetrahedron, 12 27-node hexahedron, 13 18-node prism, 14 14-node pyramid, 15 1-node point,
    // 16 8-node quadrangle, 17 20-node hexahedron, 18 15-node prism, 19 13-node pyramid,
    // 20 9-node triangle, 21 10-node triangle, 22 12-node triangle, 23 15-node triangle,
    // 24 15-node triangle, 25 21-node triangle, 26 4-node edge, 27 5-node edge, 28 6-node edge,
    // 29 20-node tetrahedron, 30 35-node tetrahedron, 31 56-node tetrahedron, 92 64-node
    // hexahedron, 93 125-node hexahedron
    const expected: Record<number, number> = {
      1: 2, 2: 3, 3: 4, 4: 4, 5: 8, 6: 6, 7: 5, 8: 3, 9: 6, 10: 9, 11: 10, 12: 27, 13: 18, 14: 14, 15: 1, 16: 8,
      17: 20, 18: 15, 19: 13, 20: 9, 21: 10, 22: 12, 23: 15, 24: 15, 25: 21, 26: 4, 27: 5, 28: 6, 29: 20, 30: 35,
      31: 56, 92: 64, 93: 125,
    };
    for (const [t, n] of Object.entries(expected)) expect(mshNodeCount(Number(t)), `type ${t}`).toBe(n);
    for (const t of [0, -1, 34, 35, 141, 1e9, 2.5]) expect(mshNodeCount(t)).toBe(0);
  });

  it('sorts types into dropped, surface and volume kinds with VTK ids of the same shape', () => {
    for (const t of [15, 1, 8, 26, 27, 28]) expect(MSH_DIM[t]).toBe(0);
    for (const t of [2, 9, 20, 21, 22, 23, 24, 25, 3, 10, 16, 36, 37]) expect(MSH_DIM[t]).toBe(2);
    expect([MSH_VTK[2], MSH_VTK[9], MSH_VTK[21], MSH_VTK[3], MSH_VTK[16], MSH_VTK[10], MSH_VTK[36]]).toEqual([5, 22, 69, 9, 23, 28, 70]);
    expect([MSH_VTK[4], MSH_VTK[11], MSH_VTK[5], MSH_VTK[17], MSH_VTK[6], MSH_VTK[7]]).toEqual([10, 10, 12, 12, 13, 14]);
    for (const t of [4, 5, 6, 7, 11, 12, 13, 14, 17, 18, 19, 29]) expect(MSH_DIM[t]).toBe(3);
  });
});

describe('TagMap', () => {
  const fail = (t: number) => new Error(`dup ${t}`);

  it('maps dense unordered tags and answers -1 for the rest', () => {
    const m = new TagMap(new Float64Array([5, 1, 3, 0]), 4, fail);
    expect([m.get(5), m.get(1), m.get(3), m.get(0)]).toEqual([0, 1, 2, 3]);
    for (const t of [2, 4, 6, -1, 1e12]) expect(m.get(t)).toBe(-1);
  });

  it('maps sparse tags beyond 2^32 through the hash table', () => {
    const tags = [2 ** 40 + 7, 3, 2 ** 33, 999_999_999_999, 2 ** 52 + 1];
    const m = new TagMap(new Float64Array(tags), tags.length, fail);
    tags.forEach((t, i) => expect(m.get(t)).toBe(i));
    for (const t of [2 ** 40, 4, 2 ** 33 + 1, 0]) expect(m.get(t)).toBe(-1);
  });

  it('reports the first duplicated tag in both modes', () => {
    expect(() => new TagMap(new Float64Array([1, 2, 1]), 3, fail)).toThrow('dup 1');
    expect(() => new TagMap(new Float64Array([2 ** 40, 5, 2 ** 40]), 3, fail)).toThrow(`dup ${2 ** 40}`);
  });
});

const square: MshDoc = {
  nodes: [
    { tag: 1, x: 0, y: 0, z: 0 }, { tag: 2, x: 1, y: 0, z: 0 }, { tag: 3, x: 1, y: 1, z: 0 }, { tag: 4, x: 0, y: 1, z: 0 },
  ],
  elements: [
    { tag: 10, type: 1, nodes: [1, 2] },
    { tag: 11, type: 2, nodes: [1, 2, 3] },
    { tag: 12, type: 2, nodes: [1, 3, 4] },
  ],
};

const field = (name: string, step: number, time: number, entries: [number, number][]): MshField =>
  ({ kind: 'node', name, step, time, components: 1, entries: entries.map(([tag, v]) => ({ tag, values: [v] })) });

describe('data sections', () => {
  it('merges blocks of one time step (partitions) and replaces older steps', () => {
    const fields = [
      field('depth', 0, 0, [[1, 9], [2, 9], [3, 9], [4, 9]]),
      field('depth', 1, 60, [[1, 1], [2, 2]]),
      field('depth', 1, 60, [[3, 3], [4, 4]]),
    ];
    for (const version of ['2.2', '4.1'] as const) {
      const m = readMsh(encodeMsh({ ...square, fields }, { version, binary: true }), 'parts.msh');
      expect(Array.from(findArray(m.pointData, 'depth')!.values)).toEqual([1, 2, 3, 4]);
      expect(m.time).toBe(60);
      expect(m.warnings).toEqual([]);
    }
  });

  it('rejects element data for an element that does not exist, and drops line data', () => {
    const rough = (tags: number[]): MshField => ({ kind: 'element', name: 'n', components: 1, entries: tags.map((tag) => ({ tag, values: [tag] })) });
    const m = readMsh(encodeMsh({ ...square, fields: [rough([10, 12, 11])] }, { version: '4.1', binary: false }), 'parts.msh');
    expect(Array.from(findArray(m.cellData, 'n')!.values)).toEqual([11, 12]);
    const partial = readMsh(encodeMsh({ ...square, fields: [rough([12])] }, { version: '2.2', binary: true }), 'parts.msh');
    expect(Array.from(findArray(partial.cellData, 'n')!.values)).toEqual([0, 12]);
    expect(partial.warnings).toEqual(['array "n" is given for 1 of the 2 triangles and quads; the others are set to 0']);
    expectInputError(() => readMsh(encodeMsh({ ...square, fields: [rough([11, 13])] }, { version: '4.1', binary: false }), 'parts.msh'),
      /"n" refers to element tag 13, which is not in \$Elements/, 'line');
  });

  it('warns when the file holds no triangles or quads', () => {
    const m = readMsh(encodeMsh({ ...square, elements: square.elements.slice(0, 1) }, { version: '4.1', binary: true }), 'parts.msh');
    expect(m.nCells).toBe(0);
    expect(m.nPoints).toBe(4);
    expect(m.warnings).toEqual(['$Elements holds no triangles or quads']);
  });

  it('bounds the values per point that data arrays may hold', () => {
    const wide: MshField = { kind: 'node', name: 'wide', components: 40, entries: [{ tag: 1, values: new Array<number>(40).fill(1) }] };
    const wide2 = { ...wide, name: 'wide2' };
    expectInputError(() => readMsh(encodeMsh({ ...square, fields: [wide, wide2] }, { version: '2.2', binary: true }), 'parts.msh'),
      /hold 80 values per node, more than the 64/, 'byte');
  });
});
