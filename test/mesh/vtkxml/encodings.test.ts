// Every numeric type in every encoding and byte order, written here with Node's Buffer (not with
// our writer) into small one-triangle files.
import { describe, expect, it } from 'vitest';
import { findArray } from '../../../src/mesh/model.js';
import { readVtkXml } from '../../../src/mesh/vtkxml/index.js';
import { fieldValues, indexValues, numType } from '../../../src/mesh/vtkxml/types.js';

type T = 'Int8' | 'UInt8' | 'Int16' | 'UInt16' | 'Int32' | 'UInt32' | 'Int64' | 'UInt64' | 'Float32' | 'Float64';

const SIZE: Record<T, number> = { Int8: 1, UInt8: 1, Int16: 2, UInt16: 2, Int32: 4, UInt32: 4, Int64: 8, UInt64: 8, Float32: 4, Float64: 8 };

/** Extremes of each type (limits from the type's width: common practice). */
const SAMPLES: Record<T, number[]> = {
  Int8: [-128, 0, 127],
  UInt8: [0, 200, 255],
  Int16: [-32768, 1, 32767],
  UInt16: [0, 40000, 65535],
  Int32: [-2147483648, 5, 2147483647],
  UInt32: [0, 3000000000, 4294967295],
  Int64: [-(2 ** 53 - 1), -1, 2 ** 53 - 1],
  UInt64: [0, 2 ** 40, 2 ** 53 - 1],
  Float32: [1.5, -0.25, 3.4028234663852886e38],
  Float64: [0.1, -1e300, 5e-324],
};

function encode(t: T, values: number[], be: boolean): Buffer {
  const s = SIZE[t];
  const b = Buffer.alloc(values.length * s);
  values.forEach((v, i) => {
    const o = i * s;
    switch (t) {
      case 'Int8': b.writeInt8(v, o); break;
      case 'UInt8': b.writeUInt8(v, o); break;
      case 'Int16': be ? b.writeInt16BE(v, o) : b.writeInt16LE(v, o); break;
      case 'UInt16': be ? b.writeUInt16BE(v, o) : b.writeUInt16LE(v, o); break;
      case 'Int32': be ? b.writeInt32BE(v, o) : b.writeInt32LE(v, o); break;
      case 'UInt32': be ? b.writeUInt32BE(v, o) : b.writeUInt32LE(v, o); break;
      case 'Int64': be ? b.writeBigInt64BE(BigInt(v), o) : b.writeBigInt64LE(BigInt(v), o); break;
      case 'UInt64': be ? b.writeBigUInt64BE(BigInt(v), o) : b.writeBigUInt64LE(BigInt(v), o); break;
      case 'Float32': be ? b.writeFloatBE(v, o) : b.writeFloatLE(v, o); break;
      case 'Float64': be ? b.writeDoubleBE(v, o) : b.writeDoubleLE(v, o); break;
    }
  });
  return b;
}

interface Arr { section: string; name: string; type: T; comps: number; values: number[] }

type Layout = 'ascii' | 'binary' | 'appended';

/** A one-piece UnstructuredGrid holding `arrays` in the given layout. */
function build(layout: Layout, be: boolean, header64: boolean, arrays: Arr[]): Uint8Array {
  const header = (n: number): Buffer => {
    const h = Buffer.alloc(header64 ? 8 : 4);
    if (header64) be ? h.writeBigUInt64BE(BigInt(n)) : h.writeBigUInt64LE(BigInt(n));
    else be ? h.writeUInt32BE(n) : h.writeUInt32LE(n);
    return h;
  };
  const blobs: Buffer[] = [];
  let offset = 0;
  const element = (a: Arr): string => {
    const open = `<DataArray type="${a.type}" Name="${a.name}" NumberOfComponents="${a.comps}"`;
    if (layout === 'ascii') return `${open} format="ascii">${a.values.join(' ')}</DataArray>`;
    const data = encode(a.type, a.values, be);
    const blob = Buffer.concat([header(data.length), data]);
    if (layout === 'binary') return `${open} format="binary">${blob.toString('base64')}</DataArray>`;
    blobs.push(blob);
    offset += blob.length;
    return `${open} format="appended" offset="${offset - blob.length}"/>`;
  };
  const section = (name: string): string => `<${name}>${arrays.filter((a) => a.section === name).map(element).join('\n')}</${name}>\n`;
  const head = `<?xml version="1.0"?>
<VTKFile type="UnstructuredGrid" version="1.0" byte_order="${be ? 'BigEndian' : 'LittleEndian'}" header_type="${header64 ? 'UInt64' : 'UInt32'}">
<UnstructuredGrid>
${section('FieldData')}<Piece NumberOfPoints="3" NumberOfCells="1">
${section('CellData')}${section('PointData')}${section('Points')}${section('Cells')}</Piece>
</UnstructuredGrid>
`;
  const tail = layout === 'appended' ? [Buffer.from('<AppendedData encoding="raw">\n_'), ...blobs, Buffer.from('\n</AppendedData>\n')] : [];
  return new Uint8Array(Buffer.concat([Buffer.from(head), ...tail, Buffer.from('</VTKFile>\n')]));
}

