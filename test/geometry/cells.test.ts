import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Delaunator from 'delaunator';
import { computeGeometry, FLAG_DEGENERATE, FLAG_INVERTED, FLAG_NONCONVEX, FLAG_REPEATED_NODE } from '../../src/geometry/cells.js';
import { gridMesh, meshOf, rng } from '../helpers/meshes.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

describe('triangle worked examples', () => {
  it('equilateral triangle of side a (standard handbook formulas: r = a/(2√3), R = a/√3)', () => {
    const a = 2.5;
    const g = computeGeometry(meshOf([0, 0, a, 0, a / 2, (a * Math.sqrt(3)) / 2], [[0, 1, 2]]));
    expect(rel(g.area[0]!, (Math.sqrt(3) / 4) * a * a)).toBeLessThan(1e-14);
    expect(rel(g.inradius[0]!, a / (2 * Math.sqrt(3)))).toBeLessThan(1e-14);
    expect(rel(g.circumradius[0]!, a / Math.sqrt(3))).toBeLessThan(1e-14);
    expect(rel(g.perimeter[0]!, 3 * a)).toBeLessThan(1e-15);
    expect(g.minAngle[0]!).toBeCloseTo(60, 10);
    expect(g.maxAngle[0]!).toBeCloseTo(60, 10);
    // Verdict manual (Stimpson et al., SAND2007-2853P, 2007), triangle metrics: value 1 on the equilateral triangle
    for (const q of [g.radiusRatio, g.aspectRatio, g.scaledJacobian, g.condition, g.edgeRatio]) expect(q[0]!).toBeCloseTo(1, 12);
    expect(g.flags[0]).toBe(0);
  });

  it('3-4-5 right triangle: area 6, r = 1, R = 2.5 (standard handbook formulas)', () => {
    const g = computeGeometry(meshOf([0, 0, 4, 0, 0, 3], [[0, 1, 2]]));
    expect(g.area[0]).toBe(6);
    expect(g.inradius[0]).toBeCloseTo(1, 14);
    expect(g.circumradius[0]).toBeCloseTo(2.5, 14);
    expect(g.minAltitude[0]).toBeCloseTo(12 / 5, 14);
    expect(g.maxAngle[0]).toBeCloseTo(90, 12);
    // the minimum angle is opposite the shortest side (3): asin(3/5)
    expect(g.minAngle[0]).toBeCloseTo((Math.asin(3 / 5) * 180) / Math.PI, 12);
    // Verdict radius ratio R/(2r) = 1.25; edge ratio 5/3
    expect(g.radiusRatio[0]).toBeCloseTo(1.25, 14);
    expect(g.edgeRatio[0]).toBeCloseTo(5 / 3, 14);
  });
});

describe('quad worked examples', () => {
  it('unit square: Verdict quad metrics equal 1 (Stimpson et al., SAND2007-2853P, 2007)', () => {
    const g = computeGeometry(meshOf([0, 0, 1, 0, 1, 1, 0, 1], [[0, 1, 2, 3]]));
    expect(g.area[0]).toBe(1);
    expect(g.inradius[0]).toBe(0.5);
    for (const q of [g.radiusRatio, g.aspectRatio, g.scaledJacobian, g.condition, g.edgeRatio]) expect(q[0]!).toBeCloseTo(1, 14);
    expect(g.minAngle[0]).toBeCloseTo(90, 12);
    expect(g.centroidX[0]).toBeCloseTo(0.5, 15);
    expect(g.centroidY[0]).toBeCloseTo(0.5, 15);
  });

  it('rectangle 4 × 1: edge ratio 4, quad radius ratio √(ΣL²)·h_max/(4√2·min Aᵢ) as the corrected Verdict form', () => {
    const g = computeGeometry(meshOf([0, 0, 4, 0, 4, 1, 0, 1], [[0, 1, 2, 3]]));
    expect(g.edgeRatio[0]).toBeCloseTo(4, 14);
    // ΣL² = 34, h_max = diagonal √17, min corner-triangle area = 2
    expect(g.radiusRatio[0]).toBeCloseTo((Math.sqrt(34) * Math.sqrt(17)) / (4 * Math.SQRT2 * 2), 12);
    // aspect ratio ½·h_max·P / (|e0×e1| + |e2×e3|) = ½·4·10/8
    expect(g.aspectRatio[0]).toBeCloseTo(2.5, 14);
    expect(g.inradius[0]).toBeCloseTo(0.8, 14);
  });

  it('flags a non-convex (dart) quad and a bow-tie', () => {
    const g = computeGeometry(meshOf([0, 0, 2, 0, 0.5, 0.5, 0, 2, 2, 2, 0, 0], [[0, 1, 2, 3], [0, 1, 3, 4]]));
    expect(g.flags[0]! & FLAG_NONCONVEX).toBeTruthy();
    expect(g.minAngle[0]).toBeGreaterThan(0);
    expect(g.maxAngle[0]).toBeGreaterThan(180);
    expect(g.flags[1]! & FLAG_NONCONVEX).toBeTruthy();
  });
});

