/**
 * The per-cell table: a header row, then one row per 2-D cell in file order. Numbers in the
 * shortest form that parses back to the same double; an unlimited step is written `inf`.
 */
import type { AuditResult } from '../audit/audit.js';
import { causeList } from '../audit/audit.js';
import { FLAG_DEGENERATE, FLAG_INVERTED, FLAG_NONCONVEX, FLAG_REPEATED_NODE } from '../geometry/cells.js';
import { QUAD } from '../mesh/model.js';
import { MAX_NUMBER_BYTES, writeInteger, writeNumber } from './digits.js';

export const CSV_COLUMNS = [
  'cell', 'type', 'area', 'perimeter', 'inradius', 'circumradius', 'speed', 'dt', 'radius_ratio', 'min_angle',
  'max_angle', 'aspect_ratio', 'scaled_jacobian', 'condition', 'edge_ratio', 'centroid_x', 'centroid_y', 'flags', 'cause',
];

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

/** The arrays one table row is made of (plain typed arrays, so threads can share them). */
export interface CsvTable {
  nCells: number;
  types: Uint8Array;
  /** The 15 numeric columns from area to centroid_y, in CSV_COLUMNS order. */
  columns: Float64Array[];
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

export function csvTable(r: AuditResult, extra: ExtraColumns = []): CsvTable {
  const { fl, cs } = texts();
  const g = r.geom;
  const ex = extraColumns(r, extra);
  let longestText = 0;
  for (let v = 0; v < 256; v++) longestText = Math.max(longestText, fl[v]!.length + cs[v]!.length);
  return {
    nCells: r.mesh.nCells,
    types: r.mesh.cellTypes,
    columns: [g.area, g.perimeter, g.inradius, g.circumradius, r.speed, r.dt, g.radiusRatio, g.minAngle, g.maxAngle,
      g.aspectRatio, g.scaledJacobian, g.condition, g.edgeRatio, g.centroidX, g.centroidY],
    flags: g.flags,
    cause: r.cause,
    extras: ex.map((c) => c.values),
    header: CSV_COLUMNS.concat(ex.map((c) => c.name)).join(',') + '\n',
    // index, type, 15 numbers, flags, cause, extra numbers, separators
    rowMax: 32 + (15 + ex.length) * (MAX_NUMBER_BYTES + 1) + longestText,
  };
}

/**
 * Rows from `from` on, written at out[pos..], until row `to` or until the next row might not fit.
 * Returns the next row and the end of the bytes written.
 */
export function writeCsvRows(t: CsvTable, out: Uint8Array, pos: number, from: number, to: number): { row: number; pos: number } {
  const { fl, cs } = texts();
  const { types, columns, flags, cause, extras, rowMax } = t;
  const limit = out.length - rowMax;
  let p = pos;
  let i = from;
  for (; i < to && p <= limit; i++) {
    const q = types[i] === QUAD;
    p = writeInteger(out, p, i);
    p = put(out, p, q ? QUAD_TEXT : TRIANGLE_TEXT);
    for (let k = 0; k < columns.length; k++) {
      if (k > 0) out[p++] = 44;
      // circumradius (column 3) is left empty for quads
      if (k !== 3 || !q) p = writeNumber(out, p, columns[k]![i]!);
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
  return { row: i, pos: p };
}

/**
 * The table as byte chunks of about `chunkBytes` each, rows written straight into the buffer
 * (no string per value or per row). The buffer is reused: a chunk is valid until the next
 * one is requested (write it out, or copy it, before continuing).
 */
export function* cellsCsvBytes(r: AuditResult, extra: ExtraColumns = [], chunkBytes = 2 ** 20): Generator<Uint8Array> {
  const t = csvTable(r, extra);
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
export function* cellsCsvChunks(r: AuditResult, extra: ExtraColumns = []): Generator<string> {
  for (const chunk of cellsCsvBytes(r, extra)) yield textDecoder.decode(chunk);
}

/** The whole table as one string (small meshes, tests, the browser export). */
export function cellsCsv(r: AuditResult, extra: ExtraColumns = []): string {
  let s = '';
  for (const chunk of cellsCsvChunks(r, extra)) s += chunk;
  return s;
}
