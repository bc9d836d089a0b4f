/**
 * Less common legacy VTK content: string and bit arrays, NULL_ARRAY entries, id types,
 * PEDIGREE_IDS / TENSORS6 sections, METADATA right after a binary block, CRLF line ends with
 * a byte-order mark, %-encoded names and a varying z. Files are built here by hand.
 */
import { describe, expect, it } from 'vitest';
import { readVtkLegacy } from '../../../src/mesh/legacy/index.js';
import { findArray, TRIANGLE } from '../../../src/mesh/model.js';
import { bigEndian, concatBytes } from './encode.js';

const concat = concatBytes;

const TRI = { xyz: [0, 0, 0, 4, 0, 0, 0, 3, 0], nodes: [3, 0, 1, 2] };

describe('binary sections of known size', () => {
  // string lengths: 0b11xxxxxx is a one-byte length, 0b10xxxxxx xxxxxxxx a two-byte one (from memory)
  const long = 'a'.repeat(100);
  const file = concat([
    '# vtk DataFile Version 4.2\nsections\nBINARY\nDATASET UNSTRUCTURED_GRID\n',
    'FIELD FieldData 4\n',
    'names 1 2 string\n', [0xc0 | 7], 'harbour', [0x80, 100], long, '\n',
    'NULL_ARRAY\n',
    'TIME 1 1 double\n', bigEndian('double', [42.25]), '\n',
    'flags 1 10 bit\n', [0xff, 0xc0], '\n',
    'POINTS 3 float\n', bigEndian('float', TRI.xyz),
    'METADATA\nINFORMATION 0\n\n',
    'CELLS 1 4\n', bigEndian('int', TRI.nodes), '\n',
    'CELL_TYPES 1\n', bigEndian('int', [5]),
    'CELL_DATA 1\n',
    'PEDIGREE_IDS pid string\n', [0xc0 | 2], 'p1', '\n',
    'TENSORS6 t float\n', bigEndian('float', [1, 2, 3, 4, 5, 6]), '\n',
    'EDGE_FLAGS e unsigned_char\n', [1], '\n',
    'SCALARS level%20set vtkIdType\nLOOKUP_TABLE default\n', bigEndian('int', [77]), '\n',
    'SCALARS wet bit\nLOOKUP_TABLE default\n', [0x80],
  ]);

  it('skips string, bit and id sections and reads the arrays around them', () => {
    const m = readVtkLegacy(file, 'sections.vtk');
    expect(m.time).toBe(42.25);
    expect(Array.from(m.points)).toEqual([0, 0, 4, 0, 0, 3]);
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE]);
    expect(Array.from(findArray(m.cellData, 'level set')!.values)).toEqual([77]);
    expect(m.cellData.map((a) => a.name)).toEqual(['level set']);
    expect(m.warnings).toEqual(['SCALARS wet: bit values are not read']);
  });

  it('reports a string cut off at the end of the file at its byte', () => {
    const cut = concat([
      '# vtk DataFile Version 4.2\nsections\nBINARY\nDATASET POLYDATA\n', 'FIELD FieldData 1\n', 'names 1 1 string\n', [0xc0 | 9], 'harb',
    ]);
    const at = cut.length - 5;
    expect(() => readVtkLegacy(cut, 'cut.vtk')).toThrow(new RegExp(`cut\\.vtk: byte ${at}: FIELD array names: string 1 of 1 is cut off`));
  });
});

describe('ASCII details', () => {
  const text = [
    '# vtk DataFile Version 2.0', 'details', 'ASCII', 'DATASET UNSTRUCTURED_GRID',
    'FIELD FieldData 2', 'names 1 2 string', 'harbour%20north', 'basin', 'TimeValue 1 1 float', '0.5',
    'POINTS 3 double', '0 0 1 4 0 2.5 0 3 1',
    'CELLS 1 4 3 0 1 2', // values on the keyword line
    'CELL_TYPES 1', '5',
    'CELL_DATA 1', 'FIELD FieldData 2', 'NULL_ARRAY', 'wave%20speed 1 1 float', '2.5',
    'SCALARS flags bit', 'LOOKUP_TABLE default', '1',
  ].join('\r\n');

  it('reads CRLF lines after a byte-order mark, strings and bits skipped, names decoded', () => {
    const m = readVtkLegacy(concat([[0xef, 0xbb, 0xbf], text]), 'crlf.vtk');
    expect(m.time).toBe(0.5);
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2]);
    expect(Array.from(findArray(m.cellData, 'wave speed')!.values)).toEqual([2.5]);
    expect(m.warnings).toEqual([
      'SCALARS flags: bit values are not read',
      'z varies from 1 to 2.5; the mesh is read as its projection on the x-y plane',
    ]);
  });
});
