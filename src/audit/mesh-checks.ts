/**
 * Mesh hygiene counts that the cell-by-cell geometry cannot see: points at the same place,
 * points no cell uses, and cells that share no edge with any other cell.
 *
 * Flat typed arrays and O(n) work whatever the mesh: coincident points through a hash table of
 * point indices, shared edges through two stable counting-sort passes over the half-edges (no
 * per-node scans, so a node shared by a million cells costs no more than any other).
 */
import type { Mesh } from '../mesh/model.js';

export interface MeshChecks {
  /** Points at exactly the coordinates of another point: a group of k such points counts k − 1. */
  duplicatePoints: number;
  /** Points that no cell uses. */
  unusedPoints: number;
  /** Cells that share no edge with another cell (a one-cell mesh has one). */
  isolatedCells: number;
}

/**
 * One stable counting-sort pass: `order` (a permutation of items) is rearranged into `out` by
 * `digit[item]` in [0, nBuckets). Returns false, leaving `out` untouched, when every item has the
 * same digit (the pass would not change the order).
 */
function countingPass(order: Int32Array, out: Int32Array, digit: Int32Array, count: Int32Array, nBuckets: number): boolean {
  const n = order.length;
  count.fill(0, 0, nBuckets + 1);
  for (let k = 0; k < n; k++) count[digit[order[k]!]! + 1]!++;
  if (n === 0 || count[digit[order[0]!]! + 1] === n) return false;
  for (let b = 0; b < nBuckets; b++) count[b + 1]! += count[b]!;
  for (let k = 0; k < n; k++) {
    const i = order[k]!;
    out[count[digit[i]!]!++] = i;
  }
  return true;
}

/** 0..n-1. */
function identity(n: number): Int32Array {
  const a = new Int32Array(n);
  for (let i = 0; i < n; i++) a[i] = i;
  return a;
}

/** Mixes the four 32-bit words of a point's (x, y) into a table slot. */
function slot(w: Uint32Array, p: number, mask: number): number {
  let h = Math.imul(w[p]! ^ 0x9e3779b9, 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13) ^ w[p + 1]!, 0xc2b2ae35);
  h = Math.imul(h ^ (h >>> 16) ^ w[p + 2]!, 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13) ^ w[p + 3]!, 0xc2b2ae35);
  return (h ^ (h >>> 16)) & mask;
}

/**
 * Points at bit-identical (x, y) (-0 read as +0), found with an open-addressing table of point
 * indices: one probe sequence per point, so even a million points at one place stay O(n).
 */
function countDuplicatePoints(mesh: Mesh): number {
  const n = mesh.nPoints;
  if (n < 2) return 0;
  const xy = new Float64Array(2 * n);
  for (let k = 0; k < 2 * n; k++) xy[k] = mesh.points[k]! + 0;
  const w = new Uint32Array(xy.buffer);
  let cap = 16;
  while (cap < 2 * n) cap *= 2;
  const table = new Int32Array(cap).fill(-1);
  const mask = cap - 1;
  let dup = 0;
  for (let i = 0; i < n; i++) {
    const p = 4 * i;
    let h = slot(w, p, mask);
    for (;;) {
      const j = table[h]!;
      if (j < 0) { table[h] = i; break; }
      const q = 4 * j;
      if (w[p] === w[q] && w[p + 1] === w[q + 1] && w[p + 2] === w[q + 2] && w[p + 3] === w[q + 3]) { dup++; break; }
      h = (h + 1) & mask;
    }
  }
  return dup;
}

function countUnusedPoints(mesh: Mesh): number {
  const used = new Uint8Array(mesh.nPoints);
  const nodes = mesh.cellNodes;
  const end = mesh.cellOffsets[mesh.nCells]!;
  for (let k = 0; k < end; k++) used[nodes[k]!] = 1;
  let unused = 0;
  for (let p = 0; p < mesh.nPoints; p++) if (used[p] === 0) unused++;
  return unused;
}

/**
 * Cells with no side in common with another cell. Half-edges are grouped by node pair (sorted by
 * the larger node, then stably by the smaller); a group with two or more cells links them all.
 * A collapsed side (both ends one node) is no edge; a non-manifold edge (three cells) is fine.
 */
function countIsolatedCells(mesh: Mesh): number {
  const { nCells, nPoints, cellOffsets: off, cellNodes: nodes } = mesh;
  const total = off[nCells]!;
  const lo = new Int32Array(total);
  const hi = new Int32Array(total);
  const cell = new Int32Array(total);
  let m = 0;
  for (let c = 0; c < nCells; c++) {
    const s = off[c]!, e = off[c + 1]!;
    for (let k = s; k < e; k++) {
      const a = nodes[k]!, b = nodes[k + 1 < e ? k + 1 : s]!;
      if (a === b) continue;
      lo[m] = a < b ? a : b;
      hi[m] = a < b ? b : a;
      cell[m] = c;
      m++;
    }
  }
  const count = new Int32Array(nPoints + 1);
  let order: Int32Array = identity(m);
  let spare: Int32Array = new Int32Array(m);
  for (const key of [hi, lo]) {
    if (!countingPass(order, spare, key.subarray(0, m), count, nPoints)) continue;
    const t = order;
    order = spare;
    spare = t;
  }
  const linked = new Uint8Array(nCells);
  for (let g = 0; g < m; ) {
    const first = order[g]!;
    let end = g + 1;
    let shared = false;
    while (end < m && lo[order[end]!] === lo[first] && hi[order[end]!] === hi[first]) {
      if (cell[order[end]!] !== cell[first]) shared = true;
      end++;
    }
    if (shared) for (let k = g; k < end; k++) linked[cell[order[k]!]!] = 1;
    g = end;
  }
  let isolated = 0;
  for (let c = 0; c < nCells; c++) if (linked[c] === 0) isolated++;
  return isolated;
}

/** Duplicate points, unused points and isolated cells of a mesh read by any reader. */
export function meshChecks(mesh: Mesh): MeshChecks {
  return {
    duplicatePoints: countDuplicatePoints(mesh),
    unusedPoints: countUnusedPoints(mesh),
    isolatedCells: countIsolatedCells(mesh),
  };
}
