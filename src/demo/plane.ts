/**
 * Plane geometry for the demo generators: distances to segments and polylines, and a region
 * made of closed rings with a banded point-in-region test (even-odd rule, so holes are rings too).
 */

export function distToSegment(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  let t = len2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / len2 : 0;
  if (t < 0) t = 0;
  else if (t > 1) t = 1;
  const ex = ax + t * dx - px;
  const ey = ay + t * dy - py;
  return Math.sqrt(ex * ex + ey * ey);
}

/** Distance from a point to an open polyline given as x,y interleaved vertices. */
export function distToPolyline(line: ArrayLike<number>, px: number, py: number): number {
  let best = Infinity;
  for (let i = 0; i + 3 < line.length; i += 2) {
    const d = distToSegment(px, py, line[i]!, line[i + 1]!, line[i + 2]!, line[i + 3]!);
    if (d < best) best = d;
  }
  return best;
}

/** Linear ramp from 0 at a to 1 at b, clamped. */
export function ramp(v: number, a: number, b: number): number {
  const t = (v - a) / (b - a);
  return t <= 0 ? 0 : t >= 1 ? 1 : t;
}

/**
 * A region bounded by closed rings (x,y interleaved, last vertex not repeated). A point is inside
 * when a ray from it crosses the rings an odd number of times. Edges are bucketed in horizontal
 * bands so that a query looks at a few edges only.
 */
export class Region {
  private readonly edges: Float64Array;
  private readonly bandStart: Int32Array;
  private readonly bandEdges: Int32Array;
  private readonly y0: number;
  private readonly bandHeight: number;
  private readonly nBands: number;

  constructor(rings: Float64Array[], nBands = 512) {
    let nEdges = 0;
    for (const r of rings) nEdges += r.length / 2;
    const edges = new Float64Array(nEdges * 4);
    let ymin = Infinity;
    let ymax = -Infinity;
    let e = 0;
    for (const r of rings) {
      const n = r.length / 2;
      for (let i = 0; i < n; i++) {
        const j = i + 1 === n ? 0 : i + 1;
        edges[e++] = r[2 * i]!;
        edges[e++] = r[2 * i + 1]!;
        edges[e++] = r[2 * j]!;
        edges[e++] = r[2 * j + 1]!;
        ymin = Math.min(ymin, r[2 * i + 1]!);
        ymax = Math.max(ymax, r[2 * i + 1]!);
      }
    }
    this.edges = edges;
    this.nBands = nBands;
    this.y0 = ymin;
    this.bandHeight = (ymax - ymin) / nBands || 1;

    const start = new Int32Array(nBands + 1);
    for (let k = 0; k < nEdges; k++) {
      for (let b = this.band(this.edgeLowY(k)); b <= this.band(this.edgeHighY(k)); b++) start[b + 1]!++;
    }
    for (let b = 0; b < nBands; b++) start[b + 1] = start[b + 1]! + start[b]!;
    const cursor = start.slice(0, nBands);
    const list = new Int32Array(start[nBands]!);
    for (let k = 0; k < nEdges; k++) {
      for (let b = this.band(this.edgeLowY(k)); b <= this.band(this.edgeHighY(k)); b++) list[cursor[b]!++] = k;
    }
    this.bandStart = start;
    this.bandEdges = list;
  }

  private edgeLowY(k: number): number {
    return Math.min(this.edges[4 * k + 1]!, this.edges[4 * k + 3]!);
  }

  private edgeHighY(k: number): number {
    return Math.max(this.edges[4 * k + 1]!, this.edges[4 * k + 3]!);
  }

  private band(y: number): number {
    const b = Math.floor((y - this.y0) / this.bandHeight);
    return b < 0 ? 0 : b >= this.nBands ? this.nBands - 1 : b;
  }

  contains(x: number, y: number): boolean {
    if (y < this.y0 || y > this.y0 + this.bandHeight * this.nBands) return false;
    const b = this.band(y);
    const ed = this.edges;
    let inside = false;
    for (let i = this.bandStart[b]!; i < this.bandStart[b + 1]!; i++) {
      const k = 4 * this.bandEdges[i]!;
      const ya = ed[k + 1]!;
      const yb = ed[k + 3]!;
      if (ya > y === yb > y) continue;
      const xa = ed[k]!;
      const xc = xa + ((y - ya) * (ed[k + 2]! - xa)) / (yb - ya);
      if (x < xc) inside = !inside;
    }
    return inside;
  }
}
