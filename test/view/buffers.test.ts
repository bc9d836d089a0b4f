import Delaunator from 'delaunator';
import Flatbush from 'flatbush';
import { describe, expect, it } from 'vitest';
import type { Mesh } from '../../src/mesh/model.js';
import { pickCell, pointInCell } from '../../src/view/pick.js';
import { cellIndex, renderBuffers, uniqueEdges, usedBounds } from '../../src/view/worker/buffers.js';
import { gridMesh, meshOf } from '../helpers/meshes.js';

function shoelace(m: Mesh, i: number): number {
  let a = 0;
  const s = m.cellOffsets[i]!, e = m.cellOffsets[i + 1]!;
  for (let k = s; k < e; k++) {
    const p = m.cellNodes[k]!, q = m.cellNodes[k + 1 < e ? k + 1 : s]!;
    a += m.points[2 * p]! * m.points[2 * q + 1]! - m.points[2 * q]! * m.points[2 * p + 1]!;
  }
  return Math.abs(a) / 2;
}

function drawnAreaPerCell(m: Mesh, cx: number, cy: number): Float64Array {
  const { positions, cellIds } = renderBuffers(m, cx, cy);
  const out = new Float64Array(m.nCells);
  for (let t = 0; t < cellIds.length / 3; t++) {
    const id = cellIds[3 * t]!;
    expect(cellIds[3 * t + 1]).toBe(id);
    expect(cellIds[3 * t + 2]).toBe(id);
    const [ax, ay, bx, by, qx, qy] = positions.subarray(6 * t, 6 * t + 6);
    out[id] += Math.abs((bx! - ax!) * (qy! - ay!) - (by! - ay!) * (qx! - ax!)) / 2;
  }
  return out;
}

/** A random Delaunay triangulation (delaunator) of points from a seeded generator. */
function randomMesh(n: number, seed: number): Mesh {
  let s = seed;
  const rnd = () => ((s = (s * 16807) % 2147483647) / 2147483647);
  const pts: number[] = [];
  for (let i = 0; i < n; i++) pts.push(rnd() * 100, rnd() * 50);
  const d = new Delaunator(pts);
  const cells: number[][] = [];
  for (let t = 0; t < d.triangles.length; t += 3) cells.push([d.triangles[t]!, d.triangles[t + 1]!, d.triangles[t + 2]!]);
  return meshOf(pts, cells);
}

describe('render buffers', () => {
  it('draws every cell with its own id and its exact area (quads as two triangles)', () => {
    const m = meshOf([0, 0, 2, 0, 2, 1, 0, 1, 3, 0.5], [[0, 1, 2, 3], [1, 4, 2]]);
    const { positions, cellIds } = renderBuffers(m, 0, 0);
    expect(cellIds.length).toBe(9); // 2 + 1 triangles
    expect(positions.length).toBe(18);
    const drawn = drawnAreaPerCell(m, 0, 0);
    for (let i = 0; i < m.nCells; i++) expect(drawn[i]).toBeCloseTo(shoelace(m, i), 12);
  });

  it('splits a non-convex quad along its inner diagonal', () => {
    // a chevron (0,0) (2,1) (4,0) (2,3): the corner at (2,1) is reflex, so only the diagonal
    // (2,1)–(2,3) lies inside; every rotation of the node order must still draw area 4
    for (const rot of [0, 1, 2, 3]) {
      const pts = [0, 0, 2, 1, 4, 0, 2, 3];
      const order = [0, 1, 2, 3].map((k) => (k + rot) % 4);
      const m = meshOf(pts, [order]);
      expect(drawnAreaPerCell(m, 0, 0)[0]).toBeCloseTo(shoelace(m, 0), 12);
    }
  });

  it('subtracts the centre in float64 before the float32 conversion', () => {
    // projected map coordinates: 0.01 m cells at 4e6 m would be lost in float32 without the shift
    const m = gridMesh(2, 2, 0.01, false, 5e5, 4e6);
    const b = usedBounds(m);
    const cx = (b.minX + b.maxX) / 2, cy = (b.minY + b.maxY) / 2;
    const { positions } = renderBuffers(m, cx, cy);
    let max = 0;
    for (const v of positions) max = Math.max(max, Math.abs(v));
    expect(max).toBeCloseTo(0.01, 6);
    const drawn = drawnAreaPerCell(m, cx, cy);
    for (let i = 0; i < m.nCells; i++) expect(drawn[i]).toBeCloseTo(1e-4, 9);
  });

  it('bounds only the points that cells use', () => {
    const m = meshOf([0, 0, 1, 0, 0, 1, 1e9, 1e9], [[0, 1, 2]]);
    expect(usedBounds(m)).toEqual({ minX: 0, minY: 0, maxX: 1, maxY: 1 });
  });
});

describe('unique edges', () => {
  it('counts each shared edge once (structured quad grid: nx(ny+1) + ny(nx+1), common practice)', () => {
    const m = gridMesh(7, 4, 1);
    const { positions, lengths } = uniqueEdges(m, 0, 0);
    expect(positions.length / 4).toBe(7 * 5 + 4 * 8);
    for (const l of lengths) expect(l).toBeCloseTo(1, 12);
  });

  it('satisfies Euler’s formula V − E + F = 1 on a random triangulation (common practice)', () => {
    const m = randomMesh(300, 7);
    const e = uniqueEdges(m, 0, 0).positions.length / 4;
    expect(m.nPoints - e + m.nCells).toBe(1);
  });
});

describe('picking through the cell index', () => {
  it('finds the cell that contains a point, as a brute-force search does', () => {
    const m = randomMesh(400, 11);
    const index = Flatbush.from(cellIndex(m));
    let s = 5;
    const rnd = () => ((s = (s * 48271) % 2147483647) / 2147483647);
    for (let k = 0; k < 500; k++) {
      const x = rnd() * 110 - 5, y = rnd() * 60 - 5;
      let brute = -1;
      for (let i = 0; i < m.nCells && brute < 0; i++) if (pointInCell(m, i, x, y)) brute = i;
      expect(pickCell(index, m, x, y)).toBe(brute);
    }
  });

  it('tells inside from outside for both node orders and for a non-convex quad', () => {
    const dart = meshOf([0, 0, 2, 1, 4, 0, 2, 3], [[0, 1, 2, 3], [3, 2, 1, 0]]);
    for (const c of [0, 1]) {
      expect(pointInCell(dart, c, 2, 2)).toBe(true);
      expect(pointInCell(dart, c, 2, 0.5)).toBe(false); // in the notch
      expect(pointInCell(dart, c, 0.5, 0.5)).toBe(true); // in a wing
    }
  });

  it('returns -1 for non-finite points and for an empty mesh', () => {
    const m = meshOf([], []);
    const index = Flatbush.from(cellIndex(m));
    expect(pickCell(index, m, 0, 0)).toBe(-1);
    const g = gridMesh(2, 2, 1);
    expect(pickCell(Flatbush.from(cellIndex(g)), g, NaN, 0.5)).toBe(-1);
  });
});
