/** The plan built from an audit: which parts appear, their columns, and the option checks. */
import { describe, expect, it } from 'vitest';
import { runAudit } from '../../src/audit/audit.js';
import { buildPlan } from '../../src/audit/plan.js';
import { cellsCsv } from '../../src/io/csv.js';
import { UsageError } from '../../src/mesh/errors.js';
import { gridMesh, vectorField } from '../helpers/meshes.js';

// a strip of six unit squares (h = 0.5) with speeds chosen so that dt = 0.5/λ is 1, 16, 16, 16, 2, 40
function strip() {
  const m = gridMesh(6, 1, 1);
  const dts = [1, 16, 16, 16, 2, 40];
  m.cellData.push(vectorField('velocity', dts.flatMap((d) => [0.5 / d, 0])));
  return m;
}

describe('buildPlan', () => {
  it('remeshing is always there: the gains and one region per group of touching cells', () => {
    const r = runAudit(strip(), { top: 2 });
    const p = buildPlan(r, { gains: [2, 10] });
    const w = p.summary.remesh!;
    expect(w.reference_dt).toBeCloseTo(1, 14);
    // sorted steps 1, 2, 16, 16, 16, 40: ×2 after one cell, ×10 after two
    expect(w.gains.map((g) => g.cells)).toEqual([1, 2]);
    // grouped: max(1 for ×2, --top 2) = 2 cells: 0 and 4, which do not touch
    expect(w.grouped.cells).toBe(2);
    expect(w.regions.map((g) => g.cell_ids)).toEqual([[0], [4]]);
    expect(w.regions[0]!.gain_after).toBeCloseTo(2, 12);
    expect(w.regions[1]!.gain_after).toBeCloseTo(16, 12);
    expect(p.cellColumns).toEqual([]);
    expect(p.summary.lts).toBeUndefined();
  });

  it('--lts, --target-dt, --duration, --courant-min with --dt: the parts and their columns', () => {
    const r = runAudit(strip(), { dt: 4 });
    const p = buildPlan(r, { lts: true, targetDt: 4, duration: 100, cellStepCost: 1e-3, courantMin: 0.2 });
    expect(p.cellColumns.map((c) => c.name)).toEqual(['target_inradius', 'target_edge', 'lts_level', 'below_courant_min']);
    expect(Array.from(p.cellColumns[2]!.values)).toEqual([0, 1, 2, 2, 1, 2]);
    // Courant numbers at X = 4: 4·λ/h = 4/dt = 4, 0.25, 0.25, 0.25, 2, 0.1 → only the last below 0.2
    expect(Array.from(p.cellColumns[3]!.values)).toEqual([0, 0, 0, 0, 0, 1]);
    expect(p.pointData.map((a) => a.name)).toEqual(['node_target_edge', 'size']);
    expect(p.nodeSize).toBe(p.pointData[1]!.values);
    expect(p.summary.size_field!.cells_to_change).toBe(2); // steps 1 and 2 are below 4
    expect(p.summary.lts!.speedup_after).toBeCloseTo(6 / 2.75, 14);
    expect(p.summary.cost!.global!.steps).toBe(100);
    expect(p.summary.courant_min!.below).toBe(1);
    const csv = cellsCsv(r, p.cellColumns).split('\n');
    expect(csv[0]!.endsWith(',target_inradius,target_edge,lts_level,below_courant_min')).toBe(true);
    expect(csv[6]!.endsWith(',2,1')).toBe(true);
  });

  it('--duration alone prices local stepping without adding the level column', () => {
    const p = buildPlan(runAudit(strip()), { duration: 10 });
    expect(p.summary.lts).toBeDefined();
    expect(p.summary.cost!.lts).not.toBeNull();
    expect(p.cellColumns).toEqual([]);
  });

  it('refuses options that cannot work, with the option named', () => {
    const r = runAudit(strip());
    const bad: [object, RegExp][] = [
      [{ targetDt: 0 }, /--target-dt must be a positive number/],
      [{ ltsLevels: 2.5 }, /--lts-levels must be an integer/],
      [{ ltsLevels: 31 }, /--lts-levels must be an integer from 0 to 30/],
      [{ cellStepCost: 1e-6 }, /--cell-step-cost needs --duration/],
      [{ suggestDt: true }, /--suggest-dt needs --courant-min/],
      [{ courantMin: 0.1 }, /--courant-min needs --dt/],
      [{ courantMin: 1, suggestDt: true }, /must be below the Courant number/],
      [{ courantMin: 0.1, suggestDt: true, bandShare: 1.5 }, /--band-share must be in \(0, 1\]/],
      [{ bandShare: 0.5 }, /--band-share applies to --suggest-dt/],
      [{ gains: [1] }, /above 1/],
      [{ gains: [] }, /1 to 12 factors/],
    ];
    for (const [o, msg] of bad) expect(() => buildPlan(r, o)).toThrow(msg);
    expect(() => buildPlan(r, { targetDt: -1 })).toThrow(UsageError);
  });

  it('degenerate cells: gains from the first positive step, no local stepping', () => {
    const m = gridMesh(3, 1, 1);
    m.cellNodes[3] = m.cellNodes[0]!; // cell 0 uses a node twice: zero area, dt 0
    m.cellData.push(vectorField('velocity', [1, 0, 1, 0, 1, 0]));
    const p = buildPlan(runAudit(m), { lts: true, duration: 5 });
    expect(p.summary.remesh!.zero_cells).toBe(1);
    expect(p.summary.lts!.note).toMatch(/degenerate/);
    expect(p.summary.cost!.global).toBeNull();
  });
});
