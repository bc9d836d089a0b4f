/**
 * "Millrace test channel", an invented straight flume (metres): 60 m long, 8 m wide, a round
 * bridge pier in it. Stretched quad layers line both walls and wrap the pier (an O-grid); the core
 * between them is triangulated. Cells are written in streamwise slabs, so triangles and quads
 * interleave in the file. Under pure advection the thin quads beside the pier, where the flow
 * speeds up, set the step.
 */
import type { Mesh } from '../mesh/model.js';
import { MeshBuilder } from './builder.js';
import { Region } from './plane.js';
import { Rng } from './random.js';
import { poissonFill, sampleCurve, Segment, type SizeField } from './sampling.js';
import { delaunayInside } from './triangulate.js';

export const CHANNEL = {
  length: 60,
  width: 8,
  /** Pier: centre, radius, nodes around it, and its quad layers (first thickness, growth ratio). */
  pier: { x: 20, y: 4, r: 0.5, around: 64, layers: 10, first: 0.004, growth: 1.25 },
  /** Wall layers: columns along the wall, layers, first thickness, growth ratio. */
  wall: { columns: 200, layers: 10, first: 0.01, growth: 1.3 },
  /** Core spacing away from the pier. */
  coreSize: 0.3,
  /** Free-stream speed (m/s) and uniform depth (m). */
  inflow: 1.2,
  depth: 2,
  /** Width of the streamwise slabs that order the cells in the file. */
  slab: 1,
} as const;

const SEED = 0x4d696c6c; // "Mill"

/** Distances of the layer lines from the surface: 0, t, t + t·g, ... (layers + 1 values). */
export function layerDistances(first: number, growth: number, layers: number): Float64Array {
  const d = new Float64Array(layers + 1);
  let t = first;
  for (let j = 1; j <= layers; j++) {
    d[j] = d[j - 1]! + t;
    t *= growth;
  }
  return d;
}

class CoreSize implements SizeField {
  constructor(private readonly ringRadius: number, private readonly ringSpacing: number) {}

  at(x: number, y: number): number {
    const { pier, coreSize } = CHANNEL;
    const d = Math.max(0, Math.hypot(x - pier.x, y - pier.y) - this.ringRadius);
    return Math.min(coreSize, this.ringSpacing + 0.12 * d);
  }
}

/** Power-law (1/7) no-slip factor: 0 on the surface, 1 from `thickness` away. */
function noSlip(d: number, thickness: number): number {
  // nodes placed on a surface by cos/sin may sit a rounding error off it
  return d >= thickness ? 1 : d <= 1e-9 * thickness ? 0 : Math.pow(d / thickness, 1 / 7);
}

/**
 * Flow past the pier (m/s) into out[2i], out[2i+1]: inviscid flow round a cylinder (twice the
 * free stream at its sides), a wake deficit behind it, and no-slip layers at the walls and pier.
 */
function pierFlow(x: number, y: number, out: Float64Array, i: number): void {
  const { pier, inflow, width } = CHANNEL;
  const X = x - pier.x;
  const Y = y - pier.y;
  const a2 = pier.r * pier.r;
  const r2 = Math.max(X * X + Y * Y, a2);
  const r4 = r2 * r2;
  let u = inflow * (1 - (a2 * (X * X - Y * Y)) / r4);
  let v = (-2 * inflow * a2 * X * Y) / r4;
  if (X > 0) {
    const spread = pier.r + 0.1 * X;
    const deficit = 0.5 * (pier.r / (pier.r + 0.05 * X)) * Math.exp(-(Y / spread) * (Y / spread));
    u *= 1 - deficit;
    v *= 1 - deficit;
  }
  const f = noSlip(Math.min(y, width - y), 0.4) * noSlip(Math.sqrt(r2) - pier.r, 0.15);
  out[2 * i] = u * f;
  out[2 * i + 1] = v * f;
}

