/** The decision options through the built CLI: a hand-made strip and the harbour demo. */
import { describe, expect, it, beforeAll } from 'vitest';
import * as fs from 'node:fs';
import * as path from 'node:path';
import { readMesh } from '../../src/mesh/read.js';
import { findArray } from '../../src/mesh/model.js';
import { cliTempDir, root, runCli as run } from '../helpers/cli.js';

const harbour = path.join(root, 'meshes/harbour.vtu');
let tmp = '';
let f = '';

beforeAll(() => {
  tmp = cliTempDir('steplens-plan-');
  f = path.join(tmp, 'strip.vtk');
  fs.writeFileSync(f, stripVtk());
});

/**
 * Six unit squares in a row (h = 2A/P = 0.5) with cell velocities 0.5/d for d = 1, 16, 16, 16,
 * 2, 40: with C = 1 the cells' steps are exactly those d.
 */
function stripVtk(): string {
  const pts: string[] = [];
  for (let j = 0; j <= 1; j++) for (let i = 0; i <= 6; i++) pts.push(`${i} ${j} 0`);
  const cells = Array.from({ length: 6 }, (_, i) => `4 ${i} ${i + 1} ${i + 8} ${i + 7}`);
  const vel = [1, 16, 16, 16, 2, 40].map((d) => `${0.5 / d} 0 0`);
  return `# vtk DataFile Version 4.2\nstrip\nASCII\nDATASET UNSTRUCTURED_GRID\nPOINTS 14 double\n${pts.join('\n')}\n` +
    `CELLS 6 30\n${cells.join('\n')}\nCELL_TYPES 6\n9 9 9 9 9 9\nCELL_DATA 6\nVECTORS velocity double\n${vel.join('\n')}\n`;
}

