/**
 * Legacy VTK reader (.vtk): UNSTRUCTURED_GRID and POLYDATA, ASCII and big-endian BINARY,
 * the 4.x cell layout and the 5.x OFFSETS/CONNECTIVITY layout.
 */
import { MeshInputError, type ErrorLocation } from '../errors.js';
import { assembleMesh, badPointMessage, keepSurfaceCells, planarPoints, usableCoordinate, vtkCellTypeName, type RawCells } from '../cells.js';
import type { FieldValues, Mesh } from '../model.js';
import { readAttribute, readFieldBlock, type AttributeSet } from './attributes.js';
import { readCellBlock, type CellBlock } from './cells.js';
import { LegacySource, shown } from './source.js';
import { INT32 } from './types.js';

type Dataset = 'UNSTRUCTURED_GRID' | 'POLYDATA';

const GRID_SECTIONS = new Set(['CELLS', 'CELL_TYPES']);
const POLY_SECTIONS = new Set(['VERTICES', 'LINES', 'POLYGONS', 'TRIANGLE_STRIPS']);
const TIME_NAMES = new Set(['TimeValue', 'TIME']);

/** VTK ids given to POLYDATA cells: polygons are told apart by their node count. */
const VTK_VERTEX = 1;
const VTK_LINE = 3;
const VTK_POLYGON = 7;

interface Body {
  points: FieldValues | null;
  pointsStart: number;
  pointsSize: number;
  /** CELLS (grid) or POLYGONS (polydata). */
  cells: CellBlock | null;
  types: Int32Array | null;
  typesStart: number;
  typesAt: number;
  /** POLYDATA vertices and lines: they come before the polygons in cell numbering. */
  nVerts: number;
  nLines: number;
  pointSet: AttributeSet | null;
  cellSet: AttributeSet | null;
  time: number | undefined;
  warnings: string[];
}

export function readVtkLegacy(bytes: Uint8Array, file: string): Mesh {
  const src = new LegacySource(bytes, file);
  const { version, dataset } = readHeader(src);
  const body = readBody(src, dataset);
  return assemble(src, body, dataset, `vtk-legacy/${version}-${src.binary ? 'binary' : 'ascii'}`);
}

function readHeader(src: LegacySource): { version: string; dataset: Dataset } {
  const sc = src.sc;
  const b = src.bytes;
  if (b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) sc.pos = 3;
  sc.skipSpace();
  const first = sc.line();
  const m = /^#\s*vtk\s+DataFile\s+Version\s+(\S+)/i.exec(first);
  if (!m) throw src.fail('not a legacy VTK file: the first line must read "# vtk DataFile Version x.y"', 0);
  if (sc.pos >= sc.end) throw src.fail('the file ends after its first line');
  sc.line(); // title
  sc.skipSpace();
  const modeAt = sc.pos;
  const mode = sc.token().toUpperCase();
  if (mode === 'BINARY') src.setBinary();
  else if (mode !== 'ASCII') throw src.fail(`expected ASCII or BINARY after the title line, found "${shown(mode)}"`, modeAt);
  const kw = src.keyword();
  if (kw !== 'DATASET') throw src.fail(kw ? `expected DATASET, found "${shown(kw)}"` : 'the file ends before its DATASET line', src.keywordAt);
  const at = src.keywordAt;
  const ds = src.need('a dataset type', 'DATASET').toUpperCase();
  src.endLine('DATASET');
  if (ds !== 'UNSTRUCTURED_GRID' && ds !== 'POLYDATA') {
    throw src.fail(`DATASET ${shown(ds)} is not supported: only UNSTRUCTURED_GRID and POLYDATA hold triangle and quad meshes`, at);
  }
  return { version: m[1]!, dataset: ds };
}

