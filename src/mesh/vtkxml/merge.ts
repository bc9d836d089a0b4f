/**
 * Several pieces as one: points concatenated, node indices of piece k shifted by the points of
 * the pieces before it, cells in piece order, arrays joined by name.
 */
import { MeshInputError } from '../errors.js';
import type { DataArray } from '../model.js';
import type { PieceData } from './piece.js';

/** Arrays of the same name joined across pieces; those missing or shaped differently somewhere are left out with a warning. */
export function joinArrays(lists: DataArray[][], what: string, warnings: string[]): DataArray[] {
  const out: DataArray[] = [];
  const names = new Set<string>();
  for (const list of lists) for (const a of list) names.add(a.name);
  for (const name of names) {
    const parts: DataArray[] = [];
    for (const list of lists) {
      const a = list.find((x) => x.name === name);
      if (a) parts.push(a);
    }
    const m = parts[0]!.components;
    if (parts.length !== lists.length || parts.some((a) => a.components !== m)) {
      warnings.push(`${what} array "${name}" is missing or shaped differently in some pieces and was left out`);
      continue;
    }
    let total = 0;
    for (const a of parts) total += a.values.length;
    const values = parts.every((a) => a.values instanceof Float32Array) ? new Float32Array(total) : new Float64Array(total);
    let at = 0;
    for (const a of parts) {
      values.set(a.values, at);
      at += a.values.length;
    }
    out.push({ name, components: m, values });
  }
  return out;
}

export function mergePieces(pieces: PieceData[], warnings: string[]): PieceData {
  if (pieces.length === 1) return pieces[0]!;
  const first = pieces[0]!;
  let nPoints = 0;
  let nCells = 0;
  let nConn = 0;
  let dim = 0;
  for (const p of pieces) {
    if (p.nPoints > 0) {
      if (dim !== 0 && p.dim !== dim) throw new MeshInputError(`pieces have points with ${dim} and ${p.dim} components`, p.pointsLoc);
      dim = p.dim;
    }
    nPoints += p.nPoints;
    nCells += p.types.length;
    nConn += p.conn.length;
  }
  if (dim === 0) dim = 3;
  if (nConn > 0x7fffffff) throw new MeshInputError(`connectivity of ${nConn} entries is too large`, first.connLoc);
  const coords = new Float64Array(nPoints * dim);
  const conn = new Int32Array(nConn);
  const starts = new Int32Array(nCells + 1);
  const types = new Float64Array(nCells);
  let pointBase = 0;
  let cellBase = 0;
  let connBase = 0;
  for (const p of pieces) {
    coords.set(p.coords.subarray(0, p.nPoints * dim), pointBase * dim);
    const c = p.conn;
    for (let i = 0; i < c.length; i++) {
      const v = c[i]!;
      // indices are local to their piece
      if (!(v >= 0 && v < p.nPoints) || !Number.isInteger(v)) {
        throw new MeshInputError(`connectivity entry ${i} is ${v}, outside this piece's points 0..${p.nPoints - 1}`, p.connLoc);
      }
      conn[connBase + i] = v + pointBase;
    }
    const n = p.types.length;
    for (let i = 0; i < n; i++) {
      types[cellBase + i] = p.types[i]!;
      starts[cellBase + i + 1] = p.starts[i + 1]! + connBase;
    }
    pointBase += p.nPoints;
    cellBase += n;
    connBase += c.length;
  }
  return {
    nPoints, coords, dim, pointsLoc: first.pointsLoc, types, starts, conn,
    connLoc: first.connLoc, typesLoc: first.typesLoc,
    pointData: joinArrays(pieces.map((p) => p.pointData), 'point', warnings),
    cellData: joinArrays(pieces.map((p) => p.cellData), 'cell', warnings),
    encoding: pieces.find((p) => p.encoding !== null)?.encoding ?? null,
  };
}
