import { describe, expect, it } from 'vitest';
import { formatNumber, writeVtu, type VtuEncoding } from '../../src/io/vtu.js';
import { UsageError } from '../../src/mesh/errors.js';
import { findArray, QUAD, TRIANGLE, type DataArray, type Mesh } from '../../src/mesh/model.js';
import { readVtkXml } from '../../src/mesh/vtkxml/index.js';

/** Two quads and two triangles in an invented channel, with awkward values in every array. */
function channel(): Mesh {
  const points = Float64Array.of(0, 0, 1, 0, 2, 0, 0, 1, 1, 1, 2, 1, 3, 0.5, 0.1, 1e-310, 5e5, 4e6);
  return {
    points,
    nPoints: points.length / 2,
    cellOffsets: Int32Array.of(0, 4, 8, 11, 14),
    cellNodes: Int32Array.of(0, 1, 4, 3, 1, 2, 5, 4, 2, 6, 5, 7, 8, 0),
    cellTypes: Uint8Array.of(QUAD, QUAD, TRIANGLE, TRIANGLE),
    nCells: 4,
    pointData: [{ name: 'depth', components: 1, values: Float64Array.of(1, 2, 3, 4, 5, 6, 7, 8, 0.3) }],
    cellData: [{ name: 'roughness', components: 1, values: Float32Array.of(0.025, 0.03, -0, 1e-40) }],
    format: 'test',
    warnings: [],
  };
}

const extra: { pointData: DataArray[]; cellData: DataArray[]; time: number } = {
  pointData: [{
    name: 'velocity & "flux"', components: 2,
    values: Float32Array.of(0.1, -0.2, 1.5, 2, 3.4028234663852886e38, -1.401298464324817e-45, 0, -0, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16),
  }],
  cellData: [{
    name: 'wind', components: 3,
    values: Float64Array.of(Math.PI, -Math.E, 1 / 3, Number.MAX_VALUE, Number.MIN_VALUE, -0, Infinity, -Infinity, NaN, 1e21, 1e-7, 123456789.123),
  }],
  time: 1 / 7,
};

