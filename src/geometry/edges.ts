/**
 * Edge topology: every distinct edge with the one or two cells that share it.
 * Buckets half-edges by their smaller node (counting sort), then matches the larger node inside
 * each small bucket: O(n), flat typed arrays, no hashing of pairs.
 */
import { MeshInputError } from '../mesh/errors.js';
import type { Mesh } from '../mesh/model.js';

export interface EdgeTopology {
  nEdges: number;
  /** Two node indices per edge (smaller first). */
  edgeNodes: Int32Array;
  /** Two cells per edge: [c0, c1]; c1 = -1 on a boundary edge. c0 holds the edge as e_k = n_k → n_{k+1}. */
  edgeCells: Int32Array;
  /** Local edge index k (edge from node k to node k+1) within c0 and within c1 (-1 on the boundary). */
  edgeLocal: Int8Array;
  /** Per half-edge (aligned with cellNodes): the edge it belongs to; -1 for a side whose two ends are one node. */
  halfEdgeEdge: Int32Array;
}

export function buildEdges(mesh: Mesh, file?: string): EdgeTopology {
  const { nPoints, cellOffsets: off, cellNodes: nodes, nCells } = mesh;
  const nHalf = nodes.length;
  const start = new Int32Array(nPoints + 1);
  for (let c = 0; c < nCells; c++) {
    const s = off[c]!, e = off[c + 1]!;
    for (let k = s; k < e; k++) {
      const a = nodes[k]!, b = nodes[k + 1 < e ? k + 1 : s]!;
      start[(a < b ? a : b) + 1]!++;
    }
  }
  for (let p = 0; p < nPoints; p++) start[p + 1]! += start[p]!;
  const fill = start.slice(0, nPoints);
  const bucketHalf = new Int32Array(nHalf); // half-edge index (position in cellNodes)
  for (let c = 0; c < nCells; c++) {
    const s = off[c]!, e = off[c + 1]!;
    for (let k = s; k < e; k++) {
      const a = nodes[k]!, b = nodes[k + 1 < e ? k + 1 : s]!;
      bucketHalf[fill[a < b ? a : b]!++] = k;
    }
  }
  // cell of each half-edge
  const halfCell = new Int32Array(nHalf);
  for (let c = 0; c < nCells; c++) for (let k = off[c]!; k < off[c + 1]!; k++) halfCell[k] = c;
  const other = (k: number): number => {
    const c = halfCell[k]!;
    const s = off[c]!, e = off[c + 1]!;
    const a = nodes[k]!, b = nodes[k + 1 < e ? k + 1 : s]!;
    return a < b ? b : a;
  };
  const edgeNodes = new Int32Array(2 * nHalf);
  const edgeCells = new Int32Array(2 * nHalf);
  const edgeLocal = new Int8Array(2 * nHalf);
  const halfEdgeEdge = new Int32Array(nHalf).fill(-1);
  // per other node q: the edge (p, q) made while scanning bucket p (stamped by p: no clearing)
  const stamp = new Int32Array(nPoints).fill(-1);
  const edgeOf = new Int32Array(nPoints);
  let ne = 0;
  for (let p = 0; p < nPoints; p++) {
    const s = start[p]!, e = start[p + 1]!;
    for (let i = s; i < e; i++) {
      const h = bucketHalf[i]!;
      const q = other(h);
      if (q === p) continue; // a side from a node to itself (a cell that repeats a node)
      const c = halfCell[h]!;
      if (stamp[q] !== p) {
        stamp[q] = p;
        const edge = ne++;
        edgeOf[q] = edge;
        halfEdgeEdge[h] = edge;
        edgeNodes[2 * edge] = p;
        edgeNodes[2 * edge + 1] = q;
        edgeCells[2 * edge] = c;
        edgeCells[2 * edge + 1] = -1;
        edgeLocal[2 * edge] = h - off[c]!;
        edgeLocal[2 * edge + 1] = -1;
        continue;
      }
      const edge = edgeOf[q]!;
      if (edgeCells[2 * edge] === c || edgeCells[2 * edge + 1] === c) continue; // the same cell twice on one edge
      if (edgeCells[2 * edge + 1] !== -1) {
        throw new MeshInputError(`the edge between nodes ${p} and ${q} is shared by three or more cells (cells ${edgeCells[2 * edge]}, ${edgeCells[2 * edge + 1]}, ${c})`, file === undefined ? {} : { file });
      }
      halfEdgeEdge[h] = edge;
      edgeCells[2 * edge + 1] = c;
      edgeLocal[2 * edge + 1] = h - off[c]!;
    }
  }
  return {
    nEdges: ne,
    edgeNodes: edgeNodes.subarray(0, 2 * ne),
    edgeCells: edgeCells.subarray(0, 2 * ne),
    edgeLocal: edgeLocal.subarray(0, 2 * ne),
    halfEdgeEdge,
  };
}
