/**
 * Numbers at the edges: a flow at rest, non-finite field values, micrometre cells, map
 * coordinates ten thousand kilometres from the origin, float32 input. Meshes are invented;
 * reference values come from the same mesh near the origin, or are worked out by hand.
 */
import { describe, expect, it } from 'vitest';
import { runAudit, type AuditResult } from '../../src/audit/audit.js';
import { cellsCsv, CSV_COLUMNS } from '../../src/io/csv.js';
import { summaryJson } from '../../src/io/summary.js';
import { writeVtu } from '../../src/io/vtu.js';
import { MeshInputError } from '../../src/mesh/errors.js';
import type { Mesh } from '../../src/mesh/model.js';
import { readMesh } from '../../src/mesh/read.js';
import { encodeLegacy } from '../mesh/legacy/encode.js';
import { gridMesh, meshOf, rng, scalarField, vectorField } from '../helpers/meshes.js';
import { expectNoNaN } from '../fuzz/outcome.js';
import { cellLists, legacyFiles, mshFiles, readEncoded, triangleFiles, vtuFiles, xyzOf, type FuzzMesh } from '../fuzz/meshes.js';
import { inputError } from '../helpers/errors.js';

/** A mesh with a 2-D point velocity as legacy VTK, points and velocity of type `type`. */
function legacyOf(m: Mesh, type: 'double' | 'float', binary: boolean): Uint8Array {
  const round = type === 'float' ? Math.fround : (v: number) => v;
  return encodeLegacy({
    binary, points: { type, xyz: xyzOf(m.points).map(round) }, cells: cellLists(m), cellTypes: Array.from(m.cellTypes),
    attributes: [{ section: 'POINT_DATA', count: m.nPoints, items: [{ kind: 'VECTORS', name: 'velocity', type, values: xyzOf(m.pointData[0]!.values).map(round) }] }],
  });
}

/** A jittered 6 × 5 grid of triangles of side `d` (m) starting at (x0, y0), with a varied velocity. */
function basin(d: number, x0: number, y0: number): Mesh {
  const m = gridMesh(6, 5, d, true, x0, y0);
  const r = rng(99);
  for (let p = 0; p < m.nPoints; p++) {
    // move interior-ish points by up to 0.2 d, the same in every copy (offsets are added after)
    m.points[2 * p] = x0 + (m.points[2 * p]! - x0) + (r() - 0.5) * 0.4 * d;
    m.points[2 * p + 1] = y0 + (m.points[2 * p + 1]! - y0) + (r() - 0.5) * 0.4 * d;
  }
  const u: number[] = [];
  for (let p = 0; p < m.nPoints; p++) u.push(0.5 + r(), r() - 0.5);
  m.pointData.push(vectorField('velocity', u));
  return m;
}

function expectRelative(a: ArrayLike<number>, b: ArrayLike<number>, tol: number, what: string): void {
  expect(a.length).toBe(b.length);
  for (let i = 0; i < a.length; i++) {
    const x = a[i]!, y = b[i]!;
    if (x === y) continue;
    expect(Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y)), `${what}[${i}]: ${x} vs ${y}`).toBeLessThanOrEqual(tol);
  }
}

/** The size-dependent results of two audits agree within `tol`, after scaling b's lengths by `scale`. */
function expectSameAudit(a: AuditResult, b: AuditResult, tol: number, scale = 1): void {
  const scaled = (v: Float64Array, k: number) => v.map((x) => x * k);
  expectRelative(a.dt, scaled(b.dt, scale), tol, 'dt');
  expectRelative(a.geom.inradius, scaled(b.geom.inradius, scale), tol, 'inradius');
  expectRelative(a.geom.area, scaled(b.geom.area, scale * scale), tol, 'area');
  expectRelative(a.geom.radiusRatio, b.geom.radiusRatio, tol, 'radius ratio');
  expectRelative(a.geom.minAngle, b.geom.minAngle, tol, 'min angle');
  expect(Array.from(a.geom.flags)).toEqual(Array.from(b.geom.flags));
  expect(a.summary.limit.cell).toBe(b.summary.limit.cell);
}

