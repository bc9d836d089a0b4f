/**
 * Drawing and picking buffers built from a Mesh (worker side, no DOM).
 * Vertices are unshared so that each one carries its cell id; coordinates are shifted by a
 * centre in float64 before the float32 conversion so that map coordinates keep their detail.
 */
import Flatbush from 'flatbush';
import { QUAD, type Mesh } from '../../mesh/model.js';
import { cellBox } from '../cellbox.js';

export interface Bounds {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** Bounding box of the points that cells use (unused points in a file do not widen it). */
export function usedBounds(mesh: Mesh): Bounds {
  const p = mesh.points;
  const nodes = mesh.cellNodes;
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let k = 0; k < nodes.length; k++) {
    const v = nodes[k]!;
    const x = p[2 * v]!;
    const y = p[2 * v + 1]!;
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  if (minX > maxX) return { minX: 0, minY: 0, maxX: 0, maxY: 0 };
  return { minX, minY, maxX, maxY };
}

export function countQuads(mesh: Mesh): number {
  let n = 0;
  const t = mesh.cellTypes;
  for (let i = 0; i < t.length; i++) if (t[i] === QUAD) n++;
  return n;
}

function orient(p: Float64Array, a: number, b: number, c: number): number {
  const ax = p[2 * a]!, ay = p[2 * a + 1]!;
  return (p[2 * b]! - ax) * (p[2 * c + 1]! - ay) - (p[2 * b + 1]! - ay) * (p[2 * c]! - ax);
}

/**
 * Triangles to draw: three unshared vertices each, x and y relative to (cx, cy), and the cell id
 * of every vertex. A quad becomes two triangles with the same cell id, split along the diagonal
 * that lies inside it (matters for non-convex quads).
 */
export function renderBuffers(mesh: Mesh, cx: number, cy: number): { positions: Float32Array; cellIds: Float32Array } {
  const nQuads = countQuads(mesh);
  const nTri = mesh.nCells + nQuads;
  const positions = new Float32Array(nTri * 6);
  const cellIds = new Float32Array(nTri * 3);
  const p = mesh.points;
  const off = mesh.cellOffsets;
  const nodes = mesh.cellNodes;
  let v = 0;
  for (let i = 0; i < mesh.nCells; i++) {
    const s = off[i]!;
    const a = nodes[s]!, b = nodes[s + 1]!, c = nodes[s + 2]!;
    if (off[i + 1]! - s === 3) {
      putTriangle(positions, cellIds, v, p, a, b, c, cx, cy, i);
      v += 3;
      continue;
    }
    const d = nodes[s + 3]!;
    const o1 = orient(p, a, b, c), o2 = orient(p, a, c, d);
    if (o1 * (o1 + o2) >= 0 && o2 * (o1 + o2) >= 0) {
      putTriangle(positions, cellIds, v, p, a, b, c, cx, cy, i);
      putTriangle(positions, cellIds, v + 3, p, a, c, d, cx, cy, i);
    } else {
      putTriangle(positions, cellIds, v, p, b, c, d, cx, cy, i);
      putTriangle(positions, cellIds, v + 3, p, b, d, a, cx, cy, i);
    }
    v += 6;
  }
  return { positions, cellIds };
}

function putTriangle(pos: Float32Array, ids: Float32Array, v: number, p: Float64Array, a: number, b: number, c: number, cx: number, cy: number, cell: number): void {
  pos[2 * v] = p[2 * a]! - cx;
  pos[2 * v + 1] = p[2 * a + 1]! - cy;
  pos[2 * v + 2] = p[2 * b]! - cx;
  pos[2 * v + 3] = p[2 * b + 1]! - cy;
  pos[2 * v + 4] = p[2 * c]! - cx;
  pos[2 * v + 5] = p[2 * c + 1]! - cy;
  ids[v] = ids[v + 1] = ids[v + 2] = cell;
}

/** Flatbush index of the cells' bounding boxes; item i is cell i. Returns the index's buffer. */
export function cellIndex(mesh: Mesh): ArrayBuffer {
  const n = Math.max(mesh.nCells, 1);
  const index = new Flatbush(n);
  const box = new Float64Array(4);
  for (let i = 0; i < mesh.nCells; i++) {
    cellBox(mesh.points, mesh.cellOffsets, mesh.cellNodes, i, box);
    index.add(box[0]!, box[1]!, box[2]!, box[3]!);
  }
  // Flatbush needs at least one item: an empty mesh gets one box nobody can hit.
  if (mesh.nCells === 0) index.add(Infinity, Infinity, Infinity, Infinity);
  index.finish();
  return index.data as ArrayBuffer;
}

/**
 * Every edge once (two cells sharing an edge draw it once): two vertices per edge relative to
 * (cx, cy), and each edge's length at both of its vertices so the shader can hide edges too
 * short to see. Edges are keyed lo * nPoints + hi in float64 (exact below 9e7 points) and sorted.
 */
export function uniqueEdges(mesh: Mesh, cx: number, cy: number): { positions: Float32Array; lengths: Float32Array } {
  const off = mesh.cellOffsets;
  const nodes = mesh.cellNodes;
  const np = mesh.nPoints;
  const keys = new Float64Array(nodes.length);
  let m = 0;
  for (let i = 0; i < mesh.nCells; i++) {
    const s = off[i]!;
    const e = off[i + 1]!;
    for (let k = s; k < e; k++) {
      const a = nodes[k]!;
      const b = nodes[k + 1 < e ? k + 1 : s]!;
      keys[m++] = a < b ? a * np + b : b * np + a;
    }
  }
  const sorted = keys.subarray(0, m).sort();
  let u = 0;
  for (let k = 0; k < m; k++) if (k === 0 || sorted[k] !== sorted[k - 1]) sorted[u++] = sorted[k]!;
  const positions = new Float32Array(u * 4);
  const lengths = new Float32Array(u * 2);
  const p = mesh.points;
  for (let k = 0; k < u; k++) {
    const key = sorted[k]!;
    const a = Math.floor(key / np);
    const b = key - a * np;
    const ax = p[2 * a]!, ay = p[2 * a + 1]!, bx = p[2 * b]!, by = p[2 * b + 1]!;
    positions[4 * k] = ax - cx;
    positions[4 * k + 1] = ay - cy;
    positions[4 * k + 2] = bx - cx;
    positions[4 * k + 3] = by - cy;
    lengths[2 * k] = lengths[2 * k + 1] = Math.hypot(bx - ax, by - ay);
  }
  return { positions, lengths };
}

/** x, y interleaved from two coordinate arrays. */
export function interleave(xs: ArrayLike<number>, ys: ArrayLike<number>): Float64Array {
  const out = new Float64Array(xs.length * 2);
  for (let i = 0; i < xs.length; i++) {
    out[2 * i] = xs[i]!;
    out[2 * i + 1] = ys[i]!;
  }
  return out;
}