function triangleWith(t: T): Arr[] {
  return [
    // one UInt8 value first, so that appended arrays after it sit at odd offsets
    { section: 'CellData', name: 'pad', type: 'UInt8', comps: 1, values: [1] },
    { section: 'PointData', name: 'p', type: t, comps: 1, values: SAMPLES[t] },
    { section: 'Points', name: 'Points', type: 'Float64', comps: 3, values: [0, 0, 0, 1, 0, 0, 0, 1, 0] },
    { section: 'Cells', name: 'connectivity', type: t, comps: 1, values: [0, 1, 2] },
    { section: 'Cells', name: 'offsets', type: t, comps: 1, values: [3] },
    { section: 'Cells', name: 'types', type: 'UInt8', comps: 1, values: [5] },
  ];
}

const TYPES = Object.keys(SIZE) as T[];
const LAYOUTS: Array<[Layout, boolean, boolean]> = [
  ['ascii', false, false], ['binary', false, false], ['binary', true, true], ['appended', false, true], ['appended', true, false],
];
const cases = TYPES.flatMap((t) => LAYOUTS.map(([l, be, h64]) => [t, l, be, h64] as const));

describe('numeric types', () => {
  it.each(cases)('%s in %s, big-endian=%s, UInt64 headers=%s', (t, layout, be, h64) => {
    const m = readVtkXml(build(layout, be, h64, triangleWith(t)), 'types.vtu');
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 2]);
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 0, 1]);
    const p = findArray(m.pointData, 'p')!;
    expect(p.values).toBeInstanceOf(t === 'Float32' ? Float32Array : Float64Array);
    expect(Array.from(p.values)).toEqual(SAMPLES[t]);
  });

  it('older type names are understood', () => {
    expect(['Char', 'UnsignedChar', 'Int', 'Float', 'Double', 'IdType'].map(numType)).toEqual(['Int8', 'UInt8', 'Int32', 'Float32', 'Float64', 'Int64']);
    expect(numType('Complex')).toBeNull();
  });
});

describe('layout variants', () => {
  it('offsets in n + 1 start form are accepted', () => {
    const arrays = triangleWith('Int32');
    arrays.find((a) => a.name === 'offsets')!.values = [0, 3];
    expect(Array.from(readVtkXml(build('ascii', false, false, arrays), 'a.vtu').cellOffsets)).toEqual([0, 3]);
  });

  it('an uncompressed inline array whose header is base64-encoded apart from its data', () => {
    const pts = encode('Float64', [0, 0, 0, 1, 0, 0, 0, 1, 0], false);
    const size = Buffer.alloc(4);
    size.writeUInt32LE(pts.length);
    const text = Buffer.from(build('binary', false, false, triangleWith('Int32'))).toString('latin1');
    const joint = Buffer.concat([size, pts]).toString('base64');
    const apart = size.toString('base64') + pts.toString('base64');
    expect(apart).not.toBe(joint);
    const m = readVtkXml(new Uint8Array(Buffer.from(text.replace(joint, apart), 'latin1')), 'a.vtu');
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 0, 1]);
  });

  it('a FieldData array named TIME gives the time', () => {
    const arrays = [...triangleWith('Int32'), { section: 'FieldData', name: 'TIME', type: 'Float32', comps: 1, values: [0.75] } as Arr];
    expect(readVtkXml(build('binary', true, false, arrays), 'a.vtu').time).toBe(0.75);
  });
});

describe('typed-array conversion', () => {
  it('aligned little-endian Float64 bytes are viewed, not copied; unaligned ones are copied once', () => {
    const buf = new Uint8Array(8 * 4 + 1);
    new DataView(buf.buffer).setFloat64(8, 2.5, true);
    const aligned = fieldValues(buf.subarray(8, 24), 'Float64', false, false);
    expect(aligned.buffer).toBe(buf.buffer);
    expect(aligned[0]).toBe(2.5);
    const odd = buf.subarray(1, 17);
    new DataView(buf.buffer).setFloat64(1, -4, true);
    const copied = fieldValues(odd, 'Float64', false, false);
    expect(copied.buffer).not.toBe(buf.buffer);
    expect(copied[0]).toBe(-4);
    // the caller's bytes are left as they were
    expect(new DataView(buf.buffer).getFloat64(1, true)).toBe(-4);
  });

  it('big-endian bytes the reader does not own are swapped in a copy', () => {
    const be = new Uint8Array(encode('Int32', [1, -2], true));
    const v = indexValues(be, 'Int32', true, false, () => { throw new Error('unreachable'); });
    expect(Array.from(v)).toEqual([1, -2]);
    expect(Array.from(be)).toEqual(Array.from(encode('Int32', [1, -2], true)));
  });

  it('64-bit indices outside the 32-bit range are refused with their value', () => {
    const bytes = new Uint8Array(encode('UInt64', [7, 2 ** 31], false));
    expect(() => indexValues(bytes, 'UInt64', false, false, (i, v) => { throw new Error(`${i}:${v}`); })).toThrow('1:2147483648');
    const neg = new Uint8Array(encode('Int64', [-1, -(2 ** 31) - 1], false));
    expect(() => indexValues(neg, 'Int64', false, false, (i, v) => { throw new Error(`${i}:${v}`); })).toThrow('1:-2147483649');
  });
});
