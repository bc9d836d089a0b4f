/** Snapshots over a run: order, same-mesh check, envelope, schedule (values worked out by hand). */
import { describe, expect, it } from 'vitest';
import { runAudit } from '../../src/audit/audit.js';
import {
  checkSameMesh, Envelope, limitingCells, meshDifference, naturalCompare, precedes, snapshotOrder, snapshotSummary, stepSchedule,
} from '../../src/audit/snapshots.js';
import { MeshInputError, UsageError } from '../../src/mesh/errors.js';
import type { Mesh } from '../../src/mesh/model.js';
import { gridMesh, vectorField } from '../helpers/meshes.js';

describe('natural order', () => {
  it('digit runs compare as numbers: _2 before _10; leading zeros and plain text still order', () => {
    const names = ['run_10.vtu', 'run_2.vtu', 'run_1.vtu', 'run_0010b.vtu', 'a/run_3.vtu', 'run_02.vtu'];
    expect([...names].sort(naturalCompare)).toEqual(['a/run_3.vtu', 'run_1.vtu', 'run_2.vtu', 'run_02.vtu', 'run_10.vtu', 'run_0010b.vtu']);
    expect(naturalCompare('mesh_0009', 'mesh_0010')).toBeLessThan(0);
    expect(naturalCompare('x', 'x')).toBe(0);
  });

  it('by the stored time when every file has one, else by name with a warning for a partial set', () => {
    const files = ['b_1.vtu', 'b_2.vtu', 'b_10.vtu'];
    const byTime = snapshotOrder(files, [600, 0, 300]);
    expect(byTime.by).toBe('time');
    expect(byTime.order).toEqual([1, 2, 0]);
    const byName = snapshotOrder(['b_10.vtu', 'b_2.vtu'], [null, null]);
    expect(byName).toEqual({ order: [1, 0], by: 'name', warnings: [] });
    const mixed = snapshotOrder(['b_10.vtu', 'b_2.vtu'], [5, null]);
    expect(mixed.by).toBe('name');
    expect(mixed.warnings[0]).toMatch(/1 of 2 files hold a time/);
    expect(snapshotOrder(files, [1, 1, 2]).warnings[0]).toMatch(/same time 1/);
  });
});

describe('same mesh', () => {
  const ref = gridMesh(2, 1, 1);
  const copy = (): Mesh => ({ ...ref, points: Float64Array.from(ref.points), cellNodes: Int32Array.from(ref.cellNodes), cellTypes: Uint8Array.from(ref.cellTypes) });

  it('accepts a copy (and rounding far below the extent), names the first difference otherwise', () => {
    expect(meshDifference(ref, copy())).toBeNull();
    const round = copy();
    round.points[3] = round.points[3]! + 1e-12;
    expect(meshDifference(ref, round)).toBeNull();
    const moved = copy();
    moved.points[2 * 4] = 1.5;
    expect(meshDifference(ref, moved)).toBe('point 4 is at (1.5, 1) instead of (1, 1)');
    const renumbered = copy();
    renumbered.cellNodes[5] = 0;
    expect(meshDifference(ref, renumbered)).toMatch(/^cell 1 has nodes \[1, 0, 5, 4\] instead of \[1, 2, 5, 4\]$/);
    expect(meshDifference(ref, gridMesh(3, 1, 1))).toBe('8 points instead of 6');
    expect(() => checkSameMesh(ref, 'a.vtu', moved, 'b.vtu')).toThrow(MeshInputError);
    expect(() => checkSameMesh(ref, 'a.vtu', moved, 'b.vtu')).toThrow(/^b\.vtu: not the same mesh as a\.vtu: point 4/);
  });
});

/** Unit squares in a row; cell data velocity per cell, so each snapshot sets its own limits. */
function snapshot(speeds: number[]) {
  const m = gridMesh(speeds.length, 1, 1);
  m.cellData.push(vectorField('velocity', speeds.flatMap((s) => [s, 0])));
  return runAudit(m, { dt: 0.1 });
}