describe('a flow at rest', () => {
  it('no cell limits the step: JSON null, CSV inf, every cell counted as unlimited', () => {
    const m = gridMesh(3, 2, 1, true);
    m.pointData.push(vectorField('velocity', new Array(2 * m.nPoints).fill(0)));
    const r = runAudit(m);
    expectNoNaN(r, 'at rest');
    const json = JSON.parse(summaryJson(r));
    expect(json.limit.dt).toBeNull();
    expect(json.limit.cell).toBeNull();
    expect(json.counts.unlimited).toBe(m.nCells);
    expect(json.quantiles.min).toBeNull();
    const rows = cellsCsv(r).trim().split('\n').slice(1);
    expect(rows).toHaveLength(m.nCells);
    const col = CSV_COLUMNS.indexOf('dt');
    for (const row of rows) expect(row.split(',')[col]).toBe('inf');
  });

  it('shallow water on dry land at rest: no limit either, and every cell is dry', () => {
    const m = gridMesh(2, 2, 1);
    m.pointData.push(vectorField('velocity', new Array(2 * m.nPoints).fill(0)), scalarField('depth', new Array(m.nPoints).fill(-0.5)));
    const r = runAudit(m, { model: 'shallow-water', depth: 'depth' });
    expectNoNaN(r, 'dry');
    expect(r.summary.limit.dt).toBeNull();
    expect(r.summary.counts.dry).toBe(m.nCells);
  });
});

describe('non-finite field values', () => {
  function failure(m: Mesh, options = {}): MeshInputError {
    return inputError(() => runAudit(m, { file: 'basin.vtu', ...options }));
  }

  it('names the array and the first bad tuple: NaN, +Infinity, -Infinity', () => {
    for (const bad of [NaN, Infinity, -Infinity]) {
      const m = gridMesh(2, 1, 1);
      const u = new Array(2 * m.nPoints).fill(1);
      u[2 * 3 + 1] = bad; // tuple 3, component 1
      u[2 * 5] = bad; // a later one is not the one reported
      m.pointData.push(vectorField('velocity', u));
      const e = failure(m);
      expect(e.message).toMatch(/^basin\.vtu: /);
      expect(e.detail).toContain('"velocity"');
      expect(e.detail).toContain('tuple 3 (component 1)');
    }
  });

  it('in the depth of a shallow-water audit', () => {
    const m = gridMesh(2, 1, 1);
    m.pointData.push(vectorField('velocity', new Array(2 * m.nPoints).fill(0)));
    const h = new Array(m.nPoints).fill(2);
    h[4] = Infinity;
    m.pointData.push(scalarField('depth', h));
    const e = failure(m, { model: 'shallow-water', depth: 'depth' });
    expect(e.detail).toContain('"depth"');
    expect(e.detail).toContain('tuple 4');
  });

  it('read from a file (legacy VTK "nan", VTU binary Infinity), then refused by the audit', () => {
    const vtk = encodeLegacy({
      points: { type: 'double', xyz: [0, 0, 0, 1, 0, 0, 0, 1, 0] }, cells: [[0, 1, 2]], cellTypes: [5],
      attributes: [{ section: 'POINT_DATA', count: 3, items: [{ kind: 'VECTORS', name: 'velocity', type: 'double', values: [1, 0, 0, Number.NaN, 0, 0, 1, 0, 0] }] }],
    });
    const fromVtk = readMesh(vtk, 'nan.vtk');
    expect(() => runAudit(fromVtk, { file: 'nan.vtk' })).toThrow(/nan\.vtk: array "velocity" holds NaN at tuple 1/);
    const m = meshOf([0, 0, 1, 0, 0, 1], [[0, 1, 2]], [vectorField('velocity', [1, 0, 1, 0, 1, Infinity])]);
    const fromVtu = readMesh(writeVtu(m, {}, { encoding: 'appended-raw' }), 'inf.vtu');
    expect(() => runAudit(fromVtu, { file: 'inf.vtu' })).toThrow(/inf\.vtu: array "velocity" holds Infinity at tuple 2/);
  });
});

describe('scales and offsets', () => {
  const ref = runAudit(basin(1, 0, 0));

  it('micrometre cells: every length scales by 1e-6, shapes do not change', () => {
    const tiny = runAudit(basin(1e-6, 0, 0));
    expectNoNaN(tiny, 'tiny');
    expectSameAudit(tiny, ref, 1e-9, 1e-6);
    expect(tiny.summary.counts.degenerate).toBe(0);
  });

  it('cells 10 000 km from the origin agree with the same cells at the origin to 1e-6', () => {
    // projected map coordinates reach a few 10^6 m (common practice); 10^7 m is beyond any of them
    const far = runAudit(basin(1, 1e7, -1e7));
    expectNoNaN(far, 'far');
    expectSameAudit(far, ref, 1e-6);
  });

  it('micrometre cells a kilometre out still agree to 1e-6', () => {
    expectSameAudit(runAudit(basin(1e-6, 1e3, 1e3)), ref, 1e-6, 1e-6);
  });

  it('micrometre cells 10^7 m out: float64 spacing there is 2^-29 m, so only the NaN-free promise holds', () => {
    // 10^7 lies in [2^23, 2^24): neighbouring doubles are 2^(23-52) = 2^-29 ≈ 1.9e-9 m apart
    expect(1e7 + 2 ** -29).not.toBe(1e7);
    expect(1e7 + 2 ** -31).toBe(1e7);
    const r = runAudit(basin(1e-6, 1e7, 1e7));
    expectNoNaN(r, 'tiny and far');
    expectSameAudit(r, ref, 2e-2, 1e-6);
  });

  it('map coordinates survive a write and a read (VTU, legacy ASCII) unchanged', () => {
    const m = basin(3.5, 512345.25, 4123456.5);
    const expected = runAudit(m);
    for (const [name, bytes] of [['map.vtu', writeVtu(m, {}, { encoding: 'ascii' })], ['map.vtk', legacyOf(m, 'double', false)]] as const) {
      const r = runAudit(readMesh(bytes, name));
      expect(Array.from(r.dt), name).toEqual(Array.from(expected.dt));
    }
  });
});

