/**
 * The per-cell table: a header row, then one row per 2-D cell in file order. Numbers in the
 * shortest form that parses back to the same double; an unlimited step is written `inf`.
 */
import type { AuditResult } from '../audit/audit.js';
import { causeList } from '../audit/audit.js';
import { FLAG_DEGENERATE, FLAG_INVERTED, FLAG_NONCONVEX, FLAG_REPEATED_NODE } from '../geometry/cells.js';
import { shapeRange, allocShape, type CellGeometry, type ShapeField, type ShapeGeometry } from '../geometry/cells.js';
import type { CoordinateSystem } from '../geometry/geographic.js';
import { UsageError } from '../mesh/errors.js';
import { bareMesh, QUAD } from '../mesh/model.js';
import { MAX_NUMBER_BYTES, writeInteger, writeNumber } from './digits.js';

/** Every per-cell column the table can hold, in table order. */
export const CSV_COLUMNS_ALL = [
  'cell', 'type', 'area', 'perimeter', 'inradius', 'circumradius', 'speed', 'dt', 'radius_ratio', 'min_angle',
  'max_angle', 'aspect_ratio', 'scaled_jacobian', 'condition', 'edge_ratio', 'centroid_x', 'centroid_y', 'flags', 'cause',
];
/** The shape measures only the full table (`all`) adds. */
const SHAPE_ONLY_COLUMNS = new Set(['circumradius', 'max_angle', 'aspect_ratio', 'scaled_jacobian', 'condition', 'edge_ratio']);
/** The default table: what locates a cell and explains its step. */
export const CSV_COLUMNS = CSV_COLUMNS_ALL.filter((c) => !SHAPE_ONLY_COLUMNS.has(c));

/** `standard` (CSV_COLUMNS, the default) or `all` (CSV_COLUMNS_ALL). */
export type CsvColumnSet = 'standard' | 'all';

export function csvColumnSet(value: unknown): CsvColumnSet {
  if (value === undefined || value === 'standard') return 'standard';
  if (value === 'all') return 'all';
  throw new UsageError(`--cell-columns must be standard or all, got "${String(value)}"`);
}

function flagText(f: number): string {
  const parts: string[] = [];
  if (f & FLAG_DEGENERATE) parts.push('degenerate');
  if (f & FLAG_REPEATED_NODE) parts.push('repeated_node');
  if (f & FLAG_INVERTED) parts.push('inverted');
  if (f & FLAG_NONCONVEX) parts.push('non_convex');
  return parts.join(';');
}

function causeText(c: number): string {
  return causeList(c).join(';');
}

/** Extra per-cell columns later features add (name → values), written after the standard ones. */
export type ExtraColumns = { name: string; values: Float64Array | Int32Array }[];

function extraColumns(r: AuditResult, extra: ExtraColumns): ExtraColumns {
  const cols: ExtraColumns = [];
  if (r.courantAtDt) cols.push({ name: 'courant', values: r.courantAtDt });
  return cols.concat(r.columns, extra);
}

const textEncoder = new TextEncoder();
const textDecoder = new TextDecoder();

/** Bytes of `text(v)` for every byte value v (flags and causes are bit sets in a byte). */
function byteTexts(text: (v: number) => string): Uint8Array[] {
  const out: Uint8Array[] = [];
  for (let v = 0; v < 256; v++) out.push(textEncoder.encode(text(v)));
  return out;
}

let flagBytes: Uint8Array[] | null = null;
let causeBytes: Uint8Array[] | null = null;
const QUAD_TEXT = textEncoder.encode(',quad,');
const TRIANGLE_TEXT = textEncoder.encode(',triangle,');

function put(out: Uint8Array, pos: number, b: Uint8Array): number {
  for (let k = 0; k < b.length; k++) out[pos + k] = b[k]!;
  return pos + b.length;
}

/** A numeric column: an array indexed by cell, or a shape measure computed block by block. */
export type CsvColumn = Float64Array | ShapeField;

/** The cells' nodes and points, for shape measures computed block by block while writing. */
export interface CsvShapeSource {
  points: Float64Array;
  offsets: Int32Array;
  nodes: Int32Array;
  coords: CoordinateSystem;
}

/** The arrays one table row is made of (plain typed arrays, so threads can share them). */
export interface CsvTable {
  nCells: number;
  types: Uint8Array;
  /** The numeric columns from area to centroid_y, in header order. */
  columns: CsvColumn[];
  /** Per numeric column: left empty for quads (the circumradius). */
  emptyForQuad: boolean[];
  /** Set when some columns are shape measures still to compute. */
  shape: CsvShapeSource | null;
  flags: Uint8Array;
  cause: Uint8Array;
  extras: (Float64Array | Int32Array)[];
  header: string;
  /** Bytes the longest possible row takes. */
  rowMax: number;
}

function texts(): { fl: Uint8Array[]; cs: Uint8Array[] } {
  flagBytes ??= byteTexts(flagText);
  causeBytes ??= byteTexts(causeText);
  return { fl: flagBytes, cs: causeBytes };
}

const SHAPE_OF: Record<string, ShapeField> = {
  circumradius: 'circumradius', min_angle: 'minAngle', max_angle: 'maxAngle', aspect_ratio: 'aspectRatio',
  scaled_jacobian: 'scaledJacobian', condition: 'condition', edge_ratio: 'edgeRatio', centroid_x: 'centroidX', centroid_y: 'centroidY',
};

