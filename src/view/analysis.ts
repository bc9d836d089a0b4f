/** Display-side summaries of the per-cell steps: histogram bins and the cells to mark. */

export interface LogHistogram {
  /** log10 of the lower and upper edges of the binned range. */
  lo: number;
  hi: number;
  counts: Uint32Array;
  /** Cells with a zero step (degenerate) and with no limit; not binned. */
  zero: number;
  unlimited: number;
}

/** Counts of log10(dt) in `bins` equal bins spanning the positive finite steps. */
export function logHistogram(dt: Float64Array, bins: number): LogHistogram {
  let lo = Infinity;
  let hi = -Infinity;
  let zero = 0;
  let unlimited = 0;
  for (let i = 0; i < dt.length; i++) {
    const v = dt[i]!;
    if (v === Infinity) { unlimited++; continue; }
    if (!(v > 0)) { zero++; continue; }
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const counts = new Uint32Array(bins);
  if (!(lo <= hi)) return { lo: 0, hi: 1, counts, zero, unlimited };
  let a = Math.log10(lo);
  let b = Math.log10(hi);
  if (b - a < 1e-9) { a -= 0.5; b += 0.5; }
  const w = (b - a) / bins;
  for (let i = 0; i < dt.length; i++) {
    const v = dt[i]!;
    if (!(v > 0) || v === Infinity) continue;
    let k = Math.floor((Math.log10(v) - a) / w);
    if (k >= bins) k = bins - 1;
    if (k < 0) k = 0;
    counts[k]!++;
  }
  return { lo: a, hi: b, counts, zero, unlimited };
}

/**
 * Cells whose step is within `factor` of the global limit (dt ≤ factor · limit, zero steps
 * included), in cell order; when there are more than `cap`, the `cap` smallest steps.
 * `total` counts them all.
 */
export function markedCells(dt: Float64Array, limit: number | null, factor: number, cap: number): { cells: Int32Array; total: number } {
  if (limit === null || !(factor >= 1)) return { cells: new Int32Array(0), total: 0 };
  const bound = limit * factor;
  let n = 0;
  for (let i = 0; i < dt.length; i++) if (dt[i]! <= bound) n++;
  const all = new Int32Array(n);
  for (let i = 0, j = 0; i < dt.length; i++) if (dt[i]! <= bound) all[j++] = i;
  if (n <= cap) return { cells: all, total: n };
  const keys = new Float64Array(n);
  for (let k = 0; k < n; k++) keys[k] = dt[all[k]!]!;
  const order = Uint32Array.from({ length: n }, (_, k) => k).sort((p, q) => keys[p]! - keys[q]! || p - q);
  const out = new Int32Array(cap);
  for (let k = 0; k < cap; k++) out[k] = all[order[k]!]!;
  return { cells: out.sort(), total: n };
}

/** Centred float32 positions of the given cells' centroids. */
export function centredPoints(centroids: Float64Array, cells: Int32Array, cx: number, cy: number): Float32Array {
  const out = new Float32Array(cells.length * 2);
  for (let k = 0; k < cells.length; k++) {
    const c = cells[k]!;
    out[2 * k] = centroids[2 * c]! - cx;
    out[2 * k + 1] = centroids[2 * c + 1]! - cy;
  }
  return out;
}

/**
 * How thick each listed cell looks, 2·area/perimeter from its corners (a display heuristic for
 * when a ring is needed: a sliver can be long yet too thin to see).
 */
export function cellThickness(points: Float64Array, cellOffsets: Int32Array, cellNodes: Int32Array, cells: Int32Array): Float32Array {
  const out = new Float32Array(cells.length);
  for (let k = 0; k < cells.length; k++) {
    const c = cells[k]!;
    const s = cellOffsets[c]!, e = cellOffsets[c + 1]!;
    let twiceArea = 0;
    let perimeter = 0;
    for (let j = s; j < e; j++) {
      const a = cellNodes[j]!, b = cellNodes[j + 1 < e ? j + 1 : s]!;
      const ax = points[2 * a]!, ay = points[2 * a + 1]!, bx = points[2 * b]!, by = points[2 * b + 1]!;
      twiceArea += ax * by - bx * ay;
      perimeter += Math.hypot(bx - ax, by - ay);
    }
    // a zero-size cell still gets a ring: the smallest positive thickness
    out[k] = perimeter > 0 ? Math.max(Math.abs(twiceArea) / perimeter, 1e-30) : 1e-30;
  }
  return out;
}