describe('steplens audit: remeshing, size field, local time stepping, run cost, Courant band', () => {
  it('every option on a strip with known steps: JSON plan, CSV columns, size field, VTU arrays', () => {
    const csv = path.join(tmp, 'strip.csv'), sizes = path.join(tmp, 'sizes.csv'), vtu = path.join(tmp, 'strip.vtu');
    const r = run(['audit', f, '--json', '--top', '2', '--gains', '2,10', '--lts', '--target-dt', '4', '--size-field', sizes,
      '--duration', '100', '--cell-step-cost', '0.001', '--dt', '4', '--courant-min', '0.2', '--suggest-dt', '--band-share', '0.5',
      '--cells', csv, '--vtu', vtu]);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.limit.dt).toBeCloseTo(1, 12); // the summary keeps its fields
    const p = j.plan;
    expect(p.remesh.gains.map((g: { cells: number }) => g.cells)).toEqual([1, 2]);
    expect(p.remesh.regions).toHaveLength(2);
    // levels before the rule 0, 4, 4, 4, 1, 4 (capped at 4); after it 0, 1, 2, 2, 1, 2
    expect(p.lts.levels.map((l: { before: number }) => l.before)).toEqual([1, 1, 0, 0, 4]);
    expect(p.lts.levels.map((l: { after: number }) => l.after)).toEqual([1, 2, 3, 0, 0]);
    expect(p.lts.speedup_before).toBeCloseTo(6 / 1.75, 12);
    expect(p.lts.speedup_after).toBeCloseTo(6 / 2.75, 12);
    // 100 s at dt 1: 100 steps × 6 cells; local: macro step 4 s × 25, per macro step 1·4 + 2·2 + 3·1 = 11
    expect(p.cost.global).toMatchObject({ steps: 100, cell_updates: 600 });
    expect(p.cost.global.wall_time).toBeCloseTo(0.6, 12);
    expect(p.cost.lts).toMatchObject({ macro_steps: 25, cell_updates: 275 });
    expect(p.size_field.cells_to_change).toBe(2);
    // Courant numbers at 4 s: 4/d = 4, 0.25, 0.25, 0.25, 2, 0.1
    expect(p.courant_min).toMatchObject({ below: 1, moving_cells: 6 });
    // band [0.2, 1], half the cells: lo = 0.2 × the 3rd smallest step (16) = 3.2 > hi = 1 → none
    expect(p.band).toMatchObject({ status: 'none', needed: 3, hi: 1 });
    expect(p.band.blocking.cells).toBe(4); // steps 16, 16, 16, 40 exceed 1/0.2 = 5

    const lines = fs.readFileSync(csv, 'utf8').trimEnd().split('\n');
    const head = lines[0]!.split(',');
    for (const c of ['dt', 'courant', 'target_inradius', 'target_edge', 'lts_level', 'below_courant_min']) expect(head).toContain(c);
    const row5 = lines[6]!.split(',');
    expect(Number(row5[head.indexOf('target_inradius')])).toBeCloseTo((4 * (0.5 / 40)) / 1, 14); // T·λ/C
    expect(row5[head.indexOf('lts_level')]).toBe('2');

    const nodeRows = fs.readFileSync(sizes, 'utf8').trimEnd().split('\n');
    expect(nodeRows[0]).toBe('node,x,y,size');
    expect(nodeRows).toHaveLength(15);
    // node 0 only touches cell 0: floor 2√3·(4·0.5/1) = 4√3 against the current mean edge 1
    expect(Number(nodeRows[1]!.split(',')[3])).toBeCloseTo(4 * Math.sqrt(3), 12);
    // node 6 only touches cell 5 (λ = 0.0125): floor 2√3·0.05 ≈ 0.17 < mean edge 1 → keeps 1
    expect(Number(nodeRows[7]!.split(',')[3])).toBeCloseTo(1, 14);

    const back = readMesh(new Uint8Array(fs.readFileSync(vtu)), vtu);
    expect(Array.from(findArray(back.cellData, 'lts_level')!.values)).toEqual([0, 1, 2, 2, 1, 2]);
    expect(findArray(back.pointData, 'size')!.values[0]).toBeCloseTo(4 * Math.sqrt(3), 12);
    expect(findArray(back.cellData, 'target_edge')).toBeDefined();
    expect(findArray(back.cellData, 'below_courant_min')).toBeDefined();
  });

  it('the report shows each section', () => {
    const r = run(['audit', f, '--lts', '--target-dt', '4', '--duration', '100', '--dt', '0.5', '--courant-min', '0.2', '--suggest-dt', '--band-share', '0.5']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/REMESHING/);
    expect(r.out).toMatch(/×2 +1 +2 s/);
    expect(r.out).toMatch(/1 region holds the 6 worst cells/);
    expect(r.out).toMatch(/SIZE FIELD {2}for dt = 4 s/);
    expect(r.out).toMatch(/to change {2}2 of 6 cells/);
    expect(r.out).toMatch(/LOCAL TIME STEPPING/);
    expect(r.out).toMatch(/×3\.43 from the levels alone, ×2\.18 with cells sharing an edge/);
    expect(r.out).toMatch(/RUN COST/);
    expect(r.out).toMatch(/COURANT BAND/);
    expect(r.out).toMatch(/step range {2}none keeps 50% of moving cells/);
  });

  it('options that cannot work exit 2 with one line', () => {
    const cases: [string[], RegExp][] = [
      [['--size-field', path.join(tmp, 's.csv')], /--size-field needs --target-dt/],
      [['--cell-step-cost', '1e-6'], /--cell-step-cost needs --duration/],
      [['--courant-min', '0.1'], /--courant-min needs --dt/],
      [['--lts-levels', 'many'], /--lts-levels expects a number/],
      [['--gains', '2,x'], /--gains expects a number/],
      [['--target-dt', '0'], /--target-dt must be a positive number/],
    ];
    for (const [args, msg] of cases) {
      const r = run(['audit', f, ...args]);
      expect(r.code).toBe(2);
      expect(r.err.trim().split('\n')).toHaveLength(1);
      expect(r.err).toMatch(msg);
    }
  });

  it('the harbour demo: cross-checks between the plan and the audit', () => {
    const sizes = path.join(tmp, 'harbour-size.csv');
    const r = run(['audit', harbour, '--model', 'shallow-water', '--depth', 'depth', '--json', '--lts', '--target-dt', '0.25',
      '--size-field', sizes, '--duration', '3600', '--dt', '0.1', '--courant-min', '0.05', '--suggest-dt', '--band-share', '0.5']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    const p = j.plan;
    // the k for ×10 counts the cells under 10× the limit; the audit counts those at or under it
    const ten = p.remesh.gains.find((g: { gain: number }) => g.gain === 10);
    expect(ten.cells).toBe(j.near_limit.within_10x);
    expect(p.remesh.gains.find((g: { gain: number }) => g.gain === 2).cells).toBe(j.near_limit.within_2x);
    expect(p.remesh.regions[0].cell_ids).toContain(j.limit.cell);
    const [x0, y0, x1, y1] = p.remesh.regions[0].bbox;
    const [cx, cy] = j.limit.centroid;
    expect(cx >= x0 && cx <= x1 && cy >= y0 && cy <= y1).toBe(true);
    const after = p.lts.levels.reduce((s: number, l: { after: number }) => s + l.after, 0);
    expect(after).toBe(j.mesh.cells);
    expect(p.lts.speedup_after).toBeLessThanOrEqual(p.lts.speedup_before);
    expect(p.lts.speedup_after).toBeGreaterThan(1);
    expect(p.cost.global.steps).toBe(Math.ceil(3600 / j.limit.dt));
    expect(p.cost.lts.cell_updates).toBeLessThan(p.cost.global.cell_updates);
    expect(p.band.hi).toBe(j.limit.dt);
    if (p.band.status === 'ok') expect(p.band.lo).toBeLessThanOrEqual(p.band.hi);
    const rows = fs.readFileSync(sizes, 'utf8').trimEnd().split('\n');
    expect(rows.length - 1).toBe(j.mesh.points);
    for (const row of rows.slice(1)) expect(Number(row.split(',')[3])).toBeGreaterThan(0);
  });
});
