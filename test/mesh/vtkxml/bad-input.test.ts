// Broken and lying VTK XML input: every failure must be a MeshInputError that names the file and
// a line or byte offset. Files are the hand-written fixtures, edited, or writer output, edited.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { writeVtu, type VtuEncoding } from '../../../src/io/vtu.js';
import { MeshInputError } from '../../../src/mesh/errors.js';
import { QUAD, TRIANGLE, type Mesh } from '../../../src/mesh/model.js';
import { readVtkXml } from '../../../src/mesh/vtkxml/index.js';
import { inputError } from '../../helpers/errors.js';

const latin1 = new TextDecoder('latin1');

function fixtureText(name: string): string {
  return readFileSync(fileURLToPath(new URL(`../../fixtures/vtkxml/${name}`, import.meta.url)), 'latin1');
}

function bytesOf(text: string): Uint8Array {
  const b = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) b[i] = text.charCodeAt(i);
  return b;
}

/** A fixture with `from` replaced by `to` (which must occur). */
function edited(name: string, from: string, to: string): Uint8Array {
  const t = fixtureText(name);
  expect(t.includes(from), `${name} contains ${from}`).toBe(true);
  return bytesOf(t.replace(from, to));
}

const LOCATED = /^bad\.vtu: (line \d+|byte \d+): \S/;

/** Reads `bytes` as bad.vtu and returns the MeshInputError it must throw. */
function failure(bytes: Uint8Array): MeshInputError {
  const e = inputError(() => readVtkXml(bytes, 'bad.vtu'));
  expect(e.message).toMatch(LOCATED);
  return e;
}

function smallMesh(): Mesh {
  return {
    points: Float64Array.of(0, 0, 1, 0, 1, 1, 0, 1, 2, 0),
    nPoints: 5,
    cellOffsets: Int32Array.of(0, 4, 7),
    cellNodes: Int32Array.of(0, 1, 2, 3, 1, 4, 2),
    cellTypes: Uint8Array.of(QUAD, TRIANGLE),
    nCells: 2,
    pointData: [{ name: 'eta', components: 1, values: Float64Array.of(0.5, 0.25, 0, -0.25, 1) }],
    cellData: [],
    format: 'test',
    warnings: [],
  };
}

/** Byte offset of the appended data (after '_') and of the named array inside it. */
function appendedAt(bytes: Uint8Array, name: string): number {
  const head = latin1.decode(bytes.subarray(0, 4000));
  const start = head.indexOf('_', head.indexOf('<AppendedData')) + 1;
  const m = new RegExp(`Name="${name}"[^>]*offset="(\\d+)"`).exec(head);
  expect(m, name).not.toBeNull();
  return start + Number(m![1]);
}

function putU32(bytes: Uint8Array, at: number, v: number): Uint8Array {
  const out = bytes.slice();
  new DataView(out.buffer).setUint32(at, v, true);
  return out;
}

describe('truncated files', () => {
  it('an empty file', () => {
    const e = failure(new Uint8Array(0));
    expect(e.detail).toMatch(/empty/);
  });

  const variants: Array<[VtuEncoding, boolean]> = [
    ['ascii', false], ['base64', false], ['base64', true], ['appended-raw', false],
    ['appended-raw', true], ['appended-base64', false], ['appended-base64', true],
  ];
  it.each(variants)('cut at every byte: %s compress=%s', (encoding, compress) => {
    const full = writeVtu(smallMesh(), { time: 2 }, { encoding, compress, blockSize: 16 });
    const text = latin1.decode(full);
    const dataEnd = encoding.startsWith('appended') ? text.lastIndexOf('</AppendedData>') - 3 : text.lastIndexOf('</VTKFile>') + 10;
    let failures = 0;
    for (let cut = 0; cut < full.length; cut++) {
      const part = full.subarray(0, cut);
      try {
        const m = readVtkXml(part, 'bad.vtu');
        // appended data is complete before the closing tags: those may go missing harmlessly
        expect(cut, `read succeeded at cut ${cut}`).toBeGreaterThanOrEqual(dataEnd);
        expect(Array.from(m.cellNodes)).toEqual([0, 1, 2, 3, 1, 4, 2]);
      } catch (e) {
        if (!(e instanceof MeshInputError)) throw new Error(`cut ${cut}: ${String(e)}`);
        expect(e.message, `cut ${cut}`).toMatch(cut === 0 ? /^bad\.vtu: byte 0: / : LOCATED);
        failures++;
      }
    }
    expect(failures).toBeGreaterThan(full.length / 2);
  });

  it('mid-header, mid-array, mid-base64, mid-compressed-block give located messages', () => {
    const raw = writeVtu(smallMesh(), {}, { encoding: 'appended-raw' });
    const head = latin1.decode(raw).indexOf('<Piece');
    expect(failure(raw.subarray(0, head + 10)).detail).toMatch(/end of file inside an XML tag/);
    const pts = appendedAt(raw, 'Points');
    expect(failure(raw.subarray(0, pts + 20)).detail).toMatch(/"Points" claims 120 bytes but at most 16 remain/);

    const b64 = writeVtu(smallMesh(), {}, { encoding: 'appended-base64' });
    const e = failure(b64.subarray(0, appendedAt(b64, 'Points') + 30));
    expect(e.detail).toMatch(/Points/);

    const zip = writeVtu(smallMesh(), {}, { encoding: 'appended-raw', compress: true });
    const z = appendedAt(zip, 'Points');
    // block table of one block: 4 header integers, then the zlib stream
    expect(failure(zip.subarray(0, z + 16 + 5)).detail).toMatch(/compressed blocks of "Points" need \d+ bytes/);
  });
});

