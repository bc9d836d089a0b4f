/** The size field for a target step: per-cell floors, node sizes and the node table. */
import { describe, expect, it } from 'vitest';
import { runAudit } from '../../src/audit/audit.js';
import { EQUILATERAL_EDGE_PER_INRADIUS, sizeField, sizeFieldCsvChunks } from '../../src/audit/sizefield.js';
import { meshOf, vectorField } from '../helpers/meshes.js';

// two equilateral triangles of side 2 forming a rhombus; cell 0 in flow of 1 m/s, cell 1 of 2 m/s
const S3 = Math.sqrt(3);
function rhombus() {
  return meshOf([0, 0, 2, 0, 1, S3, 3, S3], [[0, 1, 2], [1, 3, 2]], [], [vectorField('velocity', [1, 0, 2, 0])]);
}

describe('sizeField', () => {
  it('equilateral edge per inradius: a = 2√3·r (elementary geometry, common practice)', () => {
    // an equilateral triangle of side a has area √3a²/4 and perimeter 3a: 2A/P = a/(2√3)
    const a = 2;
    expect(EQUILATERAL_EDGE_PER_INRADIUS * ((2 * (S3 * a * a) / 4) / (3 * a))).toBeCloseTo(a, 14);
  });

  it('a known value: h* = T·λ/C, and the edge of cell 0 at 0.9 × its own step is 0.9 × its side', () => {
    const m = rhombus();
    const C = 0.5;
    const r = runAudit(m, { courant: C });
    const h = 2 / (2 * S3); // inradius of the side-2 equilateral triangle
    const T = 0.9 * ((C * h) / 1); // 0.9 × the step of cell 0
    const sf = sizeField(r.mesh, r.geom, r.speed, C, T);
    expect(sf.targetInradius[0]).toBeCloseTo((T * 1) / C, 14);
    expect(sf.targetInradius[1]).toBeCloseTo((T * 2) / C, 14);
    expect(sf.targetEdge[0]).toBeCloseTo(0.9 * 2, 12);
    expect(sf.targetEdge[1]).toBeCloseTo(0.9 * 4, 12);
    // cell 0 already allows T; cell 1 (twice the speed) must grow to 1.8 × its inradius
    expect(sf.summary).toMatchObject({ cells_to_change: 1, nodes_raised: 3 });
    expect(sf.summary.area_share_to_change).toBeCloseTo(0.5, 14);
    expect(sf.summary.area_to_change).toBeCloseTo(S3, 12); // one triangle: √3·2²/4
    expect(sf.summary.largest_growth).toBeCloseTo(1.8, 12);
    // node floors: the largest target edge of the node's cells; node 0 only touches cell 0
    expect(Array.from(sf.nodeFloor).map((x) => +x.toFixed(12))).toEqual([1.8, 3.6, 3.6, 3.6]);
    // node size: max(floor, current mean edge 2): node 0 keeps its size, the others grow
    expect(Array.from(sf.nodeSize).map((x) => +x.toFixed(12))).toEqual([2, 3.6, 3.6, 3.6]);
  });

  it('cells at rest ask for no size; unused nodes stay out of the node table', () => {
    const m = meshOf([0, 0, 2, 0, 1, S3, 3, S3, 9, 9], [[0, 1, 2], [1, 3, 2]], [], [vectorField('velocity', [0, 0, 0, 0])]);
    const r = runAudit(m);
    const sf = sizeField(r.mesh, r.geom, r.speed, 1, 10);
    expect(Array.from(sf.targetEdge)).toEqual([0, 0]);
    expect(sf.summary.cells_to_change).toBe(0);
    expect(sf.summary.largest_growth).toBeNull();
    const csv = [...sizeFieldCsvChunks(r.mesh, sf.nodeSize, 2)].join('');
    const lines = csv.trimEnd().split('\n');
    expect(lines[0]).toBe('node,x,y,size');
    expect(lines.map((l) => l.split(',')[0])).toEqual(['node', '0', '1', '2', '3']);
    expect(Number(lines[1]!.split(',')[3])).toBeCloseTo(2, 14);
  });
});
