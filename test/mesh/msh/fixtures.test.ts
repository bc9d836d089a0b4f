/**
 * Hand-written MSH files (invented basin and channel). Expected values are read off the
 * fixtures by eye; layouts follow the "MSH file format" chapter of the Gmsh reference manual
 * (C. Geuzaine, J.-F. Remacle).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { findArray, QUAD, TRIANGLE } from '../../../src/mesh/model.js';
import { readMsh } from '../../../src/mesh/msh/index.js';
import { cellArea, cellCoords, totalArea } from './helpers.js';

const dir = new URL('../../fixtures/msh/', import.meta.url);
const load = (name: string) => readMsh(readFileSync(new URL(name, dir)), name);

describe('basin-2.2.msh (2.2 ASCII, a point and shore lines beside the triangles)', () => {
  const m = load('basin-2.2.msh');

  it('keeps every node in file order and only the triangles', () => {
    expect(m.format).toBe('msh/2.2-ascii');
    expect(m.nPoints).toBe(6);
    expect(Array.from(m.points)).toEqual([0, 0, 1, 0, 2, 0, 0, 1, 1, 1, 2, 1]);
    expect(m.nCells).toBe(4);
    expect(Array.from(m.cellTypes)).toEqual([TRIANGLE, TRIANGLE, TRIANGLE, TRIANGLE]);
    // node tags 1..6 are file positions 0..5
    expect(Array.from(m.cellNodes)).toEqual([0, 1, 4, 0, 4, 3, 1, 2, 5, 1, 5, 4]);
    expect(Array.from(m.cellOffsets)).toEqual([0, 3, 6, 9, 12]);
    expect(m.warnings).toEqual([]);
    expect(m.time).toBeUndefined();
  });

  it('covers the 2 x 1 basin with counter-clockwise triangles', () => {
    for (let i = 0; i < m.nCells; i++) expect(cellArea(m, i)).toBeCloseTo(0.5, 14);
    expect(totalArea(m)).toBeCloseTo(2, 14);
  });
});

describe('channel-4.1.msh (4.1 ASCII, sparse unordered tags, entities, data)', () => {
  const m = load('channel-4.1.msh');

  it('stores the points in file order across entity blocks (parametric block included)', () => {
    expect(m.format).toBe('msh/4.1-ascii');
    expect(m.nPoints).toBe(8);
    // tags 40, 9, 7, 13, 55, 2, 31, 100
    expect(Array.from(m.points)).toEqual([0, 0, 3, 1, 1, 0, 2, 0, 1, 1, 0, 1, 2, 1, 3, 0]);
  });

  it('maps the sparse node tags of each cell to the right points', () => {
    expect(Array.from(m.cellTypes)).toEqual([QUAD, TRIANGLE, TRIANGLE, TRIANGLE, TRIANGLE]);
    expect(cellCoords(m, 0)).toEqual([[0, 0], [1, 0], [1, 1], [0, 1]]);
    expect(cellCoords(m, 1)).toEqual([[1, 0], [2, 0], [2, 1]]);
    expect(cellCoords(m, 2)).toEqual([[1, 0], [2, 1], [1, 1]]);
    expect(cellCoords(m, 3)).toEqual([[2, 0], [3, 0], [3, 1]]);
    expect(cellCoords(m, 4)).toEqual([[2, 0], [3, 1], [2, 1]]);
    expect(totalArea(m)).toBeCloseTo(3, 14);
  });

  it('keeps the last time step of "velocity" and its time', () => {
    const v = findArray(m.pointData, 'velocity')!;
    expect(v.components).toBe(3);
    // the fixture's second step is u = 1 + x, v = 2 y
    for (let i = 0; i < m.nPoints; i++) {
      const x = m.points[2 * i]!;
      const y = m.points[2 * i + 1]!;
      expect([v.values[3 * i], v.values[3 * i + 1], v.values[3 * i + 2]]).toEqual([1 + x, 2 * y, 0]);
    }
    expect(m.time).toBe(12.5);
  });

  it('fills nodes missing from "depth" with 0 and says so', () => {
    const d = findArray(m.pointData, 'depth')!;
    expect(Array.from(d.values)).toEqual([2.5, 0, 3, 3.5, 3, 2.5, 0, 4]);
    expect(m.warnings.some((w) => w.includes('"depth"') && w.includes('6 of the 8'))).toBe(true);
  });

  it('maps element data to the kept cells and drops the line entry', () => {
    const r = findArray(m.cellData, 'roughness')!;
    expect(r.components).toBe(1);
    expect(Array.from(r.values)).toEqual([0.03, 0.025, 0.025, 0.02, 0.02]);
    expect(m.warnings.filter((w) => w.includes('roughness'))).toEqual([]);
  });
});
