/** Grouping the worst cells into regions of cells that share a node. */
import { describe, expect, it } from 'vitest';
import { groupRegions } from '../../src/audit/regions.js';
import { smallestK } from '../../src/audit/stats.js';
import { gridMesh } from '../helpers/meshes.js';

// 6 × 2 unit squares; cell j·6 + i covers [i, i+1] × [j, j+1]
const mesh = gridMesh(6, 2, 1);

function stepsWith(set: Record<number, number>): Float64Array {
  const dt = new Float64Array(mesh.nCells).fill(10);
  for (const [c, v] of Object.entries(set)) dt[Number(c)] = v;
  return dt;
}

describe('groupRegions', () => {
  it('cells sharing an edge or only a corner form one region; regions come in order of their worst step', () => {
    // cell 0 ([0,1]²) and cell 7 ([1,2]×[1,2]) share only the node (1, 1); cell 5 is far to the right
    const dt = stepsWith({ 0: 1, 5: 3, 7: 4 });
    const group = smallestK(dt, 3);
    expect(Array.from(group)).toEqual([0, 5, 7]);
    const regions = groupRegions(mesh, dt, group, 10, 1);
    expect(regions).toHaveLength(2);
    expect(regions[0]).toMatchObject({ region: 1, cells: 2, worst_cell: 0, worst_dt: 1, bbox: [0, 0, 2, 2], cell_ids: [0, 7] });
    expect(regions[1]).toMatchObject({ region: 2, cells: 1, worst_cell: 5, worst_dt: 3, bbox: [5, 0, 6, 1], cell_ids: [5] });
    // remeshing region 1 leaves cell 5 (dt 3) in charge: ×3; then the next cell outside the group: 10
    expect(regions[0]!.dt_after).toBe(3);
    expect(regions[0]!.gain_after).toBe(3);
    expect(regions[1]!.dt_after).toBe(10);
    expect(regions[1]!.gain_after).toBe(10);
  });

  it('a chain joined late merges into the region of its worst cell', () => {
    // cells 0 and 2 are apart until cell 1 (between them) joins; the region keeps cell 0 first
    const dt = stepsWith({ 2: 1, 0: 2, 1: 5 });
    const regions = groupRegions(mesh, dt, smallestK(dt, 3), Infinity, 1);
    expect(regions).toHaveLength(1);
    expect(regions[0]).toMatchObject({ cells: 3, worst_cell: 2, cell_ids: [2, 0, 1], bbox: [0, 0, 3, 1], dt_after: null, gain_after: null });
  });

  it('an empty group gives no region', () => {
    expect(groupRegions(mesh, stepsWith({}), new Int32Array(0), 10, 10)).toEqual([]);
  });
});
