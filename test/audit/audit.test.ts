import { describe, expect, it } from 'vitest';
import { runAudit, CAUSE_SMALL, CAUSE_FAST, CAUSE_SHAPE, CAUSE_DEGENERATE } from '../../src/audit/audit.js';
import { cellsCsv, CSV_COLUMNS } from '../../src/io/csv.js';
import { gridMesh, meshOf, vectorField, scalarField } from '../helpers/meshes.js';

describe('per-cell limits', () => {
  it('a uniform quad grid in uniform flow: dt = C·h/|u| with h = Δx/2 for squares', () => {
    const m = gridMesh(4, 3, 2);
    m.pointData.push(vectorField('velocity', Array.from({ length: m.nPoints }, () => [3, 4]).flat()));
    const r = runAudit(m, { courant: 0.8 });
    for (let i = 0; i < m.nCells; i++) expect(r.dt[i]).toBeCloseTo((0.8 * 1) / 5, 14);
    expect(r.summary.limit.dt).toBeCloseTo(0.16, 14);
    expect(r.summary.limit.cell).toBe(0); // ties go to the first cell
    expect(r.summary.near_limit.within_2x).toBe(12);
    expect(r.summary.worst.map((w) => w.cell)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(r.summary.mesh).toMatchObject({ cells: 12, points: 20, types: { triangle: 0, quad: 12 } });
  });

  it('finds the small, the badly shaped and the fast cells and says why', () => {
    // 20 unit right triangles, one tiny triangle, one sliver, one in fast flow
    const pts: number[] = [];
    const cells: number[][] = [];
    const vel: number[] = [];
    const add = (xy: number[], u: number) => {
      const b = pts.length / 2;
      pts.push(...xy);
      for (let k = 0; k < 3; k++) vel.push(u, 0);
      cells.push([b, b + 1, b + 2]);
    };
    for (let k = 0; k < 20; k++) add([10 * k, 0, 10 * k + 1, 0, 10 * k, 1], 1);
    add([0, 50, 0.1, 50, 0, 50.1], 1); // small (h 10× below the median)
    add([0, 60, 1, 60, 0.5, 60.02], 1); // sliver: radius ratio far above 3
    add([0, 70, 1, 70, 0, 71], 30); // fast
    const m = meshOf(pts, cells, [vectorField('velocity', vel)]);
    const r = runAudit(m);
    const hUnit = 1 / (2 + Math.SQRT2); // 2A/P of the unit right triangle: 2·½/(2+√2)
    expect(r.dt[0]).toBeCloseTo(hUnit, 14);
    expect(r.cause[20]! & CAUSE_SMALL).toBeTruthy();
    expect(r.cause[21]! & CAUSE_SHAPE).toBeTruthy();
    expect(r.cause[22]! & CAUSE_FAST).toBeTruthy();
    expect(r.cause[0]).toBe(0);
    expect(r.summary.worst.slice(0, 3).map((w) => w.cell).sort()).toEqual([20, 21, 22]);
    expect(r.summary.limit.why).toMatch(/h is [\d.]+× the median/);
    const dts = r.summary.worst.map((w) => w.dt!);
    expect([...dts].sort((a, b) => a - b)).toEqual(dts);
  });

  it('degenerate cells get dt = 0 and a cause; a still flow gives no limit (null / inf)', () => {
    const m = meshOf([0, 0, 1, 0, 2, 0, 0, 1], [[0, 1, 3], [0, 1, 2]], [vectorField('velocity', [1, 0, 1, 0, 1, 0, 1, 0])]);
    const r = runAudit(m);
    expect(r.dt[1]).toBe(0);
    expect(r.cause[1]! & CAUSE_DEGENERATE).toBeTruthy();
    expect(r.summary.limit.dt).toBe(0);
    expect(r.summary.counts.degenerate).toBe(1);
    const still = meshOf([0, 0, 1, 0, 0, 1], [[0, 1, 2]], [vectorField('velocity', [0, 0, 0, 0, 0, 0])]);
    const rs = runAudit(still);
    expect(rs.summary.limit.dt).toBeNull();
    expect(rs.summary.limit.cell).toBeNull();
    expect(rs.dt[0]).toBe(Infinity);
    expect(cellsCsv(rs).split('\n')[1]!.split(',')[CSV_COLUMNS.indexOf('dt')]).toBe('inf');
  });

  it('--dt: per-cell Courant number X·λ/h, cells above C and the ratio to the limit', () => {
    const m = gridMesh(2, 1, 1);
    m.pointData.push(vectorField('velocity', [1, 0, 1, 0, 4, 0, 1, 0, 1, 0, 4, 0]));
    const r = runAudit(m, { dt: 0.2 });
    // h = 0.5; λ = max over nodes: cell 0 → 1, cell 1 → 4
    expect(Array.from(r.courantAtDt!)).toEqual([0.4, 1.6]);
    expect(r.summary.intended).toEqual({ dt: 0.2, ratio_to_limit: 0.2 / 0.125, cells_over_courant: 1, max_courant: 1.6 });
  });

  it('shallow water on the audit: λ = |u| + √(gH) and dry cells counted', () => {
    const m = gridMesh(2, 1, 1);
    m.pointData.push(vectorField('velocity', Array(12).fill(0)), scalarField('depth', [10, 10, 0, 10, 10, 0]));
    const r = runAudit(m, { model: 'shallow-water', depth: 'depth' });
    expect(r.dt[0]).toBeCloseTo(0.5 / Math.sqrt(98.0665), 14);
    expect(r.summary.counts.dry).toBe(0);
    expect(r.summary.model.gravity).toBe(9.80665);
  });
});

describe('CSV', () => {
  it('has the contract columns, one row per cell in file order, numbers that parse back exactly', () => {
    const m = gridMesh(3, 2, 0.1, true);
    m.pointData.push(vectorField('velocity', Array.from({ length: m.nPoints }, (_, i) => [Math.sin(i) + 1.1, Math.cos(i)]).flat()));
    const r = runAudit(m);
    const lines = cellsCsv(r).trimEnd().split('\n');
    const head = lines[0]!.split(',');
    for (const c of ['cell', 'type', 'area', 'perimeter', 'inradius', 'speed', 'dt', 'radius_ratio', 'min_angle']) expect(head).toContain(c);
    expect(lines.length).toBe(m.nCells + 1);
    for (let i = 0; i < m.nCells; i++) {
      const row = lines[i + 1]!.split(',');
      expect(Number(row[head.indexOf('cell')])).toBe(i);
      expect(row[head.indexOf('type')]).toBe('triangle');
      expect(Number(row[head.indexOf('dt')])).toBe(r.dt[i]);
      expect(Number(row[head.indexOf('inradius')])).toBe(r.geom.inradius[i]);
      expect(Number(row[head.indexOf('min_angle')])).toBe(r.geom.minAngle[i]);
    }
  });
});
