/**
 * Cell blocks (CELLS, POLYGONS, LINES, VERTICES, TRIANGLE_STRIPS) in both layouts:
 * - up to 4.x: `KEYWORD n size`, then per cell its node count and its nodes (size = n + Σ counts);
 * - 5.x: `KEYWORD nOffsets nConnectivity`, then `OFFSETS type` and `CONNECTIVITY type` arrays.
 * The layout is told by the content (an OFFSETS line follows), not by the version number.
 */
import { MeshInputError, type ErrorLocation } from '../errors.js';
import type { LegacySource } from './source.js';
import { INT32 } from './types.js';

export interface CellBlock {
  /** Number of cells. */
  n: number;
  /** Cell i uses connectivity[offsets[i] .. offsets[i+1]). Length n + 1. */
  offsets: Int32Array;
  connectivity: Int32Array;
  /** Byte offset of the block's keyword. */
  at: number;
  /** Where cell i's node list is in the file. */
  locate(i: number): ErrorLocation;
}

/** Read a cell block whose keyword (`section`) was just read. */
export function readCellBlock(src: LegacySource, section: string): CellBlock {
  const at = src.keywordAt;
  const a = src.count('the number of cells', section);
  const b = src.count('the size', section);
  src.endLine(section);
  if (src.accept('OFFSETS')) return readOffsetsLayout(src, section, a, b, at);
  return readCountedLayout(src, section, a, b, at);
}

function readCountedLayout(src: LegacySource, section: string, n: number, size: number, at: number): CellBlock {
  if (size < n) throw src.fail(`${section}: size ${size} is less than the number of cells ${n} (each cell needs its node count)`, at);
  const start = src.pos;
  const raw = src.readInts(size, INT32, section);
  const offsets = new Int32Array(n + 1);
  const connectivity = new Int32Array(size - n);
  let j = 0;
  let p = 0;
  for (let i = 0; i < n; i++) {
    if (j >= size) throw src.fail(`${section}: size ${size} is too small for ${n} cells (it ends before cell ${i})`, at);
    const k = raw[j]!;
    if (k < 0 || k > size - j - 1) {
      throw new MeshInputError(
        `${section}: cell ${i} has a node count of ${k}, more than the declared size ${size} leaves`,
        src.valueLocation(start, j, 4),
      );
    }
    for (let q = 0; q < k; q++) connectivity[p + q] = raw[j + 1 + q]!;
    p += k;
    j += k + 1;
    offsets[i + 1] = p;
  }
  if (j !== size) throw src.fail(`${section}: size ${size} does not match its ${n} cells, which hold ${j} values`, at);
  const cellStart = (i: number) => offsets[i]! + i;
  return { n, offsets, connectivity, at, locate: (i) => src.valueLocation(start, cellStart(i), 4) };
}

function readOffsetsLayout(src: LegacySource, section: string, nOffsets: number, nConn: number, at: number): CellBlock {
  const offType = src.type('OFFSETS');
  src.endLine('OFFSETS');
  const offStart = src.pos;
  const read = src.readInts(nOffsets, offType, 'OFFSETS');
  const kw = src.keyword();
  if (kw !== 'CONNECTIVITY') {
    throw src.fail(`${section}: expected CONNECTIVITY after OFFSETS, found ${kw ? `"${kw}"` : 'the end of the file'}`, src.keywordAt);
  }
  const connType = src.type('CONNECTIVITY');
  src.endLine('CONNECTIVITY');
  const connStart = src.pos;
  const connectivity = src.readInts(nConn, connType, 'CONNECTIVITY');
  const n = nOffsets > 0 ? nOffsets - 1 : 0;
  const offsets = nOffsets > 0 ? read : new Int32Array(1);
  const where = (i: number) => src.valueLocation(offStart, i, offType.size);
  if (offsets[0] !== 0) throw new MeshInputError(`OFFSETS must start at 0, found ${offsets[0]}`, where(0));
  for (let i = 1; i <= n; i++) {
    if (offsets[i]! < offsets[i - 1]!) {
      throw new MeshInputError(`OFFSETS decrease at entry ${i}: ${offsets[i]} after ${offsets[i - 1]}`, where(i));
    }
  }
  if (offsets[n] !== nConn) {
    throw new MeshInputError(`the last offset ${offsets[n]} differs from the ${section} connectivity size ${nConn}`, where(n));
  }
  return { n, offsets, connectivity, at, locate: (i) => src.valueLocation(connStart, offsets[i]!, connType.size) };
}