describe('lying sizes', () => {
  it('a NumberOfPoints of 2^40 fails at once in every encoding', () => {
    const lies = [
      edited('two-pieces.vtu', 'NumberOfPoints="4" NumberOfCells="1"', 'NumberOfPoints="1099511627776" NumberOfCells="1"'),
      edited('inline-uint64.vtu', 'NumberOfPoints="4"', 'NumberOfPoints="1099511627776"'),
      edited('appended-raw-f32.vtu', 'NumberOfPoints="5"', 'NumberOfPoints="1099511627776"'),
      edited('zlib-separate-header.vtu', 'NumberOfPoints="4"', 'NumberOfPoints="1099511627776"'),
    ];
    for (const bytes of lies) {
      const t0 = performance.now();
      const e = failure(bytes);
      expect(performance.now() - t0).toBeLessThan(200);
      expect(e.detail).toMatch(/Points|values/);
    }
  });

  it('a NumberOfCells larger than the cell arrays', () => {
    expect(failure(edited('tetra.vtu', 'NumberOfCells="1"', 'NumberOfCells="1000000000"')).detail).toMatch(/"offsets" should hold 1000000000 or 1000000001 values but its text is only 1 bytes/);
    expect(failure(edited('mixed-lines.vtu', 'NumberOfCells="4"', 'NumberOfCells="2"')).detail).toMatch(/"offsets" holds 4 values, 2 or 3 expected/);
  });

  it('an array size header larger than the file', () => {
    const raw = writeVtu(smallMesh(), {}, { encoding: 'appended-raw' });
    const e = failure(putU32(raw, appendedAt(raw, 'connectivity'), 0x7ffffff0));
    expect(e.detail).toMatch(/"connectivity" claims 2147483632 bytes/);
    expect(e.location.byteOffset).toBe(appendedAt(raw, 'connectivity'));
  });

  it('a block table pointing past the end, a block that does not inflate, a wrong inflated size', () => {
    const zip = writeVtu(smallMesh(), {}, { encoding: 'appended-raw', compress: true });
    const z = appendedAt(zip, 'Points');
    // table: [nblocks, blocksize, lastblocksize, size0]
    expect(failure(putU32(zip, z + 12, 1e6)).detail).toMatch(/need 1000000 bytes/);
    expect(failure(putU32(zip, z, 1e6)).detail).toMatch(/claims 1000000 compressed blocks/);
    const corrupt = zip.slice();
    corrupt[z + 16] = 0xff; // zlib header byte
    expect(failure(corrupt).detail).toMatch(/block 1 of 1 of "Points" does not inflate/);
    expect(failure(putU32(zip, z + 8, 112)).detail).toMatch(/inflates to more than 112 bytes, 112 expected|holds 14 values, 15 expected/);
    const shortBlock = putU32(putU32(zip, z + 4, 128), z + 8, 128);
    expect(failure(shortBlock).detail).toMatch(/holds 16 values, 15 expected/);
  });

  it('zlib claims beyond any possible inflation are refused before allocating', () => {
    const zip = writeVtu(smallMesh(), {}, { encoding: 'appended-raw', compress: true });
    const z = appendedAt(zip, 'Points');
    const e = failure(putU32(putU32(zip, z + 4, 0x7fffffff), z + 8, 0));
    expect(e.detail).toMatch(/more than zlib can expand/);
  });

  it('a missing _ marker and an offset beyond the appended data', () => {
    const raw = writeVtu(smallMesh(), {}, { encoding: 'appended-raw' });
    const text = latin1.decode(raw);
    const i = text.indexOf('_', text.indexOf('<AppendedData'));
    const noMarker = raw.slice();
    noMarker[i] = 0x20;
    expect(failure(noMarker).detail).toMatch(/'_' marker/);
    const far = bytesOf(text.replace(/offset="0"/, 'offset="99999"'));
    expect(failure(far).detail).toMatch(/offset 99999, beyond the end of the appended data/);
  });

  it('an array that is appended in a file without AppendedData', () => {
    expect(failure(edited('tetra.vtu', 'format="ascii">0 1 2 3</DataArray>', 'format="appended" offset="0"/>')).detail).toMatch(/no AppendedData/);
  });
});

