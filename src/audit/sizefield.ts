/**
 * A size field for the mesher from a target step T: per cell the smallest inscribed length that
 * allows T, h* = T·λ/C (the inscribed-length rule dt = C·h/λ solved for h), and the edge of the
 * equilateral triangle with that inradius, 2√3·h*.
 *
 * h* is a floor: a cell may be larger, never smaller, if T is to be stable. Per node the floor is
 * the maximum over the node's cells. Read as a resolution request that is the least restrictive
 * of the cells (the coarsest); read as what stability needs it is the only safe choice: every
 * cell that touches the node must be able to reach T, and the fastest of them needs the largest
 * cells. The minimum would let new cells next to a fast cell stay too small for T.
 *
 * A background size field is a target size, not a floor: given h* alone a mesher would also
 * refine every cell that is already large enough (a slow open basin would be meshed at the edge
 * T allows, many times finer than now). So the node `size` is the larger of that floor and the
 * current local edge length (the mean edge of the node's cells): cells that already allow T keep
 * their size, the others grow to the floor.
 */
import type { Mesh } from '../mesh/model.js';
import type { CellGeometry } from '../geometry/cells.js';
import { num } from '../io/format.js';

/** Edge of an equilateral triangle per unit inradius: a = 2√3·r. */
export const EQUILATERAL_EDGE_PER_INRADIUS = 2 * Math.sqrt(3);

export interface SizeFieldSummary {
  target_dt: number;
  courant: number;
  /** Cells with h < h*: they must grow or improve in shape to allow the target. */
  cells_to_change: number;
  area_to_change: number;
  area_share_to_change: number;
  /** Largest ratio h* : h over the cells (how much the worst cell must grow; null when no cell moves). */
  largest_growth: number | null;
  /** Nodes whose size was raised above the current local edge length. */
  nodes_raised: number;
}

export interface SizeField {
  /** Per cell h* = T·λ/C (0 where λ = 0: any size allows T). */
  targetInradius: Float64Array;
  /** Per cell 2√3·h*. */
  targetEdge: Float64Array;
  /** Per node: the largest target edge of its cells. */
  nodeFloor: Float64Array;
  /** Per node: max(floor, current mean edge of its cells); 0 for nodes no cell uses. */
  nodeSize: Float64Array;
  summary: SizeFieldSummary;
}

export function sizeField(mesh: Mesh, geom: CellGeometry, speed: Float64Array, courant: number, target: number): SizeField {
  const n = mesh.nCells;
  const off = mesh.cellOffsets, nodes = mesh.cellNodes;
  const h = geom.inradius, area = geom.area, perim = geom.perimeter;
  const targetInradius = new Float64Array(n);
  const targetEdge = new Float64Array(n);
  const nodeFloor = new Float64Array(mesh.nPoints);
  const edgeSum = new Float64Array(mesh.nPoints);
  const edgeCount = new Int32Array(mesh.nPoints);
  const scale = target / courant;
  let change = 0, areaChange = 0, areaTotal = 0, growth = 0;
  for (let c = 0; c < n; c++) {
    const hs = scale * speed[c]!;
    const edge = EQUILATERAL_EDGE_PER_INRADIUS * hs;
    targetInradius[c] = hs;
    targetEdge[c] = edge;
    areaTotal += area[c]!;
    if (h[c]! < hs) {
      change++;
      areaChange += area[c]!;
    }
    if (hs > 0 && h[c]! > 0 && hs / h[c]! > growth) growth = hs / h[c]!;
    const s = off[c]!, e = off[c + 1]!;
    const meanEdge = perim[c]! / (e - s);
    for (let k = s; k < e; k++) {
      const p = nodes[k]!;
      if (edge > nodeFloor[p]!) nodeFloor[p] = edge;
      edgeSum[p]! += meanEdge;
      edgeCount[p]!++;
    }
  }
  const nodeSize = new Float64Array(mesh.nPoints);
  let raised = 0;
  for (let p = 0; p < mesh.nPoints; p++) {
    if (edgeCount[p] === 0) continue;
    const local = edgeSum[p]! / edgeCount[p]!;
    const f = nodeFloor[p]!;
    if (f > local) raised++;
    nodeSize[p] = f > local ? f : local;
  }
  return {
    targetInradius,
    targetEdge,
    nodeFloor,
    nodeSize,
    summary: {
      target_dt: target,
      courant,
      cells_to_change: change,
      area_to_change: areaChange,
      area_share_to_change: areaTotal > 0 ? areaChange / areaTotal : 0,
      largest_growth: growth > 0 ? growth : null,
      nodes_raised: raised,
    },
  };
}

/** The node table `node,x,y,size` (nodes of size 0, which no cell uses, are left out), in chunks of about `rows` rows. */
export function* sizeFieldCsvChunks(mesh: Mesh, nodeSize: Float64Array, rows = 20000): Generator<string> {
  let buf = 'node,x,y,size\n';
  const pts = mesh.points;
  for (let p = 0, written = 0; p < mesh.nPoints; p++) {
    if (!(nodeSize[p]! > 0)) continue;
    buf += p + ',' + num(pts[2 * p]!) + ',' + num(pts[2 * p + 1]!) + ',' + num(nodeSize[p]!) + '\n';
    if (++written % rows === 0) { yield buf; buf = ''; }
  }
  if (buf.length) yield buf;
}
