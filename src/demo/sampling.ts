/**
 * Point placement for the demo generators: boundary curves sampled at the local target size,
 * and a variable-radius Poisson-disk fill of the interior (dart throwing around active points).
 * A Delaunay triangulation of such points has well-shaped triangles whose size follows the field.
 */
import type { Region } from './plane.js';
import type { Rng } from './random.js';

/** Target point spacing (edge length) at a position. */
export interface SizeField {
  at(x: number, y: number): number;
}

/** A boundary piece traced from t = 0 to t = 1. */
export interface Curve {
  readonly length: number;
  x(t: number): number;
  y(t: number): number;
}

export class Segment implements Curve {
  readonly length: number;

  constructor(readonly ax: number, readonly ay: number, readonly bx: number, readonly by: number) {
    this.length = Math.hypot(bx - ax, by - ay);
  }

  // An axis-parallel segment keeps its constant coordinate exact, so collinear samples stay collinear.
  x(t: number): number {
    return t >= 1 ? this.bx : this.ax + t * (this.bx - this.ax);
  }

  y(t: number): number {
    return t >= 1 ? this.by : this.ay + t * (this.by - this.ay);
  }
}

/** Circular arc from angle a0 to a1 (counter-clockwise when a1 > a0). */
export class Arc implements Curve {
  readonly length: number;

  constructor(readonly cx: number, readonly cy: number, readonly r: number, readonly a0: number, readonly a1: number) {
    this.length = Math.abs(a1 - a0) * r;
  }

  x(t: number): number {
    return this.cx + this.r * Math.cos(this.a0 + t * (this.a1 - this.a0));
  }

  y(t: number): number {
    return this.cy + this.r * Math.sin(this.a0 + t * (this.a1 - this.a0));
  }
}

const SUBSTEPS = 4096;

/**
 * Append the start of `curve` and its interior samples (not its end, which starts the next piece)
 * to `out` as x,y pairs. Spacing follows the size field: the number of pieces is the integral of
 * 1/size along the curve, rounded up, unless `pieces` fixes it. Samples are equally spaced in
 * that integral.
 */
export function sampleCurve(out: number[], curve: Curve, size: SizeField, pieces?: number): void {
  const cum = new Float64Array(SUBSTEPS + 1);
  const dl = curve.length / SUBSTEPS;
  let prev = 1 / size.at(curve.x(0), curve.y(0));
  for (let i = 1; i <= SUBSTEPS; i++) {
    const t = i / SUBSTEPS;
    const cur = 1 / size.at(curve.x(t), curve.y(t));
    cum[i] = cum[i - 1]! + 0.5 * (prev + cur) * dl;
    prev = cur;
  }
  const total = cum[SUBSTEPS]!;
  const n = pieces ?? Math.max(1, Math.ceil(total - 1e-9));
  out.push(curve.x(0), curve.y(0));
  let i = 0;
  for (let k = 1; k < n; k++) {
    const target = (k * total) / n;
    while (cum[i + 1]! < target) i++;
    const t = (i + (target - cum[i]!) / (cum[i + 1]! - cum[i]!)) / SUBSTEPS;
    out.push(curve.x(t), curve.y(t));
  }
}

/**
 * A closed ring (x,y interleaved) from curves that each end where the next starts; `fixed` maps a
 * curve's index to a fixed number of pieces.
 */
export function sampleRing(curves: Curve[], size: SizeField, fixed: ReadonlyMap<number, number> = new Map()): Float64Array {
  const out: number[] = [];
  for (let i = 0; i < curves.length; i++) sampleCurve(out, curves[i]!, size, fixed.get(i));
  return Float64Array.from(out);
}

export interface FillOptions {
  region: Region;
  size: SizeField;
  /** Smallest value of the size field (sets the search grid). */
  minSize: number;
  /** Bounding box of the region: [xmin, ymin, xmax, ymax]. */
  bounds: readonly [number, number, number, number];
  rng: Rng;
  /** Candidates tried around each active point before it retires. */
  tries?: number;
}

