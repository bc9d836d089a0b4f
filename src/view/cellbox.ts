/** Bounding box of one cell, written into `out` as minX, minY, maxX, maxY (no allocation). */
export function cellBox(points: Float64Array, cellOffsets: Int32Array, cellNodes: Int32Array, cell: number, out: Float64Array): Float64Array {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let k = cellOffsets[cell]!, e = cellOffsets[cell + 1]!; k < e; k++) {
    const v = cellNodes[k]!;
    const x = points[2 * v]!;
    const y = points[2 * v + 1]!;
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  out[0] = minX;
  out[1] = minY;
  out[2] = maxX;
  out[3] = maxY;
  return out;
}