export function makeChannel(): Mesh {
  const { length: L, width: W, pier, wall } = CHANNEL;
  const b = new MeshBuilder();
  const dw = layerDistances(wall.first, wall.growth, wall.layers);
  const T = dw[wall.layers]!;
  const cols = wall.columns;

  // Wall layers: node (i, j) of a wall grid is first + j * (cols + 1) + i.
  const bottom = b.nPoints;
  for (let j = 0; j <= wall.layers; j++) for (let i = 0; i <= cols; i++) b.addPoint((i * L) / cols, dw[j]!);
  const top = b.nPoints;
  for (let j = 0; j <= wall.layers; j++) for (let i = 0; i <= cols; i++) b.addPoint((i * L) / cols, W - dw[j]!);

  // Pier O-grid: node (k, j) is ring + j * around + k, at angle 2πk/around.
  const dp = layerDistances(pier.first, pier.growth, pier.layers);
  const ring = b.nPoints;
  for (let j = 0; j <= pier.layers; j++) {
    const r = pier.r + dp[j]!;
    for (let k = 0; k < pier.around; k++) {
      const a = (2 * Math.PI * k) / pier.around;
      b.addPoint(pier.x + r * Math.cos(a), pier.y + r * Math.sin(a));
    }
  }

  for (let j = 0; j < wall.layers; j++) {
    for (let i = 0; i < cols; i++) {
      const p = bottom + j * (cols + 1) + i;
      b.addQuad(p, p + 1, p + cols + 2, p + cols + 1);
      const q = top + j * (cols + 1) + i;
      b.addQuad(q + cols + 1, q + cols + 2, q + 1, q);
    }
  }
  for (let j = 0; j < pier.layers; j++) {
    for (let k = 0; k < pier.around; k++) {
      const k1 = (k + 1) % pier.around;
      const inner = ring + j * pier.around;
      const outer = inner + pier.around;
      b.addQuad(inner + k, outer + k, outer + k1, inner + k1);
    }
  }

  // Core: seeds are the outer layer nodes (shared with the quads) and the inflow/outflow lines.
  const shared: number[] = [];
  for (let i = 0; i <= cols; i++) shared.push(bottom + wall.layers * (cols + 1) + i);
  for (let i = 0; i <= cols; i++) shared.push(top + wall.layers * (cols + 1) + i);
  const outerRing = ring + pier.layers * pier.around;
  for (let k = 0; k < pier.around; k++) shared.push(outerRing + k);
  const seeds: number[] = [];
  for (const g of shared) seeds.push(b.x(g), b.y(g));

  const ringRadius = pier.r + dp[pier.layers]!;
  const size = new CoreSize(ringRadius, (2 * Math.PI * ringRadius) / pier.around);
  const ends: number[] = [];
  sampleCurve(ends, new Segment(0, W - T, 0, T), size);
  sampleCurve(ends, new Segment(L, T, L, W - T), size);
  // drop each line's start, which is a wall layer node already
  const nLine = ends.length / 4;
  for (let e = 0; e < 2; e++) for (let m = 1; m < nLine; m++) seeds.push(ends[e * 2 * nLine + 2 * m]!, ends[e * 2 * nLine + 2 * m + 1]!);

  const pierRing = new Float64Array(2 * pier.around);
  for (let k = 0; k < pier.around; k++) {
    pierRing[2 * k] = b.x(outerRing + k);
    pierRing[2 * k + 1] = b.y(outerRing + k);
  }
  const region = new Region([Float64Array.of(0, T, L, T, L, W - T, 0, W - T), pierRing]);
  const pts = poissonFill(seeds, { region, size, minSize: size.at(pier.x + ringRadius, pier.y), bounds: [0, T, L, W - T], rng: new Rng(SEED) });

  const toGlobal = new Int32Array(pts.length / 2);
  for (let i = 0; i < shared.length; i++) toGlobal[i] = shared[i]!;
  const firstNew = b.addPoints(pts.subarray(2 * shared.length));
  for (let i = shared.length; i < toGlobal.length; i++) toGlobal[i] = firstNew + i - shared.length;
  const tris = delaunayInside(pts, region);
  for (let t = 0; t < tris.length; t += 3) b.addTriangle(toGlobal[tris[t]!]!, toGlobal[tris[t + 1]!]!, toGlobal[tris[t + 2]!]!);

  b.orderCellsByCentroid(CHANNEL.slab);
  const n = b.nPoints;
  const velocity = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) pierFlow(b.x(i), b.y(i), velocity, i);
  return b.finish('demo/channel', [
    { name: 'velocity', components: 2, values: velocity },
    { name: 'depth', components: 1, values: new Float64Array(n).fill(CHANNEL.depth) },
  ]);
}
