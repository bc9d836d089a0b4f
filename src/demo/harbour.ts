/**
 * "Kestrel Cove harbour", an invented harbour basin for a shallow-water model (metres, local
 * origin at the south-west corner of the model area, y to the north).
 *
 * Open sea in the south (y < 700), two breakwaters with a 300 m mouth between them, a basin with a
 * sandy cove in the north-west (dry at its top), a quay on the north-east side and a dredged
 * navigation channel from outside the mouth to the quay. The flow is an ebb tide draining the
 * basin through the mouth. Built so that the step limit is set by a few slivers at the western
 * breakwater's tip and by the small, deep cells of the channel.
 */
import type { Mesh } from '../mesh/model.js';
import { MeshBuilder } from './builder.js';
import { distToPolyline, distToSegment, ramp, Region } from './plane.js';
import { Rng } from './random.js';
import { Arc, poissonFill, sampleRing, Segment, type Curve, type SizeField } from './sampling.js';
import { delaunayInside } from './triangulate.js';

export const HARBOUR = {
  /** The model area spans x in [0, width]; the open sea boundary is y = 0. */
  width: 3000,
  /** The northern shore (outside the cove). */
  north: 2400,
  breakwater: { south: 700, north: 760, westTip: 1350, eastTip: 1650 },
  /** Quay face at y = face between x = west and x = east; land north of it. */
  quay: { west: 2000, east: 2600, face: 2200 },
  /** The cove: a half disc north of the shore line, its arc is the beach. */
  cove: { x: 700, y: 2400, r: 400 },
  mouth: { x: 1500, y: 730 },
  /** Dredged channel: centre line, flat bottom half-width, side slope width, depth (m). */
  channel: { line: [1500, 250, 1500, 1100, 2300, 1900, 2300, 2200] as readonly number[], halfWidth: 50, slope: 30, depth: 14 },
  /** Pieces on the western tip face, and the inward offset of the nearly collinear points. */
  tipFace: { pieces: 8, sliverOffset: 0.5 },
  /** Peak ebb speed (m/s) at the mouth centre. */
  ebbSpeed: 1.8,
} as const;

const SEED = 0x4b657374; // "Kest"

/**
 * Target spacing: 6 m over the channel and its slopes, 7.5 m at the western tip, 20 m along the
 * beach, growing with the distance from each up to 40 m in the open basin and sea.
 */
class HarbourSize implements SizeField {
  at(x: number, y: number): number {
    const h = HARBOUR;
    const ch = h.channel;
    let s = 40;
    const dch = distToPolyline(ch.line, x, y);
    s = Math.min(s, 6 + 0.25 * Math.max(0, dch - ch.halfWidth - ch.slope));
    const bw = h.breakwater;
    const dtip = distToSegment(x, y, bw.westTip, bw.south, bw.westTip, bw.north);
    s = Math.min(s, 7.5 + 0.25 * Math.max(0, dtip - 10));
    s = Math.min(s, 20 + 0.3 * distToBeach(x, y));
    return s;
  }
}

/** The model boundary, counter-clockwise; returns the curves and the index of the western tip face. */
function boundaryCurves(): { curves: Curve[]; tipFace: number } {
  const { width: w, north: n, breakwater: bw, quay: q, cove } = HARBOUR;
  const c: Curve[] = [];
  const seg = (ax: number, ay: number, bx: number, by: number): number => c.push(new Segment(ax, ay, bx, by)) - 1;
  seg(0, 0, w, 0);
  seg(w, 0, w, bw.south);
  seg(w, bw.south, bw.eastTip, bw.south);
  seg(bw.eastTip, bw.south, bw.eastTip, bw.north);
  seg(bw.eastTip, bw.north, w, bw.north);
  seg(w, bw.north, w, n);
  seg(w, n, q.east, n);
  seg(q.east, n, q.east, q.face);
  seg(q.east, q.face, q.west, q.face);
  seg(q.west, q.face, q.west, n);
  seg(q.west, n, cove.x + cove.r, n);
  c.push(new Arc(cove.x, cove.y, cove.r, 0, Math.PI));
  seg(cove.x - cove.r, n, 0, n);
  seg(0, n, 0, bw.north);
  seg(0, bw.north, bw.westTip, bw.north);
  const tipFace = seg(bw.westTip, bw.north, bw.westTip, bw.south);
  seg(bw.westTip, bw.south, 0, bw.south);
  seg(0, bw.south, 0, 0);
  return { curves: c, tipFace };
}

