// The per-cell table written into byte buffers must be the text a plain String()-per-value
// writer gives (written out here as the reference), chunked only between rows.
import { describe, expect, it } from 'vitest';
import { runAudit, CAUSE_DEGENERATE, CAUSE_DIFFUSION, CAUSE_FAST, CAUSE_SHAPE, CAUSE_SMALL, type AuditResult } from '../../src/audit/audit.js';
import { cellsCsv, cellsCsvBytes, cellsCsvChunks, CSV_COLUMNS, CSV_COLUMNS_ALL, type CsvColumnSet, type ExtraColumns } from '../../src/io/csv.js';
import { computeCoreGeometry, FLAG_DEGENERATE, FLAG_INVERTED, FLAG_NONCONVEX, FLAG_REPEATED_NODE } from '../../src/geometry/cells.js';
import { QUAD, type Mesh } from '../../src/mesh/model.js';
import { gridMesh, meshOf, rng, vectorField } from '../helpers/meshes.js';

function words(bits: number, names: [number, string][]): string {
  return names.filter(([b]) => bits & b).map(([, w]) => w).join(';');
}

const num = (x: number): string => (x === Infinity ? 'inf' : x === -Infinity ? '-inf' : x !== x ? 'nan' : Object.is(x, -0) ? '-0' : String(x));

/** The table built with one String() per value (every column; `standard` keeps CSV_COLUMNS of them). */
function referenceCsv(r: AuditResult, extra: ExtraColumns, set: CsvColumnSet = 'standard'): string {
  const g = r.geom;
  const ex: ExtraColumns = [...(r.courantAtDt ? [{ name: 'courant', values: r.courantAtDt }] : []), ...r.columns, ...extra];
  const keep = CSV_COLUMNS_ALL.map((c) => set === 'all' || CSV_COLUMNS.includes(c)).concat(ex.map(() => true));
  let s = CSV_COLUMNS_ALL.filter((_, k) => keep[k]).concat(ex.map((c) => c.name)).join(',') + '\n';
  for (let i = 0; i < r.mesh.nCells; i++) {
    const q = r.mesh.cellTypes[i] === QUAD;
    const row = [String(i), q ? 'quad' : 'triangle', num(g.area[i]!), num(g.perimeter[i]!), num(g.inradius[i]!), q ? '' : num(g.circumradius[i]!),
      num(r.speed[i]!), num(r.dt[i]!), num(g.radiusRatio[i]!), num(g.minAngle[i]!), num(g.maxAngle[i]!), num(g.aspectRatio[i]!),
      num(g.scaledJacobian[i]!), num(g.condition[i]!), num(g.edgeRatio[i]!), num(g.centroidX[i]!), num(g.centroidY[i]!),
      words(g.flags[i]!, [[FLAG_DEGENERATE, 'degenerate'], [FLAG_REPEATED_NODE, 'repeated_node'], [FLAG_INVERTED, 'inverted'], [FLAG_NONCONVEX, 'non_convex']]),
      words(r.cause[i]!, [[CAUSE_DEGENERATE, 'degenerate'], [CAUSE_SMALL, 'small'], [CAUSE_SHAPE, 'shape'], [CAUSE_FAST, 'fast'], [CAUSE_DIFFUSION, 'diffusion']]),
      ...ex.map((c) => num(c.values[i]!))];
    s += row.filter((_, k) => keep[k]).join(',') + '\n';
  }
  return s;
}

/** Jittered triangles and quads in projected coordinates, still nodes, a repeated node, a clockwise quad. */
function awkward(): Mesh {
  const m = gridMesh(12, 9, 3.7, false, 4.2e5, 5.1e6);
  const next = rng(5);
  for (let i = 0; i < m.points.length; i++) m.points[i] = m.points[i]! + (next() - 0.5) * 1.5;
  const tri = gridMesh(12, 9, 3.7, true, 4.2e5, 5.1e6 + 40);
  const pts = [...m.points, ...tri.points];
  const cells: number[][] = [];
  for (let i = 0; i < m.nCells; i++) cells.push(Array.from(m.cellNodes.subarray(m.cellOffsets[i]!, m.cellOffsets[i + 1]!)));
  for (let i = 0; i < tri.nCells; i++) cells.push(Array.from(tri.cellNodes.subarray(tri.cellOffsets[i]!, tri.cellOffsets[i + 1]!), (v) => v + m.nPoints));
  const b = pts.length / 2;
  pts.push(0, 0, 1, 0, 1, 1, 0, 1, 5, 5, 6, 5);
  cells.push([b + 4, b + 4, b + 5]); // repeated node
  cells.push([b, b + 3, b + 2, b + 1]); // clockwise quad
  const n = pts.length / 2;
  const vel: number[] = [];
  for (let k = 0; k < n; k++) vel.push(k % 17 === 0 ? 0 : (next() - 0.3) * 3, k % 17 === 0 ? 0 : next() * 1e-3);
  return meshOf(pts, cells, [vectorField('velocity', vel)]);
}

describe('cellsCsvBytes', () => {
  const r = runAudit(awkward(), { dt: 0.05, length: 'flux', diffusivity: 0.3 });
  const extra: ExtraColumns = [{ name: 'level', values: Int32Array.from({ length: r.mesh.nCells }, (_, i) => (i % 5) - 2) }];

  it('writes the same text as one String() per value, standard and all columns', () => {
    expect(r.columns.length).toBeGreaterThan(0);
    expect(r.summary.counts.degenerate).toBeGreaterThan(0);
    expect(cellsCsv(r, extra)).toBe(referenceCsv(r, extra));
    expect(cellsCsv(r, extra, 'all')).toBe(referenceCsv(r, extra, 'all'));
    expect(cellsCsv(r, extra).split('\n')[0]).toBe(CSV_COLUMNS.join(',') + ',courant,dt_inscribed,dt_flux,dt_diffusion,level');
  });

  it('shape measures computed block by block (a deferred geometry) give the same bytes', () => {
    const mesh = awkward();
    const options = { dt: 0.05 };
    const eager = runAudit(mesh, options);
    for (const set of ['standard', 'all'] as const) {
      const deferred = runAudit(mesh, { ...options, geometry: computeCoreGeometry(mesh) });
      expect(deferred.geom.deferred?.computed).toBe(false);
      const chunks = Array.from(cellsCsvBytes(deferred, extra, 300, set), (c) => Buffer.from(c)); // copied: the writer reuses its buffer
      expect(deferred.geom.deferred?.computed).toBe(false);
      expect(Buffer.concat(chunks).toString()).toBe(referenceCsv(eager, extra, set));
      // first use of a shape array computes them all, equal to the eager ones
      expect(Array.from(deferred.geom.minAngle)).toEqual(Array.from(eager.geom.minAngle));
      expect(deferred.geom.deferred?.computed).toBe(true);
    }
  });

  it('splits only between rows, whatever the chunk size', () => {
    const whole = referenceCsv(r, extra);
    const dec = new TextDecoder();
    let joined = '';
    for (const chunk of cellsCsvBytes(r, extra, 700)) {
      const t = dec.decode(chunk);
      expect(t.endsWith('\n')).toBe(true);
      joined += t;
    }
    expect(joined).toBe(whole);
    expect([...cellsCsvChunks(r, extra)].join('')).toBe(whole);
  });
});
