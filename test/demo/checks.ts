/**
 * Independent cell arithmetic for the demo-mesh tests (area, perimeter, h = 2A/P, edges), written
 * here from the definitions rather than taken from src/geometry, plus the shipped-file comparison.
 */
import { readFileSync, existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';
import type { DataArray, Mesh } from '../../src/mesh/model.js';

export interface CellStats {
  /** Signed (shoelace) area, positive when the nodes run counter-clockwise. */
  area: Float64Array;
  perimeter: Float64Array;
  longest: Float64Array;
  /** h = 2A/P. */
  h: Float64Array;
  /** Mean of the node coordinates. */
  cx: Float64Array;
  cy: Float64Array;
  /** Smallest cross product of consecutive edges, over the corners (positive for a convex CCW cell). */
  minCorner: Float64Array;
}

export function cellStats(m: Mesh): CellStats {
  const n = m.nCells;
  const s: CellStats = {
    area: new Float64Array(n), perimeter: new Float64Array(n), longest: new Float64Array(n),
    h: new Float64Array(n), cx: new Float64Array(n), cy: new Float64Array(n), minCorner: new Float64Array(n),
  };
  const p = m.points;
  for (let c = 0; c < n; c++) {
    const start = m.cellOffsets[c]!;
    const k = m.cellOffsets[c + 1]! - start;
    const x0 = p[2 * m.cellNodes[start]!]!;
    const y0 = p[2 * m.cellNodes[start]! + 1]!;
    let twiceA = 0, per = 0, longest = 0, sx = 0, sy = 0, minCorner = Infinity;
    for (let i = 0; i < k; i++) {
      const a = m.cellNodes[start + i]!;
      const b = m.cellNodes[start + ((i + 1) % k)]!;
      const d = m.cellNodes[start + ((i + 2) % k)]!;
      const ax = p[2 * a]! - x0, ay = p[2 * a + 1]! - y0;
      const bx = p[2 * b]! - x0, by = p[2 * b + 1]! - y0;
      const dx = p[2 * d]! - x0, dy = p[2 * d + 1]! - y0;
      twiceA += ax * by - bx * ay;
      const len = Math.hypot(bx - ax, by - ay);
      per += len;
      longest = Math.max(longest, len);
      minCorner = Math.min(minCorner, (bx - ax) * (dy - by) - (by - ay) * (dx - bx));
      sx += p[2 * a]!;
      sy += p[2 * a + 1]!;
    }
    s.area[c] = twiceA / 2;
    s.perimeter[c] = per;
    s.longest[c] = longest;
    s.h[c] = twiceA / per;
    s.cx[c] = sx / k;
    s.cy[c] = sy / k;
    s.minCorner[c] = minCorner;
  }
  return s;
}

/** Cell value of a point array: the mean over the cell's nodes (common practice), one component. */
export function cellMean(m: Mesh, a: DataArray, component = 0): Float64Array {
  const out = new Float64Array(m.nCells);
  for (let c = 0; c < m.nCells; c++) {
    const s = m.cellOffsets[c]!;
    const e = m.cellOffsets[c + 1]!;
    let sum = 0;
    for (let i = s; i < e; i++) sum += a.values[m.cellNodes[i]! * a.components + component]!;
    out[c] = sum / (e - s);
  }
  return out;
}

export function field(m: Mesh, name: string): DataArray {
  const a = m.pointData.find((d) => d.name === name);
  if (!a) throw new Error(`no point array ${name}`);
  return a;
}

/** Indices of the k smallest values. */
export function smallest(v: Float64Array, k: number): number[] {
  return Array.from(v.keys()).sort((a, b) => v[a]! - v[b]!).slice(0, k);
}

export interface EdgeCheck {
  /** Edges used by more than two cells, or twice in the same direction. */
  bad: number;
  /** Total length of edges used by one cell only. */
  boundaryLength: number;
  /** Node pairs (a, b) of every edge, each once. */
  pairs: Int32Array;
}

/** Edge use: a conforming, consistently oriented mesh uses an inner edge once in each direction. */
export function edgeCheck(m: Mesh): EdgeCheck {
  const uses = new Map<number, number>();
  const n = m.nPoints;
  for (let c = 0; c < m.nCells; c++) {
    const s = m.cellOffsets[c]!;
    const k = m.cellOffsets[c + 1]! - s;
    for (let i = 0; i < k; i++) {
      const a = m.cellNodes[s + i]!;
      const b = m.cellNodes[s + ((i + 1) % k)]!;
      const key = Math.min(a, b) * n + Math.max(a, b);
      // low digit: uses a→b with a < b; high digit: uses b→a
      uses.set(key, (uses.get(key) ?? 0) + (a < b ? 1 : 100));
    }
  }
  let bad = 0;
  let boundaryLength = 0;
  const pairs = new Int32Array(uses.size * 2);
  let j = 0;
  for (const [key, u] of uses) {
    const a = Math.floor(key / n);
    const b = key - a * n;
    pairs[j++] = a;
    pairs[j++] = b;
    if (u === 1 || u === 100) boundaryLength += Math.hypot(m.points[2 * a]! - m.points[2 * b]!, m.points[2 * a + 1]! - m.points[2 * b + 1]!);
    else if (u !== 101) bad++;
  }
  return { bad, boundaryLength, pairs };
}

/**
 * Area and length lost by drawing an arc of a circle through its nodes in the mesh: the nodes at
 * distance r from (x, y) with angles in [a0, a1], sorted by angle; each chord cuts off a circular
 * segment of area r²/2·(θ − sin θ) and shortens the arc by rθ − 2r·sin(θ/2). A span of 2π is a
 * whole circle.
 */
export function chordDeficit(m: Mesh, x: number, y: number, r: number, a0: number, a1: number): { area: number; length: number; nodes: number } {
  const angles: number[] = [];
  for (let i = 0; i < m.nPoints; i++) {
    const dx = m.points[2 * i]! - x;
    const dy = m.points[2 * i + 1]! - y;
    if (Math.abs(Math.hypot(dx, dy) - r) > 1e-9 * r) continue;
    let a = Math.atan2(dy, dx);
    if (a < a0 - 1e-9) a += 2 * Math.PI;
    if (a <= a1 + 1e-9) angles.push(a);
  }
  angles.sort((p, q) => p - q);
  const n = angles.length;
  // a whole circle also closes from its last node back to its first
  if (a1 - a0 >= 2 * Math.PI - 1e-12 && n > 0) angles.push(angles[0]! + 2 * Math.PI);
  let area = 0;
  let length = 0;
  for (let i = 0; i + 1 < angles.length; i++) {
    const t = angles[i + 1]! - angles[i]!;
    area += (r * r / 2) * (t - Math.sin(t));
    length += r * t - 2 * r * Math.sin(t / 2);
  }
  return { area, length, nodes: n };
}

export function sameBytes(a: Uint8Array, b: Uint8Array): boolean {
  return Buffer.compare(Buffer.from(a.buffer, a.byteOffset, a.length), Buffer.from(b.buffer, b.byteOffset, b.length)) === 0;
}

/** The shipped file in meshes/ must be byte for byte what the generator and writer produce now. */
export function expectShipped(file: string, generated: Uint8Array): void {
  const path = fileURLToPath(new URL(`../../meshes/${file}`, import.meta.url));
  expect(existsSync(path), `meshes/${file} is missing: run npm run demo-meshes`).toBe(true);
  expect(sameBytes(new Uint8Array(readFileSync(path)), generated), `meshes/${file} differs from the generator's output: run npm run demo-meshes`).toBe(true);
}
