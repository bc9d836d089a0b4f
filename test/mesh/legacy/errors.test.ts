/**
 * Bad legacy VTK input: every case must end in a MeshInputError that names the file and a
 * line (ASCII) or byte offset (binary) and says what is wrong. Never a TypeError, RangeError,
 * hang or huge allocation.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MeshInputError } from '../../../src/mesh/errors.js';
import { readVtkLegacy } from '../../../src/mesh/legacy/index.js';
import { encodeLegacy, indexOfText, replaceText, type LegacySpec } from './encode.js';
import { inputError } from '../../helpers/errors.js';

const enc = new TextEncoder();

function failure(bytes: Uint8Array, file: string): MeshInputError {
  return inputError(() => readVtkLegacy(bytes, file));
}

/** The error for ASCII `text`, with its detail matching `detail` at 1-based `line`. */
function asciiError(text: string, detail: RegExp, line: number): MeshInputError {
  const e = failure(enc.encode(text), 'bad.vtk');
  expect(e.detail).toMatch(detail);
  expect(e.location.line).toBe(line);
  expect(e.message).toContain(`bad.vtk: line ${line}: `);
  return e;
}

function binaryError(bytes: Uint8Array, detail: RegExp, byte: number): MeshInputError {
  const e = failure(bytes, 'bad-bin.vtk');
  expect(e.detail).toMatch(detail);
  expect(e.location.byteOffset).toBe(byte);
  expect(e.message).toContain(`bad-bin.vtk: byte ${byte}: `);
  return e;
}

/**
 * Read every prefix of `full`. Where `mustFail(cut)` the read must end in a located error
 * (a byte offset where `binary(cut)`, else a line); any prefix that does read must give the
 * same geometry as the whole file (a cut at a section boundary leaves a valid file).
 */
function checkCuts(full: Uint8Array, mustFail: (cut: number) => boolean, binary: (cut: number) => boolean): void {
  const whole = readVtkLegacy(full, 'whole.vtk');
  for (let cut = 0; cut < full.length; cut++) {
    let mesh = null;
    let err: unknown = null;
    try {
      mesh = readVtkLegacy(full.subarray(0, cut), 'cut.vtk');
    } catch (e) {
      err = e;
    }
    if (mesh) {
      expect(mustFail(cut), `cut at ${cut} was read`).toBe(false);
      expect(Array.from(mesh.points)).toEqual(Array.from(whole.points));
      expect(Array.from(mesh.cellNodes)).toEqual(Array.from(whole.cellNodes));
      continue;
    }
    expect(err, `cut at ${cut}`).toBeInstanceOf(MeshInputError);
    const where = binary(cut) ? 'byte' : 'line';
    expect((err as MeshInputError).message, `cut at ${cut}`).toMatch(new RegExp(`^cut\\.vtk: ${where} \\d+: `));
  }
}

// cell types 5 (triangle) and 10 (tetrahedron): Kitware, "VTK File Formats" (The VTK User's Guide)
// line numbers:    1                             2             3        4
const HEAD = ['# vtk DataFile Version 4.2', 'bad inputs', 'ASCII', 'DATASET UNSTRUCTURED_GRID'];
const GRID = [
  ...HEAD,
  'POINTS 4 double', //      5
  '0 0 0 1 0 0', //          6
  '1 1 0 0 1 0', //          7
  'CELLS 2 8', //            8
  '3 0 1 2', //              9
  '3 0 2 3', //             10
  'CELL_TYPES 2', //        11
  '5', //                   12
  '5', //                   13
  'POINT_DATA 4', //        14
  'SCALARS h double', //    15
  'LOOKUP_TABLE default', // 16
  '1 2 3 4', //             17
].join('\n') + '\n';

/** GRID with line `n` (1-based) replaced. */
function withLine(n: number, text: string, base = GRID): string {
  const lines = base.split('\n');
  lines[n - 1] = text;
  return lines.join('\n');
}

const GRID51 = [
  ...HEAD.slice(0, 3).map((l, i) => (i === 0 ? '# vtk DataFile Version 5.1' : l)), 'DATASET UNSTRUCTURED_GRID',
  'POINTS 4 double', //          5
  '0 0 0 1 0 0 1 1 0 0 1 0', //  6
  'CELLS 3 6', //                7
  'OFFSETS vtktypeint64', //     8
  '0 3 6', //                    9
  'CONNECTIVITY vtktypeint64', // 10
  '0 1 2 0 2 3', //             11
  'CELL_TYPES 2', //            12
  '5 5', //                     13
].join('\n') + '\n';

