import { describe, expect, it } from 'vitest';
import { CHANNEL, layerDistances, makeChannel } from '../../src/demo/channel.js';
import { demoBytes, DEMO_MAX_BYTES } from '../../src/demo/files.js';
import { QUAD, TRIANGLE } from '../../src/mesh/model.js';
import { cellMean, cellStats, chordDeficit, edgeCheck, expectShipped, field, sameBytes, smallest } from './checks.js';

const mesh = makeChannel();
const stats = cellStats(mesh);
const { pier, wall, length: L, width: W } = CHANNEL;

function pierDistance(x: number, y: number): number {
  return Math.hypot(x - pier.x, y - pier.y);
}

describe('Millrace test channel demo', () => {
  it('mixes triangles and quads in streamwise order, every point used', () => {
    expect(mesh.nCells).toBeGreaterThanOrEqual(5000);
    expect(mesh.nCells).toBeLessThanOrEqual(20000);
    let quads = 0, tris = 0, switches = 0;
    for (let c = 0; c < mesh.nCells; c++) {
      if (mesh.cellTypes[c] === QUAD) quads++;
      else if (mesh.cellTypes[c] === TRIANGLE) tris++;
      if (c > 0 && mesh.cellTypes[c] !== mesh.cellTypes[c - 1]) switches++;
    }
    expect(quads + tris).toBe(mesh.nCells);
    expect(quads).toBe(2 * wall.columns * wall.layers + pier.around * pier.layers);
    expect(switches).toBeGreaterThan(50);
    let backwards = 0;
    for (let c = 1; c < mesh.nCells; c++) if (Math.floor(stats.cx[c]! / CHANNEL.slab) < Math.floor(stats.cx[c - 1]! / CHANNEL.slab)) backwards++;
    expect(backwards).toBe(0);
    const used = new Uint8Array(mesh.nPoints);
    for (const v of mesh.cellNodes) used[v] = 1;
    expect(used.every((u) => u === 1)).toBe(true);
  });

  it('has convex counter-clockwise cells with no zero area', () => {
    let minCorner = Infinity, minRel = Infinity;
    for (let c = 0; c < mesh.nCells; c++) {
      minCorner = Math.min(minCorner, stats.minCorner[c]!);
      minRel = Math.min(minRel, stats.area[c]! / stats.longest[c]! ** 2);
    }
    expect(minCorner).toBeGreaterThan(0);
    expect(minRel).toBeGreaterThan(1e-9);
  });

  it('tiles the channel minus the pier, with conforming edges', () => {
    // the pier is drawn as a polygon through its surface nodes: π r² less the chord segments
    const arc = chordDeficit(mesh, pier.x, pier.y, pier.r, -Math.PI, Math.PI);
    expect(arc.nodes).toBe(pier.around);
    let sum = 0;
    for (const a of stats.area) sum += a;
    expect(Math.abs(sum - (L * W - (Math.PI * pier.r * pier.r - arc.area)))).toBeLessThan(1e-9);
    const edges = edgeCheck(mesh);
    expect(edges.bad).toBe(0);
    expect(Math.abs(edges.boundaryLength - (2 * L + 2 * W + 2 * Math.PI * pier.r - arc.length))).toBeLessThan(1e-9);
  });

  it('has thin stretched quads along the walls and round the pier', () => {
    const dw = layerDistances(wall.first, wall.growth, wall.layers);
    expect(dw[1]).toBe(wall.first);
    expect(dw[2]! - dw[1]!).toBeCloseTo(wall.first * wall.growth, 15);
    let wallFirst = 0, pierFirst = 0;
    for (let c = 0; c < mesh.nCells; c++) {
      if (mesh.cellTypes[c] !== QUAD) continue;
      const y = stats.cy[c]!;
      if (Math.min(y, W - y) < wall.first) {
        wallFirst++;
        // first layer: 0.3 m along the wall by 0.01 m across it
        expect(stats.area[c]! / (L / wall.columns)).toBeCloseTo(wall.first, 12);
        expect((L / wall.columns) / wall.first).toBeGreaterThan(20);
      }
      if (pierDistance(stats.cx[c]!, y) < pier.r + pier.first) pierFirst++;
    }
    expect(wallFirst).toBe(2 * wall.columns);
    expect(pierFirst).toBe(pier.around);
  });

  it('carries a flow that is fast beside the pier and slow at the walls', () => {
    const vel = field(mesh, 'velocity');
    const depth = field(mesh, 'depth');
    expect(depth.values.every((d) => d === CHANNEL.depth)).toBe(true);
    let max = 0, at = -1, wallMax = 0, pierMax = 0;
    for (let i = 0; i < mesh.nPoints; i++) {
      const x = mesh.points[2 * i]!, y = mesh.points[2 * i + 1]!;
      const s = Math.hypot(vel.values[2 * i]!, vel.values[2 * i + 1]!);
      if (y === 0 || y === W) wallMax = Math.max(wallMax, s);
      if (Math.abs(pierDistance(x, y) - pier.r) < 1e-9) pierMax = Math.max(pierMax, s);
      if (s > max) { max = s; at = i; }
    }
    expect(wallMax).toBe(0); // no slip
    expect(pierMax).toBe(0);
    // inviscid flow round a cylinder doubles the free stream at its sides (common practice)
    expect(max).toBeGreaterThan(1.5 * CHANNEL.inflow);
    expect(max).toBeLessThanOrEqual(2 * CHANNEL.inflow);
    const ax = mesh.points[2 * at]!, ay = mesh.points[2 * at + 1]!;
    expect(Math.abs(ax - pier.x)).toBeLessThan(0.5 * pier.r);
    expect(pierDistance(ax, ay)).toBeLessThan(2 * pier.r);
    // mid-channel far upstream the flow is close to the free stream
    let mid = -1;
    for (let i = 0; i < mesh.nPoints; i++) {
      if (mesh.points[2 * i]! < 5 && Math.abs(mesh.points[2 * i + 1]! - W / 2) < 0.5) { mid = i; break; }
    }
    expect(mid).toBeGreaterThanOrEqual(0);
    expect(vel.values[2 * mid]!).toBeGreaterThan(0.95 * CHANNEL.inflow);
  });

  it('is capped by the boundary-layer quads beside the pier under advection', () => {
    const ux = cellMean(mesh, field(mesh, 'velocity'), 0);
    const uy = cellMean(mesh, field(mesh, 'velocity'), 1);
    const dt = new Float64Array(mesh.nCells);
    // λ = |u| for advection; dt = h/λ with h = 2A/P
    for (let c = 0; c < mesh.nCells; c++) dt[c] = stats.h[c]! / Math.hypot(ux[c]!, uy[c]!);
    const outer = pier.r + layerDistances(pier.first, pier.growth, pier.layers)[pier.layers]!;
    for (const c of smallest(dt, 20)) {
      expect(mesh.cellTypes[c]).toBe(QUAD);
      expect(pierDistance(stats.cx[c]!, stats.cy[c]!)).toBeLessThan(outer);
      // beside the pier (within 45° of the cross-stream axis), not ahead of or behind it
      expect(Math.abs(stats.cx[c]! - pier.x)).toBeLessThan(Math.abs(stats.cy[c]! - pier.y));
    }
  });

  it('is deterministic and shipped as generated', () => {
    const bytes = demoBytes(mesh);
    expect(sameBytes(demoBytes(makeChannel()), bytes)).toBe(true);
    expect(bytes.length).toBeLessThan(DEMO_MAX_BYTES);
    expectShipped('channel.vtu', bytes);
  }, 30000);
});
