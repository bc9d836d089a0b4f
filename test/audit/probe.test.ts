/** Measured stability of the upwind operator: hand-built operators, the strip, and the ordering measured ≥ face flux ≥ inscribed. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { runAudit } from '../../src/audit/audit.js';
import { applyOperator, growthPerStep, integrator, probeLimit, randomStart, upwindOperator } from '../../src/audit/probe.js';
import { computeGeometry } from '../../src/geometry/cells.js';
import { buildEdges } from '../../src/geometry/edges.js';
import { UsageError } from '../../src/mesh/errors.js';
import type { Mesh } from '../../src/mesh/model.js';
import { gridMesh, meshOf, rng } from '../helpers/meshes.js';

function opOf(m: Mesh, vx: number[], vy: number[], onPoints = true, geographic = false) {
  const g = computeGeometry(m, undefined, geographic ? 'geographic' : 'planar');
  return upwindOperator(m, g, buildEdges(m), { vx: Float64Array.from(vx), vy: Float64Array.from(vy), onPoints, source: 'test' }, geographic);
}

/** Point velocity from a function of (x, y). */
function pointField(m: Mesh, f: (x: number, y: number) => [number, number]): { vx: number[]; vy: number[] } {
  const vx: number[] = [], vy: number[] = [];
  for (let p = 0; p < m.nPoints; p++) {
    const [a, b] = f(m.points[2 * p]!, m.points[2 * p + 1]!);
    vx.push(a);
    vy.push(b);
  }
  return { vx, vy };
}

describe('the upwind operator', () => {
  it('two unit squares in a row, u = (1, 0): the right cell receives 1·1/1 from the left; the left one nothing (boundary inflow ignored)', () => {
    const m = meshOf([0, 0, 1, 0, 2, 0, 2, 1, 1, 1, 0, 1], [[0, 1, 4, 5], [1, 2, 3, 4]]);
    const op = opOf(m, Array(6).fill(1), Array(6).fill(0));
    expect(op.nFaces).toBe(1);
    expect(Array.from(op.dst)).toEqual([1]);
    expect(Array.from(op.src)).toEqual([0]);
    expect(op.coef[0]).toBeCloseTo(1, 15);
    expect(Array.from(op.diag)).toEqual([0, 1]);
    // clockwise node order: the same operator
    const cw = opOf(meshOf([0, 0, 1, 0, 2, 0, 2, 1, 1, 1, 0, 1], [[0, 5, 4, 1], [1, 4, 3, 2]]), Array(6).fill(1), Array(6).fill(0));
    expect(Array.from(cw.dst)).toEqual([1]);
    expect(cw.coef[0]).toBeCloseTo(1, 15);
  });

  it('cell data: u_f is the mean of the two cells (1 and 3 → 2), flow reversed → the left cell receives', () => {
    const m = meshOf([0, 0, 1, 0, 2, 0, 2, 1, 1, 1, 0, 1], [[0, 1, 4, 5], [1, 2, 3, 4]]);
    const op = opOf(m, [-1, -3], [0, 0], false);
    expect(Array.from(op.dst)).toEqual([0]);
    expect(op.coef[0]).toBeCloseTo(2, 15);
  });

  it('rows sum to zero: L·1 = 0 (constants are kept), on a jittered mixed mesh with a rotation', () => {
    const m = gridMesh(5, 4, 1, true);
    const r = rng(11);
    for (let i = 0; i < m.points.length; i++) m.points[i] = m.points[i]! + (r() - 0.5) * 0.3;
    const { vx, vy } = pointField(m, (x, y) => [-(y - 2), x - 2.5]);
    const op = opOf(m, vx, vy);
    const y = new Float64Array(m.nCells);
    applyOperator(op, new Float64Array(m.nCells).fill(1), y);
    for (const v of y) expect(Math.abs(v)).toBeLessThan(1e-12);
  });

  it('geographic: a 0.001° cell at the equator has the coefficient |u|/Δx with Δx = R·0.001·π/180 (R = 6 371 008.8 m, IUGG mean radius)', () => {
    const d = 0.001;
    const m = meshOf([0, 0, d, 0, 2 * d, 0, 2 * d, d, d, d, 0, d], [[0, 1, 4, 5], [1, 2, 3, 4]]);
    const op = opOf(m, Array(6).fill(1), Array(6).fill(0), true, true);
    const dx = (6371008.8 * d * Math.PI) / 180;
    expect(op.coef[0]! * dx).toBeCloseTo(1, 6);
  });

  it('a degenerate receiving cell is left out and counted, whichever cell comes first', () => {
    // a unit square, then a flat triangle on its right edge (node 3 = (1, 0.5) lies on that edge)
    const pts = [0, 0, 1, 0, 1, 1, 1, 0.5, 0, 1];
    for (const cells of [[[0, 1, 2, 4], [1, 3, 2]], [[1, 3, 2], [0, 1, 2, 4]]]) {
      const op = opOf(meshOf(pts, cells), Array(5).fill(1), Array(5).fill(0));
      expect(op.nFaces).toBe(0);
      expect(op.degenerate).toBe(1);
    }
    // flow the other way: the square receives from the flat cell through the face of length 1
    const back = opOf(meshOf(pts, [[1, 3, 2], [0, 1, 2, 4]]), Array(5).fill(-1), Array(5).fill(0));
    expect(back.nFaces).toBe(1);
    expect(back.dst[0]).toBe(1);
    expect(back.coef[0]).toBeCloseTo(1, 15);
  });
});