describe('envelope', () => {
  it('per cell the smallest step, its snapshot, λ and Courant number there; renumbered after sorting', () => {
    // h = 2A/P = 0.5 for a unit square, dt = h/|u|
    const a = snapshot([1, 2, 0]);
    const b = snapshot([4, 1, 0]);
    const c = snapshot([2, 8, 0]);
    const env = new Envelope(a);
    expect(env.fold(b)).toBe(1);
    expect(env.fold(c)).toBe(2);
    expect(Array.from(env.dt)).toEqual([0.125, 0.0625, Infinity]);
    expect(Array.from(env.snapshot)).toEqual([1, 2, 0]);
    expect(Array.from(env.speed)).toEqual([4, 8, 0]);
    expect(Array.from(env.courant!)).toEqual([0.8, 1.6, 0]); // 0.1·λ/h
    expect(env.limit()).toEqual({ dt: 0.0625, cell: 1 });
    env.renumber([2, 0, 1]);
    expect(Array.from(env.snapshot)).toEqual([0, 1, 2]);
    const r = env.asResult(a);
    expect(r.dt).toBe(env.dt);
    expect(r.columns.map((col) => col.name)).toEqual(['dt_envelope', 'snapshot_of_min']);
    expect(Array.from(r.columns[1]!.values)).toEqual([0, 1, 2]);
  });

  it('a tie goes to the snapshot that comes first in run order (by time when both have one, else by name)', () => {
    const late = snapshot([1, 0]), early = snapshot([1, 0]);
    const env = new Envelope(late); // read first, but t = 50
    const before = precedes(['a', 'b'], [50, 10], 1);
    expect(Array.from(before)).toEqual([1]);
    env.fold(early, before);
    expect(Array.from(env.snapshot)).toEqual([1, 1]); // both cells: equal dt (0.5 and no limit)
    expect(Array.from(precedes(['run_10', 'run_2'], [null, null], 1))).toEqual([1]);
    expect(Array.from(precedes(['run_2', 'run_10'], [null, null], 1))).toEqual([0]);
  });

  it('limiting cells: which cell set the limit at which snapshot', () => {
    const sums = [snapshot([1, 2]), snapshot([4, 1]), snapshot([1, 3])].map((r, k) => snapshotSummary(r.summary, `s${k}`, k * 10));
    expect(limitingCells(sums)).toEqual([
      { cell: 1, snapshots: [0, 2], times: [0, 20] },
      { cell: 0, snapshots: [1], times: [10] },
    ]);
  });
});

describe('step schedule', () => {
  it('safety × the smaller limit at the two ends, steps that land on the next snapshot', () => {
    const s = stepSchedule([0, 100, 300], [0.5, 0.2, 0.4], 0.9);
    expect(s.intervals).toHaveLength(2);
    expect(s.intervals[0]!.dt).toBeCloseTo(0.18, 15);
    expect(s.intervals[0]!.steps).toBe(556); // ⌈100 / 0.18⌉
    expect(s.intervals[0]!.dt_even).toBeCloseTo(100 / 556, 15);
    expect(s.intervals[1]!.steps).toBe(1112); // ⌈200 / 0.18⌉
    expect(s.constant).toBeCloseTo(0.18, 15);
    expect(s.assumption).toMatch(/vary slowly/);
    expect(s.assumption).toMatch(/necessary, not sufficient/);
  });

  it('an interval that is a whole number of steps up to rounding takes exactly that many (1.1 / 0.1 = 11)', () => {
    expect(stepSchedule([0, 1.1], [0.2, 0.2], 0.5).intervals[0]!.steps).toBe(11);
  });

  it('without times: steps only; unlimited ends are skipped; the safety factor is checked', () => {
    const s = stepSchedule([null, null, null], [null, 2, null], 0.5);
    expect(s.intervals.map((i) => i.dt)).toEqual([1, 1]);
    expect(s.intervals[0]!.steps).toBeNull();
    expect(s.constant).toBe(1);
    expect(stepSchedule([0, 1], [null, null]).intervals[0]!.dt).toBeNull();
    expect(() => stepSchedule([0], [1], 0)).toThrow(UsageError);
    expect(() => stepSchedule([0], [1], 1.5)).toThrow(UsageError);
  });
});