describe('bad values', () => {
  it('a node index out of range, ascii and binary', () => {
    const e = failure(edited('mixed-lines.vtu', '0 1 2 3</DataArray>', '0 1 2 9</DataArray>'));
    expect(e.detail).toMatch(/uses node 9, outside 0..4/);
    expect(e.location.line).toBe(14);
    const raw = writeVtu(smallMesh(), {}, { encoding: 'appended-raw' });
    const at = appendedAt(raw, 'connectivity');
    const bad = failure(putU32(raw, at + 4 + 4 * 6, 5));
    expect(bad.detail).toMatch(/uses node 5, outside 0..4/);
    expect(bad.location.byteOffset).toBe(at);
  });

  it('a node index out of range in a later piece', () => {
    const e = failure(edited('two-pieces.vtu', '>0 1 2 3</DataArray>', '>0 1 2 4</DataArray>'));
    expect(e.detail).toMatch(/outside this piece's points 0..3/);
  });

  it('an Int64 index beyond 32 bits', () => {
    const raw = writeVtu(smallMesh(), {}, { encoding: 'appended-raw', intType: 'Int64' });
    const at = appendedAt(raw, 'connectivity');
    expect(failure(putU32(raw, at + 4 + 8 * 2 + 4, 1)).detail).toMatch(/value 2 of "connectivity" is 4294967298, outside the 32-bit range/);
  });

  it('NaN and infinite coordinates', () => {
    const e = failure(edited('tetra.vtu', '0 0 0  1 0 0  0 1 0  0 0 1', '0 0 0  nan 0 0  0 1 0  0 0 1'));
    expect(e.detail).toMatch(/point 1 has a non-finite coordinate/);
    expect(e.location.line).toBe(6);
    const raw = writeVtu({ ...smallMesh(), points: Float64Array.of(0, 0, 1, 0, 1, Infinity, 0, 1, 2, 0) }, {}, { encoding: 'base64' });
    expect(failure(raw).detail).toMatch(/point 2 has a non-finite coordinate/);
  });

  it('a bad base64 character is reported at its byte', () => {
    const text = fixtureText('inline-uint64.vtu');
    const start = text.indexOf('format="binary">', text.indexOf('Name="Points"')) + 'format="binary">'.length;
    const dataAt = text.indexOf('A', start) + 40;
    const bytes = bytesOf(text.slice(0, dataAt) + '*' + text.slice(dataAt + 1));
    const e = failure(bytes);
    expect(e.detail).toMatch(/bad base64 character '\*'/);
    expect(e.location.byteOffset).toBe(dataAt);
  });

  it('offsets that decrease or do not end at the connectivity length', () => {
    expect(failure(edited('mixed-lines.vtu', '1 4 6 10', '1 6 4 10')).detail).toMatch(/offset of cell 2 is 4, after 6/);
    expect(failure(edited('mixed-lines.vtu', '1 4 6 10', '1 4 6 9')).detail).toMatch(/"connectivity" holds 10 values, 9 expected/);
  });

  it('a value count that does not match the declared points', () => {
    expect(failure(edited('tetra.vtu', '0 0 0  1 0 0  0 1 0  0 0 1', '0 0 0  1 0 0  0 1 0  0 0')).detail).toMatch(/holds 11 values, 12 expected/);
  });

  it('text where a number belongs', () => {
    expect(failure(edited('tetra.vtu', '0 1 2 3<', '0 1 two 3<')).detail).toMatch(/expected a value of "connectivity", found "two"/);
  });

  it('unsupported content is named', () => {
    expect(failure(edited('polys.vtp', 'NumberOfStrips="0"', 'NumberOfStrips="2"')).detail).toMatch(/2 triangle strips/);
    expect(failure(edited('tetra.vtu', 'type="UnstructuredGrid"', 'type="ImageData"')).detail).toMatch(/"ImageData" is not read/);
    expect(failure(edited('tetra.vtu', 'type="UInt8"', 'type="Complex"')).detail).toMatch(/unknown type "Complex"/);
    expect(failure(edited('tetra.vtu', 'header_type="UInt32"', 'header_type="UInt16"')).detail).toMatch(/header_type "UInt16"/);
    expect(failure(edited('tetra.vtu', '>10<', '>99<')).detail).toMatch(/unknown cell type id 99/);
    expect(failure(edited('tetra.vtu', '</Piece>', '</Peace>')).detail).toMatch(/<\/Peace> does not close <Piece>/);
  });
});

describe('random corruption', () => {
  const encodings: VtuEncoding[] = ['ascii', 'base64', 'appended-raw', 'appended-base64'];
  it.each(encodings)('%s: a flipped byte gives a mesh or a located MeshInputError, nothing else', (encoding) => {
    for (const compress of [false, true]) {
      const full = writeVtu(smallMesh(), {}, { encoding, compress, blockSize: 24 });
      fc.assert(
        fc.property(fc.nat(full.length - 1), fc.integer({ min: 1, max: 255 }), (at, x) => {
          const b = full.slice();
          b[at] = b[at]! ^ x;
          try {
            const m = readVtkXml(b, 'bad.vtu');
            for (const v of m.points) expect(Number.isFinite(v)).toBe(true);
            for (let i = 0; i < m.cellNodes.length; i++) expect(m.cellNodes[i]! < m.nPoints).toBe(true);
          } catch (e) {
            if (!(e instanceof MeshInputError)) throw e;
            expect(e.message).toMatch(LOCATED);
          }
        }),
        { numRuns: 300, seed: 20240611 },
      );
    }
  });
});