function columnValues(name: string, r: AuditResult, g: CellGeometry, defer: boolean): CsvColumn {
  switch (name) {
    case 'area': return g.area;
    case 'perimeter': return g.perimeter;
    case 'inradius': return g.inradius;
    case 'speed': return r.speed;
    case 'dt': return r.dt;
    case 'radius_ratio': return g.radiusRatio;
  }
  const field = SHAPE_OF[name]!;
  return defer ? field : g[field];
}

export function csvTable(r: AuditResult, extra: ExtraColumns = [], set: CsvColumnSet = 'standard'): CsvTable {
  const { fl, cs } = texts();
  const g = r.geom;
  const ex = extraColumns(r, extra);
  const names = set === 'all' ? CSV_COLUMNS_ALL : CSV_COLUMNS;
  const numeric = names.filter((c) => c !== 'cell' && c !== 'type' && c !== 'flags' && c !== 'cause');
  const d = g.deferred && !g.deferred.computed ? g.deferred : null;
  let longestText = 0;
  for (let v = 0; v < 256; v++) longestText = Math.max(longestText, fl[v]!.length + cs[v]!.length);
  return {
    nCells: r.mesh.nCells,
    types: r.mesh.cellTypes,
    columns: numeric.map((c) => columnValues(c, r, g, d !== null)),
    emptyForQuad: numeric.map((c) => c === 'circumradius'),
    shape: d ? { points: d.mesh.points, offsets: d.mesh.cellOffsets, nodes: d.mesh.cellNodes, coords: d.coords } : null,
    flags: g.flags,
    cause: r.cause,
    extras: ex.map((c) => c.values),
    header: names.concat(ex.map((c) => c.name)).join(',') + '\n',
    // index, type, the numbers, flags, cause, extra numbers, separators
    rowMax: 32 + (numeric.length + ex.length) * (MAX_NUMBER_BYTES + 1) + longestText,
  };
}

/** Rows whose shape measures are computed at once when they are computed block by block. */
const SHAPE_BLOCK = 512;
let shapeScratch: ShapeGeometry | null = null;

/**
 * Rows from `from` on, written at out[pos..], until row `to` or until the next row might not fit.
 * Returns the next row and the end of the bytes written.
 */
export function writeCsvRows(t: CsvTable, out: Uint8Array, pos: number, from: number, to: number): { row: number; pos: number } {
  const { fl, cs } = texts();
  const { types, columns, emptyForQuad, flags, cause, extras, rowMax } = t;
  const limit = out.length - rowMax;
  const nc = columns.length;
  const cols: Float64Array[] = new Array(nc);
  const shift = new Int32Array(nc);
  const source = t.shape ? bareMesh(t.shape.points, t.shape.offsets, t.shape.nodes, types, t.nCells) : null;
  let p = pos;
  let i = from;
  while (i < to && p <= limit) {
    const end = Math.min(to, i + SHAPE_BLOCK);
    for (let k = 0; k < nc; k++) {
      const c = columns[k]!;
      if (typeof c !== 'string') { cols[k] = c; shift[k] = 0; continue; }
      shapeScratch ??= allocShape(SHAPE_BLOCK);
      cols[k] = shapeScratch[c];
      shift[k] = i;
    }
    if (source && shapeScratch) shapeRange(source, shapeScratch, i, end, t.shape!.coords, i);
    for (; i < end && p <= limit; i++) {
      const q = types[i] === QUAD;
      p = writeInteger(out, p, i);
      p = put(out, p, q ? QUAD_TEXT : TRIANGLE_TEXT);
      for (let k = 0; k < nc; k++) {
        if (k > 0) out[p++] = 44;
        if (!q || !emptyForQuad[k]) p = writeNumber(out, p, cols[k]![i - shift[k]!]!);
      }
      out[p++] = 44;
      p = put(out, p, fl[flags[i]!]!);
      out[p++] = 44;
      p = put(out, p, cs[cause[i]!]!);
      for (let k = 0; k < extras.length; k++) {
        out[p++] = 44;
        p = writeNumber(out, p, extras[k]![i]!);
      }
      out[p++] = 10;
    }
  }
  return { row: i, pos: p };
}

/**
 * The table as byte chunks of about `chunkBytes` each, rows written straight into the buffer
 * (no string per value or per row). The buffer is reused: a chunk is valid until the next
 * one is requested (write it out, or copy it, before continuing).
 */
export function* cellsCsvBytes(r: AuditResult, extra: ExtraColumns = [], chunkBytes = 2 ** 20, set: CsvColumnSet = 'standard'): Generator<Uint8Array> {
  const t = csvTable(r, extra, set);
  const header = textEncoder.encode(t.header);
  // one buffer for every chunk: fresh pages cost far more than the rows written into them
  const buf = new Uint8Array(Math.max(chunkBytes, header.length + t.rowMax));
  let at = { row: 0, pos: put(buf, 0, header) };
  for (;;) {
    at = writeCsvRows(t, buf, at.pos, at.row, t.nCells);
    if (at.row >= t.nCells) break;
    yield buf.subarray(0, at.pos);
    at.pos = 0;
  }
  if (at.pos > 0) yield buf.subarray(0, at.pos);
}

/** The table as text chunks (rows are never split across chunks). */
export function* cellsCsvChunks(r: AuditResult, extra: ExtraColumns = [], set: CsvColumnSet = 'standard'): Generator<string> {
  for (const chunk of cellsCsvBytes(r, extra, 2 ** 20, set)) yield textDecoder.decode(chunk);
}

/** The whole table as one string (small meshes, tests, the browser export). */
export function cellsCsv(r: AuditResult, extra: ExtraColumns = [], set: CsvColumnSet = 'standard'): string {
  let s = '';
  for (const chunk of cellsCsvChunks(r, extra, set)) s += chunk;
  return s;
}