describe('degenerate and inverted cells', () => {
  it('zero-area and repeated-node cells are flagged, never NaN', () => {
    const g = computeGeometry(meshOf([0, 0, 1, 0, 2, 0, 1, 1], [[0, 1, 2], [0, 1, 1], [0, 0, 0], [0, 1, 3, 3], [0, 1, 3]]));
    for (let i = 0; i < 4; i++) {
      expect(g.flags[i]! & FLAG_DEGENERATE).toBeTruthy();
      for (const k of Object.keys(g) as (keyof typeof g)[]) {
        const arr = g[k];
        if (arr instanceof Float64Array) expect(Number.isNaN(arr[i]!), `${k}[${i}]`).toBe(false);
      }
    }
    expect(g.flags[1]! & FLAG_REPEATED_NODE).toBeTruthy();
    expect(g.flags[4]).toBe(0);
  });

  it('a cell ordered against the majority is inverted', () => {
    const m = meshOf([0, 0, 1, 0, 1, 1, 0, 1], [[0, 1, 2], [0, 2, 3], [0, 3, 2]]);
    const g = computeGeometry(m);
    expect(g.flags[0]! & FLAG_INVERTED).toBe(0);
    expect(g.flags[2]! & FLAG_INVERTED).toBeTruthy();
  });

  it('tiny cells of 1e-14 m² keep 1e-9 relative accuracy', () => {
    const s = 1e-7 * Math.SQRT2;
    const g = computeGeometry(meshOf([1e-3, 2e-3, 1e-3 + s, 2e-3, 1e-3, 2e-3 + s], [[0, 1, 2]]));
    const x1 = 1e-3 + s - 1e-3, y2 = 2e-3 + s - 2e-3; // the legs as stored after rounding
    expect(rel(g.area[0]!, 0.5 * x1 * y2)).toBeLessThan(1e-9);
    expect(rel(g.inradius[0]!, (x1 * y2) / (x1 + y2 + Math.hypot(x1, y2)))).toBeLessThan(1e-9);
    expect(g.flags[0]).toBe(0);
  });
});

