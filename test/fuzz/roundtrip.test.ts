/**
 * Random valid meshes, written in every format and encoding we read, come back identical
 * through readMesh: points and field values bit for bit, cells in file order, float32 arrays
 * kept as float32 where the format stores them.
 */
import fc from 'fast-check';
import { afterAll, describe, it } from 'vitest';
import { runs } from './outcome.js';
import { expectSameMesh, fuzzMesh, legacyFiles, mshFiles, readEncoded, triangleFiles, vtuFiles, type Encoded } from './meshes.js';

let cases = 0;
afterAll(() => console.log(`fuzz/roundtrip: ${cases} files read back`));

function roundTrip(files: Encoded[]): void {
  for (const f of files) {
    expectSameMesh(readEncoded(f.files, f.entry), f.expected, f.label);
    cases++;
  }
}

describe('random meshes read back identical', () => {
  it('VTU: every encoding, compression, header type, byte order and id type (50 files per mesh)', () => {
    fc.assert(fc.property(fuzzMesh, fc.constantFrom(7, 16, 64, 32768), (m, blockSize) => roundTrip(vtuFiles(m, blockSize))), runs(20, 71));
  });

  it('legacy VTK: ASCII and binary, 4.2 and 5.1 layouts, grid and polydata', () => {
    fc.assert(fc.property(fuzzMesh, fc.integer({ min: 1, max: 9 }), (m, perLine) => roundTrip(legacyFiles(m, perLine))), runs(60, 72));
  });

  it('MSH: 2.2 and 4.1, ASCII and binary, both byte orders, sparse shuffled tags', () => {
    fc.assert(fc.property(fuzzMesh, fc.constantFrom(1, 7, 1000003), (m, stride) => roundTrip(mshFiles(m, stride))), runs(60, 73));
  });

  it('Triangle: numbered from 0 or 1, with and without comments', () => {
    fc.assert(fc.property(fuzzMesh, fc.boolean(), (m, markers) => roundTrip(triangleFiles(m, markers))), runs(60, 74));
  });
});
