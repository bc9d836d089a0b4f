import { describe, expect, it } from 'vitest';
import { HARBOUR, makeHarbour } from '../../src/demo/harbour.js';
import { demoBytes, DEMO_MAX_BYTES } from '../../src/demo/files.js';
import { TRIANGLE } from '../../src/mesh/model.js';
import { cellMean, cellStats, chordDeficit, edgeCheck, expectShipped, field, sameBytes, smallest } from './checks.js';

const G = 9.81; // m/s², common practice
const mesh = makeHarbour();
const stats = cellStats(mesh);
const { breakwater: bw, cove, channel: ch, quay } = HARBOUR;

function distToPolyline(line: readonly number[], x: number, y: number): number {
  let best = Infinity;
  for (let i = 0; i + 3 < line.length; i += 2) {
    const ax = line[i]!, ay = line[i + 1]!, dx = line[i + 2]! - ax, dy = line[i + 3]! - ay;
    const t = Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / (dx * dx + dy * dy)));
    best = Math.min(best, Math.hypot(ax + t * dx - x, ay + t * dy - y));
  }
  return best;
}

/** Within 50 m of the middle of the western breakwater's tip face. */
function nearTip(c: number): boolean {
  return Math.hypot(stats.cx[c]! - bw.westTip, stats.cy[c]! - (bw.south + bw.north) / 2) < 50;
}

/** On the dredged channel: its bottom, its side slopes and 30 m beyond. */
function onChannel(c: number): boolean {
  return distToPolyline(ch.line, stats.cx[c]!, stats.cy[c]!) < ch.halfWidth + ch.slope + 30;
}

