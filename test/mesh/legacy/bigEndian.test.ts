/**
 * The bulk big-endian decoder against DataView reads of the same bytes (DataView's
 * big-endian getters are the reference), at aligned and unaligned offsets.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decodeBigEndian } from '../../../src/mesh/legacy/bigEndian.js';
import { valueType } from '../../../src/mesh/legacy/types.js';

function reference(dv: DataView, at: number, type: string): number {
  switch (type) {
    case 'char': return dv.getInt8(at);
    case 'unsigned_char': return dv.getUint8(at);
    case 'short': return dv.getInt16(at, false);
    case 'unsigned_short': return dv.getUint16(at, false);
    case 'int': return dv.getInt32(at, false);
    case 'unsigned_int': return dv.getUint32(at, false);
    case 'vtktypeint64': return Number(dv.getBigInt64(at, false));
    case 'vtktypeuint64': return Number(dv.getBigUint64(at, false));
    case 'float': return dv.getFloat32(at, false);
    default: return dv.getFloat64(at, false);
  }
}

const TYPES = ['char', 'unsigned_char', 'short', 'unsigned_short', 'int', 'unsigned_int', 'vtktypeint64',
  'vtktypeuint64', 'float', 'double'];

describe('decodeBigEndian', () => {
  it('matches DataView on random bytes for every type and offset', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...TYPES),
        fc.uint8Array({ minLength: 0, maxLength: 200 }),
        fc.integer({ min: 0, max: 7 }),
        (type, raw, start) => {
          const t = valueType(type)!;
          const count = Math.max(0, Math.floor((raw.length - start) / t.size));
          const got = Array.from(decodeBigEndian(raw, start, count, t));
          const dv = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
          const want = Array.from({ length: count }, (_, i) => reference(dv, start + i * t.size, type));
          // NaN payloads compare as NaN
          expect(got.map((v) => (Number.isNaN(v) ? 'NaN' : v))).toEqual(want.map((v) => (Number.isNaN(v) ? 'NaN' : v)));
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });

  it('returns float types as float arrays and 64-bit integers as doubles', () => {
    const bytes = new Uint8Array([0x3f, 0x80, 0, 0, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xfe]);
    expect(decodeBigEndian(bytes, 0, 1, valueType('float')!)).toEqual(new Float32Array([1]));
    expect(decodeBigEndian(bytes, 4, 1, valueType('vtktypeint64')!)).toEqual(new Float64Array([-2]));
    expect(decodeBigEndian(bytes, 4, 1, valueType('vtktypeuint64')!)).toEqual(new Float64Array([2 ** 64 - 2]));
  });
});