describe('invariants', () => {
  it('cell areas sum to the domain area of a triangulated polygon (Delaunay of random points in a square)', () => {
    const r = rng(7);
    const pts: number[] = [0, 0, 10, 0, 10, 10, 0, 10];
    for (let i = 0; i < 500; i++) pts.push(r() * 10, r() * 10);
    const d = new Delaunator(Float64Array.from(pts));
    const cells: number[][] = [];
    for (let t = 0; t < d.triangles.length; t += 3) cells.push([d.triangles[t]!, d.triangles[t + 1]!, d.triangles[t + 2]!]);
    const g = computeGeometry(meshOf(pts, cells));
    let sum = 0;
    for (let i = 0; i < g.area.length; i++) sum += g.area[i]!;
    expect(sum).toBeCloseTo(100, 9);
  });

  it('results unchanged under a translation by (5e5, 4e6) and under reversal of node order', () => {
    const base = gridMesh(6, 4, 0.75, true);
    // jitter by dyadic amounts so that the translated coordinates stay exact
    const r = rng(3);
    for (let i = 0; i < base.points.length; i++) base.points[i] = base.points[i]! + Math.round(r() * 64) / 1024;
    const g0 = computeGeometry(base);
    const moved = { ...base, points: base.points.map((v, i) => v + (i % 2 === 0 ? 5e5 : 4e6)) };
    const g1 = computeGeometry(moved);
    const rev = { ...base, cellNodes: base.cellNodes.slice() };
    for (let c = 0; c < base.nCells; c++) {
      const s = base.cellOffsets[c]!, e = base.cellOffsets[c + 1]!;
      rev.cellNodes.set(base.cellNodes.slice(s, e).reverse(), s);
    }
    const g2 = computeGeometry(rev);
    for (const k of ['area', 'perimeter', 'inradius', 'circumradius', 'minAngle', 'maxAngle', 'radiusRatio', 'scaledJacobian', 'condition', 'edgeRatio'] as const) {
      for (let i = 0; i < base.nCells; i++) {
        expect(rel(g1[k][i]!, g0[k][i]!), `${k} translated`).toBeLessThan(1e-9);
        expect(rel(g2[k][i]!, g0[k][i]!), `${k} reversed`).toBeLessThan(1e-12);
      }
    }
    expect(g1.centroidX[0]! - 5e5).toBeCloseTo(g0.centroidX[0]!, 8);
    for (let i = 0; i < base.nCells; i++) expect(g2.flags[i]).toBe(0);
  });

  it('a strip of long thin quads across the flow has h → Δx', () => {
    const dx = 0.01, W = 1e4; // cells 0.01 m along the flow, 10 km across it
    const g = computeGeometry(meshOf([0, 0, dx, 0, 2 * dx, 0, 2 * dx, W, dx, W, 0, W], [[0, 1, 4, 5], [1, 2, 3, 4]]));
    for (let i = 0; i < 2; i++) expect(rel(g.inradius[i]!, dx)).toBeLessThan(2e-6);
  });
});

/**
 * The safe bound: for a constant velocity u, the outflow of a simple polygon is
 * Σ max(u·n, 0)|f| = ½ Σ |u·n||f| ≤ |u|·P/2 (the net flux of a constant field vanishes, and
 * |u·n| ≤ |u|), so first-order upwind with forward Euler at dt = (2A/P)/|u| has an outflow
 * coefficient dt·outflow/A ≤ 1: the update is a convex combination.
 */
describe('safe-bound property', () => {
  function outflow(xs: number[], ys: number[], ux: number, uy: number): number {
    let s = 0;
    const n = xs.length;
    for (let k = 0; k < n; k++) {
      const ex = xs[(k + 1) % n]! - xs[k]!, ey = ys[(k + 1) % n]! - ys[k]!;
      // outward normal times length for counter-clockwise order: (ey, −ex)
      s += Math.max(ux * ey - uy * ex, 0);
    }
    return s;
  }

  it('holds on random star-shaped polygons, triangles and quads', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 12 }),
        fc.array(fc.double({ min: 0.05, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }),
        fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }),
        fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
        (n, radii, jitter, dir) => {
          // star-shaped (hence simple) polygon: sorted angles, positive radii
          const angles = jitter.slice(0, n).map((j, k) => ((k + 0.35 + 0.3 * j) / n) * 2 * Math.PI);
          const xs = angles.map((a, k) => radii[k]! * Math.cos(a));
          const ys = angles.map((a, k) => radii[k]! * Math.sin(a));
          let A2 = 0, P = 0;
          for (let k = 0; k < n; k++) {
            A2 += xs[k]! * ys[(k + 1) % n]! - xs[(k + 1) % n]! * ys[k]!;
            P += Math.hypot(xs[(k + 1) % n]! - xs[k]!, ys[(k + 1) % n]! - ys[k]!);
          }
          const A = A2 / 2;
          const ux = Math.cos(dir), uy = Math.sin(dir);
          const out = outflow(xs, ys, ux, uy);
          expect(out).toBeLessThanOrEqual(P / 2 + 1e-12);
          const dt = (2 * A) / P; // h/|u| with |u| = 1
          expect((dt * out) / A).toBeLessThanOrEqual(1 + 1e-12);
          if (n <= 4) {
            const pts: number[] = [];
            for (let k = 0; k < n; k++) pts.push(xs[k]!, ys[k]!);
            const g = computeGeometry(meshOf(pts, [[...Array(n).keys()]]));
            if (!(g.flags[0]! & FLAG_DEGENERATE)) expect(Math.abs(g.inradius[0]! - (2 * A) / P)).toBeLessThan(1e-12 * P);
          }
        },
      ),
      { numRuns: 500, seed: 42 },
    );
  });
});