describe('ASCII bad input', () => {
  it('reads the base files (so each case below fails for its own reason)', () => {
    expect(readVtkLegacy(enc.encode(GRID), 'ok.vtk').nCells).toBe(2);
    expect(readVtkLegacy(enc.encode(GRID51), 'ok.vtk').nCells).toBe(2);
  });

  it('fails at once on a header count of 2^40 points, before allocating', () => {
    const t = performance.now();
    asciiError(withLine(5, 'POINTS 1099511627776 float'), /POINTS: 3298534883328 float values need at least/, 5);
    expect(performance.now() - t).toBeLessThan(500);
  });

  it('rejects a CELLS size larger than the cells hold', () => {
    asciiError(withLine(8, 'CELLS 2 9'), /CELLS: value 9 of 9: expected an integer.*found "CELL_TYPES"/, 11);
  });

  it('rejects a CELLS size smaller than the cells need', () => {
    asciiError(withLine(8, 'CELLS 2 7'), /CELLS: cell 1 has a node count of 3, more than the declared size 7 leaves/, 10);
  });

  it('rejects per-cell counts that do not add up to the size', () => {
    asciiError(withLine(10, '2 0 2 3'), /CELLS: size 8 does not match its 2 cells, which hold 7 values/, 8);
  });

  it('rejects a node index out of range, at the line of the cell', () => {
    asciiError(withLine(10, '3 0 2 4'), /cell 1 uses node 4, outside 0\.\.3/, 10);
    asciiError(withLine(10, '3 0 -1 2'), /cell 1 uses node -1/, 10);
  });

  it('names an unknown cell type id at its CELL_TYPES line', () => {
    asciiError(withLine(13, '99'), /unknown cell type id 99 \(cell 1\)/, 13);
  });

  it('rejects 3-D cells', () => {
    const tet = withLine(10, '3 0 2 3').replace('CELLS 2 8\n3 0 1 2', 'CELLS 2 9\n4 0 1 2 3').replace('CELL_TYPES 2\n5', 'CELL_TYPES 2\n10');
    asciiError(tet, /2-D meshes only: found 1 tetrahedra/, 8);
  });

  it('rejects NaN and infinite coordinates at their line', () => {
    asciiError(withLine(7, '1 nan 0 0 1 0'), /point 2 has a non-finite coordinate \(NaN\)/, 7);
    asciiError(withLine(6, '0 0 0 -inf 0 0'), /point 1 has a non-finite coordinate \(-Infinity\)/, 6);
  });

  it('rejects a POINT_DATA count different from the number of points', () => {
    asciiError(withLine(14, 'POINT_DATA 5'), /POINT_DATA declares 5 values but the file has 4 points/, 14);
  });

  it('rejects a CELL_DATA count different from the number of cells', () => {
    asciiError(GRID + 'CELL_DATA 3\nSCALARS c double\n1 2 3\n', /CELL_DATA declares 3 values but the file has 2 cells/, 18);
  });

  it('rejects CELL_TYPES and CELLS of different lengths', () => {
    asciiError(withLine(11, 'CELL_TYPES 1').replace('\n5\n5\n', '\n5\n'), /CELL_TYPES lists 1 cells but CELLS holds 2/, 11);
  });

  it('rejects a value that is not a number, naming the section', () => {
    asciiError(withLine(17, '1 2 x 4'), /SCALARS h: value 3 of 4: expected a number, found "x"/, 17);
  });

  it('names an unknown section whose size cannot be known', () => {
    asciiError(GRID + 'BATHYMETRY 4 float\n1 2 3 4\n', /unknown section "BATHYMETRY"/, 18);
  });

  it('rejects an unknown value type', () => {
    asciiError(withLine(5, 'POINTS 4 quadruple'), /POINTS: unknown value type "quadruple"/, 5);
  });

  it('rejects a missing or bad count on a keyword line', () => {
    asciiError(withLine(8, 'CELLS 2'), /CELLS: missing the size/, 8);
    asciiError(withLine(8, 'CELLS -2 8'), /the number of cells must be a non-negative integer, found "-2"/, 8);
  });

  it('rejects other datasets, a bad mode line and a file that is not legacy VTK', () => {
    asciiError(withLine(4, 'DATASET STRUCTURED_POINTS'), /DATASET STRUCTURED_POINTS is not supported/, 4);
    asciiError(withLine(3, 'TEXT'), /expected ASCII or BINARY/, 3);
    asciiError(withLine(1, '# vtk file'), /not a legacy VTK file/, 1);
    asciiError('', /not a legacy VTK file/, 1);
  });

  it('rejects a file without points or cells', () => {
    asciiError(HEAD.join('\n') + '\n', /no POINTS section/, 5);
    asciiError(GRID.split('\n').slice(0, 7).join('\n') + '\n', /no CELLS section/, 8);
  });

  it('rejects SCALARS outside POINT_DATA / CELL_DATA', () => {
    asciiError(withLine(14, ''), /SCALARS comes before any POINT_DATA or CELL_DATA line/, 15);
  });

  it('rejects triangle strips with a message that says so', () => {
    const poly = [...HEAD.slice(0, 3), 'DATASET POLYDATA', 'POINTS 4 float', '0 0 0 1 0 0 1 1 0 0 1 0',
      'TRIANGLE_STRIPS 1 5', '4 0 1 3 2'].join('\n');
    asciiError(poly, /TRIANGLE_STRIPS are not supported \(1 strips\)/, 7);
    asciiError(poly.replace('TRIANGLE_STRIPS', 'CELLS'), /CELLS is not a section of DATASET POLYDATA/, 7);
  });

  it('rejects FIELD arrays whose tuple count differs from POINT_DATA', () => {
    asciiError(withLine(15, 'FIELD FieldData 1\nu 1 3 double').replace('LOOKUP_TABLE default\n1 2 3 4', '1 2 3'),
      /FIELD array u has 3 tuples but POINT_DATA declares 4/, 16);
  });

  it('checks 5.1 offsets: start at 0, never decrease, end at the connectivity size', () => {
    asciiError(withLine(9, '1 3 6', GRID51), /OFFSETS must start at 0, found 1/, 9);
    asciiError(withLine(9, '0\n7 6', GRID51), /OFFSETS decrease at entry 2: 6 after 7/, 10);
    asciiError(withLine(9, '0 3 5', GRID51), /the last offset 5 differs from the CELLS connectivity size 6/, 9);
    asciiError(withLine(10, 'CONNECT vtktypeint64', GRID51), /expected CONNECTIVITY after OFFSETS, found "CONNECT"/, 10);
    asciiError(withLine(11, '0 1 2 0 2 9', GRID51), /cell 1 uses node 9/, 11);
  });

  it('fails with a located error wherever the file is cut inside a section', () => {
    const full = enc.encode(GRID51 + 'POINT_DATA 4\nVECTORS v float\n1 2 3 4 5 6 7 8 9 10 11 12\n');
    const geometryEnd = indexOfText(full, '\nPOINT_DATA');
    const vectors = indexOfText(full, 'VECTORS');
    // the last value may be cut to a shorter number; up to here at least one is missing
    const valuesEnd = indexOfText(full, '1 2 3 4 5 6 7 8 9 10 11 12') + '1 2 3 4 5 6 7 8 9 10 11 1'.length;
    checkCuts(full, (cut) => cut < geometryEnd || (cut > vectors && cut < valuesEnd), () => false);
  });
});