function sameBits(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

function expectSameArray(got: DataArray | undefined, want: DataArray): void {
  expect(got, want.name).toBeDefined();
  expect(got!.components).toBe(want.components);
  expect(got!.values.constructor).toBe(want.values.constructor);
  expect(sameBits(got!.values, want.values), want.name).toBe(true);
}

const encodings: VtuEncoding[] = ['ascii', 'base64', 'appended-raw', 'appended-base64'];
const cases: Array<[VtuEncoding, boolean, 'UInt32' | 'UInt64', 'LittleEndian' | 'BigEndian', 'Int32' | 'Int64']> = [];
for (const e of encodings) for (const c of [false, true]) for (const h of ['UInt32', 'UInt64'] as const)
  for (const o of ['LittleEndian', 'BigEndian'] as const) for (const t of ['Int32', 'Int64'] as const) cases.push([e, c, h, o, t]);

describe('writeVtu round trips through readVtkXml', () => {
  it.each(cases)('%s compress=%s %s %s %s', (encoding, compress, headerType, byteOrder, intType) => {
    const mesh = channel();
    // a small block size gives several blocks with a partial last one
    const bytes = writeVtu(mesh, extra, { encoding, compress, headerType, byteOrder, intType, blockSize: 40 });
    const back = readVtkXml(bytes, 'roundtrip.vtu');
    expect(sameBits(back.points, mesh.points)).toBe(true);
    expect(Array.from(back.cellOffsets)).toEqual(Array.from(mesh.cellOffsets));
    expect(Array.from(back.cellNodes)).toEqual(Array.from(mesh.cellNodes));
    expect(Array.from(back.cellTypes)).toEqual(Array.from(mesh.cellTypes));
    expectSameArray(findArray(back.pointData, 'depth'), mesh.pointData[0]!);
    expectSameArray(findArray(back.cellData, 'roughness'), mesh.cellData[0]!);
    expectSameArray(findArray(back.pointData, extra.pointData[0]!.name), extra.pointData[0]!);
    expectSameArray(findArray(back.cellData, 'wind'), extra.cellData[0]!);
    expect(back.time).toBe(1 / 7);
    expect(back.warnings).toEqual([]);
    const kind = encoding === 'base64' ? 'binary' : encoding;
    expect(back.format).toBe(`vtu/${kind}${compress && encoding !== 'ascii' ? '-zlib' : ''}`);
  });

  it('an exact multiple of the block size leaves a zero last-block entry that reads as a full block', () => {
    const mesh = channel();
    // 9 points * 3 * 8 bytes = 216 = 6 blocks of 36
    const back = readVtkXml(writeVtu(mesh, {}, { compress: true, blockSize: 36 }), 'b.vtu');
    expect(sameBits(back.points, mesh.points)).toBe(true);
  });

  it('an extra array replaces the mesh array of the same name', () => {
    const mesh = channel();
    const depth = { name: 'depth', components: 1, values: new Float64Array(9).fill(2) };
    const back = readVtkXml(writeVtu(mesh, { pointData: [depth] }), 'r.vtu');
    expect(back.pointData.filter((a) => a.name === 'depth')).toHaveLength(1);
    expectSameArray(findArray(back.pointData, 'depth'), depth);
  });

  it('rejects an array of the wrong length', () => {
    const bad = { name: 'short', components: 1, values: new Float64Array(3) };
    expect(() => writeVtu(channel(), { cellData: [bad] })).toThrow(UsageError);
  });

  it('appended raw output is one head, the raw blocks, and a closing tail', () => {
    const bytes = writeVtu(channel(), {}, { encoding: 'appended-raw' });
    const text = new TextDecoder('latin1').decode(bytes);
    expect(text.startsWith('<?xml')).toBe(true);
    expect(text).toContain('<AppendedData encoding="raw">');
    expect(text.trimEnd().endsWith('</VTKFile>')).toBe(true);
  });

  it('writes a 200k-cell mesh appended-raw quickly', () => {
    const n = 317; // (n-1)^2 * 2 ≈ 200k triangles
    const nPoints = n * n;
    const points = new Float64Array(nPoints * 2);
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) { points[2 * (j * n + i)] = i; points[2 * (j * n + i) + 1] = j; }
    const nCells = (n - 1) * (n - 1) * 2;
    const cellNodes = new Int32Array(nCells * 3);
    let p = 0;
    for (let j = 0; j < n - 1; j++) for (let i = 0; i < n - 1; i++) {
      const a = j * n + i;
      cellNodes.set([a, a + 1, a + n + 1, a, a + n + 1, a + n], p);
      p += 6;
    }
    const cellOffsets = new Int32Array(nCells + 1);
    for (let c = 0; c <= nCells; c++) cellOffsets[c] = 3 * c;
    const mesh: Mesh = {
      points, nPoints, cellOffsets, cellNodes, cellTypes: new Uint8Array(nCells).fill(TRIANGLE), nCells,
      pointData: [], cellData: [{ name: 'dt', components: 1, values: new Float64Array(nCells).fill(0.5) }], format: 'grid', warnings: [],
    };
    const t0 = performance.now();
    const bytes = writeVtu(mesh);
    const ms = performance.now() - t0;
    // generous bound for a shared machine; a 1M-cell mesh should stay well under a second
    expect(ms).toBeLessThan(1000);
    const back = readVtkXml(bytes, 'grid.vtu');
    expect(back.nCells).toBe(nCells);
    expect(back.cellNodes[back.cellNodes.length - 1]).toBe(cellNodes[cellNodes.length - 1]);
  });
});

describe('formatNumber', () => {
  it('writes the shortest text that reads back to the same double, and names non-finite values', () => {
    expect(formatNumber(0.1)).toBe('0.1');
    expect(formatNumber(-0)).toBe('-0');
    expect(formatNumber(Infinity)).toBe('inf');
    expect(formatNumber(-Infinity)).toBe('-inf');
    expect(formatNumber(NaN)).toBe('nan');
    for (const v of [Math.PI, 1e-310, Number.MAX_VALUE, 5e-324, 123456789.123]) expect(Number(formatNumber(v))).toBe(v);
  });
});
