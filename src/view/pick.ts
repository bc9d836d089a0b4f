/**
 * Which cell is under a point: candidates from the Flatbush index of cell bounding boxes, then an
 * exact point-in-polygon test in float64 file coordinates.
 */
import type Flatbush from 'flatbush';

export interface PickMesh {
  points: Float64Array;
  cellOffsets: Int32Array;
  cellNodes: Int32Array;
}

/** Crossing-number test; works for either node order and for non-convex quads. */
export function pointInCell(m: PickMesh, cell: number, x: number, y: number): boolean {
  const p = m.points;
  const s = m.cellOffsets[cell]!;
  const e = m.cellOffsets[cell + 1]!;
  let inside = false;
  let j = e - 1;
  for (let k = s; k < e; j = k++) {
    const a = m.cellNodes[k]!;
    const b = m.cellNodes[j]!;
    const ax = p[2 * a]!, ay = p[2 * a + 1]!, bx = p[2 * b]!, by = p[2 * b + 1]!;
    if ((ay > y) !== (by > y) && x < ((bx - ax) * (y - ay)) / (by - ay) + ax) inside = !inside;
  }
  return inside;
}

/** The cell containing (x, y), or -1. Overlapping cells (a bad mesh): the lowest id wins. */
export function pickCell(index: Flatbush, m: PickMesh, x: number, y: number): number {
  if (!Number.isFinite(x) || !Number.isFinite(y)) return -1;
  const hits = index.search(x, y, x, y);
  let best = -1;
  for (let k = 0; k < hits.length; k++) {
    const c = hits[k]!;
    if ((best < 0 || c < best) && pointInCell(m, c, x, y)) best = c;
  }
  return best;
}
