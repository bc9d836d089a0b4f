import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { runAudit } from '../../src/audit/audit.js';
import { cellsCsv } from '../../src/io/csv.js';
import { buildEdges } from '../../src/geometry/edges.js';
import { MeshInputError } from '../../src/mesh/errors.js';
import { gridMesh, meshOf, vectorField, rng } from '../helpers/meshes.js';

const uniform = (n: number, u: number[]) => vectorField('velocity', Array.from({ length: n }, () => u).flat());

describe('exact face-flux limit', () => {
  it('unit square with u = (1, 0): 1 against 0.5 from the inscribed length (worked example)', () => {
    const m = meshOf([0, 0, 1, 0, 1, 1, 0, 1], [[0, 1, 2, 3]], [uniform(4, [1, 0])]);
    const r = runAudit(m, { length: 'flux' });
    expect(r.dtFlux![0]).toBeCloseTo(1, 15);
    expect(r.dtInscribed[0]).toBeCloseTo(0.5, 15);
    expect(r.dt[0]).toBeCloseTo(1, 15);
    expect(r.summary.limit.length).toBe('flux');
  });

  it('equilateral triangle of side 1 with u = (1, 0): 0.5 against 1/(2√3) = 0.2887 (worked example)', () => {
    const m = meshOf([0, 0, 1, 0, 0.5, Math.sqrt(3) / 2], [[0, 1, 2]], [uniform(3, [1, 0])]);
    const r = runAudit(m, { length: 'flux' });
    expect(r.dtFlux![0]).toBeCloseTo(0.5, 14);
    expect(r.dtInscribed[0]).toBeCloseTo(1 / (2 * Math.sqrt(3)), 14);
    // clockwise node order gives the same answer
    const cw = runAudit(meshOf([0, 0, 1, 0, 0.5, Math.sqrt(3) / 2], [[0, 2, 1]], [uniform(3, [1, 0])]), { length: 'flux' });
    expect(cw.dtFlux![0]).toBeCloseTo(0.5, 14);
  });

  it('is never below the inscribed bound for a constant velocity (random triangulated grids)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1000 }), fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), (seed, dir) => {
        const m = gridMesh(4, 3, 1, true);
        const r0 = rng(seed);
        for (let i = 0; i < m.points.length; i++) m.points[i] = m.points[i]! + (r0() - 0.5) * 0.3;
        m.pointData.push(uniform(m.nPoints, [Math.cos(dir), Math.sin(dir)]));
        const r = runAudit(m, { length: 'flux' });
        for (let i = 0; i < m.nCells; i++) expect(r.dtFlux![i]!).toBeGreaterThanOrEqual(r.dtInscribed[i]! * (1 - 1e-12));
      }),
      { numRuns: 50, seed: 5 },
    );
  });

  it('with a wave term: 2A/Σ(|u·n| + c)|f| — a square at rest with c gives h/c', () => {
    const m = meshOf([0, 0, 2, 0, 2, 2, 0, 2], [[0, 1, 2, 3]], [uniform(4, [0, 0])]);
    const r = runAudit(m, { model: 'acoustic', soundSpeed: 4, length: 'flux' });
    expect(r.dtFlux![0]).toBeCloseTo((2 * 4) / (4 * 2 * 4), 15); // 2A / (c·P) = h/c
    expect(r.dtInscribed[0]).toBeCloseTo(1 / 4, 15);
  });
});

describe('diffusive limit (two-point face form)', () => {
  it('square grid of quads: Δx²/(4ν) (FTCS in 2-D, Press et al., Numerical Recipes 2nd ed. §19.2)', () => {
    const m = gridMesh(5, 4, 0.5);
    m.pointData.push(uniform(m.nPoints, [0, 0]));
    const r = runAudit(m, { diffusivity: 0.1 });
    for (let i = 0; i < m.nCells; i++) expect(r.dtDiffusion![i]).toBeCloseTo(0.25 / (4 * 0.1), 13);
    expect(r.summary.limit.dt).toBeCloseTo(0.625, 13);
    // at rest, diffusion is what limits every cell: the cause says so in the JSON and the CSV
    expect(r.summary.limit.cause).toContain('diffusion');
    const lines = cellsCsv(r).trimEnd().split('\n');
    const col = lines[0]!.split(',').indexOf('cause');
    for (const line of lines.slice(1)) expect(line.split(',')[col]).toBe('diffusion');
  });

  it('the same grid split into right triangles: hand-computed value Δx²/(6ν(1 + 2/√5)) for interior cells', () => {
    const m = gridMesh(5, 5, 1, true);
    m.pointData.push(uniform(m.nPoints, [0, 0]));
    const r = runAudit(m, { diffusivity: 1 });
    // lower-right triangle of square (2,2): hypotenuse 3ν, two legs 3ν/√5 each; A = 1/2
    const cell = 2 * (2 * 5 + 2);
    expect(r.dtDiffusion![cell]).toBeCloseTo(0.5 / (3 + 6 / Math.sqrt(5)), 13);
  });

  it('1-D strip: Δx²/(2ν), and upwind + diffusion combine as 1/dt = 1/dt_adv + 1/dt_diff (c + 2d ≤ 1)', () => {
    const dx = 0.2, W = 1e5, nu = 0.03, u = 1.5;
    const pts: number[] = [];
    for (let i = 0; i <= 6; i++) pts.push(i * dx, 0);
    for (let i = 0; i <= 6; i++) pts.push(i * dx, W);
    const cells = Array.from({ length: 6 }, (_, i) => [i, i + 1, i + 8, i + 7]);
    const m = meshOf(pts, cells, [uniform(14, [u, 0])]);
    const r = runAudit(m, { diffusivity: nu });
    expect(r.dtDiffusion![3]! / (dx * dx / (2 * nu))).toBeCloseTo(1, 5);
    const expected = 1 / (u / dx + (2 * nu) / (dx * dx));
    expect(r.dt[3]! / expected).toBeCloseTo(1, 5);
    expect(r.summary.limit.parts.diffusion!.dt).toBeGreaterThan(0);
  });
});

describe('edge topology', () => {
  it('counts interior and boundary edges of a grid (E = 2·nx·ny + nx + ny)', () => {
    const e = buildEdges(gridMesh(4, 3, 1));
    expect(e.nEdges).toBe(2 * 12 + 4 + 3);
    let boundary = 0;
    for (let k = 0; k < e.nEdges; k++) if (e.edgeCells[2 * k + 1] === -1) boundary++;
    expect(boundary).toBe(2 * (4 + 3));
  });

  it('an edge shared by three cells is an error naming its nodes', () => {
    const m = meshOf([0, 0, 1, 0, 0.5, 1, 0.5, -1, 2, 2], [[0, 1, 2], [1, 0, 3], [0, 1, 4]]);
    expect(() => buildEdges(m, 'fan.vtu')).toThrow(MeshInputError);
    expect(() => buildEdges(m, 'fan.vtu')).toThrow(/between nodes 0 and 1 is shared by three or more cells/);
  });
});
