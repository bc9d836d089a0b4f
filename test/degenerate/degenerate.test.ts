/**
 * Degenerate meshes through the audit: every result free of NaN, every kind of defect counted.
 * Meshes are invented and their defects counted by hand; geometric facts used: three collinear
 * points enclose no area, a quad whose corners turn both ways is not convex (common practice).
 */
import { describe, expect, it } from 'vitest';
import { runAudit, type AuditOptions } from '../../src/audit/audit.js';
import { meshChecks } from '../../src/audit/mesh-checks.js';
import { SteplensError } from '../../src/mesh/errors.js';
import type { Mesh } from '../../src/mesh/model.js';
import { gridMesh, meshOf, vectorField } from '../helpers/meshes.js';
import { expectNoNaN } from '../fuzz/outcome.js';

/** A uniform point velocity (1, 0.5) m/s on every point. */
function withFlow(m: Mesh): Mesh {
  m.pointData.push(vectorField('velocity', Array.from({ length: m.nPoints }, () => [1, 0.5]).flat()));
  return m;
}

/** The option sets that add columns: the intended step, the face-flux length, diffusion. */
const OPTION_SETS: AuditOptions[] = [{}, { dt: 0.01 }, { length: 'flux' }, { diffusivity: 0.001 }];

/** The audit in every option set: never NaN; a typed error is acceptable, nothing else. */
function auditAll(m: Mesh, label: string) {
  const results = [];
  for (const o of OPTION_SETS) {
    try {
      const r = runAudit(m, o);
      expectNoNaN(r, `${label} ${JSON.stringify(o)}`);
      results.push(r);
    } catch (e) {
      if (!(e instanceof SteplensError)) throw e;
    }
  }
  expect(results.length, `${label}: the plain audit must run`).toBeGreaterThan(0);
  return results[0]!;
}

interface Case {
  name: string;
  mesh: () => Mesh;
  counts: Partial<Record<'degenerate' | 'repeated_node' | 'inverted' | 'non_convex', number>>;
  checks: { duplicatePoints: number; unusedPoints: number; isolatedCells: number };
}

const CASES: Case[] = [
  {
    name: 'all cells degenerate (collinear points)',
    mesh: () => meshOf([0, 0, 1, 0, 2, 0, 3, 0], [[0, 1, 2], [1, 2, 3], [0, 1, 3, 2]]),
    counts: { degenerate: 3 },
    checks: { duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 },
  },
  {
    name: 'a zero-area sliver among good cells',
    // cell 1 is 1 m long and 1e-13 m high: area 5e-14 m², below 1e-12 of its longest edge squared
    mesh: () => meshOf([0, 0, 1, 0, 0, 1, 0.5, -1e-13], [[0, 1, 2], [0, 3, 1]]),
    counts: { degenerate: 1, inverted: 0 },
    checks: { duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 },
  },
  {
    name: 'duplicate nodes: a crack of two coincident point pairs',
    mesh: () => meshOf([0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 1, 1], [[0, 1, 2], [3, 5, 4]]),
    counts: { degenerate: 0 },
    checks: { duplicatePoints: 2, unusedPoints: 0, isolatedCells: 2 },
  },
  {
    name: 'a cell using the same node twice (a triangle and a collapsed quad)',
    mesh: () => meshOf([0, 0, 1, 0, 1, 1, 0, 1], [[0, 1, 2], [0, 2, 2], [0, 2, 3, 3]]),
    counts: { degenerate: 2, repeated_node: 2 },
    checks: { duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 },
  },
  {
    name: 'an inverted cell in a grid',
    mesh: () => {
      const m = gridMesh(3, 2, 1, true);
      // reverse the node order of cell 4 (clockwise among counter-clockwise cells)
      const s = m.cellOffsets[4]!;
      [m.cellNodes[s + 1], m.cellNodes[s + 2]] = [m.cellNodes[s + 2]!, m.cellNodes[s + 1]!];
      return m;
    },
    counts: { degenerate: 0, inverted: 1 },
    checks: { duplicatePoints: 0, unusedPoints: 0, isolatedCells: 0 },
  },
  {
    name: 'a non-convex (dart) quad and a bow-tie quad',
    // dart: corner (1, 0.5) turns the other way; bow-tie: its sides cross between (0,0)-(3,2) and (3,0)-(0,1)
    mesh: () => meshOf([0, 0, 2, 0, 1, 0.5, 2, 2, 10, 0, 13, 2, 13, 0, 10, 1], [[0, 1, 3, 2], [4, 5, 6, 7]]),
    counts: { degenerate: 0, non_convex: 2 },
    checks: { duplicatePoints: 0, unusedPoints: 0, isolatedCells: 2 },
  },
  {
    name: 'unused points',
    mesh: () => meshOf([0, 0, 1, 0, 0, 1, 5, 5, 6, 6, 7, 7], [[0, 1, 2]]),
    counts: { degenerate: 0 },
    checks: { duplicatePoints: 0, unusedPoints: 3, isolatedCells: 1 },
  },
  {
    name: 'isolated cells: three triangles that share no edge',
    mesh: () => meshOf([0, 0, 1, 0, 0, 1, 1, 1, 2, 1, 1, 2, 5, 5, 6, 5, 5, 6], [[0, 1, 2], [3, 4, 5], [6, 7, 8]]),
    counts: { degenerate: 0, inverted: 0 },
    checks: { duplicatePoints: 0, unusedPoints: 0, isolatedCells: 3 },
  },
  {
    name: 'a one-cell mesh',
    mesh: () => meshOf([0, 0, 4, 0, 0, 3], [[0, 1, 2]]),
    counts: { degenerate: 0, inverted: 0, non_convex: 0 },
    checks: { duplicatePoints: 0, unusedPoints: 0, isolatedCells: 1 },
  },
];