function readBody(src: LegacySource, dataset: Dataset): Body {
  const body: Body = {
    points: null, pointsStart: 0, pointsSize: 0, cells: null, types: null, typesStart: 0, typesAt: 0,
    nVerts: 0, nLines: 0, pointSet: null, cellSet: null, time: undefined, warnings: [],
  };
  let current: AttributeSet | null = null;
  for (;;) {
    const kw = src.keyword();
    if (kw === '') break;
    const at = src.keywordAt;
    if (kw === 'POINT_DATA' || kw === 'CELL_DATA') {
      current = readAttributeHeader(src, kw, body, dataset);
    } else if (readAttribute(src, kw, current, body.warnings)) {
      // read into `current`
    } else if (!readDatasetSection(src, kw, body, dataset)) {
      if (GRID_SECTIONS.has(kw) || POLY_SECTIONS.has(kw)) throw src.fail(`${kw} is not a section of DATASET ${dataset}`, at);
      throw src.fail(`unknown section "${shown(kw)}": its size is not known, so the file cannot be read past it`, at);
    }
  }
  return body;
}

function readAttributeHeader(src: LegacySource, kw: 'POINT_DATA' | 'CELL_DATA', body: Body, dataset: Dataset): AttributeSet {
  const at = src.keywordAt;
  const count = src.count(kw === 'POINT_DATA' ? 'the number of points' : 'the number of cells', kw);
  src.endLine(kw);
  if ((kw === 'POINT_DATA' ? body.pointSet : body.cellSet) !== null) throw src.fail(`a second ${kw} section`, at);
  const set: AttributeSet = { section: kw, count, at, arrays: [] };
  // compare now when the mesh part is known, before reading arrays of a wrong length
  checkCount(src, set, body, dataset);
  if (kw === 'POINT_DATA') body.pointSet = set;
  else body.cellSet = set;
  return set;
}

/** Compare a POINT_DATA / CELL_DATA count with the mesh; before the end only with the parts read so far. */
function checkCount(src: LegacySource, set: AttributeSet | null, body: Body, dataset: Dataset, final = false): void {
  if (!set) return;
  if (set.section === 'POINT_DATA') {
    if (body.points && set.count !== body.points.length / 3) {
      throw src.fail(`POINT_DATA declares ${set.count} values but the file has ${body.points.length / 3} points`, set.at);
    }
    return;
  }
  if (!body.cells && !final) return;
  const n = (body.cells?.n ?? 0) + (dataset === 'POLYDATA' ? body.nVerts + body.nLines : 0);
  if (set.count !== n) {
    throw src.fail(`CELL_DATA declares ${set.count} values but the file has ${n} cells`, set.at);
  }
}

function readDatasetSection(src: LegacySource, kw: string, body: Body, dataset: Dataset): boolean {
  const at = src.keywordAt;
  const grid = dataset === 'UNSTRUCTURED_GRID';
  switch (kw) {
    case 'FIELD': {
      // only the time is taken from dataset-level arrays, so notes on the others are not kept
      for (const a of readFieldBlock(src, null, 'FIELD', [])) {
        if (TIME_NAMES.has(a.name) && a.values.length > 0 && Number.isFinite(a.values[0]!)) body.time = a.values[0]!;
      }
      return true;
    }
    case 'POINTS': {
      if (body.points) throw src.fail('a second POINTS section', at);
      const n = src.count('the number of points', 'POINTS');
      const t = src.type('POINTS');
      src.endLine('POINTS');
      body.pointsStart = src.pos;
      body.pointsSize = t.size;
      body.points = src.readData(3 * n, t, 'POINTS');
      return true;
    }
    case 'CELLS':
    case 'POLYGONS': {
      if ((kw === 'CELLS') !== grid) return false;
      if (body.cells) throw src.fail(`a second ${kw} section`, at);
      body.cells = readCellBlock(src, kw);
      return true;
    }
    case 'CELL_TYPES': {
      if (!grid) return false;
      if (body.types) throw src.fail('a second CELL_TYPES section', at);
      const n = src.count('the number of cells', kw);
      src.endLine(kw);
      body.typesAt = at;
      body.typesStart = src.pos;
      body.types = src.readInts(n, INT32, kw);
      return true;
    }
    case 'VERTICES':
    case 'LINES':
    case 'TRIANGLE_STRIPS': {
      if (grid) return false;
      const block = readCellBlock(src, kw);
      if (kw === 'VERTICES') body.nVerts += block.n;
      else if (kw === 'LINES') body.nLines += block.n;
      else if (block.n > 0) {
        throw src.fail(`TRIANGLE_STRIPS are not supported (${block.n} strips): convert them to triangles first`, at);
      }
      return true;
    }
    default:
      return false;
  }
}