describe('integrators', () => {
  it('rkS is the Taylor polynomial Σ z^k/k! (common practice); Heun has the same as rk2; unknown names are a usage error', () => {
    expect(Array.from(integrator('euler').r)).toEqual([1, 1]);
    expect(Array.from(integrator('rk2').r)).toEqual([1, 1, 0.5]);
    expect(Array.from(integrator('RK4').r)).toEqual([1, 1, 0.5, 1 / 6, 1 / 24]);
    const heun = integrator('heun').r;
    expect(heun.length).toBe(3);
    expect(heun[2]).toBeCloseTo(0.5, 14);
    expect(() => integrator('leapfrog')).toThrow(UsageError);
  });
});

/** Largest c with max_θ |R(c(e^{−iθ} − 1))| ≤ 1: von Neumann analysis of upwind on a periodic grid (common practice), by bisection here. */
function vonNeumannUpwind(r: Float64Array): number {
  const grows = (c: number): boolean => {
    for (let k = 1; k <= 720; k++) {
      const th = (Math.PI * k) / 720;
      const zr = c * (Math.cos(th) - 1), zi = -c * Math.sin(th);
      let pr = r[r.length - 1]!, pi = 0;
      for (let j = r.length - 2; j >= 0; j--) {
        const t = pr * zr - pi * zi + r[j]!;
        pi = pr * zi + pi * zr;
        pr = t;
      }
      if (pr * pr + pi * pi > 1 + 1e-12) return true;
    }
    return false;
  };
  let lo = 0.5, hi = 4;
  while (hi - lo > 1e-9) { const mid = 0.5 * (lo + hi); if (grows(mid)) hi = mid; else lo = mid; }
  return lo;
}