describe('degenerate meshes through the audit', () => {
  it.each(CASES)('$name: no NaN, each defect counted', (c) => {
    const r = auditAll(withFlow(c.mesh()), c.name);
    expect(r.summary.counts).toMatchObject(c.counts);
    expect(meshChecks(r.mesh)).toEqual(c.checks);
    if ((c.counts.degenerate ?? 0) > 0) {
      // a degenerate cell has no stable step at all: it caps the run at zero
      expect(r.summary.limit.dt).toBe(0);
      expect(r.summary.limit.cause).toContain('degenerate');
    }
  });

  it('a one-cell mesh: that cell sets the limit, h = 2A/P of the 3-4-5 triangle', () => {
    const r = runAudit(withFlow(meshOf([0, 0, 4, 0, 0, 3], [[0, 1, 2]])));
    // area 6, perimeter 12: h = 1; λ = |(1, 0.5)| = √1.25
    expect(r.summary.limit.cell).toBe(0);
    expect(r.summary.limit.dt).toBeCloseTo(1 / Math.sqrt(1.25), 14);
  });

  it('a mesh without cells gives an empty, NaN-free report', () => {
    const r = runAudit(withFlow(meshOf([0, 0, 1, 1], [])));
    expectNoNaN(r, 'no cells');
    expect(r.summary.limit.dt).toBeNull();
    expect(r.summary.mesh.cells).toBe(0);
  });

  // Fails until src/geometry/cells.ts handles a zero-length quad side (see the issue 7 report):
  // Math.min(a0 / (l0 * l3), …) is 0/0 when two distinct corner nodes sit at the same place.
  it('[geometry fix needed] a quad with two coincident corner nodes has no NaN quality', () => {
    const m = withFlow(meshOf([0, 0, 0, 0, 1, 1, 0, 1, 2, 0], [[0, 1, 2, 3], [1, 4, 2]]));
    auditAll(m, 'coincident quad corners');
  });
});

// Fail until src/geometry/edges.ts is fixed (see the issue 7 report); buildEdges serves
// --diffusivity and the planning and probing commands.
describe('[geometry fix needed] edge topology on degenerate meshes', () => {
  it('a cell using the same node twice beside a good cell: --diffusivity still runs', () => {
    // cell 1 (0, 1, 1) has the side 0-1 twice: not a third cell on the edge 0-1 of cell 0
    const m = withFlow(meshOf([0, 0, 1, 0, 0, 1], [[0, 1, 2], [0, 1, 1]]));
    const r = runAudit(m, { diffusivity: 0.001 });
    expectNoNaN(r, 'repeated node');
    expect(r.summary.counts.repeated_node).toBe(1);
  });

  it('a fan of 16 000 triangles around one node: --diffusivity runs in well under a second', () => {
    const n = 16000;
    const pts = [0, 0];
    for (let i = 0; i <= n; i++) pts.push(Math.cos((i / n) * 6), Math.sin((i / n) * 6));
    const m = withFlow(meshOf(pts, Array.from({ length: n }, (_, i) => [0, i + 1, i + 2])));
    const t0 = performance.now();
    runAudit(m, { diffusivity: 0.001 });
    // linear work is a few milliseconds here; a scan of the hub's 32 000 half-edges per edge is seconds
    expect(performance.now() - t0).toBeLessThan(500);
  });
});

// The lead wires meshChecks into the summary as counts.duplicate_points, counts.unused_points
// and counts.isolated_cells: this one test fails until that is done.
it('[lead: wire meshChecks into summary.counts] duplicate_points, unused_points, isolated_cells', () => {
  const got = CASES.map((c) => {
    const counts = runAudit(withFlow(c.mesh())).summary.counts as unknown as Record<string, number | undefined>;
    return { name: c.name, duplicate_points: counts.duplicate_points, unused_points: counts.unused_points, isolated_cells: counts.isolated_cells };
  });
  const want = CASES.map((c) => ({ name: c.name, duplicate_points: c.checks.duplicatePoints, unused_points: c.checks.unusedPoints, isolated_cells: c.checks.isolatedCells }));
  expect(got).toEqual(want);
});