/**
 * Nearly collinear points just off the western tip face: each sits `sliverOffset` in front of the
 * middle of a face piece, far enough from the face's ends that the flat triangle it makes with the
 * piece keeps an empty circumcircle (the circle bulges into the breakwater, where no points are).
 */
function sliverPoints(): number[] {
  const { breakwater: bw, tipFace } = HARBOUR;
  const piece = (bw.north - bw.south) / tipFace.pieces;
  const d = tipFace.sliverOffset;
  const circumradius = (piece * piece / 4 + d * d) / (2 * d);
  const out: number[] = [];
  for (let k = 0; k < tipFace.pieces; k++) {
    const mid = bw.north - (k + 0.5) * piece;
    if (mid - circumradius > bw.south + 1 && mid + circumradius < bw.north - 1) out.push(bw.westTip + d, mid);
  }
  return out;
}

/** Distance to the cove's arc (the beach): the arc spans the upper half of the cove circle. */
function distToBeach(x: number, y: number): number {
  const { cove } = HARBOUR;
  if (y >= cove.y) return Math.abs(Math.hypot(x - cove.x, y - cove.y) - cove.r);
  return Math.min(Math.hypot(x - cove.x - cove.r, y - cove.y), Math.hypot(x - cove.x + cove.r, y - cove.y));
}

/** Still-water depth (m, positive down; negative on the dry upper beach). */
export function harbourDepth(x: number, y: number): number {
  const { mouth, cove, channel: ch } = HARBOUR;
  const r = Math.hypot(x - mouth.x, y - mouth.y);
  let depth = 3 + 5 / (1 + (r / 700) * (r / 700)) + 4 * ramp(mouth.y - y, 0, mouth.y);
  depth += (-0.6 - depth) * (1 - ramp(distToBeach(x, y), 0, 100));
  const dch = distToPolyline(ch.line, x, y);
  const dredged = depth + (ch.depth - depth) * (1 - ramp(dch, ch.halfWidth, ch.halfWidth + ch.slope));
  return Math.max(depth, dredged);
}

/**
 * Ebb-tide velocity (m/s) written to out[2i], out[2i+1]: the basin drains towards the mouth and
 * the jet spreads into the sea. Speed falls off as 1/r away from the mouth and vanishes on dry land.
 */
function ebbVelocity(x: number, y: number, depth: number, out: Float64Array, i: number): void {
  const { mouth, ebbSpeed } = HARBOUR;
  const dx = x - mouth.x;
  const dy = y - mouth.y;
  const z = dy / 100;
  // converging above the mouth line, spreading below it, straight down the mouth in between
  const ux = -dx * (z / Math.sqrt(1 + z * z));
  const uy = -Math.sqrt(dy * dy + 60 * 60);
  const len = Math.hypot(ux, uy);
  const speed = ebbSpeed * (150 / Math.sqrt(150 * 150 + dx * dx + dy * dy)) * ramp(depth, 0, 1);
  out[2 * i] = (speed * ux) / len;
  out[2 * i + 1] = (speed * uy) / len;
}

export function makeHarbour(): Mesh {
  const size = new HarbourSize();
  const { curves, tipFace } = boundaryCurves();
  const ring = sampleRing(curves, size, new Map([[tipFace, HARBOUR.tipFace.pieces]]));
  const region = new Region([ring]);
  const seeds = Array.from(ring).concat(sliverPoints());
  const pts = poissonFill(seeds, {
    region,
    size,
    minSize: 6,
    bounds: [0, 0, HARBOUR.width, HARBOUR.cove.y + HARBOUR.cove.r],
    rng: new Rng(SEED),
  });
  const tris = delaunayInside(pts, region);

  const b = new MeshBuilder();
  b.addPoints(pts);
  for (let t = 0; t < tris.length; t += 3) b.addTriangle(tris[t]!, tris[t + 1]!, tris[t + 2]!);
  const n = b.nPoints;
  const depth = new Float64Array(n);
  const velocity = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    depth[i] = harbourDepth(pts[2 * i]!, pts[2 * i + 1]!);
    ebbVelocity(pts[2 * i]!, pts[2 * i + 1]!, depth[i]!, velocity, i);
  }
  return b.finish('demo/harbour', [
    { name: 'depth', components: 1, values: depth },
    { name: 'velocity', components: 2, values: velocity },
  ]);
}
