// Files larger than one buffer: the in-place VTU path is exercised on small files by lowering
// the buffer limit, and must give exactly what reading the whole file gives.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { readMeshFile } from '../../src/cli/large-vtu.js';
import { writeVtu, type VtuWriteOptions } from '../../src/io/vtu.js';
import { MeshInputError } from '../../src/mesh/errors.js';
import type { Mesh } from '../../src/mesh/model.js';
import { readMesh } from '../../src/mesh/read.js';
import { gridMesh, rng } from '../helpers/meshes.js';
import { inputError } from '../helpers/errors.js';

let dir = '';

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-large-'));
});

afterAll(() => {
  fs.rmSync(dir, { recursive: true, force: true });
});

/** A 30 × 20 grid of triangles with jittered nodes, a point velocity and a float32 cell array. */
function sample(): Mesh {
  const m = gridMesh(30, 20, 2, true, 5e5, 4e6);
  const next = rng(11);
  for (let i = 0; i < m.points.length; i++) m.points[i] = m.points[i]! + (next() - 0.5) * 0.3;
  const vel = new Float64Array(m.nPoints * 3).map(() => next() - 0.5);
  const rough = new Float32Array(m.nCells).map(() => next());
  return { ...m, pointData: [{ name: 'velocity', components: 3, values: vel }], cellData: [{ name: 'roughness', components: 1, values: rough }] };
}

function write(name: string, bytes: Uint8Array | string): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, bytes);
  return file;
}

function same(a: Mesh, b: Mesh): void {
  expect(b.nCells).toBe(a.nCells);
  expect(b.points).toEqual(a.points);
  expect(b.cellNodes).toEqual(a.cellNodes);
  expect(b.cellOffsets).toEqual(a.cellOffsets);
  expect(b.cellTypes).toEqual(a.cellTypes);
  expect(b.pointData).toEqual(a.pointData);
  expect(b.cellData).toEqual(a.cellData);
  expect(b.format).toBe(a.format);
  expect(b.warnings).toEqual(a.warnings);
}

const failure = inputError;