/**
 * Fill a region with points no closer to each other than the size field at the new point.
 * `seeds` (x,y interleaved, typically the boundary samples) come first in the result, in order;
 * the fill grows from them.
 */
export function poissonFill(seeds: ArrayLike<number>, opt: FillOptions): Float64Array {
  const { region, size, rng } = opt;
  const tries = opt.tries ?? 30;
  const [x0, y0, x1, y1] = opt.bounds;
  const cell = opt.minSize / Math.SQRT2;
  const gx = Math.floor((x1 - x0) / cell) + 1;
  const gy = Math.floor((y1 - y0) / cell) + 1;
  const head = new Int32Array(gx * gy).fill(-1);
  let next = new Int32Array(1024);
  let pts = new Float64Array(2048);
  let active = new Int32Array(1024);
  let n = 0;
  let nActive = 0;

  const cellOf = (x: number, y: number): number => {
    const cx = Math.min(gx - 1, Math.max(0, Math.floor((x - x0) / cell)));
    const cy = Math.min(gy - 1, Math.max(0, Math.floor((y - y0) / cell)));
    return cy * gx + cx;
  };
  const add = (x: number, y: number): void => {
    if (2 * n + 2 > pts.length) {
      const grown = new Float64Array(pts.length * 2);
      grown.set(pts);
      pts = grown;
      const nx = new Int32Array(next.length * 2);
      nx.set(next);
      next = nx;
    }
    if (nActive + 1 > active.length) {
      const grown = new Int32Array(active.length * 2);
      grown.set(active);
      active = grown;
    }
    pts[2 * n] = x;
    pts[2 * n + 1] = y;
    const c = cellOf(x, y);
    next[n] = head[c]!;
    head[c] = n;
    active[nActive++] = n;
    n++;
  };
  const farEnough = (x: number, y: number, r: number): boolean => {
    const r2 = r * r;
    const ca = Math.max(0, Math.floor((x - r - x0) / cell));
    const cb = Math.min(gx - 1, Math.floor((x + r - x0) / cell));
    const ra = Math.max(0, Math.floor((y - r - y0) / cell));
    const rb = Math.min(gy - 1, Math.floor((y + r - y0) / cell));
    for (let row = ra; row <= rb; row++) {
      for (let col = ca; col <= cb; col++) {
        for (let q = head[row * gx + col]!; q >= 0; q = next[q]!) {
          const dx = pts[2 * q]! - x;
          const dy = pts[2 * q + 1]! - y;
          if (dx * dx + dy * dy < r2) return false;
        }
      }
    }
    return true;
  };

  for (let i = 0; i + 1 < seeds.length; i += 2) add(seeds[i]!, seeds[i + 1]!);
  while (nActive > 0) {
    const slot = rng.below(nActive);
    const p = active[slot]!;
    const px = pts[2 * p]!;
    const py = pts[2 * p + 1]!;
    const s = size.at(px, py);
    let placed = false;
    for (let k = 0; k < tries && !placed; k++) {
      // a uniform offset in the annulus [s, 2s], by rejection from the square
      let dx = 0;
      let dy = 0;
      let d2 = 0;
      do {
        dx = (rng.next() * 4 - 2) * s;
        dy = (rng.next() * 4 - 2) * s;
        d2 = dx * dx + dy * dy;
      } while (d2 < s * s || d2 > 4 * s * s);
      const cx = px + dx;
      const cy = py + dy;
      if (cx < x0 || cx > x1 || cy < y0 || cy > y1 || !region.contains(cx, cy)) continue;
      if (farEnough(cx, cy, size.at(cx, cy))) {
        add(cx, cy);
        placed = true;
      }
    }
    if (!placed) active[slot] = active[--nActive]!;
  }
  return pts.slice(0, 2 * n);
}
