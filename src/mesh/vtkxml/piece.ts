/**
 * One `Piece` of an UnstructuredGrid or PolyData: its points, raw cells (offsets in start form)
 * and point/cell arrays, all still in the piece's own numbering.
 */
import { int32s } from '../alloc.js';
import { MeshInputError, type ErrorLocation } from '../errors.js';
import type { DataArray, FieldValues } from '../model.js';
import { arrayInfo, attrInt, readField, readIndices, type ArrayContext, type ArrayEncoding, type ArrayInfo } from './arrays.js';
import { childNamed, type XmlElement } from './xml.js';

export interface PieceData {
  nPoints: number;
  /** Coordinates with `dim` components per point. */
  coords: FieldValues;
  dim: number;
  pointsLoc: ErrorLocation;
  /** VTK cell type per cell. */
  types: ArrayLike<number>;
  /** Start of each cell in `conn`, length nCells + 1. */
  starts: Int32Array;
  conn: ArrayLike<number>;
  connLoc: ErrorLocation;
  typesLoc: ErrorLocation;
  pointData: DataArray[];
  /** One tuple per cell of `types`. */
  cellData: DataArray[];
  /** Encoding of the points array (null when the piece has no points). */
  encoding: ArrayEncoding | null;
}

const VTK_POLYGON = 7;

function dataArrays(el: XmlElement): XmlElement[] {
  return el.children.filter((c) => c.name === 'DataArray');
}

function namedArray(ctx: ArrayContext, section: XmlElement, name: string): ArrayInfo {
  for (const c of dataArrays(section)) {
    if ((c.attrs.get('Name') ?? '') === name) {
      const info = arrayInfo(ctx, c);
      if (info === null) throw new MeshInputError(`the "${name}" array of <${section.name}> is not numeric`, { file: ctx.file, byteOffset: c.start });
      return info;
    }
  }
  throw new MeshInputError(`<${section.name}> has no "${name}" array`, { file: ctx.file, byteOffset: section.start });
}

function readPoints(ctx: ArrayContext, piece: XmlElement, nPoints: number): Pick<PieceData, 'coords' | 'dim' | 'pointsLoc' | 'encoding'> {
  const el = childNamed(piece, 'Points');
  const da = el ? dataArrays(el)[0] : undefined;
  if (!da) {
    if (nPoints === 0) return { coords: new Float64Array(0), dim: 3, pointsLoc: { file: ctx.file, byteOffset: piece.start }, encoding: null };
    throw new MeshInputError(`the Piece declares ${nPoints} points but has no Points array`, { file: ctx.file, byteOffset: piece.start });
  }
  const info = arrayInfo(ctx, da);
  if (info === null) throw new MeshInputError('the Points array is not numeric', { file: ctx.file, byteOffset: da.start });
  if (info.components < 2 || info.components > 3) {
    throw new MeshInputError(`the Points array has ${info.components} components; 2 or 3 expected`, info.loc);
  }
  const coords = readField(ctx, info, nPoints * info.components);
  return { coords, dim: info.components, pointsLoc: info.loc, encoding: info.encoding };
}

/**
 * Point or cell arrays of a section: each must hold `nTuples` tuples; kept are the tuples
 * [first, first + count). Non-numeric arrays are skipped.
 */
function readSection(ctx: ArrayContext, section: XmlElement | undefined, nTuples: number, first = 0, count = nTuples): DataArray[] {
  if (!section) return [];
  const out: DataArray[] = [];
  for (const c of dataArrays(section)) {
    const info = arrayInfo(ctx, c);
    if (info === null) continue;
    const m = info.components;
    let values = readField(ctx, info, nTuples * m);
    if (first !== 0 || count !== nTuples) values = values.subarray(first * m, (first + count) * m);
    out.push({ name: info.name, components: m, values });
  }
  return out;
}

/** VTK offsets (end offsets, one per cell; or n + 1 start offsets from 0) as start offsets. */
function startOffsets(raw: ArrayLike<number>, nCells: number, connLength: number, loc: ErrorLocation): Int32Array {
  let shift: number;
  if (raw.length === nCells) shift = 0;
  else if (raw.length === nCells + 1 && raw[0] === 0) shift = 1;
  else throw new MeshInputError(`the offsets array holds ${raw.length} values for ${nCells} cells`, loc);
  if (connLength > 0x7fffffff) throw new MeshInputError(`connectivity of ${connLength} entries is too large`, loc);
  const starts = int32s(nCells + 1);
  let prev = 0;
  for (let i = 0; i < nCells; i++) {
    const v = raw[i + shift]!;
    if (!Number.isInteger(v) || v < prev) {
      throw new MeshInputError(`offset of cell ${i} is ${v}, after ${prev}: offsets must be increasing integers`, loc);
    }
    if (v > connLength) {
      throw new MeshInputError(`offset of cell ${i} is ${v}, beyond the ${connLength} connectivity entries`, loc);
    }
    starts[i + 1] = v;
    prev = v;
  }
  if (prev !== connLength) {
    throw new MeshInputError(`the last offset is ${prev} but connectivity holds ${connLength} entries`, loc);
  }
  return starts;
}

