import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cellSpeeds, STANDARD_GRAVITY } from '../../src/physics/speed.js';
import { MeshInputError, UsageError } from '../../src/mesh/errors.js';
import { gridMesh, meshOf, scalarField, vectorField } from '../helpers/meshes.js';

const twoTris = (pd: Parameters<typeof meshOf>[2] = [], cd: Parameters<typeof meshOf>[3] = []) =>
  meshOf([0, 0, 1, 0, 1, 1, 0, 1], [[0, 1, 2], [0, 2, 3]], pd, cd);

describe('wave speeds', () => {
  it('shallow-water gravity wave: √(9.80665·10) = 9.902853 m/s (standard gravity, CGPM 1901)', () => {
    const m = twoTris([vectorField('velocity', [0, 0, 0, 0, 0, 0, 0, 0]), scalarField('depth', [10, 10, 10, 10])]);
    const r = cellSpeeds(m, { model: 'shallow-water', depth: 'depth' });
    expect(STANDARD_GRAVITY).toBe(9.80665);
    expect(r.speed[0]).toBeCloseTo(9.902853, 6);
    expect(r.dry).toBe(0);
  });

  it('point data → cell as the maximum over the nodes; λ per node when all inputs are point data', () => {
    // node 1 fast and shallow, node 2 slow and deep: per-node λ max, not the sum of maxima
    const m = twoTris([vectorField('velocity', [0, 0, 3, 0, 0, 0, 0, 0]), scalarField('depth', [0, 0, 10, 0])]);
    const r = cellSpeeds(m, { model: 'shallow-water', depth: 'depth', gravity: 10 });
    expect(r.speed[0]).toBeCloseTo(Math.max(3, 10), 12);
    expect(r.speed[1]).toBeCloseTo(10, 12);
    // cell 1 has node 2 wet; a cell with every node dry counts as dry
    const dry = twoTris([vectorField('velocity', [1, 0, 1, 0, 1, 0, 1, 0]), scalarField('depth', [0, -1, 2, 0])]);
    const rd = cellSpeeds(dry, { model: 'shallow-water', depth: 'depth' });
    expect(rd.dry).toBe(0);
    const alldry = cellSpeeds(twoTris([vectorField('velocity', [1, 0, 1, 0, 1, 0, 1, 0]), scalarField('depth', [0, -1, -2, 0])]), { model: 'shallow-water', depth: 'depth' });
    expect(alldry.dry).toBe(2);
    expect(alldry.speed[0]).toBe(1);
  });

  it('point velocity → cell: the largest |u| over the nodes, bit for bit (any magnitude, any unit factor)', () => {
    const m = gridMesh(6, 5, 1, true);
    // reference: |u| per node by the square root (by hypot where the squares leave its range), then the maximum
    const norm = (x: number, y: number): number => { const s = x * x + y * y; return s < 1e300 && s > 1e-300 ? Math.sqrt(s) : Math.hypot(x, y); };
    const component = fc.oneof(fc.double({ min: -50, max: 50, noNaN: true }), fc.constantFrom(0, -0, 1e-200, -3e-170, 2e160, -1e200, 5e-324));
    fc.assert(fc.property(fc.array(component, { minLength: 2 * m.nPoints, maxLength: 2 * m.nPoints }), fc.constantFrom('m/s', 'kn'), (u, unit) => {
      const scale = unit === 'kn' ? 1852 / 3600 : 1;
      const r = cellSpeeds({ ...m, pointData: [vectorField('velocity', u)] }, { velocityScale: scale });
      for (let c = 0; c < m.nCells; c++) {
        let want = 0;
        for (let k = m.cellOffsets[c]!; k < m.cellOffsets[c + 1]!; k++) {
          const p = m.cellNodes[k]!;
          want = Math.max(want, norm(u[2 * p]! * scale, u[2 * p + 1]! * scale));
        }
        expect(r.speed[c]).toBe(want);
      }
    }), { numRuns: 200, seed: 17 });
  });

  it('cell data is used as is; two scalar arrays as X,Y; acoustic constant and array', () => {
    const m = twoTris([scalarField('ux', [3, 0, 0, 0]), scalarField('uy', [4, 0, 0, 0])], [vectorField('U', [1, 0, 0, 2]), scalarField('c', [340, 300])]);
    expect(Array.from(cellSpeeds(m, { velocity: 'U' }).speed)).toEqual([1, 2]);
    expect(Array.from(cellSpeeds(m, { velocity: ['ux', 'uy'] }).speed)).toEqual([5, 5]);
    expect(Array.from(cellSpeeds(m, { velocity: 'U', model: 'acoustic', soundSpeed: 340 }).speed)).toEqual([341, 342]);
    expect(Array.from(cellSpeeds(m, { velocity: 'U', model: 'acoustic', soundSpeed: 'c' }).speed)).toEqual([341, 302]);
  });

  it('3-component velocity with a nonzero z gives a warning', () => {
    const m = twoTris([vectorField('velocity', [1, 0, 0.5, 1, 0, 0, 1, 0, 0, 1, 0, 0], 3)]);
    const r = cellSpeeds(m);
    expect(r.speed[0]).toBe(1);
    expect(r.warnings.join()).toMatch(/nonzero z/);
  });

  it('a missing velocity name lists the arrays there are; NaN names the array and index', () => {
    const m = twoTris([vectorField('flow', [1, 0, 1, 0, 1, 0, 1, 0]), scalarField('depth', [1, 1, 1, 1])]);
    expect(() => cellSpeeds(m, { velocity: 'velocity' })).toThrow(UsageError);
    expect(() => cellSpeeds(m, { velocity: 'velocity' })).toThrow(/flow \(point, 2\).*depth \(point, 1\)/);
    expect(() => cellSpeeds(m)).toThrow(/no velocity array found/);
    const bad = twoTris([vectorField('velocity', [1, 0, 1, 0, NaN, 0, 1, 0])]);
    expect(() => cellSpeeds(bad, { file: 'x.vtu' })).toThrow(MeshInputError);
    expect(() => cellSpeeds(bad, { file: 'x.vtu' })).toThrow(/x\.vtu: array "velocity" holds NaN at tuple 2/);
  });
});
