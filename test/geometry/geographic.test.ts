import { describe, expect, it } from 'vitest';
import proj4 from 'proj4';
import { computeGeometry } from '../../src/geometry/cells.js';
import { EARTH_RADIUS, DEG } from '../../src/geometry/geographic.js';
import { runAudit } from '../../src/audit/audit.js';
import { cellsCsv } from '../../src/io/csv.js';
import { meshOf, rng, vectorField } from '../helpers/meshes.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/** Great-circle distance (haversine formula; standard spherical geometry). */
function haversine(lon1: number, lat1: number, lon2: number, lat2: number): number {
  const dphi = (lat2 - lat1) * DEG, dl = (lon2 - lon1) * DEG;
  const a = Math.sin(dphi / 2) ** 2 + Math.cos(lat1 * DEG) * Math.cos(lat2 * DEG) * Math.sin(dl / 2) ** 2;
  return 2 * EARTH_RADIUS * Math.asin(Math.sqrt(a));
}

describe('geographic coordinates', () => {
  it('mean Earth radius R = 6 371 008.8 m (IUGG, Moritz: Geodetic Reference System 1980)', () => {
    expect(EARTH_RADIUS).toBe(6371008.8);
  });

  it('east–west lengths halve from the equator to 60° N', () => {
    const d = 0.005;
    const cell = (lat: number) => meshOf([10, lat, 10 + d, lat, 10 + d / 2, lat + d * 0.866], [[0, 1, 2]]);
    const g0 = computeGeometry(cell(0), undefined, 'geographic');
    const g60 = computeGeometry(cell(60), undefined, 'geographic');
    // the base edge is east–west; it is the shortest edge at 60° N
    expect(g60.minEdge[0]! / haversine(10, 0, 10 + d, 0)).toBeCloseTo(0.5, 3);
    expect(g0.perimeter[0]!).toBeGreaterThan(g60.perimeter[0]!);
  });

  it('edge lengths agree with haversine distances within 1e-6 for cells under 1 km', () => {
    const r = rng(11);
    for (let k = 0; k < 200; k++) {
      const lon = -180 + 360 * r(), lat = -80 + 160 * r();
      const s = 0.008 * r() + 0.0005; // up to ~900 m
      const pts = [lon, lat, lon + s * r(), lat + s * (r() - 0.5), lon + s * (r() - 0.5), lat + s * r()];
      const g = computeGeometry(meshOf(pts, [[0, 1, 2]]), undefined, 'geographic');
      const hv = haversine(pts[0]!, pts[1]!, pts[2]!, pts[3]!) + haversine(pts[2]!, pts[3]!, pts[4]!, pts[5]!) + haversine(pts[4]!, pts[5]!, pts[0]!, pts[1]!);
      expect(rel(g.perimeter[0]!, hv)).toBeLessThan(1e-6);
    }
  });

  it('a 1°×1° cell at the equator vs the spherical zone area R²·Δλ·(sin φ₂ − sin φ₁) (standard spherical geometry)', () => {
    const g = computeGeometry(meshOf([0, 0, 1, 0, 1, 1, 0, 1], [[0, 1, 2, 3]]), undefined, 'geographic');
    const exact = EARTH_RADIUS ** 2 * DEG * (Math.sin(1 * DEG) - Math.sin(0));
    // the tangent-plane error is of second order in cell size / R: (111 km / 6371 km)² ≈ 3e-4
    expect(rel(g.area[0]!, exact)).toBeLessThan(1e-4);
    // and it falls with the square of the size: a 0.01° cell is within 1e-8
    const small = computeGeometry(meshOf([0, 0, 0.01, 0, 0.01, 0.01, 0, 0.01], [[0, 1, 2, 3]]), undefined, 'geographic');
    expect(rel(small.area[0]!, EARTH_RADIUS ** 2 * 0.01 * DEG * Math.sin(0.01 * DEG))).toBeLessThan(1e-8);
  });

  it('cells across the antimeridian are unwrapped', () => {
    const a = computeGeometry(meshOf([179.998, 10, -179.998, 10, 179.999, 10.003], [[0, 1, 2]]), undefined, 'geographic');
    const b = computeGeometry(meshOf([-0.002, 10, 0.002, 10, -0.001, 10.003], [[0, 1, 2]]), undefined, 'geographic');
    expect(rel(a.area[0]!, b.area[0]!)).toBeLessThan(1e-9);
    expect(a.area[0]!).toBeGreaterThan(1e4);
  });

  it('same steps as the mesh projected to metres by proj4 (spherical transverse Mercator, k = 1), within 1e-6', () => {
    const r = rng(5);
    const lon0 = -4.2, lat0 = 50.35; // an invented estuary mouth
    const pts: number[] = [];
    for (let j = 0; j <= 6; j++) for (let i = 0; i <= 6; i++) pts.push(lon0 + i * 0.004 + (r() - 0.5) * 0.001, lat0 + j * 0.003 + (r() - 0.5) * 0.001);
    const cells: number[][] = [];
    for (let j = 0; j < 6; j++) for (let i = 0; i < 6; i++) {
      const a = j * 7 + i;
      cells.push([a, a + 1, a + 8], [a, a + 8, a + 7]);
    }
    const vel = vectorField('velocity', Array.from({ length: 49 }, (_, k) => [1 + 0.3 * Math.sin(k), 0.4 * Math.cos(k)]).flat());
    const geo = runAudit(meshOf(pts, cells, [vel]), { coords: 'geographic' });
    const tm = proj4('+proj=longlat +R=6371008.8 +no_defs', `+proj=tmerc +approx +lat_0=${lat0 + 0.01} +lon_0=${lon0 + 0.012} +k=1 +x_0=0 +y_0=0 +R=6371008.8 +units=m +no_defs`);
    const xy: number[] = [];
    for (let k = 0; k < pts.length; k += 2) xy.push(...tm.forward([pts[k]!, pts[k + 1]!]));
    const planar = runAudit(meshOf(xy, cells, [vel]));
    for (let i = 0; i < cells.length; i++) expect(rel(geo.dt[i]!, planar.dt[i]!)).toBeLessThan(1e-6);
    // the CSV holds m² and m for geographic input
    const lines = cellsCsv(geo).split('\n');
    const head = lines[0]!.split(',');
    const row = lines[1]!.split(',');
    expect(rel(Number(row[head.indexOf('area')]), planar.geom.area[0]!)).toBeLessThan(1e-6);
    expect(rel(Number(row[head.indexOf('inradius')]), planar.geom.inradius[0]!)).toBeLessThan(1e-6);
    expect(geo.summary.units.coordinates).toBe('degrees');
  });

  it('warns when coordinates look like degrees and no --coords is given', () => {
    const m = meshOf([-4.2, 50.3, -4.19, 50.3, -4.2, 50.31], [[0, 1, 2]], [vectorField('velocity', [1, 0, 1, 0, 1, 0])]);
    expect(runAudit(m).summary.warnings.join()).toMatch(/look like degrees.*--coords geographic/);
    expect(runAudit(m, { coords: 'planar' }).summary.warnings.join()).not.toMatch(/look like degrees/);
    const metres = meshOf([5e5, 4e6, 5e5 + 10, 4e6, 5e5, 4e6 + 10], [[0, 1, 2]], [vectorField('velocity', [1, 0, 1, 0, 1, 0])]);
    expect(runAudit(metres).summary.warnings.join()).not.toMatch(/look like degrees/);
  });
});

describe('input units', () => {
  it('feet and knots are converted once (1 ft = 0.3048 m, NIST SP 811; 1 kn = 1852/3600 m/s, SI Brochure 9th ed.)', () => {
    const m = meshOf([0, 0, 100, 0, 100, 100, 0, 100], [[0, 1, 2, 3]], [vectorField('velocity', [2, 0, 2, 0, 2, 0, 2, 0])]);
    const r = runAudit(m, { lengthUnit: 'ft', velocityUnit: 'kn' });
    expect(r.dt[0]).toBeCloseTo((50 * 0.3048) / (2 * 1852 / 3600), 12);
    expect(r.geom.area[0]).toBeCloseTo(10000 * 0.3048 ** 2, 9);
    expect(r.summary.input).toEqual({ coords: 'planar', length_unit: 'ft', velocity_unit: 'kn' });
    expect(() => runAudit(m, { velocityUnit: 'mph' })).toThrow(/--velocity-unit must be one of/);
  });
});