describe('Kestrel Cove harbour demo', () => {
  it('is a triangle mesh of the intended size, every point used', () => {
    expect(mesh.nCells).toBeGreaterThanOrEqual(15000);
    expect(mesh.nCells).toBeLessThanOrEqual(40000);
    expect(mesh.cellTypes.every((t) => t === TRIANGLE)).toBe(true);
    const used = new Uint8Array(mesh.nPoints);
    for (const v of mesh.cellNodes) used[v] = 1;
    expect(used.every((u) => u === 1)).toBe(true);
  });

  it('has counter-clockwise cells, and only the intended slivers are thin', () => {
    let thin = 0;
    let minRel = Infinity;
    const strayThin: number[] = [];
    for (let c = 0; c < mesh.nCells; c++) {
      const rel = stats.area[c]! / stats.longest[c]! ** 2;
      minRel = Math.min(minRel, rel);
      // an equilateral triangle has √3/4 ≈ 0.43; below 0.1 a triangle is badly shaped
      if (rel < 0.1) {
        thin++;
        if (!nearTip(c)) strayThin.push(c);
      }
    }
    expect(minRel).toBeGreaterThan(1e-9);
    expect(strayThin).toEqual([]);
    expect(thin).toBeGreaterThanOrEqual(2);
    expect(thin).toBeLessThanOrEqual(8);
  });

  it('tiles the domain: areas and boundary length match the plan, edges conform', () => {
    // plan: the 3000 m × 2400 m model area, minus two 1350 m × 60 m breakwaters and the quay's
    // 600 m × 200 m block, plus the half disc of the cove; the mesh draws the cove's arc as chords
    const arc = chordDeficit(mesh, cove.x, cove.y, cove.r, 0, Math.PI);
    expect(arc.nodes).toBeGreaterThan(20);
    const bwLen = bw.westTip;
    const planArea = HARBOUR.width * HARBOUR.north - 2 * bwLen * (bw.north - bw.south)
      - (quay.east - quay.west) * (HARBOUR.north - quay.face) + (Math.PI * cove.r * cove.r) / 2;
    let sum = 0;
    for (const a of stats.area) sum += a;
    expect(Math.abs(sum - (planArea - arc.area))).toBeLessThan(1e-3);

    const planPerimeter = 2 * HARBOUR.width + 2 * HARBOUR.north // the outer rectangle's sides...
      - 2 * cove.r + Math.PI * cove.r // ...with the cove's arc instead of its diameter
      + 2 * (2 * bwLen) // breakwater flanks (their 60 m roots lie on the side boundaries)
      + 2 * (HARBOUR.north - quay.face); // the quay block's flanks (its face replaces 600 m of shore)
    const edges = edgeCheck(mesh);
    expect(edges.bad).toBe(0);
    expect(Math.abs(edges.boundaryLength - (planPerimeter - arc.length))).toBeLessThan(1e-6);
  });

  it('has the planned depths: 14 m channel, 3–8 m basin, a few dry cells at the beach', () => {
    const depth = field(mesh, 'depth').values;
    let dryNodes = 0;
    const wrong: string[] = [];
    for (let i = 0; i < mesh.nPoints; i++) {
      const x = mesh.points[2 * i]!, y = mesh.points[2 * i + 1]!;
      const d = depth[i]!;
      const dch = distToPolyline(ch.line, x, y);
      const beach = Math.min(Math.abs(Math.hypot(x - cove.x, y - cove.y) - cove.r), Math.hypot(x - cove.x - cove.r, y - cove.y), Math.hypot(x - cove.x + cove.r, y - cove.y));
      const basin = y > bw.north && dch > ch.halfWidth + ch.slope && beach > 100;
      if ((dch <= ch.halfWidth && Math.abs(d - ch.depth) > 1e-9) || (basin && (d < 3 || d > 8)) || (d <= 0 && beach >= 100)) {
        wrong.push(`${d} m at (${x}, ${y})`);
      }
      if (d <= 0) dryNodes++;
    }
    expect(wrong).toEqual([]);
    expect(dryNodes).toBeGreaterThan(0);
    const dryCells = cellMean(mesh, field(mesh, 'depth')).filter((h) => h <= 0).length;
    expect(dryCells).toBeGreaterThan(0);
    expect(dryCells).toBeLessThan(0.01 * mesh.nCells);
  });

  it('has an ebb flow, fastest in the mouth, smooth, still on dry land', () => {
    const vel = field(mesh, 'velocity');
    expect(vel.components).toBe(2);
    const depth = field(mesh, 'depth').values;
    let max = 0, at = -1, dryMax = 0;
    for (let i = 0; i < mesh.nPoints; i++) {
      const s = Math.hypot(vel.values[2 * i]!, vel.values[2 * i + 1]!);
      if (s > max) { max = s; at = i; }
      if (depth[i]! <= 0) dryMax = Math.max(dryMax, s);
    }
    expect(dryMax).toBe(0);
    expect(max).toBeGreaterThanOrEqual(1.5);
    expect(max).toBeLessThanOrEqual(2);
    const mx = mesh.points[2 * at]!, my = mesh.points[2 * at + 1]!;
    expect(mx > bw.westTip && mx < bw.eastTip && my > bw.south && my < bw.north).toBe(true);
    // leaving through the mouth: southward there
    expect(vel.values[2 * at + 1]!).toBeLessThan(-0.9 * max);
    // smooth: no velocity jump steeper than 0.05 (m/s)/m between neighbouring nodes
    const { pairs } = edgeCheck(mesh);
    let gradient = 0;
    for (let e = 0; e < pairs.length; e += 2) {
      const a = pairs[e]!, b = pairs[e + 1]!;
      const du = Math.hypot(vel.values[2 * a]! - vel.values[2 * b]!, vel.values[2 * a + 1]! - vel.values[2 * b + 1]!);
      gradient = Math.max(gradient, du / Math.hypot(mesh.points[2 * a]! - mesh.points[2 * b]!, mesh.points[2 * a + 1]! - mesh.points[2 * b + 1]!));
    }
    expect(gradient).toBeLessThan(0.05);
  });

  it('is capped by the slivers at the breakwater tip and the deep channel cells', () => {
    const H = cellMean(mesh, field(mesh, 'depth'));
    const ux = cellMean(mesh, field(mesh, 'velocity'), 0);
    const uy = cellMean(mesh, field(mesh, 'velocity'), 1);
    const dt = new Float64Array(mesh.nCells);
    // λ = |u| + √(gH), the shallow-water wave speed (common practice); dt = h/λ with h = 2A/P
    for (let c = 0; c < mesh.nCells; c++) dt[c] = stats.h[c]! / (Math.hypot(ux[c]!, uy[c]!) + Math.sqrt(G * Math.max(H[c]!, 0)));
    const worst = smallest(dt, 20);
    let tip = 0, channel = 0;
    for (const c of worst) {
      if (nearTip(c)) tip++;
      else if (onChannel(c)) channel++;
      else expect.fail(`cell ${c} at (${stats.cx[c]}, ${stats.cy[c]}) is among the worst 20 but neither at the tip nor on the channel`);
    }
    expect(tip).toBeGreaterThan(0);
    expect(channel).toBeGreaterThan(0);
    // the very worst is a sliver: circumradius R = abc/4A far above the inradius r = A/s
    const c = worst[0]!;
    expect(nearTip(c)).toBe(true);
    const s = mesh.cellOffsets[c]!;
    const len = (i: number, j: number) => Math.hypot(mesh.points[2 * mesh.cellNodes[s + i]!]! - mesh.points[2 * mesh.cellNodes[s + j]!]!, mesh.points[2 * mesh.cellNodes[s + i]! + 1]! - mesh.points[2 * mesh.cellNodes[s + j]! + 1]!);
    const abc = len(0, 1) * len(1, 2) * len(2, 0);
    const A = stats.area[c]!;
    const ratio = abc / (4 * A) / (A / (stats.perimeter[c]! / 2));
    expect(ratio).toBeGreaterThan(20); // 2 for an equilateral triangle
  });

  it('is deterministic and shipped as generated', () => {
    const bytes = demoBytes(mesh);
    expect(sameBytes(demoBytes(makeHarbour()), bytes)).toBe(true);
    expect(bytes.length).toBeLessThan(DEMO_MAX_BYTES);
    expectShipped('harbour.vtu', bytes);
  }, 30000);
});