function readCellArrays(ctx: ArrayContext, section: XmlElement, nCells: number): { starts: Int32Array; conn: ArrayLike<number>; connLoc: ErrorLocation } {
  const offInfo = namedArray(ctx, section, 'offsets');
  const connInfo = namedArray(ctx, section, 'connectivity');
  const rawOffsets = readIndices(ctx, offInfo, [nCells, nCells + 1]);
  // the last offset is the connectivity length; startOffsets checks the rest
  const connLength = rawOffsets.length > 0 ? rawOffsets[rawOffsets.length - 1]! : 0;
  if (!Number.isSafeInteger(connLength) || connLength < 0) {
    throw new MeshInputError(`the last offset ${connLength} is not a valid connectivity length`, offInfo.loc);
  }
  const conn = readIndices(ctx, connInfo, connLength);
  return { starts: startOffsets(rawOffsets, nCells, conn.length, offInfo.loc), conn, connLoc: connInfo.loc };
}

function emptyCells(loc: ErrorLocation): { starts: Int32Array; conn: ArrayLike<number>; connLoc: ErrorLocation } {
  return { starts: new Int32Array(1), conn: new Int32Array(0), connLoc: loc };
}

export function readUnstructuredPiece(ctx: ArrayContext, piece: XmlElement): PieceData {
  const nPoints = attrInt(ctx, piece, 'NumberOfPoints', null);
  const nCells = attrInt(ctx, piece, 'NumberOfCells', null);
  const points = readPoints(ctx, piece, nPoints);
  const section = childNamed(piece, 'Cells');
  const here = { file: ctx.file, byteOffset: piece.start };
  let cells = emptyCells(here);
  let types: ArrayLike<number> = new Uint8Array(0);
  let typesLoc: ErrorLocation = here;
  if (nCells > 0 || section) {
    if (!section) throw new MeshInputError(`the Piece declares ${nCells} cells but has no Cells section`, here);
    cells = readCellArrays(ctx, section, nCells);
    const typesInfo = namedArray(ctx, section, 'types');
    types = readIndices(ctx, typesInfo, nCells);
    typesLoc = typesInfo.loc;
  }
  return {
    nPoints, ...points, ...cells, types, typesLoc,
    pointData: readSection(ctx, childNamed(piece, 'PointData'), nPoints),
    cellData: readSection(ctx, childNamed(piece, 'CellData'), nCells),
  };
}

/** PolyData keeps its Polys; cells are numbered verts, lines, polys, strips, so cell arrays are cut to the polys. */
export function readPolyPiece(ctx: ArrayContext, piece: XmlElement): PieceData {
  const nPoints = attrInt(ctx, piece, 'NumberOfPoints', null);
  const nVerts = attrInt(ctx, piece, 'NumberOfVerts', 0);
  const nLines = attrInt(ctx, piece, 'NumberOfLines', 0);
  const nStrips = attrInt(ctx, piece, 'NumberOfStrips', 0);
  const nPolys = attrInt(ctx, piece, 'NumberOfPolys', 0);
  const here = { file: ctx.file, byteOffset: piece.start };
  if (nStrips > 0) {
    throw new MeshInputError(`the PolyData holds ${nStrips} triangle strips, which are not read; convert them to triangles first`, here);
  }
  const points = readPoints(ctx, piece, nPoints);
  const section = childNamed(piece, 'Polys');
  let cells = emptyCells(here);
  if (nPolys > 0) {
    if (!section) throw new MeshInputError(`the Piece declares ${nPolys} polygons but has no Polys section`, here);
    cells = readCellArrays(ctx, section, nPolys);
  }
  // nPolys is now backed by the offsets array read above
  const types = new Uint8Array(nPolys).fill(VTK_POLYGON);
  return {
    nPoints, ...points, ...cells, types, typesLoc: cells.connLoc,
    pointData: readSection(ctx, childNamed(piece, 'PointData'), nPoints),
    cellData: readSection(ctx, childNamed(piece, 'CellData'), nVerts + nLines + nPolys, nVerts + nLines, nPolys),
  };
}