describe('coordinates near the float64 limit', () => {
  /** One triangle with a velocity, its corners at ±`r`, in every format and encoding. */
  function everywhere(r: number): ReturnType<typeof vtuFiles> {
    const m: FuzzMesh = {
      points: [-r, -r, r, -r, 0, r], cells: [[0, 1, 2]], time: undefined, cellArrays: [],
      // Triangle keeps scalars only: its velocity is made of the first two (ux, uy)
      pointArrays: [
        { name: 'ux', components: 1, float32: false, values: [1, 1, 1] }, { name: 'uy', components: 1, float32: false, values: [0, 0, 0] },
        { name: 'velocity', components: 2, float32: false, values: [1, 0, 1, 0, 1, 0] },
      ],
    };
    return [...vtuFiles(m, 64), ...legacyFiles(m, 4), ...mshFiles(m, 1), ...triangleFiles(m, false)];
  }

  it('±1e150 is read and audited without NaN: differences square to 4e300, below the float64 limit', () => {
    for (const f of everywhere(1e150)) expectNoNaN(runAudit(readEncoded(f.files, f.entry)), f.label);
  });

  it('beyond ±1e150 every reader refuses the point, saying where (a point at 1e308 would make areas infinite)', () => {
    for (const f of everywhere(1e200)) {
      let caught: unknown = null;
      try {
        readEncoded(f.files, f.entry);
      } catch (e) {
        caught = e;
      }
      expect(caught, f.label).toBeInstanceOf(MeshInputError);
      const e = caught as MeshInputError;
      expect(e.detail, f.label).toMatch(/1e\+200.*beyond ±1e\+150|beyond ±1e\+150.*1e\+200|is -?1e\+200, beyond ±1e\+150/);
      expect(e.location.line ?? e.location.byteOffset, f.label).toBeGreaterThanOrEqual(0);
    }
  });
});

describe('float32 input', () => {
  it('float32 points and velocity audit exactly as their float64 widening does', () => {
    const m = basin(2.5, 100, 200);
    // the same numbers as float64, built by hand
    const xy32 = Array.from(m.points, Math.fround);
    const u32 = Array.from(m.pointData[0]!.values, Math.fround);
    const wide = meshOf(xy32, cellLists(m), [vectorField('velocity', u32)]);
    for (const binary of [false, true]) {
      const read = readMesh(legacyOf(m, 'float', binary), 'f32.vtk');
      expect(read.pointData[0]!.values).toBeInstanceOf(Float32Array);
      const a = runAudit(read), b = runAudit(wide);
      expectNoNaN(a, 'float32');
      expect(Array.from(a.dt)).toEqual(Array.from(b.dt));
      expect(Array.from(a.speed)).toEqual(Array.from(b.speed));
    }
  });

  it('a float32 velocity through every VTU encoding reads back as float32 and audits the same', () => {
    const m = basin(1, 0, 0);
    const v32 = Float32Array.from(m.pointData[0]!.values);
    const m32: Mesh = { ...m, pointData: [{ name: 'velocity', components: 2, values: v32 }] };
    const wide = runAudit({ ...m, pointData: [{ name: 'velocity', components: 2, values: Float64Array.from(v32) }] });
    for (const encoding of ['ascii', 'base64', 'appended-raw', 'appended-base64'] as const) {
      const read = readMesh(writeVtu(m32, {}, { encoding, compress: encoding !== 'ascii' }), 'f32.vtu');
      expect(read.pointData[0]!.values, encoding).toBeInstanceOf(Float32Array);
      expect(Array.from(runAudit(read).dt), encoding).toEqual(Array.from(wide.dt));
    }
  });
});
