/**
 * The per-cell table: a header row, then one row per 2-D cell in file order. Numbers in the
 * shortest form that parses back to the same double; an unlimited step is written `inf`.
 */
import type { AuditResult } from '../audit/audit.js';
import { CAUSE_DEGENERATE, CAUSE_FAST, CAUSE_SHAPE, CAUSE_SMALL } from '../audit/audit.js';
import { FLAG_DEGENERATE, FLAG_INVERTED, FLAG_NONCONVEX, FLAG_REPEATED_NODE } from '../geometry/cells.js';
import { QUAD } from '../mesh/model.js';
import { num } from './format.js';

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
  const parts: string[] = [];
  if (c & CAUSE_DEGENERATE) parts.push('degenerate');
  if (c & CAUSE_SMALL) parts.push('small');
  if (c & CAUSE_SHAPE) parts.push('shape');
  if (c & CAUSE_FAST) parts.push('fast');
  return parts.join(';');
}

/** Extra per-cell columns later features add (name → values), written after the standard ones. */
export type ExtraColumns = { name: string; values: Float64Array | Int32Array }[];

function extraColumns(r: AuditResult, extra: ExtraColumns): ExtraColumns {
  const cols: ExtraColumns = [];
  if (r.courantAtDt) cols.push({ name: 'courant', values: r.courantAtDt });
  return cols.concat(r.columns, extra);
}

/** The table in chunks of about `rows` rows each (a big mesh never becomes one huge string). */
export function* cellsCsvChunks(r: AuditResult, extra: ExtraColumns = [], rows = 20000): Generator<string> {
  const g = r.geom;
  const types = r.mesh.cellTypes;
  const ex = extraColumns(r, extra);
  const header = CSV_COLUMNS.concat(ex.map((c) => c.name)).join(',') + '\n';
  const n = r.mesh.nCells;
  let buf = header;
  for (let i = 0; i < n; i++) {
    const q = types[i] === QUAD;
    let line = i + (q ? ',quad,' : ',triangle,') + num(g.area[i]!) + ',' + num(g.perimeter[i]!) + ',' + num(g.inradius[i]!) + ',' +
      (q ? '' : num(g.circumradius[i]!)) + ',' + num(r.speed[i]!) + ',' + num(r.dt[i]!) + ',' + num(g.radiusRatio[i]!) + ',' +
      num(g.minAngle[i]!) + ',' + num(g.maxAngle[i]!) + ',' + num(g.aspectRatio[i]!) + ',' + num(g.scaledJacobian[i]!) + ',' +
      num(g.condition[i]!) + ',' + num(g.edgeRatio[i]!) + ',' + num(g.centroidX[i]!) + ',' + num(g.centroidY[i]!) + ',' +
      flagText(g.flags[i]!) + ',' + causeText(r.cause[i]!);
    for (let k = 0; k < ex.length; k++) line += ',' + num(ex[k]!.values[i]!);
    buf += line + '\n';
    if ((i + 1) % rows === 0) { yield buf; buf = ''; }
  }
  if (buf.length) yield buf;
}

/** The whole table as one string (small meshes, tests, the browser export). */
export function cellsCsv(r: AuditResult, extra: ExtraColumns = []): string {
  let s = '';
  for (const chunk of cellsCsvChunks(r, extra)) s += chunk;
  return s;
}
