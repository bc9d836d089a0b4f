/**
 * meshChecks: duplicate points, unused points, isolated cells. Expected values are counted by
 * hand on small invented meshes, or by brute force (all pairs) on random ones.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { meshChecks } from '../../src/audit/mesh-checks.js';
import { gridMesh, meshOf } from '../helpers/meshes.js';

describe('meshChecks on hand-made meshes', () => {
  it('a clean grid has nothing to report, in quads and in triangles', () => {
    expect(meshChecks(gridMesh(5, 4, 1))).toEqual({ duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 });
    expect(meshChecks(gridMesh(5, 4, 1, true))).toEqual({ duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 });
  });

  it('one cell is isolated; an empty mesh has nothing', () => {
    expect(meshChecks(meshOf([0, 0, 1, 0, 0, 1], [[0, 1, 2]]))).toEqual({ duplicatePoints: 0, unusedPoints: 0, isolatedCells: 1 });
    expect(meshChecks(meshOf([], []))).toEqual({ duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 });
    expect(meshChecks(meshOf([3, 4], []))).toEqual({ duplicatePoints: 0, unusedPoints: 1, isolatedCells: 0 });
  });

  it('a crack: two triangles with their own copies of the shared side', () => {
    // nodes 1,2 and 3,4 sit at the same places: the cells touch but share no edge
    const m = meshOf([0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 1, 1], [[0, 1, 2], [3, 5, 4]]);
    expect(meshChecks(m)).toEqual({ duplicatePoints: 2, unusedPoints: 0, isolatedCells: 2 });
  });

  it('cells touching at a corner only are isolated; unused points are counted', () => {
    const m = meshOf([0, 0, 1, 0, 1, 1, 2, 1, 2, 2, 9, 9, 8, 8], [[0, 1, 2], [2, 3, 4]]);
    expect(meshChecks(m)).toEqual({ duplicatePoints: 0, unusedPoints: 2, isolatedCells: 2 });
  });

  it('three or more coincident points count as k − 1; -0 and +0 are the same place', () => {
    const m = meshOf([0, 0, -0, 0, 0, -0, 5, 5, 5, 5, 1, 2], []);
    expect(meshChecks(m).duplicatePoints).toBe(3);
    // equal x but different y, and the other way round, are not duplicates
    expect(meshChecks(meshOf([1, 2, 1, 3, 2, 2, 7, 2], [])).duplicatePoints).toBe(0);
  });

  it('a cell with a repeated node still shares its real edges; a collapsed side is no edge', () => {
    // cell 1 repeats node 1: its sides are 0-1 (shared with cell 0), 1-1 (collapsed), 1-0
    const m = meshOf([0, 0, 1, 0, 0, 1], [[0, 1, 2], [0, 1, 1]]);
    expect(meshChecks(m).isolatedCells).toBe(0);
    // a cell whose nodes are all one node has no edges at all
    expect(meshChecks(meshOf([0, 0, 1, 0, 0, 1], [[0, 1, 2], [2, 2, 2]])).isolatedCells).toBe(2);
  });

  it('an edge shared by three cells (not a manifold) is counted, not rejected', () => {
    const m = meshOf([0, 0, 1, 0, 0, 1, 0, -1, 2, 2], [[0, 1, 2], [1, 0, 3], [0, 1, 4]]);
    expect(meshChecks(m).isolatedCells).toBe(0);
  });
});

/** All-pairs reference counts, independent of the sorting in meshChecks. */
function bruteForce(points: number[], cells: number[][]): { duplicatePoints: number; unusedPoints: number; isolatedCells: number } {
  const n = points.length / 2;
  let duplicatePoints = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < i; j++) {
      if (points[2 * i] === points[2 * j] && points[2 * i + 1] === points[2 * j + 1]) { duplicatePoints++; break; }
    }
  }
  const used = new Set(cells.flat());
  const edges = (c: number[]) => c.map((a, k) => [a, c[(k + 1) % c.length]!]).filter(([a, b]) => a !== b).map(([a, b]) => `${Math.min(a!, b!)}-${Math.max(a!, b!)}`);
  let isolatedCells = 0;
  cells.forEach((c, i) => {
    const mine = new Set(edges(c));
    if (!cells.some((d, j) => j !== i && edges(d).some((e) => mine.has(e)))) isolatedCells++;
  });
  return { duplicatePoints, unusedPoints: n - used.size, isolatedCells };
}

describe('meshChecks against brute force', () => {
  it('random small meshes on a coarse lattice (many coincidences)', () => {
    const arb = fc.integer({ min: 1, max: 12 }).chain((n) =>
      fc.record({
        points: fc.array(fc.integer({ min: -2, max: 2 }), { minLength: 2 * n, maxLength: 2 * n }),
        cells: fc.array(fc.array(fc.nat(n - 1), { minLength: 3, maxLength: 4 }), { maxLength: 10 }),
      }));
    fc.assert(fc.property(arb, ({ points, cells }) => {
      expect(meshChecks(meshOf(points, cells))).toEqual(bruteForce(points, cells));
    }), { numRuns: 400, seed: 77 });
  });

  it('a fan of 200 000 triangles around one node and a million points at one place stay linear', () => {
    const n = 200000;
    const pts = [0, 0];
    for (let i = 0; i <= n; i++) pts.push(Math.cos((i / n) * 6), Math.sin((i / n) * 6));
    const fan = meshOf(pts, Array.from({ length: n }, (_, i) => [0, i + 1, i + 2]));
    const t0 = performance.now();
    // neighbouring triangles share their spokes 0-(i+1): nothing is isolated
    expect(meshChecks(fan)).toEqual({ duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 });
    const pile = meshOf(new Array(2e6).fill(7), []);
    expect(meshChecks(pile)).toEqual({ duplicatePoints: 1e6 - 1, unusedPoints: 1e6, isolatedCells: 0 });
    expect(performance.now() - t0).toBeLessThan(3000);
  });

  it('a 400 × 400 quad grid (160 000 cells) is checked quickly', () => {
    const m = gridMesh(400, 400, 0.5);
    const t0 = performance.now();
    expect(meshChecks(m)).toEqual({ duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 });
    expect(performance.now() - t0).toBeLessThan(2000);
  });
});
