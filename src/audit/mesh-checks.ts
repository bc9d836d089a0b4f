/**
 * Mesh hygiene counts that the cell-by-cell geometry cannot see: points at the same place,
 * points no cell uses, and cells that share no edge with any other cell.
 *
 * Flat typed arrays and O(n) work whatever the mesh: coincident points through a hash table of
 * point indices, shared edges through buckets of half-edges by their smaller node (a node shared
 * by a million cells costs no more than any other).
 */
import type { Mesh } from '../mesh/model.js';
import { HI_WORD as HI } from '../mesh/host.js';

export interface MeshChecks {
  /** Points at exactly the coordinates of another point: a group of k such points counts k − 1. */
  duplicatePoints: number;
  /** Points that no cell uses. */
  unusedPoints: number;
  /** Cells that share no edge with another cell (a one-cell mesh has one). */
  isolatedCells: number;
}


/** The four 32-bit words of point p's (x, y), with -0 read as +0, into `key`. */
function pointKey(w: Uint32Array, p: number, key: Uint32Array): void {
  for (let k = 0; k < 2; k++) {
    const lo = w[4 * p + 2 * k + 1 - HI]!;
    let hi = w[4 * p + 2 * k + HI]!;
    if (hi === 0x80000000 && lo === 0) hi = 0;
    key[2 * k] = lo;
    key[2 * k + 1] = hi;
  }
}

/** Mixes the four 32-bit words of a point key into a table slot. */
function slot(k: Uint32Array, mask: number): number {
  let h = Math.imul(k[0]! ^ 0x9e3779b9, 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13) ^ k[1]!, 0xc2b2ae35);
  h = Math.imul(h ^ (h >>> 16) ^ k[2]!, 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13) ^ k[3]!, 0xc2b2ae35);
  return (h ^ (h >>> 16)) & mask;
}

/**
 * Points at bit-identical (x, y) (-0 read as +0), found with an open-addressing table of point
 * indices: one probe sequence per point, so even a million points at one place stay O(n).
 */
function countDuplicatePoints(mesh: Mesh): number {
  const n = mesh.nPoints;
  if (n < 2) return 0;
  const pts = mesh.points;
  const w = new Uint32Array(pts.buffer, pts.byteOffset, 4 * n);
  let cap = 16;
  while (cap < 2 * n) cap *= 2;
  const table = new Int32Array(cap).fill(-1);
  const mask = cap - 1;
  const kp = new Uint32Array(4), kq = new Uint32Array(4);
  let dup = 0;
  for (let i = 0; i < n; i++) {
    pointKey(w, i, kp);
    let h = slot(kp, mask);
    for (;;) {
      const j = table[h]!;
      if (j < 0) { table[h] = i; break; }
      pointKey(w, j, kq);
      if (kp[0] === kq[0] && kp[1] === kq[1] && kp[2] === kq[2] && kp[3] === kq[3]) { dup++; break; }
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
 * Cells with no side in common with another cell. Half-edges are put in buckets by their smaller
 * node (a counting sort); inside a bucket, the half-edges with the same larger node are one edge,
 * and an edge held by two or more cells links them all. A collapsed side (both ends one node) is
 * no edge; a non-manifold edge (three cells) is fine.
 */
function countIsolatedCells(mesh: Mesh): number {
  const { nCells, nPoints, cellOffsets: off, cellNodes: nodes } = mesh;
  const start = new Int32Array(nPoints + 1);
  for (let c = 0; c < nCells; c++) {
    const s = off[c]!, e = off[c + 1]!;
    for (let k = s; k < e; k++) {
      const a = nodes[k]!, b = nodes[k + 1 < e ? k + 1 : s]!;
      if (a !== b) start[(a < b ? a : b) + 1]!++;
    }
  }
  for (let p = 0; p < nPoints; p++) start[p + 1]! += start[p]!;
  const m = start[nPoints]!;
  // per bucket entry: the larger node and the cell
  const other = new Int32Array(m);
  const cellOf = new Int32Array(m);
  const fill = start.slice(0, nPoints);
  for (let c = 0; c < nCells; c++) {
    const s = off[c]!, e = off[c + 1]!;
    for (let k = s; k < e; k++) {
      const a = nodes[k]!, b = nodes[k + 1 < e ? k + 1 : s]!;
      if (a === b) continue;
      const j = fill[a < b ? a : b]!++;
      other[j] = a < b ? b : a;
      cellOf[j] = c;
    }
  }
  // per larger node q, within the bucket of p: the first cell seen on edge (p, q) (stamped by p)
  const stamp = fill.fill(-1);
  const firstCell = new Int32Array(nPoints);
  const linked = new Uint8Array(nCells);
  for (let p = 0; p < nPoints; p++) {
    for (let j = start[p]!, e = start[p + 1]!; j < e; j++) {
      const q = other[j]!, c = cellOf[j]!;
      if (stamp[q] !== p) { stamp[q] = p; firstCell[q] = c; continue; }
      const c0 = firstCell[q]!;
      if (c0 !== c) { linked[c] = 1; linked[c0] = 1; }
    }
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