function assemble(src: LegacySource, body: Body, dataset: Dataset, format: string): Mesh {
  const { points, warnings } = body;
  const end = src.bytes.length;
  if (!points) throw src.fail('the file has no POINTS section', end);
  const nPoints = points.length / 3;
  for (let i = 0; i < points.length; i++) {
    const v = points[i]!;
    if (!usableCoordinate(v)) {
      throw new MeshInputError(badPointMessage(`point ${Math.floor(i / 3)}`, v), src.valueLocation(body.pointsStart, i, body.pointsSize));
    }
  }
  const xy = planarPoints(points, nPoints, 3, warnings, src.locate(body.pointsStart));
  checkCount(src, body.pointSet, body, dataset, true);
  const cells = body.cells;
  let raw: RawCells;
  let describe: (i: number) => ErrorLocation;
  if (dataset === 'UNSTRUCTURED_GRID') {
    if (!cells) throw src.fail('the file has no CELLS section', end);
    const types = body.types;
    if (!types) throw src.fail('CELLS without a CELL_TYPES section', cells.at);
    if (types.length !== cells.n) {
      throw src.fail(`CELL_TYPES lists ${types.length} cells but CELLS holds ${cells.n}`, body.typesAt);
    }
    raw = { types, offsets: cells.offsets, connectivity: cells.connectivity };
    // an unknown type id is best shown at its CELL_TYPES entry, every other cell error at its nodes
    describe = (i) => (vtkCellTypeName(types[i]!) === `cell type ${types[i]}`
      ? src.valueLocation(body.typesStart, i, 4)
      : cells.locate(i));
  } else {
    const skipped = body.nVerts + body.nLines;
    raw = polydataCells(body.nVerts, body.nLines, cells);
    describe = (i) => (cells ? cells.locate(i - skipped) : src.locate(end));
  }
  checkCount(src, body.cellSet, body, dataset, true);
  if (dataset === 'POLYDATA' && !cells) warnings.push('the file has no POLYGONS section: no 2-D cells');
  const kept = keepSurfaceCells(raw, nPoints, src.locate(cells ? cells.at : end), describe);
  return assembleMesh({
    points: xy,
    cells: kept,
    pointData: body.pointSet?.arrays ?? [],
    cellData: body.cellSet?.arrays ?? [],
    format,
    warnings,
    ...(body.time !== undefined ? { time: body.time } : {}),
  });
}

/**
 * POLYDATA cells in VTK's numbering (vertices, lines, then polygons), so that CELL_DATA tuples
 * line up: vertices and lines get empty node lists and are dropped by keepSurfaceCells.
 */
function polydataCells(nVerts: number, nLines: number, polys: CellBlock | null): RawCells {
  const skipped = nVerts + nLines;
  const nPolys = polys ? polys.n : 0;
  const types = new Uint8Array(skipped + nPolys);
  types.fill(VTK_VERTEX, 0, nVerts);
  types.fill(VTK_LINE, nVerts, skipped);
  types.fill(VTK_POLYGON, skipped);
  const offsets = new Int32Array(skipped + nPolys + 1);
  if (polys) offsets.set(polys.offsets, skipped);
  return { types, offsets, connectivity: polys ? polys.connectivity : new Int32Array(0) };
}