const BIN: LegacySpec = {
  binary: true,
  points: { type: 'float', xyz: [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0] },
  cells: [[0, 1, 2], [0, 2, 3]],
  cellTypes: [5, 5],
  attributes: [{ section: 'POINT_DATA', count: 4, items: [{ kind: 'SCALARS', name: 'h', type: 'double', values: [1, 2, 3, 4] }] }],
};

/** Byte offset just past the keyword line `line` (where its binary block starts). */
function after(bytes: Uint8Array, line: string): number {
  const i = indexOfText(bytes, line + '\n');
  expect(i).toBeGreaterThan(0);
  return i + line.length + 1;
}

describe('binary bad input', () => {
  const ok = encodeLegacy(BIN);

  it('reads the base file', () => {
    expect(readVtkLegacy(ok, 'ok.vtk').nCells).toBe(2);
  });

  it('fails at once on a header count of 2^40 points, at the byte where the data starts', () => {
    const bad = replaceText(ok, 'POINTS 4 float', 'POINTS 1099511627776 float');
    binaryError(bad, /POINTS: 3298534883328 float values need 13194139533312 bytes but only \d+ remain/, after(bad, 'POINTS 1099511627776 float'));
  });

  it('rejects a CELLS size that runs past the end of the file', () => {
    const bad = replaceText(ok, 'CELLS 2 8', 'CELLS 2 800');
    binaryError(bad, /CELLS: 800 int values need 3200 bytes/, after(bad, 'CELLS 2 800'));
  });

  it('rejects a CELLS size that disagrees with the per-cell counts', () => {
    // 7 values are read: 3 0 1 2 3 0 2, and cell 1 claims 3 nodes where 2 values remain
    const bad = replaceText(ok, 'CELLS 2 8', 'CELLS 2 7');
    binaryError(bad, /cell 1 has a node count of 3, more than the declared size 7 leaves/, after(bad, 'CELLS 2 7') + 16);
  });

  it('locates a node index out of range at its cell in the CELLS block', () => {
    const bad = encodeLegacy({ ...BIN, cells: [[0, 1, 2], [0, 2, 4]] });
    binaryError(bad, /cell 1 uses node 4, outside 0\.\.3/, after(bad, 'CELLS 2 8') + 16);
  });

  it('names an unknown cell type at its CELL_TYPES entry', () => {
    const bad = encodeLegacy({ ...BIN, cellTypes: [5, 77777] });
    binaryError(bad, /unknown cell type id 77777 \(cell 1\)/, after(bad, 'CELL_TYPES 2') + 4);
  });

  it('rejects an infinite coordinate at its bytes', () => {
    const bad = encodeLegacy({ ...BIN, points: { type: 'float', xyz: [0, 0, 0, 1, 0, 0, 1, Infinity, 0, 0, 1, 0] } });
    binaryError(bad, /point 2 has a non-finite coordinate \(Infinity\)/, after(bad, 'POINTS 4 float') + 7 * 4);
  });

  it('rejects a POINT_DATA count different from the number of points', () => {
    const bad = replaceText(ok, 'POINT_DATA 4', 'POINT_DATA 3');
    binaryError(bad, /POINT_DATA declares 3 values but the file has 4 points/, indexOfText(bad, 'POINT_DATA 3'));
  });

  it('checks 5.1 offsets and 64-bit values that do not fit 32 bits', () => {
    const v51: LegacySpec = { ...BIN, version: '5.1' };
    const good = encodeLegacy(v51);
    expect(readVtkLegacy(good, 'ok.vtk').nCells).toBe(2);
    // offsets 0 3 6 as int64: overwrite the middle one with 7 (decreasing after it)
    const offAt = after(good, 'OFFSETS vtktypeint64');
    const bad = good.slice();
    bad[offAt + 15] = 7;
    binaryError(bad, /OFFSETS decrease at entry 2: 6 after 7/, offAt + 16);
    const huge = good.slice();
    huge[offAt + 11] = 1; // 2^32 + 3
    binaryError(huge, /OFFSETS: value 4294967299 is not a 32-bit integer/, offAt + 8);
  });

  it('fails with a located error wherever the file is cut inside a section', () => {
    for (const spec of [BIN, { ...BIN, version: '5.1', newlineAfterBinary: false }]) {
      const full = encodeLegacy(spec);
      const modeEnd = indexOfText(full, 'BINARY') + 'BINARY'.length;
      const geometryEnd = indexOfText(full, 'POINT_DATA') - (spec.newlineAfterBinary === false ? 0 : 1);
      const scalars = indexOfText(full, 'SCALARS');
      const complete = spec.newlineAfterBinary === false ? full.length : full.length - 1;
      checkCuts(full, (cut) => cut < geometryEnd || (cut > scalars && cut < complete), (cut) => cut >= modeEnd);
    }
  });
});

describe('mutated files', () => {
  const seeds = [
    encodeLegacy(BIN),
    encodeLegacy({ ...BIN, version: '5.1' }),
    enc.encode(GRID),
    enc.encode(GRID51),
  ];

  it('end in a mesh or a MeshInputError, never another exception', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: seeds.length - 1 }),
        fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 4 }),
        (which, edits) => {
          const bytes = seeds[which]!.slice();
          for (const [at, v] of edits) bytes[at % bytes.length] = v;
          try {
            readVtkLegacy(bytes, 'fuzz.vtk');
          } catch (e) {
            if (!(e instanceof MeshInputError)) throw e;
            expect(e.message).toMatch(/^fuzz\.vtk: (line|byte) \d+: /);
          }
        },
      ),
      { numRuns: 400, seed: 20240611 },
    );
  });
});