describe('measured limit', () => {
  // A periodic strip is not available (boundary faces carry nothing). A strip of 1000 cells is
  // longer than the 400 steps of a trial, and upwind moves information one cell per step, so most of
  // the random start never feels the ends: the iteration sees the interior operator, the same as on
  // a periodic strip, whose shortest wave grows by |1 − 2c| per step, c = |u|dt/Δx (von Neumann,
  // common practice): the limit is Δx/|u|. The finite matrix alone has eigenvalues 1 − c and would
  // pass up to 2Δx/|u|; that only shows once disturbances have had time to leave the strip.
  const strip = () => {
    const m = gridMesh(1000, 2, 1);
    return opOf(m, Array(m.nPoints).fill(2), Array(m.nPoints).fill(0));
  };

  it('uniform strip of quads, flow along it, forward Euler: Δx/|u| within 1 %', () => {
    const r = probeLimit(strip(), integrator('euler').r);
    expect(r.dt).not.toBeNull();
    expect(Math.abs(r.dt! / 0.5 - 1)).toBeLessThan(0.01);
    expect(r.trials.length).toBeLessThan(20);
  });

  it('same strip with rk4: the von Neumann Courant number of rk4 × upwind times Δx/|u|, within 1 %', () => {
    const expected = vonNeumannUpwind(integrator('rk4').r) * 0.5;
    expect(expected).toBeGreaterThan(0.6);
    const r = probeLimit(strip(), integrator('rk4').r);
    expect(Math.abs(r.dt! / expected - 1)).toBeLessThan(0.01);
  });

  it('is deterministic (seeded start) and null when nothing flows', () => {
    const m = gridMesh(6, 3, 1);
    const { vx, vy } = pointField(m, (x, y) => [1 + 0.1 * y, 0.2 * x]);
    const a = probeLimit(opOf(m, vx, vy), integrator('rk3').r);
    const b = probeLimit(opOf(m, vx, vy), integrator('rk3').r);
    expect(a.dt).toBe(b.dt);
    expect(a.trials).toEqual(b.trials);
    expect(Array.from(randomStart(5, 1))).toEqual(Array.from(randomStart(5, 1)));
    const still = probeLimit(opOf(m, Array(m.nPoints).fill(0), Array(m.nPoints).fill(0)), integrator('euler').r);
    expect(still.dt).toBeNull();
  });

  it('growth per step: the strip at twice its limit grows by |1 − 2c| = 3 per step (von Neumann, common practice)', () => {
    const op = strip();
    const g = growthPerStep(op, integrator('euler').r, 1, randomStart(op.nCells, 3), 200, 50);
    expect(g).toBeGreaterThan(2.9);
    expect(g).toBeLessThanOrEqual(3 + 1e-9);
  });

  it('measured ≥ face flux ≥ inscribed for constant and linear divergence-free velocities (property, generated meshes)', () => {
    const fields: ((x: number, y: number) => [number, number])[] = [
      () => [0.8, -0.3], // constant
      (x, y) => [-(y - 2), x - 2.5], // solid-body rotation about (2.5, 2)
      (x, y) => [0.5 * x, -0.5 * y + 0.1], // strain
    ];
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1 << 20 }), fc.boolean(), fc.integer({ min: 0, max: 2 }), fc.constantFrom('euler', 'rk2', 'rk4'), (seed, split, which, name) => {
        const m = gridMesh(5, 4, 1, split);
        const r = rng(seed);
        // interior nodes only, so the outline stays a rectangle
        for (let p = 0; p < m.nPoints; p++) {
          const x = m.points[2 * p]!, y = m.points[2 * p + 1]!;
          if (x > 0 && x < 5 && y > 0 && y < 4) { m.points[2 * p] = x + (r() - 0.5) * 0.4; m.points[2 * p + 1] = y + (r() - 0.5) * 0.4; }
        }
        const { vx, vy } = pointField(m, fields[which]!);
        m.pointData.push({ name: 'velocity', components: 2, values: Float64Array.from(vx.flatMap((v, i) => [v, vy[i]!])) });
        const inscribed = runAudit(m).summary.limit.dt!;
        const flux = runAudit(m, { length: 'flux' }).summary.limit.dt!;
        const measured = probeLimit(opOf(m, vx, vy), integrator(name).r, { iterations: 120 }).dt!;
        expect(flux).toBeGreaterThanOrEqual(inscribed * (1 - 1e-12));
        expect(measured).toBeGreaterThanOrEqual(flux * (1 - 1e-9));
      }),
      { numRuns: 8, seed: 42 },
    );
  });
});