describe('files over the buffer limit', () => {
  const variants: [string, VtuWriteOptions][] = [
    ['raw', { encoding: 'appended-raw' }],
    ['raw, 64-bit ids and headers', { encoding: 'appended-raw', intType: 'Int64', headerType: 'UInt64' }],
    ['raw, big-endian', { encoding: 'appended-raw', byteOrder: 'BigEndian' }],
    ['raw, zlib', { encoding: 'appended-raw', compress: true, blockSize: 1000 }],
  ];
  for (const [what, options] of variants) {
    it(`reads an appended VTU array by array (${what}), as the whole-file reader does`, () => {
      const bytes = writeVtu(sample(), { time: 12.5 }, options);
      const file = write(`v-${what.replace(/\W+/g, '-')}.vtu`, bytes);
      const whole = readMesh(bytes, file);
      const inPlace = readMeshFile(file, { bufferLimit: 1000 });
      same(whole, inPlace);
      expect(inPlace.time).toBe(12.5);
      expect(readMeshFile(file)).toEqual(whole);
    });
  }

  it('reads raw appended arrays in place whatever the size, each in its own aligned buffer', () => {
    const bytes = writeVtu(sample(), {}, { encoding: 'appended-raw' });
    const file = write('aligned.vtu', bytes);
    const m = readMeshFile(file);
    const velocity = m.pointData[0]!.values;
    expect(velocity.byteOffset % 8).toBe(0);
    expect(velocity.buffer.byteLength).toBeLessThan(bytes.length); // not a view into the whole file
    same(readMesh(bytes, file), m);
  });

  it('64-bit ids read in place keep their narrowed arrays (no copy) and still check every node', () => {
    const m = sample();
    const file = write('ids64.vtu', writeVtu(m, {}, { encoding: 'appended-raw', intType: 'Int64' }));
    const back = readMeshFile(file);
    same(readMesh(new Uint8Array(fs.readFileSync(file)), file), back);
    const bad = { ...m, cellNodes: m.cellNodes.slice() };
    bad.cellNodes[3 * 7 + 1] = m.nPoints; // cell 7 names a node past the last one
    const badFile = write('ids64-bad.vtu', writeVtu(bad, {}, { encoding: 'appended-raw', intType: 'Int64' }));
    expect(() => readMeshFile(badFile)).toThrow(MeshInputError);
    expect(() => readMeshFile(badFile)).toThrow(new RegExp(`cell 7 uses node ${m.nPoints}, outside 0\\.\\.${m.nPoints - 1}`));
  });

  it('refuses other formats over the limit, naming the size', () => {
    const vtk = '# vtk DataFile Version 4.2\nx\nASCII\nDATASET UNSTRUCTURED_GRID\nPOINTS 3 double\n0 0 0 1 0 0 0 1 0\nCELLS 1 4\n3 0 1 2\nCELL_TYPES 1\n5\n';
    const file = write('small.vtk', vtk);
    const e = failure(() => readMeshFile(file, { bufferLimit: 50 }));
    expect(e.detail).toBe(`file of ${vtk.length} bytes is larger than one buffer can hold (50 bytes); only VTK XML files with raw appended data are read in parts`);
    expect(e.location.file).toBe(file);
    expect(readMeshFile(file).nCells).toBe(1);
  });

  it('refuses appended base64 and inline data over the limit', () => {
    const bytes = writeVtu(sample(), {}, { encoding: 'appended-base64' });
    const b64 = write('b64.vtu', bytes);
    expect(failure(() => readMeshFile(b64, { bufferLimit: 1000 })).detail).toMatch(new RegExp(`^file of ${bytes.length} bytes is larger than one buffer can hold`));
    expect(readMeshFile(b64)).toEqual(readMesh(bytes, b64));
    const inline = write('inline.vtu', writeVtu(sample(), {}, { encoding: 'base64' }));
    expect(failure(() => readMeshFile(inline, { bufferLimit: 1000 })).detail).toMatch(/larger than one buffer can hold/);
  });

  it('a truncated file is a located error, not a crash', () => {
    const bytes = writeVtu(sample(), {}, { encoding: 'appended-raw' });
    const file = write('cut.vtu', bytes.subarray(0, bytes.length - 2000));
    const e = failure(() => readMeshFile(file, { bufferLimit: 1000 }));
    expect(e.location.file).toBe(file);
    expect(e.location.byteOffset).toBeGreaterThan(0);
    expect(e.detail).toMatch(/remain/);
  });

  it('a lying size header fails before allocating', () => {
    const bytes = writeVtu(sample(), {}, { encoding: 'appended-raw', headerType: 'UInt64' });
    const text = new TextDecoder('latin1').decode(bytes.subarray(0, 4000));
    const at = text.indexOf('_', text.indexOf('<AppendedData')) + 1; // the first array's 8-byte size header
    const lying = bytes.slice();
    new DataView(lying.buffer).setUint32(at + 4, 0x100000, true); // 2^52 bytes
    const file = write('lying.vtu', lying);
    expect(failure(() => readMeshFile(file, { bufferLimit: 1000 })).detail).toMatch(/claims \d+ bytes but at most \d+ remain/);
  });

  it('names every file it reads: a .pvtu and its pieces', () => {
    const piece = writeVtu(sample(), {}, { encoding: 'appended-raw' });
    write('p0.vtu', piece);
    write('p1.vtu', piece);
    const index = write('both.pvtu', '<VTKFile type="PUnstructuredGrid"><PUnstructuredGrid><Piece Source="p0.vtu"/><Piece Source="p1.vtu"/></PUnstructuredGrid></VTKFile>');
    const seen: string[] = [];
    const m = readMeshFile(index, { onFile: (f) => seen.push(f) });
    expect(m.nCells).toBe(2 * sample().nCells);
    expect(seen).toEqual([index, path.join(dir, 'p0.vtu'), path.join(dir, 'p1.vtu')]);
  });

  it('a missing file and a folder are usage errors', () => {
    expect(() => readMeshFile(path.join(dir, 'nope.vtu'))).toThrow(/no such file/);
    expect(() => readMeshFile(dir)).toThrow(/is a folder/);
  });
});
